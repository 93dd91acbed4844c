/*
 * The schedule's calendar grid as the owner uses it: a booked build dragged to another day, a drop on
 * a day without builds refused, the "Move to…" field as the keyboard's way, and the calendar file the
 * homeowner receives read back with ical.js (RFC 5545 §3.8.7.4: one UID, SEQUENCE raised by each move).
 * Sunniva Okoro's build is the seed's booked one, two weeks out; Tobias Wren's is left to builds.spec.ts,
 * so every day chosen here is nine days out or more, clear of the days his booking will take.
 */
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import ICAL from "ical.js";
import { listMail, MAIL_FAKE, screenshotThreeWidths, signIn, type FakeMessage } from "./helpers";

test.describe.configure({ timeout: 120_000 });

const CUSTOMER = "Sunniva Okoro";
const HOMEOWNER_EMAIL = "sunniva.okoro@example.test";
const CHIP = `${CUSTOMER}: move this build`;

async function calendarOf(message: FakeMessage) {
  const text = await (await fetch(`${MAIL_FAKE}/m/${encodeURIComponent(message.id)}/attachments/0`)).text();
  const calendar = new ICAL.Component(ICAL.parse(text));
  const event = new ICAL.Event(calendar.getFirstSubcomponent("vevent")!);
  return {
    method: calendar.getFirstPropertyValue("method"),
    uid: event.uid,
    sequence: event.sequence,
    start: event.startDate.toString().slice(0, 10),
  };
}

/** The homeowner's "New build dates" mails, oldest first, once there are at least `count`. */
async function movedMails(count: number): Promise<FakeMessage[]> {
  let found: FakeMessage[] = [];
  await expect
    .poll(
      async () => {
        found = (await listMail()).filter((m) => m.to.includes(HOMEOWNER_EMAIL) && /^New build dates/.test(m.subject));
        return found.length;
      },
      { timeout: 30_000 },
    )
    .toBeGreaterThanOrEqual(count);
  return found;
}

const plusDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

/** The day cells of the grid that take builds (or not), as "YYYY-MM-DD". */
async function cellDays(page: Page, working: boolean): Promise<string[]> {
  return page
    .locator(`td[data-working="${working}"]`)
    .evaluateAll((cells) => cells.map((c) => (c as HTMLElement).dataset.day!));
}

async function firstDayOf(page: Page): Promise<string> {
  return (await page
    .getByRole("button", { name: CHIP, exact: true })
    .locator("xpath=ancestor::td[1]")
    .getAttribute("data-day"))!;
}

/** Drags the build's first-day chip onto the day's cell with the mouse, in small steps, as a person would. */
async function dragBuildTo(page: Page, day: string) {
  const chip = page.getByRole("button", { name: CHIP, exact: true });
  const target = page.locator(`td[data-day="${day}"]`);
  await chip.scrollIntoViewIfNeeded();
  const from = (await chip.boundingBox())!;
  const to = (await target.boundingBox())!;
  await page.mouse.move(from.x + from.width / 2, from.y + from.height / 2);
  await page.mouse.down();
  await page.mouse.move(to.x + to.width / 2, to.y + to.height / 2, { steps: 12 });
  await page.mouse.up();
}

test("the owner drags a build to another day; the new dates show and the homeowner's calendar file follows", async ({
  page,
}) => {
  await page.setViewportSize({ width: 1366, height: 1100 });
  await signIn(page, "owner@cinder-slate.test");
  await page.goto("/app/schedule");
  const grid = page.getByRole("region", { name: "Calendar", exact: true });
  await expect(grid.getByRole("button", { name: CHIP, exact: true })).toBeVisible();
  const axe = await new AxeBuilder({ page }).analyze();
  expect(axe.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);
  await screenshotThreeWidths(page, "schedule-calendar");
  await page.setViewportSize({ width: 1366, height: 1100 });

  const oldFirst = await firstDayOf(page);
  const target = (await cellDays(page, true)).find((d) => d >= plusDays(9) && d < oldFirst)!;
  expect(target, "a working day between nine days out and the build's first day").toBeTruthy();
  await dragBuildTo(page, target);
  await expect(page.getByRole("status")).toContainText(`${CUSTOMER}'s build moved to`);
  await expect(page.locator(`td[data-day="${target}"]`).getByRole("button", { name: CHIP, exact: true })).toBeVisible();
  // The list beside the grid shows the same first day.
  await expect(page.getByLabel(`Move to… start day for ${CUSTOMER}`)).toHaveValue(target);

  const [moved] = await movedMails(1);
  const first = await calendarOf(moved!);
  expect(first.method).toBe("REQUEST");
  // The seed booked it at SEQUENCE 0; the move is the first change.
  expect(first.sequence).toBe(1);
  expect(first.start).toBe(target);

  // A drop on a day that takes no builds is refused, and the build stays where it was.
  const closed = (await cellDays(page, false)).find((d) => d > plusDays(1))!;
  await dragBuildTo(page, closed);
  await expect(page.getByRole("alert")).toContainText(/not a working day|a day off/);
  await expect(page.locator(`td[data-day="${target}"]`).getByRole("button", { name: CHIP, exact: true })).toBeVisible();

  // The keyboard's way: a day typed into the build's "Move to…" field.
  const later = (await cellDays(page, true)).find((d) => d > target && d >= plusDays(10))!;
  const field = page.getByLabel(`Move to… start day for ${CUSTOMER}`);
  await field.fill(later);
  await field.press("Enter");
  await expect(page.getByRole("status")).toContainText(`${CUSTOMER}'s build moved to`);
  await expect(page.locator(`td[data-day="${later}"]`).getByRole("button", { name: CHIP, exact: true })).toBeVisible();
  const mails = await movedMails(2);
  const second = await calendarOf(mails.find((m) => m.id !== moved!.id)!);
  expect(second.uid).toBe(first.uid);
  expect(second.sequence).toBeGreaterThan(first.sequence);
  expect(second.start).toBe(later);
});

