import { expect, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "ember-demo-2026";

/** Signs in through the form, as a person would; with the demo password it waits until signed in. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto("/login");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  if (password === DEMO_PASSWORD) await expect(page).not.toHaveURL(/\/login/);
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

/** Sends a fire-pit request from the demo contractor's configurator, as a homeowner would. */
export async function sendRequest(page: Page, person: { name: string; email: string; town?: string }, query = "") {
  await page.goto(`/c/cinder-slate${query}`);
  await expect(page.getByRole("button", { name: "Update the design" })).toHaveCount(0);
  await page.getByLabel("Your name").fill(person.name);
  await page.getByLabel("E-mail", { exact: true }).fill(person.email);
  await page.getByLabel("Phone", { exact: true }).fill("(970) 555-0178");
  await page.getByLabel("Street address").fill("21 Juniper Row");
  await page.getByLabel("Town").fill(person.town ?? "Millbrook Falls");
  await page.getByLabel(/may contact me/).check();
  await page.getByRole("button", { name: "Send my request" }).click();
  await expect(page.getByRole("heading", { name: new RegExp(`Thank you, ${person.name.split(" ")[0]}`) })).toBeVisible();
}

export const MAIL_FAKE = `http://127.0.0.1:${process.env.E2E_EMAIL_PORT ?? 4110}`;
export const PAYMENTS_FAKE = `http://127.0.0.1:${process.env.E2E_PAYMENTS_PORT ?? 4120}`;

export type FakeMessage = { id: string; to: string[]; subject: string; text: string; attachments?: { filename: string }[] };

export async function listMail(): Promise<FakeMessage[]> {
  return (await (await fetch(`${MAIL_FAKE}/_fake/messages`)).json()) as FakeMessage[];
}
