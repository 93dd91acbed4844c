/*
 * Completion and the balance, end to end, on a seeded job no other spec touches (Oriel Fenwick,
 * build booked; her proposal is $2,900 with no add-ons and a 30 % deposit of $870, so $2,030 is
 * left to pay). The owner marks the job built; the homeowner gets the completion e-mail, follows its
 * link to her page and pays on the payment stand-in; the job becomes paid in full from the signed
 * webhook; the owner sees the job's cost and the monthly report. Pages checked with axe-core (WCAG
 * 2.x rules) at 1366 and 390 px, and for sideways scrolling at 360 px.
 */
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { listMail, PAYMENTS_FAKE, screenshotThreeWidths, signIn } from "./helpers";

const CUSTOMER = "Oriel Fenwick";
const EMAIL = "oriel.fenwick@example.test";

async function expectNoAxeViolations(page: Page, label: string) {
  for (const width of [1366, 390]) {
    await page.setViewportSize({ width, height: 900 });
    const result = await new AxeBuilder({ page }).analyze();
    expect(
      result.violations.map(
        (v) => `${label} at ${width}: ${v.id} ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`,
      ),
    ).toEqual([]);
  }
  await page.setViewportSize({ width: 1366, height: 900 });
}

async function openLead(page: Page) {
  await page.goto(`/app/inbox?q=Fenwick`);
  await page.getByRole("link", { name: CUSTOMER }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(CUSTOMER);
}

test("the owner marks a job built; the homeowner pays the balance from her page; the job is paid in full; the owner sees job cost and the monthly report", async ({
  page,
  browser,
}) => {
  test.setTimeout(150_000);
  await signIn(page, "owner@cinder-slate.test");
  await openLead(page);
  await page.getByLabel(/^Move the job/).selectOption({ label: "Built" });
  await page.getByRole("button", { name: "Move the job" }).click();
  await expect(page.getByRole("heading", { name: "Collect the balance" })).toBeVisible();
  const balanceCard = page.getByRole("region", { name: "Balance", exact: true });
  // $2,900 − $870 deposit = $2,030.
  await expect(balanceCard).toContainText("Balance due");
  await expect(balanceCard).toContainText("$2,030.00");
  await expect(page.getByRole("region", { name: "Timeline" })).toContainText("Balance of $2,030.00 due");

  // The completion e-mail: the balance, a link to her page, the care notes.
  let mailText = "";
  await expect
    .poll(
      async () => {
        const message = (await listMail()).find(
          (m) => m.to.includes(EMAIL) && /Your fire pit is built/.test(m.subject),
        );
        mailText = message?.text ?? "";
        return mailText;
      },
      { timeout: 20_000 },
    )
    .toContain("$2,030.00");
  expect(mailText).toMatch(/metal can/);
  expect(mailText).toMatch(/spark screen/i);
  const link = /https?:\/\/[^\s)\]]+\/my#balance-\d+/.exec(mailText)![0];

  const context = await browser.newContext();
  const home = await context.newPage();
  await signIn(home, EMAIL);
  await home.goto(new URL(link).pathname + new URL(link).hash);
  const section = home.getByRole("region", { name: "Balance on completion" });
  await expect(section).toBeVisible();
  await expect(home.getByTestId("balance-due")).toHaveText("$2,030.00");
  await expect(section).toContainText("Deposit paid");
  await expect(home.getByText("Looking after your fire pit")).toBeVisible();
  await expectNoAxeViolations(home, "/my with a balance");
  await screenshotThreeWidths(home, "my-balance");

  await home.getByRole("button", { name: "Pay the balance of $2,030.00" }).click();
  await expect(home).toHaveURL(new RegExp(`^${PAYMENTS_FAKE}/pay/`));
  await home.getByLabel("Card number").fill("4242 4242 4242 4242");
  await home.getByLabel("Expiry (MM / YY)").fill("12 / 30");
  await home.getByLabel("Security code (CVC)").fill("123");
  await home.getByLabel("Name on card").fill(CUSTOMER);
  await home.getByRole("button", { name: /^Pay / }).click();
  await expect(home).toHaveURL(/\/my\?paid=\d+/);
  await expect(async () => {
    await home.reload();
    await expect(home.getByText(/Paid in full on/)).toBeVisible({ timeout: 1_000 });
  }).toPass({ timeout: 25_000 });
  await expect(home.getByRole("button", { name: /Pay the balance/ })).toHaveCount(0);
  await screenshotThreeWidths(home, "my-balance-paid");
  await context.close();

  // The receipt went out.
  await expect
    .poll(async () => (await listMail()).some((m) => m.to.includes(EMAIL) && /^Receipt:/.test(m.subject)), {
      timeout: 20_000,
    })
    .toBe(true);

  // The office sees it paid in full, and the owner the job's cost.
  await page.reload();
  await expect(page.getByRole("list", { name: "Job progress" }).locator("[aria-current=step]")).toContainText("Paid");
  await expect(balanceCard).toContainText("Paid by card on");
  const cost = page.getByRole("region", { name: "Job cost" });
  await expect(cost).toContainText("Estimated");
  await expect(cost).toContainText("Actual");
  await expect(cost).toContainText("Gross profit");
  await expect(page.getByTestId("gross-profit")).toHaveText(/^\$[\d,]+\.\d\d \(\d+\.\d %\)$/);
  await expectNoAxeViolations(page, "the lead page, paid in full");
  await screenshotThreeWidths(page, "lead-paid-in-full");

  // The monthly report: at least two months of seeded jobs, a chart with a title and a table.
  await page.getByRole("link", { name: "Reports" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Jobs built by month");
  await expect(page.getByRole("img", { name: /Revenue and gross profit by month/ })).toBeVisible();
  const rows = page.getByRole("table").getByRole("row");
  await expect.poll(async () => rows.count()).toBeGreaterThanOrEqual(3);
  await expectNoAxeViolations(page, "/app/reports");
  await screenshotThreeWidths(page, "reports");

  // Estimators and crew are refused the report and see no job cost.
  const staff = await browser.newContext();
  const estimator = await staff.newPage();
  await signIn(estimator, "estimator@cinder-slate.test");
  expect((await estimator.goto("/app/reports"))!.status()).toBe(403);
  await openLead(estimator);
  await expect(estimator.getByRole("region", { name: "Balance", exact: true })).toBeVisible();
  await expect(estimator.getByRole("region", { name: "Job cost" })).toHaveCount(0);
  await staff.close();
});
