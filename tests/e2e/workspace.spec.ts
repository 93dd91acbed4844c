import { expect, test, type Page } from "@playwright/test";
import { screenshotBothWidths, sendRequest, signIn } from "./helpers";

const CUSTOMER = "Yusuf Abernethy";

async function moveJob(page: Page, to: string, reason = "") {
  await page.getByLabel(/^Move the job/).selectOption({ label: to });
  await page.getByLabel("Why (for on hold or not going ahead)").fill(reason);
  await page.getByRole("button", { name: "Move the job" }).click();
}

test("an estimator sees a new request arrive, takes it on, calls back, holds it and picks it up again; then gives a signed job to the crew and opens its cut sheet", async ({
  page,
  browser,
}) => {
  test.setTimeout(90_000);
  await signIn(page, "estimator@cinder-slate.test");
  await expect(page).toHaveURL(/\/app\/inbox$/);
  await expect(page.getByRole("heading", { name: "Inbox" })).toBeVisible();

  // A homeowner sends a request while the inbox is open; the inbox picks it up when it regains focus.
  const homeowner = await browser.newContext();
  await sendRequest(await homeowner.newPage(), {
    name: CUSTOMER,
    email: `yusuf.${Date.now()}@example.test`,
    town: "Quillan Park",
  });
  await homeowner.close();
  await expect(async () => {
    await page.evaluate(() => window.dispatchEvent(new Event("focus")));
    await expect(page.getByRole("link", { name: CUSTOMER })).toBeVisible({ timeout: 1_000 });
  }).toPass({ timeout: 15_000 });
  const row = page.getByRole("row", { name: new RegExp(CUSTOMER) });
  await expect(row).toContainText("Unread since your last visit");
  await screenshotBothWidths(page, "inbox");

  // Filters live in the URL: search, then the stage tab.
  await page.getByLabel("Search").fill("abernethy");
  await page.getByRole("button", { name: "Apply" }).click();
  await expect(page).toHaveURL(/q=abernethy/);
  await page
    .getByRole("navigation", { name: "Filter by stage" })
    .getByRole("link", { name: /^Request in/ })
    .click();
  await expect(page).toHaveURL(/status=request/);
  await expect(page).toHaveURL(/q=abernethy/);
  await expect(page.getByRole("row")).toHaveCount(2);
  await page.getByRole("link", { name: CUSTOMER }).click();
  await expect(page.getByRole("heading", { level: 1 })).toContainText(CUSTOMER);

  await page.getByLabel("Estimator").selectOption({ label: "Theo Brandvold" });
  await page.getByRole("button", { name: "Assign" }).click();
  const timeline = page.getByRole("region", { name: "Timeline" });
  await expect(timeline).toContainText("Assigned to Theo Brandvold");

  // The page leads with the next step, and the job's steps as one line.
  await expect(page.getByRole("heading", { name: "Call Yusuf back" })).toBeVisible();
  await expect(page.getByRole("list", { name: "Job progress" }).locator("[aria-current=step]")).toContainText(
    "Request",
  );
  await moveJob(page, "Called back");
  await expect(timeline).toContainText("Request in → Called back");
  await expect(page.getByRole("heading", { name: "Get the design consult booked" })).toBeVisible();

  // On hold needs a reason: the message sits beside the field, the choice stays, nothing changes.
  await moveJob(page, "On hold");
  await expect(page.getByText(/^Say why/)).toBeVisible();
  await expect(page.getByLabel("Why (for on hold or not going ahead)")).toHaveAttribute("aria-invalid", "true");
  await expect(page.getByLabel(/^Move the job/)).toHaveValue("on-hold");
  await moveJob(page, "On hold", "Waiting for the town's burn permit.");
  await expect(timeline).toContainText("Called back → On hold: Waiting for the town's burn permit.");
  await expect(page.getByRole("heading", { name: "On hold" })).toBeVisible();
  await moveJob(page, "Pick it up again (Called back)");
  await expect(timeline).toContainText("On hold → Called back");

  // A signed job (deposit in) goes to the crew.
  // (Found by name: the supplier-order journey may have moved this job on to "stone ordered" already.)
  await page.goto("/app/inbox?q=Mirela%20Castellanos");
  await page.getByRole("link", { name: "Mirela Castellanos" }).click();
  await expect(page.getByRole("heading", { name: /^(Order the stone|Book the build)$/ })).toBeVisible();
  await page.getByLabel("Crew").selectOption({ label: "Dario Quist" });
  await page.getByRole("button", { name: "Give the job to the crew" }).click();
  await expect(timeline).toContainText("Job given to Dario Quist");
  await page.getByLabel("Add a note").fill("Customer asked for the charcoal caps.");
  await page.getByRole("button", { name: "Add note" }).click();
  await expect(timeline).toContainText("Customer asked for the charcoal caps.");
  await expect(page.getByRole("region", { name: "Labour and price" })).toContainText("Markup (22 % on cost)");
  await screenshotBothWidths(page, "lead-detail");

  await page.getByRole("link", { name: "Cut sheet" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Mirela Castellanos");
  await expect(page.getByRole("row", { name: /Inner mark/ })).toContainText("from each corner");
  await expect(page.getByRole("region", { name: "Safety on site" })).toContainText("1926.1153");
  await screenshotBothWidths(page, "cut-sheet");

  const pdfHref = await page.getByRole("link", { name: "PDF with full-size cap template" }).getAttribute("href");
  const pdf = await page.request.get(pdfHref!);
  expect(pdf.status()).toBe(200);
  expect(pdf.headers()["content-type"]).toBe("application/pdf");
  expect((await pdf.body()).subarray(0, 5).toString()).toBe("%PDF-");
});

test("the crew member sees only the jobs given to them, with no prices or customer contact, and nothing else", async ({
  page,
  browser,
}) => {
  // The owner knows a request that is not the crew's.
  const office = await browser.newContext();
  const ownerPage = await office.newPage();
  await signIn(ownerPage, "owner@cinder-slate.test");
  await ownerPage.goto("/app/inbox?status=called-back");
  const otherJob = await ownerPage.getByRole("link", { name: "Hattie Lindqvist" }).getAttribute("href");
  await office.close();

  await signIn(page, "crew@cinder-slate.test");
  await expect(page).toHaveURL(/\/app\/jobs$/);
  const jobs = page.getByRole("main");
  await expect(jobs.getByRole("heading", { name: "Tobias Wren" })).toBeVisible();
  await expect(jobs.getByText("11 Cinderbrook Lane, Millbrook Falls")).toBeVisible();
  await expect(jobs.getByRole("heading", { name: "Hattie Lindqvist" })).toHaveCount(0);
  await expect(jobs).not.toContainText("$");
  await screenshotBothWidths(page, "crew-jobs");

  await jobs.getByRole("link", { name: "Tobias Wren" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toContainText("Tobias Wren");
  await expect(page.getByRole("region", { name: "Site", exact: true })).toContainText("11 Cinderbrook Lane");
  await expect(page.getByRole("main")).not.toContainText("tobias.wren@example.test");
  await expect(page.getByRole("main")).not.toContainText("$");
  await expect(page.getByRole("region", { name: "Labour and price" })).toHaveCount(0);
  await expect(page.getByRole("region", { name: "Material order" })).toContainText("Sill Cap 16");

  expect((await page.goto(otherJob!))?.status()).toBe(404);
  expect((await page.goto("/app/inbox"))?.status()).toBe(403);
  expect((await page.request.get("/api/leads")).status()).toBe(403);
});

test("the owner invites a crew member and sees the invitation waiting", async ({ page }) => {
  await signIn(page, "owner@cinder-slate.test");
  await page.getByRole("navigation", { name: "Workspace" }).getByRole("link", { name: "Team" }).click();
  await page.getByLabel("Name").fill("Ilka Brandt");
  await page.getByLabel("E-mail").fill("ilka.brandt@cinder-slate.test");
  await page.getByLabel("Role", { exact: true }).selectOption({ label: "Crew" });
  await page.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByRole("status")).toHaveText("Invitation sent. It works once, for 7 days.");
  await expect(page.getByRole("listitem").filter({ hasText: "Ilka Brandt" })).toContainText(
    "Invited, has not set a password yet",
  );
  await page.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByText("Name must be 2 to 80 characters.")).toBeVisible();
  await screenshotBothWidths(page, "team");
});

test("a lead that does not exist, or a malformed id, shows a 404 inside the workspace with its navigation kept", async ({
  page,
}) => {
  await signIn(page, "estimator@cinder-slate.test");
  for (const path of ["/app/leads/987654321", "/app/leads/not-a-number", "/app/leads/987654321/proposal"]) {
    const response = await page.goto(path);
    expect(response?.status(), path).toBe(404);
    await expect(page.getByRole("heading", { level: 1 })).toHaveText("We could not find that");
    // The workspace layout is still there: its navigation, the signed-in person, a way back.
    await expect(
      page.getByRole("navigation", { name: "Workspace" }).getByRole("link", { name: "Inbox" }),
    ).toBeVisible();
    await expect(page.getByRole("button", { name: "Sign out" })).toBeVisible();
    await expect(page).toHaveTitle("We could not find that · Emberwright");
  }
  // Axe (WCAG 2.x rules) finds nothing, and the page fits a 360 px phone.
  const { default: AxeBuilder } = await import("@axe-core/playwright");
  expect((await new AxeBuilder({ page }).analyze()).violations.map((v) => v.id)).toEqual([]);
  await screenshotBothWidths(page, "workspace-not-found");
  await page.setViewportSize({ width: 360, height: 800 });
  expect(await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
  // The way back leads into the workspace.
  await page.setViewportSize({ width: 1280, height: 900 });
  await page.getByRole("link", { name: "Back to the workspace" }).click();
  await expect(page).toHaveURL(/\/app\/inbox$/);
});
