import { expect, test, type Page } from "@playwright/test";
import {
  chooseConsultTime,
  freeTimesOn,
  holdConsultTime,
  longDayOf,
  listMail,
  PAYMENTS_FAKE,
  screenshotBothWidths,
  screenshotThreeWidths,
  sendRequest,
  signIn,
  MAIL_FAKE,
} from "./helpers";

async function payWith(page: Page, card: string) {
  await page.getByLabel("Card number").fill(card);
  await page.getByLabel("Expiry (MM / YY)").fill("12 / 30");
  await page.getByLabel("Security code (CVC)").fill("123");
  await page.getByLabel("Name on card").fill("Juno Marsh");
  await page.getByRole("button", { name: /^Pay / }).click();
}

test("a homeowner books a consult: the declined card leaves the slot free, the good card books it, the e-mail carries a calendar file, staff see it and cancel with a refund", async ({
  page,
  browser,
}) => {
  const email = `juno.${Date.now()}@example.test`;
  await sendRequest(page, { name: "Juno Marsh", email });
  await page.getByRole("link", { name: "Book a design consult" }).click();
  await expect(page.getByRole("heading", { name: "Book a design consult" })).toBeVisible();
  await screenshotBothWidths(page, "consult-slots");

  const slot = await holdConsultTime(page, 0);
  await expect(page).toHaveURL(new RegExp(`^${PAYMENTS_FAKE}/pay/`));
  await payWith(page, "4000 0000 0000 0002");
  await expect(page.getByText("Your card was declined.")).toBeVisible();
  await page.getByRole("link", { name: "Cancel and go back" }).click();
  await expect(
    page.getByText("You left the payment page, so nothing was charged and that time is free again."),
  ).toBeVisible();
  // The same time is offered again, first on its day.
  expect(await holdConsultTime(page, 0)).toEqual(slot);
  await payWith(page, "4242 4242 4242 4242");
  await expect(page.getByRole("heading", { name: "Your design consult is booked" })).toBeVisible({ timeout: 20_000 });
  await screenshotBothWidths(page, "consult-booked");

  await expect
    .poll(
      async () =>
        (await listMail()).filter((m) => m.to.includes(email) && m.subject.startsWith("Design consult booked")).length,
      { timeout: 15_000 },
    )
    .toBe(1);
  const confirmation = (await listMail()).find(
    (m) => m.to.includes(email) && m.subject.startsWith("Design consult booked"),
  )!;
  const full = await (await fetch(`${MAIL_FAKE}/_fake/messages/${confirmation.id}`)).json();
  expect(full.attachments.map((a: { filename: string }) => a.filename)).toEqual(["design-consult.ics"]);
  expect(Buffer.from(full.attachments[0].content, "base64").toString()).toContain("BEGIN:VEVENT");

  // Staff see it on the schedule and cancel it; the fake shows the refund; both sides get e-mail.
  const staff = await browser.newContext();
  const staffPage = await staff.newPage();
  await signIn(staffPage, "estimator@cinder-slate.test");
  await staffPage.goto("/app/schedule");
  // Named in the calendar grid and in the list of consults below it.
  await expect(staffPage.getByRole("link", { name: "Juno Marsh", exact: true }).first()).toBeVisible();
  await expect(staffPage.getByRole("link", { name: /consult: Juno Marsh$/ }).first()).toBeVisible();
  await screenshotBothWidths(staffPage, "schedule");
  const refundsBefore = ((await (await fetch(`${PAYMENTS_FAKE}/_fake/refunds`)).json()) as { data: unknown[] }).data
    .length;
  await staffPage.getByRole("button", { name: "Cancel and refund the consult with Juno Marsh" }).click();
  await staffPage.getByRole("button", { name: "Yes, cancel and refund" }).click();
  await expect(staffPage.getByText(/Consult cancelled/)).toBeVisible();
  await expect
    .poll(
      async () => ((await (await fetch(`${PAYMENTS_FAKE}/_fake/refunds`)).json()) as { data: unknown[] }).data.length,
      { timeout: 15_000 },
    )
    .toBe(refundsBefore + 1);
  await expect
    .poll(
      async () =>
        (await listMail()).filter((m) => m.to.includes(email) && /cancelled and refunded/.test(m.subject)).length,
      { timeout: 15_000 },
    )
    .toBe(1);
  // The request's stage follows the cancelled booking: no longer "consult booked" in the inbox.
  await staffPage.goto(`/app/inbox?q=${encodeURIComponent(email)}`);
  await expect(staffPage.getByRole("row", { name: /Juno Marsh/ })).toContainText("Request in");
  await expect(staffPage.getByRole("row", { name: /Juno Marsh/ })).not.toContainText("Consult booked");
  await staff.close();
});

