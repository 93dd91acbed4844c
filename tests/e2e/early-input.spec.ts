/*
 * What a homeowner does while the page is drawn but its code has not started. The page's scripts
 * start after the first paint, so on a slow phone there is a moment when the controls already work
 * as plain HTML. Here the client entry is held back on purpose (the test releases it), so every
 * step below happens before hydration, then the page must show and price exactly what was chosen.
 */
import { expect, test, type Page } from "@playwright/test";

/** Holds every request for the client entry until `release` is called. */
async function holdClientEntry(page: Page) {
  let release = () => {};
  const released = new Promise<void>((resolve) => (release = resolve));
  await page.route(/\/assets\/entry\.client-[^/]+\.js$/, async (route) => {
    await released;
    await route.continue();
  });
  return release;
}

const notHydrated = (page: Page) => expect(page.getByRole("button", { name: "Update the design" })).toBeVisible();
const hydrated = (page: Page) => expect(page.getByRole("button", { name: "Update the design" })).toHaveCount(0);

test("choices made before the configurator is interactive are all kept: a select, a typed number and distance, a ticked box and a pressed button", async ({
  page,
}) => {
  await page.setViewportSize({ width: 390, height: 844 });
  const release = await holdClientEntry(page);
  await page.goto("/c/cinder-slate?liner=none&units=16&courses=3&patio=0", { waitUntil: "domcontentloaded" });
  await notHydrated(page);
  const summary = page.getByTestId("plan-summary");
  const priceBefore = await page.getByTestId("price-range").textContent();

  const cap = page.getByLabel("Cap stone");
  const capOptions = await cap
    .locator("option")
    .evaluateAll((options) =>
      options.map((o) => ({ value: (o as HTMLOptionElement).value, label: o.textContent ?? "" })),
    );
  const otherCap = capOptions.find((o) => o.value !== "none" && o.value !== "") ?? capOptions[0]!;
  const capBefore = await cap.inputValue();
  const chosenCap = capOptions.find((o) => o.value !== capBefore && o.value !== "none") ?? otherCap;
  await cap.selectOption(chosenCap.value);
  await page.getByLabel("Courses", { exact: true }).fill("5");
  await page.getByLabel("Distance to the nearest building, deck or fence").fill("12");
  await page.getByLabel("Add a round patio").check();
  await page.getByRole("button", { name: "Millimetres" }).click();
  // Nothing has run yet: still the server's page, the unit not switched.
  await notHydrated(page);
  await expect(page.getByRole("button", { name: "Millimetres" })).toHaveAttribute("aria-pressed", "false");

  release();
  await hydrated(page);

  // Every choice reached the design: the address bar carries it and the page shows it.
  await expect(page).toHaveURL(/[?&]courses=5(&|$)/);
  await expect(page).toHaveURL(new RegExp(`[?&]cap=${chosenCap.value}(&|$)`));
  await expect(page).toHaveURL(/[?&]setback=12(&|$)/);
  await expect(page).toHaveURL(/[?&]unit=mm(&|$)/);
  await expect(page.getByRole("button", { name: "Millimetres" })).toHaveAttribute("aria-pressed", "true");
  await expect(page.getByLabel("Courses", { exact: true })).toHaveValue("5");
  // 12 ft, shown in metres once the unit switched after it (12 × 0.3048 = 3.66 m, to a tenth).
  await expect(page.getByLabel(/Distance to the nearest building, deck or fence/)).toHaveValue("3.7");
  // Ticking the patio box asks for its size (the homeowner's next step), as it does after hydration.
  await expect(page.getByLabel("Add a round patio")).toBeChecked();
  await expect(page.getByRole("group", { name: "How big a patio?" })).toBeVisible();
  // And the price follows the taller wall.
  await expect(page.getByTestId("price-range")).not.toHaveText(priceBefore!);
  await expect(summary).toContainText("5");
});

test("a button pressed before the page is interactive is pressed once, not twice", async ({ page }) => {
  const release = await holdClientEntry(page);
  await page.goto("/c/cinder-slate?liner=none&units=16&courses=3&patio=0", { waitUntil: "domcontentloaded" });
  await notHydrated(page);
  await page.getByRole("button", { name: "One course more" }).click();
  release();
  await hydrated(page);
  await expect(page).toHaveURL(/[?&]courses=4(&|$)/);
  await expect(page.getByLabel("Courses", { exact: true })).toHaveValue("4");
  // Pressed again after hydration, it counts once more.
  await page.getByRole("button", { name: "One course more" }).click();
  await expect(page.getByLabel("Courses", { exact: true })).toHaveValue("5");
});
