import { expect, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "ember-demo-2026";

/** Signs in through the form, as a person would. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto("/login");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

/** Saves a full-page screenshot at desktop and phone width under data/screens (kept between runs, unlike test-results/). */
export async function screenshotBothWidths(page: Page, name: string) {
  for (const [label, width, height] of [["desktop", 1280, 900], ["phone", 375, 812]] as const) {
    await page.setViewportSize({ width, height });
    await page.screenshot({ path: `data/screens/${name}-${label}.png`, fullPage: true });
    // The page must not scroll sideways on a phone: that is what "looks broken" usually is.
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow, `${name} at ${label} width scrolls sideways`).toBeLessThanOrEqual(1);
  }
  await page.setViewportSize({ width: 1280, height: 900 });
}
