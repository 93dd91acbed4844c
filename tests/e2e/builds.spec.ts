/*
 * Build dates, as the owner books and moves them and the homeowner receives them: the calendar file
 * that arrives is read back with ical.js (RFC 5545: one UID for the build, SEQUENCE raised by the move).
 */
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import ICAL from "ical.js";
import { listMail, MAIL_FAKE, signIn, type FakeMessage } from "./helpers";

test.describe.configure({ timeout: 120_000 });

async function calendarOf(message: FakeMessage) {
  const text = await (await fetch(`${MAIL_FAKE}/m/${encodeURIComponent(message.id)}/attachments/0`)).text();
  const calendar = new ICAL.Component(ICAL.parse(text));
  const event = new ICAL.Event(calendar.getFirstSubcomponent("vevent")!);
  return {
    method: calendar.getFirstPropertyValue("method"),
    uid: event.uid,
    sequence: event.sequence,
    start: event.startDate.toString(),
  };
}

async function homeownerMail(subject: RegExp): Promise<FakeMessage> {
  let found: FakeMessage | undefined;
  await expect
    .poll(
      async () => {
        found = (await listMail()).find((m) => m.to.includes("tobias.wren@example.test") && subject.test(m.subject));
        return Boolean(found);
      },
      { timeout: 30_000 },
    )
    .toBe(true);
  return found!;
}

async function openTobiasBuildPage(page: Page) {
  await page.goto("/app/inbox?q=Tobias%20Wren");
  await page.getByRole("main").getByRole("link", { name: "Tobias Wren" }).first().click();
  await page.getByRole("link", { name: "Build dates" }).click();
  await expect(page.getByRole("heading", { name: "Build dates" })).toBeVisible();
}

test("the owner books a signed job's build, sees it on the schedule, moves it, and the homeowner's calendar file follows", async ({
  page,
}) => {
  await signIn(page, "owner@cinder-slate.test");
  await openTobiasBuildPage(page);
  // The page says how the days were worked out.
  await expect(page.getByText(/labour-hours ÷/)).toBeVisible();
  const axe = await new AxeBuilder({ page }).analyze();
  expect(axe.violations.map((v) => v.id)).toEqual([]);

  await page.getByRole("button", { name: "Book and tell everyone" }).click();
  await expect(page.getByRole("status")).toContainText("Build booked");
  const bookedDays = await page.getByRole("region", { name: "Booked" }).locator("p").first().innerText();

  const booked = await homeownerMail(/^Your fire pit build/);
  const first = await calendarOf(booked);
  expect(first.method).toBe("REQUEST");
  expect(first.sequence).toBe(0);

  await page.goto("/app/schedule");
  const builds = page.getByRole("region", { name: "Builds" });
  await expect(builds.getByRole("link", { name: "Tobias Wren", exact: true })).toBeVisible();
  await expect(builds).toContainText(bookedDays);

  // Moved a week later by a new first day: same event, raised sequence.
  await builds.getByRole("link", { name: "Change dates of Tobias Wren" }).click();
  const startField = page.getByLabel("New first day");
  const oldStart = await startField.inputValue();
  const later = new Date(`${oldStart}T12:00:00Z`);
  later.setUTCDate(later.getUTCDate() + 7);
  await startField.fill(later.toISOString().slice(0, 10));
  await page.getByRole("button", { name: "Move and tell everyone" }).click();
  await expect(page.getByRole("status")).toContainText("Build moved");

  const moved = await homeownerMail(/^New build dates/);
  const second = await calendarOf(moved);
  expect(second.uid).toBe(first.uid);
  expect(second.sequence).toBe(1);
  expect(second.method).toBe("REQUEST");
  expect(second.start > first.start).toBe(true);
});

test("a crew member makes a private calendar link that answers a feed, and a new link ends the old one", async ({
  page,
  request,
}) => {
  await signIn(page, "crew@cinder-slate.test");
  await page.goto("/app/calendar");
  const axe = await new AxeBuilder({ page }).analyze();
  expect(axe.violations.map((v) => v.id)).toEqual([]);
  await page.getByRole("button", { name: /calendar link|new link/ }).click();
  const first = await page.getByLabel("Calendar link").inputValue();
  const feed = await request.get(new URL(first).pathname);
  expect(feed.status()).toBe(200);
  expect(feed.headers()["content-type"]).toContain("text/calendar");
  expect(await feed.text()).toMatch(/^BEGIN:VCALENDAR/);

  await page.getByRole("button", { name: "Make a new link" }).click();
  await expect(page.getByLabel("Calendar link")).not.toHaveValue(first);
  expect((await request.get(new URL(first).pathname)).status()).toBe(404);
  await page.getByRole("button", { name: "Stop sharing" }).click();
  await expect(page.getByRole("status")).toContainText("Sharing stopped");
});
