import { expect, test, type Page } from "@playwright/test";
import { listMail, PAYMENTS_FAKE, screenshotBothWidths, sendRequest, signIn, MAIL_FAKE } from "./helpers";

async function payWith(page: Page, card: string) {
  await page.getByLabel("Card number").fill(card);
  await page.getByLabel("Expiry (MM / YY)").fill("12 / 30");
  await page.getByLabel("Security code (CVC)").fill("123");
  await page.getByLabel("Name on card").fill("Juno Marsh");
  await page.getByRole("button", { name: /^Pay / }).click();
}

test("a homeowner books a consult: the declined card leaves the slot free, the good card books it, the e-mail carries a calendar file, staff see it and cancel with a refund", async ({ page, browser }) => {
  const email = `juno.${Date.now()}@example.test`;
  await sendRequest(page, { name: "Juno Marsh", email });
  await page.getByRole("link", { name: "Book a design consult" }).click();
  await expect(page.getByRole("heading", { name: "Book a design consult" })).toBeVisible();
  await screenshotBothWidths(page, "consult-slots");

  const slot = page.getByRole("button", { name: /^Book / }).first();
  const slotLabel = (await slot.getAttribute("aria-label"))!;
  await slot.click();
  await expect(page).toHaveURL(new RegExp(`^${PAYMENTS_FAKE}/pay/`));
  await payWith(page, "4000 0000 0000 0002");
  await expect(page.getByText("Your card was declined.")).toBeVisible();
  await page.getByRole("link", { name: "Cancel and go back" }).click();
  await expect(page.getByText("You left the payment page, so nothing was charged and that time is free again.")).toBeVisible();
  await expect(page.getByRole("button", { name: slotLabel })).toBeVisible();

  await page.getByRole("button", { name: slotLabel }).click();
  await payWith(page, "4242 4242 4242 4242");
  await expect(page.getByRole("heading", { name: "Your design consult is booked" })).toBeVisible({ timeout: 20_000 });
  await screenshotBothWidths(page, "consult-booked");

  await expect.poll(async () => (await listMail()).filter((m) => m.to.includes(email) && m.subject.startsWith("Design consult booked")).length, { timeout: 15_000 }).toBe(1);
  const confirmation = (await listMail()).find((m) => m.to.includes(email) && m.subject.startsWith("Design consult booked"))!;
  const full = await (await fetch(`${MAIL_FAKE}/_fake/messages/${confirmation.id}`)).json();
  expect(full.attachments.map((a: { filename: string }) => a.filename)).toEqual(["design-consult.ics"]);
  expect(Buffer.from(full.attachments[0].content, "base64").toString()).toContain("BEGIN:VEVENT");

  // Staff see it on the schedule and cancel it; the fake shows the refund; both sides get e-mail.
  const staff = await browser.newContext();
  const staffPage = await staff.newPage();
  await signIn(staffPage, "estimator@cinder-slate.test");
  await staffPage.goto("/app/schedule");
  await expect(staffPage.getByRole("link", { name: "Juno Marsh" })).toBeVisible();
  await screenshotBothWidths(staffPage, "schedule");
  const refundsBefore = ((await (await fetch(`${PAYMENTS_FAKE}/_fake/refunds`)).json()) as { data: unknown[] }).data.length;
  await staffPage.getByRole("button", { name: "Cancel and refund the consult with Juno Marsh" }).click();
  await staffPage.getByRole("button", { name: "Yes, cancel and refund" }).click();
  await expect(staffPage.getByText(/Consult cancelled/)).toBeVisible();
  await expect.poll(async () => ((await (await fetch(`${PAYMENTS_FAKE}/_fake/refunds`)).json()) as { data: unknown[] }).data.length, { timeout: 15_000 }).toBe(refundsBefore + 1);
  await expect.poll(async () => (await listMail()).filter((m) => m.to.includes(email) && /cancelled and refunded/.test(m.subject)).length, { timeout: 15_000 }).toBe(1);
  // The request's stage follows the cancelled booking: no longer "consult booked" in the inbox.
  await staffPage.goto(`/app/inbox?q=${encodeURIComponent(email)}`);
  await expect(staffPage.getByRole("row", { name: /Juno Marsh/ })).toContainText("Request in");
  await expect(staffPage.getByRole("row", { name: /Juno Marsh/ })).not.toContainText("Consult booked");
  await staff.close();
});

test("with the payment service down, pressing pay says so, nothing is charged, and a retry works", async ({ page }) => {
  await sendRequest(page, { name: "Otto Varga", email: `otto.${Date.now()}@example.test` });
  await page.getByRole("link", { name: "Book a design consult" }).click();
  await fetch(`${PAYMENTS_FAKE}/_fake/fail-next`, { method: "POST", body: JSON.stringify({ down: true }), headers: { "Content-Type": "application/json" } });
  try {
    const slot = page.getByRole("button", { name: /^Book / }).nth(2);
    const label = (await slot.getAttribute("aria-label"))!;
    await slot.click();
    await expect(page.getByRole("alert")).toContainText("Nothing was charged");
    await fetch(`${PAYMENTS_FAKE}/_fake/fail-next`, { method: "POST", body: JSON.stringify({ down: false }), headers: { "Content-Type": "application/json" } });
    // The time stays held for this homeowner (offered to nobody else); continuing opens the checkout.
    await page.goto(page.url());
    await expect(page.getByRole("button", { name: label })).toHaveCount(0);
    await page.getByRole("button", { name: "Continue to payment" }).click();
    await expect(page).toHaveURL(new RegExp(`^${PAYMENTS_FAKE}/pay/`));
    await expect(page.getByRole("button", { name: /^Pay / })).toBeVisible();
  } finally {
    await fetch(`${PAYMENTS_FAKE}/_fake/fail-next`, { method: "POST", body: JSON.stringify({ down: false }), headers: { "Content-Type": "application/json" } });
  }
});