test("with the payment service down, pressing pay says so, nothing is charged, and a retry works", async ({ page }) => {
  await sendRequest(page, { name: "Otto Varga", email: `otto.${Date.now()}@example.test` });
  await page.getByRole("link", { name: "Book a design consult" }).click();
  await fetch(`${PAYMENTS_FAKE}/_fake/fail-next`, {
    method: "POST",
    body: JSON.stringify({ down: true }),
    headers: { "Content-Type": "application/json" },
  });
  try {
    const slot = await holdConsultTime(page, 2);
    await expect(page.getByRole("alert")).toContainText("Nothing was charged");
    await fetch(`${PAYMENTS_FAKE}/_fake/fail-next`, {
      method: "POST",
      body: JSON.stringify({ down: false }),
      headers: { "Content-Type": "application/json" },
    });
    // The time stays held for this homeowner (offered to nobody else); continuing opens the checkout.
    await page.goto(page.url());
    await expect(page.getByRole("radio").and(page.locator(`[value="${slot.time}"]`))).toHaveCount(0);
    await page.getByRole("button", { name: "Continue to payment" }).click();
    await expect(page).toHaveURL(new RegExp(`^${PAYMENTS_FAKE}/pay/`));
    await expect(page.getByRole("button", { name: /^Pay / })).toBeVisible();
  } finally {
    await fetch(`${PAYMENTS_FAKE}/_fake/fail-next`, {
      method: "POST",
      body: JSON.stringify({ down: false }),
      headers: { "Content-Type": "application/json" },
    });
  }
});

test("a homeowner on a phone picks a day, then a time: the page says how long the visit is and what to have ready, and the payment page names the contractor", async ({
  page,
}) => {
  await sendRequest(page, { name: "Ines Aldana", email: `ines.${Date.now()}@example.test` });
  await page.setViewportSize({ width: 390, height: 844 });
  await page.getByRole("link", { name: "Book a design consult" }).click();
  await expect(page.getByRole("heading", { name: "Book a design consult" })).toBeVisible();
  // The visit first: its length (the company's 60-minute slot), where, and what happens at it.
  await expect(page.getByText("About 1 hour", { exact: true })).toBeVisible();
  await expect(page.getByText("21 Juniper Row, Millbrook Falls")).toBeVisible();
  await expect(page.getByRole("heading", { name: "What gets measured" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Have ready" })).toBeVisible();
  await expect(page.getByRole("link", { name: "(217) 555-0142" })).toBeVisible();

  // Every day with free times fits in well under one phone screen; only the chosen day's times show.
  const dayList = page.getByRole("list", { name: "Days with free times" });
  const days = dayList.getByRole("link");
  expect(await days.count()).toBeGreaterThanOrEqual(10);
  expect((await dayList.boundingBox())!.height).toBeLessThan(844 / 2);
  const freeOn = (i: number) => freeTimesOn(days.nth(i));
  await expect(days.first()).toHaveAttribute("aria-current", "date");
  // Each day sits under its own weekday, Monday first, whatever days have no free time.
  const columns = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];
  for (let i = 0; i < 6; i++) {
    const day = /day=(\d{4}-\d{2}-\d{2})/.exec((await days.nth(i).getAttribute("href"))!)![1]!;
    const column = (new Date(`${day}T12:00:00Z`).getUTCDay() + 6) % 7;
    const header = (await page.getByText(columns[column]!, { exact: true }).first().boundingBox())!;
    const cell = (await days.nth(i).boundingBox())!;
    expect(Math.abs(header.x + header.width / 2 - (cell.x + cell.width / 2)), day).toBeLessThan(cell.width / 2);
  }
  await expect(page.getByRole("radio")).toHaveCount(await freeOn(0));
  await screenshotThreeWidths(page, "consult-booking");

  await page.setViewportSize({ width: 390, height: 844 });
  const second = await longDayOf(days.nth(1));
  await days.nth(1).click();
  await expect(page).toHaveURL(/[?&]day=\d{4}-\d{2}-\d{2}/);
  await expect(days.nth(1)).toHaveAttribute("aria-current", "date");
  await expect(page.getByRole("group", { name: `Pick a time on ${second}` })).toBeVisible();
  await expect(page.getByRole("radio")).toHaveCount(await freeOn(1));

  // Pressing the button with no time chosen goes nowhere: the browser asks for a time first.
  await page.getByRole("button", { name: /^Hold this time and pay/ }).click();
  await expect(page).toHaveURL(/\/consult\//);
  const chosen = await chooseConsultTime(page, (await freeOn(0)) + 1);
  expect(chosen.day).toBe(second);
  await expect(page.getByText(new RegExp(`^${second}, \\d{1,2}:\\d{2} [AP]M – `))).toBeVisible();
  await page.getByRole("button", { name: "Hold this time and pay $150.00" }).click();
  await expect(page).toHaveURL(new RegExp(`^${PAYMENTS_FAKE}/pay/`));
  await expect(page.getByText("Fire pit design consult with Cinder & Slate Outdoor Works")).toBeVisible();
  await expect(
    page.getByText(/Paid to Cinder & Slate Outdoor Works for a visit to 21 Juniper Row, Millbrook Falls/),
  ).toBeVisible();
});