test("an estimator sees the grid read-only: builds are links, nothing to drag or move", async ({ page }) => {
  await signIn(page, "estimator@cinder-slate.test");
  await page.goto("/app/schedule");
  const grid = page.getByRole("region", { name: "Calendar", exact: true });
  await expect(grid.getByRole("link", { name: CUSTOMER, exact: true })).toBeVisible();
  await expect(page.getByRole("button", { name: CHIP })).toHaveCount(0);
  await expect(page.getByLabel(/Move to…/)).toHaveCount(0);
  await expect(page.getByText("Owners move builds.")).toBeVisible();
});

test("the owner sets the crew and the working week; a bad value is refused beside its field and nothing is saved", async ({
  page,
}) => {
  await signIn(page, "owner@cinder-slate.test");
  await page.goto("/app/settings");
  const crew = page.getByRole("form", { name: "Build crew and working week" });
  await expect(crew.getByLabel("Crew size")).toHaveValue("2");
  await expect(crew.getByText("Default: 2.")).toBeVisible();

  await crew.getByLabel("Crew size").fill("3");
  await crew.getByLabel("Crew day").fill("9.5");
  await crew.getByRole("checkbox", { name: "Saturday" }).check();
  await crew.getByRole("button", { name: "Save crew and week" }).click();
  await expect(page.getByRole("status")).toContainText("Crew and working week saved");
  await expect(crew.getByLabel("Crew size")).toHaveValue("3");
  await expect(crew.getByLabel("Crew day")).toHaveValue("9.5");
  await expect(crew.getByRole("checkbox", { name: "Saturday" })).toBeChecked();

  // Thirteen people and no weekday at all: both named beside their fields, neither saved.
  await crew.getByLabel("Crew size").fill("13");
  for (const day of ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday"])
    await crew.getByRole("checkbox", { name: day }).uncheck();
  await crew.getByRole("button", { name: "Save crew and week" }).click();
  await expect(page.getByRole("alert")).toContainText("Nothing was saved");
  await expect(crew.getByText("Crew size must be between 1 and 12 people.")).toBeVisible();
  await expect(crew.getByText(/Working weekdays: tick at least one day/)).toBeVisible();
  const axe = await new AxeBuilder({ page }).analyze();
  expect(axe.violations.map((v) => v.id)).toEqual([]);
  await screenshotThreeWidths(page, "settings-crew-refused");
  await page.goto("/app/settings");
  await expect(crew.getByLabel("Crew size")).toHaveValue("3");
  await expect(crew.getByRole("checkbox", { name: "Monday" })).toBeChecked();

  // Back to the seed's values, so later journeys book with the crew they expect.
  await crew.getByLabel("Crew size").fill("2");
  await crew.getByLabel("Crew day").fill("8");
  await crew.getByRole("checkbox", { name: "Saturday" }).uncheck();
  await crew.getByRole("button", { name: "Save crew and week" }).click();
  await expect(page.getByRole("status")).toContainText("Crew and working week saved");
  await expect(crew.getByLabel("Crew size")).toHaveValue("2");
});

test.describe("on a touch screen", () => {
  test.use({ hasTouch: true, isMobile: true, viewport: { width: 390, height: 844 } });

  test("the owner drags a build with a finger to the same weekday a week later", async ({ page }) => {
    await signIn(page, "owner@cinder-slate.test");
    await page.goto("/app/schedule");
    const chip = page.getByRole("button", { name: CHIP, exact: true });
    await chip.scrollIntoViewIfNeeded();
    const from = await firstDayOf(page);
    const weekLater = new Date(`${from}T12:00:00Z`);
    weekLater.setUTCDate(weekLater.getUTCDate() + 7);
    const target = weekLater.toISOString().slice(0, 10);
    const cell = page.locator(`td[data-day="${target}"]`);
    const a = (await chip.boundingBox())!;
    const b = (await cell.boundingBox())!;
    // Chromium turns these touches into pointer events of type "touch", as a phone's would be.
    const cdp = await page.context().newCDPSession(page);
    const at = (x: number, y: number) => [{ x: Math.round(x), y: Math.round(y) }];
    await cdp.send("Input.dispatchTouchEvent", { type: "touchStart", touchPoints: at(a.x + a.width / 2, a.y + 8) });
    for (let i = 1; i <= 10; i++) {
      const x = a.x + a.width / 2 + ((b.x + b.width / 2 - (a.x + a.width / 2)) * i) / 10;
      const y = a.y + 8 + ((b.y + b.height / 2 - (a.y + 8)) * i) / 10;
      await cdp.send("Input.dispatchTouchEvent", { type: "touchMove", touchPoints: at(x, y) });
    }
    await cdp.send("Input.dispatchTouchEvent", { type: "touchEnd", touchPoints: [] });
    await expect(page.getByRole("status")).toContainText(`${CUSTOMER}'s build moved to`);
    await expect(cell.getByRole("button", { name: CHIP, exact: true })).toBeVisible();
  });
});
