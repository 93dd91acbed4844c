import { expect, type Locator, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "ember-demo-2026";

/** Signs in through the form, as a person would; with the demo password it waits until signed in. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto("/login");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  if (password === DEMO_PASSWORD) await expect(page).not.toHaveURL(/\/login/);
}

/**
 * Saves a full-page screenshot at desktop and phone width under data/screens (kept between runs, unlike test-results/).
 */
export async function screenshotBothWidths(page: Page, name: string) {
  for (const [label, width, height] of [
    ["desktop", 1280, 900],
    ["phone", 375, 812],
  ] as const) {
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
  await expect(
    page.getByRole("heading", { name: new RegExp(`Thank you, ${person.name.split(" ")[0]}`) }),
  ).toBeVisible();
}

export const MAIL_FAKE = `http://127.0.0.1:${process.env.E2E_EMAIL_PORT ?? 4110}`;
export const PAYMENTS_FAKE = `http://127.0.0.1:${process.env.E2E_PAYMENTS_PORT ?? 4120}`;

export type FakeMessage = {
  id: string;
  to: string[];
  subject: string;
  text: string;
  attachments?: { filename: string }[];
};

export async function listMail(): Promise<FakeMessage[]> {
  return (await (await fetch(`${MAIL_FAKE}/_fake/messages`)).json()) as FakeMessage[];
}

/**
 * Picks the nth free consult time counted across all days (0 = the first), as a person would: the
 * day in the grid of days, then the time among that day's. Returns the day's and the time's names.
 */
export async function chooseConsultTime(page: Page, n = 0): Promise<{ day: string; time: string }> {
  const days = page.getByRole("list", { name: "Days with free times" }).getByRole("link");
  await expect(days.first()).toBeVisible();
  let left = n;
  for (let i = 0; i < (await days.count()); i++) {
    const free = await freeTimesOn(days.nth(i));
    if (left >= free) {
      left -= free;
      continue;
    }
    const day = await longDayOf(days.nth(i));
    await days.nth(i).click();
    await expect(days.nth(i)).toHaveAttribute("aria-current", "date");
    const times = page.getByRole("group", { name: `Pick a time on ${day}` }).getByRole("radio");
    await expect(times.nth(left)).toBeAttached();
    const time = (await times.nth(left).getAttribute("value"))!;
    // Keeps trying until the page has hydrated (a choice made before it may be reset).
    await expect(async () => {
      await times.nth(left).check({ force: true });
      await expect(times.nth(left)).toBeChecked();
    }).toPass();
    return { day, time };
  }
  throw new Error(`only ${n - left} free consult times are offered`);
}

/** How many free times a day link says it has ("Thu, Dec 3: 6 free times"). */
export async function freeTimesOn(dayLink: Locator): Promise<number> {
  return Number(/(\d+) free/.exec((await dayLink.textContent())!)![1]);
}

/** "Thursday, December 3" for a day link, from its `?day=YYYY-MM-DD`. */
export async function longDayOf(dayLink: Locator): Promise<string> {
  const day = /[?&]day=(\d{4}-\d{2}-\d{2})/.exec((await dayLink.getAttribute("href"))!)![1];
  return new Intl.DateTimeFormat("en-US", { weekday: "long", month: "long", day: "numeric", timeZone: "UTC" }).format(
    new Date(`${day}T12:00:00Z`),
  );
}

/** Picks the nth free time and presses the pay button: the browser goes to the payment page. */
export async function holdConsultTime(page: Page, n = 0): Promise<{ day: string; time: string }> {
  const chosen = await chooseConsultTime(page, n);
  await page.getByRole("button", { name: /^Hold this time and pay/ }).click();
  return chosen;
}

/**
 * Full-page screenshots at 1366, 390 and 360 px under data/screens; at each width the page must not scroll sideways.
 */
export async function screenshotThreeWidths(page: Page, name: string) {
  for (const width of [1366, 390, 360]) {
    await page.setViewportSize({ width, height: width > 400 ? 900 : 800 });
    await page.screenshot({ path: `data/screens/${name}-${width}.png`, fullPage: true });
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow, `${name} at ${width} px scrolls sideways`).toBeLessThanOrEqual(0);
  }
  await page.setViewportSize({ width: 1280, height: 900 });
}
