import { expect, test, type Page } from "@playwright/test";
import { screenshotBothWidths, signIn } from "./helpers";

async function openConfigurator(page: Page) {
  await page.goto("/c/cinder-slate?units=14&liner=none");
  await expect(page.getByRole("button", { name: "Update the design" })).toHaveCount(0);
  return page
    .getByTestId("plan-summary")
    .getByText(/spare$/)
    .last();
}

async function saveFactors(page: Page) {
  await page.getByRole("button", { name: "Save factors" }).click();
  await expect(page.getByRole("status")).toHaveText("Factors saved.");
}

test("an owner changes estimating factors and the configurator, a revision and its breakdown follow them", async ({
  page,
}) => {
  // Many page loads on a shared machine: more than the default 30 s.
  test.setTimeout(120_000);
  await signIn(page, "owner@cinder-slate.test");

  // The configurator's cap count before: one spare blank, the default.
  const caps = await openConfigurator(page);
  await expect(caps).toHaveText(/^\d+ \+ 1 spare$/);

  await page.goto("/app/settings");
  await page.getByRole("link", { name: "Estimating factors" }).click();
  await expect(page.getByRole("heading", { name: "Estimating factors", level: 1 })).toBeVisible();
  const spareCaps = page.getByLabel("Spare cap blanks", { exact: true });
  await expect(spareCaps).toHaveValue("1");
  await expect(page.getByText(/Default: 1 blank \(in use\)\./)).toBeVisible();
  await screenshotBothWidths(page, "factors");

  // Out of range: nothing saved, the message beside the field says what is allowed.
  await page.getByLabel("Base depth under the pit", { exact: true }).fill("1");
  await spareCaps.fill("3");
  await page.getByRole("button", { name: "Save factors" }).click();
  await expect(page.getByRole("alert").first()).toContainText("Nothing was saved");
  await expect(page.getByText("Base depth under the pit must be between 2 and 12 in (51–305 mm).")).toBeVisible();
  await page.getByLabel("Base depth under the pit", { exact: true }).fill("6");
  await saveFactors(page);
  await expect(spareCaps).toHaveValue("3");
  await expect(page.getByRole("button", { name: "Reset Spare cap blanks to its default" })).toBeEnabled();

  // The configurator (its instant redraw and the server's answer) now orders three spare blanks.
  await expect(await openConfigurator(page)).toHaveText(/^\d+ \+ 3 spare$/);

  // A revision of a request is priced with the company's profit as a margin of price: a higher price than the markup.
  await page.goto("/app/inbox");
  await page.getByRole("link", { name: "Hattie Lindqvist" }).click();
  await expect(page).toHaveURL(/\/app\/leads\/\d+$/);
  const leadUrl = page.url();
  await page.goto(`${leadUrl}/design`);
  const revisionPrice = page.getByTestId("price-range");
  const asMarkup = await revisionPrice.textContent();
  await page.goto("/app/settings/factors");
  await page.getByRole("radio", { name: /A margin of the price/ }).check();
  await saveFactors(page);
  await page.goto(`${leadUrl}/design`);
  await expect(revisionPrice).not.toHaveText(asMarkup!);
  await page.getByRole("button", { name: "Save this revision" }).click();
  await expect(page).toHaveURL(leadUrl);
  const breakdown = page.getByRole("table", { name: "Price breakdown" });
  await expect(breakdown).toContainText("Margin (22 % of the price)");
  await expect(breakdown).toContainText(/A markup of 28\.2\d % on cost/);
  await expect(breakdown).toContainText(/Labour at cost: [\d.]+ h × \$85\.00\/h/);
  await expect(page.getByRole("region", { name: "Material order" })).toContainText("plus 3 spare");

  // Each factor resets to its default on its own.
  await page.goto("/app/settings/factors");
  await page.getByRole("button", { name: "Reset Spare cap blanks to its default" }).click();
  await expect(page.getByRole("status")).toHaveText("Spare cap blanks is back to its default.");
  await expect(spareCaps).toHaveValue("1");
  await page.getByRole("button", { name: "Reset We set our profit as to its default" }).click();
  await expect(page.getByRole("radio", { name: /A markup on cost/ })).toBeChecked();
  await expect(await openConfigurator(page)).toHaveText(/^\d+ \+ 1 spare$/);
});
