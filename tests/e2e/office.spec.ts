/*
 * The office's own pages as staff use them: typing sizes as read off a tape or in millimetres, one
 * word for what the company pays, finding a time zone, handing out the public page, reading the
 * inbox on a phone, and being brought to the message when a form is refused.
 */
import { readFileSync } from "node:fs";
import { expect, test, type Page } from "@playwright/test";
import QRCode from "qrcode";
import { sendRequest, signIn } from "./helpers";

const WIDTHS = [1366, 390, 360] as const;

/** Full-page screenshots at the three widths under data/screens; none may scroll sideways. */
async function screenshotThreeWidths(page: Page, name: string, { reload = true } = {}) {
  for (const width of WIDTHS) {
    await page.setViewportSize({ width, height: width > 400 ? 900 : 800 });
    // Loaded at each width, as someone on that screen would see it.
    if (reload) await page.reload();
    await page.waitForLoadState("load");
    await page.waitForTimeout(250);
    await page.screenshot({ path: `data/screens/office-${name}-${width}.png`, fullPage: true });
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow, `${name} at ${width} px scrolls sideways`).toBeLessThanOrEqual(0);
  }
  await page.setViewportSize({ width: 1366, height: 900 });
}

test("the owner adds a wall unit typing its sizes as 12 1/4, 7-1/2, 49/8 and 89 mm, and the catalog confirms it with each size named", async ({
  page,
}) => {
  await signIn(page, "owner@cinder-slate.test");
  await page.goto("/app/catalog/new");
  await expect(page.getByRole("button", { name: "Add item" })).toBeEnabled();
  await page.getByLabel("Kind").selectOption({ label: "Wall unit" });
  await page.getByLabel("Name", { exact: true }).fill("Office test taper");
  await page.getByLabel("Face length", { exact: true }).fill("12 1/4");
  await page.getByLabel("Back length", { exact: true }).fill("7-1/2");
  await page.getByLabel("Depth", { exact: true }).fill("49/8");
  // 89 mm is 3.504 in (25.4 mm per inch, NIST SP 811), 3 1/2 in to the nearest 1/16 in.
  await page.getByLabel("Height", { exact: true }).fill("89 mm");
  await page.getByLabel("Cost each").fill("4.10");
  // Hidden from the configurator, so homeowners' pages stay as the demo has them.
  await page.getByLabel("Offered in the configurator").uncheck();
  await page.getByRole("button", { name: "Add item" }).click();

  await expect(page).toHaveURL(/\/app\/catalog\?saved=\d+&added=1$/);
  await expect(page.getByRole("status")).toHaveText(
    "Added Office test taper: face 12 1/4 in · back 7 1/2 in · depth 6 1/8 in · height 3 1/2 in, cost $4.10 each.",
  );
  const row = page.getByRole("row", { name: /Office test taper/ });
  await expect(row).toContainText("face 12 1/4 in");
  await expect(row).toContainText("height 3 1/2 in");
  await screenshotThreeWidths(page, "catalog");

  // Open it again: the form shows the sizes as typed fractions, and a save says so.
  await row.getByRole("link", { name: "Office test taper" }).click();
  await expect(page.getByLabel("Face length", { exact: true })).toHaveValue("12 1/4");
  await expect(page.getByLabel("Depth", { exact: true })).toHaveValue("6 1/8");
  await page.getByLabel("Face length", { exact: true }).fill("311 mm");
  await page.getByRole("button", { name: "Save changes" }).click();
  // 311 mm = 12.244 in, 12 1/4 in to the nearest 1/16 in.
  await expect(page.getByRole("status")).toHaveText(/^Saved Office test taper: face 12 1\/4 in · back 7 1\/2 in/);
});

test("the owner types a size the form cannot read and is taken to the message, which names the field and the ways to type it", async ({
  page,
}) => {
  await signIn(page, "owner@cinder-slate.test");
  await page.goto("/app/catalog/1");
  const save = page.getByRole("button", { name: "Save changes" });
  await expect(save).toBeEnabled();
  // The first size field of the item, whatever its kind (a wall unit's face, a cap's length…).
  const size = page
    .getByRole("group", { name: /^Size in inches/ })
    .getByRole("textbox")
    .first();
  await size.fill("twelve and a bit");
  await save.click();
  await expect(page.getByRole("alert")).toBeFocused();
  await expect(page.getByText(/must be a length, like 12 1\/4, 12-1\/4, 49\/4, 12.25 or 311 mm\./)).toBeVisible();
  await expect(size).toHaveValue("twelve and a bit");

  // Refused a second time while the summary is showing: focus goes back to it, not left on the button.
  await size.fill("1/0");
  await save.click();
  await expect(page.getByRole("alert")).toBeFocused();
});

test("the owner sets a factor length as 1-1/4 and as 32 mm, and a refused factor brings focus to the summary", async ({
  page,
}) => {
  await signIn(page, "owner@north-ridge.test");
  await page.goto("/app/settings/factors");
  const gap = page.getByRole("textbox", { name: "Gap around a steel ring" });
  await expect(page.getByRole("button", { name: "Save factors" }).last()).toBeEnabled();
  const before = await gap.inputValue();
  await gap.fill("1-1/4");
  await page.getByRole("button", { name: "Save factors" }).last().click();
  await expect(page.getByRole("status")).toHaveText("Factors saved.");
  await expect(gap).toHaveValue("1 1/4");

  await gap.fill("wide");
  await page.getByRole("button", { name: "Save factors" }).last().click();
  await expect(page.getByRole("alert")).toBeFocused();
  await expect(
    page.getByText("Gap around a steel ring must be a length, like 12 1/4, 12-1/4, 49/4, 12.25 or 311 mm."),
  ).toBeVisible();

  // 31.75 mm is exactly 1 1/4 in (25.4 mm per inch, NIST SP 811).
  await gap.fill("31.75 mm");
  await page.getByRole("button", { name: "Save factors" }).last().click();
  await expect(page.getByRole("status")).toHaveText("Factors saved.");
  await expect(gap).toHaveValue("1 1/4");
  await page.getByRole("button", { name: "Reset Gap around a steel ring to its default" }).click();
  await expect(gap).toHaveValue(before);
});

test("the owner reads what a catalog item costs the company as cost, the same word the lead page's breakdown uses", async ({
  page,
}) => {
  await signIn(page, "owner@cinder-slate.test");
  await page.goto("/app/catalog/1");
  await expect(page.getByLabel(/^Cost (each|per )/)).toBeVisible();
  await expect(page.getByText("What you pay your supplier.", { exact: false })).toBeVisible();
  await expect(page.getByText(/what you charge/i)).toHaveCount(0);
  await page.goto("/app/catalog");
  await expect(page.getByRole("columnheader", { name: /^Cost/ }).first()).toBeVisible();
  await expect(page.getByRole("columnheader", { name: /^Price/ })).toHaveCount(0);
  const lead = await page
    .goto("/app/inbox")
    .then(() => page.getByRole("main").locator('a[href^="/app/leads/"]').first().getAttribute("href"));
  await page.goto(lead!);
  await expect(page.getByRole("table", { name: "Price breakdown" }).getByText("Materials at cost")).toBeVisible();
});

test("the owner finds their time zone by typing a city, sees its local time, and saves it under its current name", async ({
  page,
}) => {
  await signIn(page, "owner@north-ridge.test");
  await page.goto("/app/settings");
  const zone = page.getByLabel("Time zone", { exact: true });
  const before = await zone.inputValue();
  // The list holds current names only, grouped by region.
  await expect(zone.locator("optgroup[label='Americas']")).toHaveCount(1);
  await expect(zone.locator("option[value='Europe/Kiev']")).toHaveCount(0);
  await expect(zone.locator("option[value='Asia/Calcutta']")).toHaveCount(0);

  const filter = page.getByLabel("Find a time zone");
  await expect(async () => {
    await filter.fill("kyiv");
    await expect(page.getByText(/^1 of \d+ zones match “kyiv”\.$/)).toBeVisible({ timeout: 500 });
  }).toPass();
  // Kyiv is UTC+2 in winter and UTC+3 in summer (EET/EEST).
  await expect(zone.locator("option[value='Europe/Kyiv']")).toHaveText(/^Kyiv \(\d{1,2}:\d{2} [AP]M, GMT\+[23]\)$/);
  await zone.selectOption("Europe/Kyiv");
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(page.getByRole("status")).toHaveText("Settings saved.");
  await expect(zone).toHaveValue("Europe/Kyiv");
  await screenshotThreeWidths(page, "settings");

  await zone.selectOption(before);
  await page.getByRole("button", { name: "Save settings" }).click();
  await expect(zone).toHaveValue(before);
});

test("the owner copies the public page's full link and downloads its QR code for the truck", async ({
  page,
  context,
  baseURL,
}) => {
  await context.grantPermissions(["clipboard-read", "clipboard-write"]);
  await signIn(page, "owner@cinder-slate.test");
  await page.goto("/app/settings");
  // The e2e server's APP_ORIGIN is http://localhost:<port> (scripts/e2e-server.sh), the address the tests browse.
  const url = `${baseURL}/c/cinder-slate`;
  await expect(page.getByLabel("Link", { exact: true })).toHaveValue(url);
  await expect(async () => {
    await page.getByRole("button", { name: "Copy link" }).click();
    await expect(page.getByText("Link copied.")).toBeVisible({ timeout: 500 });
  }).toPass();
  expect(await page.evaluate(() => navigator.clipboard.readText())).toBe(url);
  await expect(page.getByRole("img", { name: `QR code that opens ${url}` })).toBeVisible();

  const [download] = await Promise.all([
    page.waitForEvent("download"),
    page.getByRole("link", { name: "Download the QR code (SVG)" }).click(),
  ]);
  expect(download.suggestedFilename()).toBe("cinder-slate-qr-code.svg");
  const svg = readFileSync((await download.path())!, "utf8");
  // The qrcode library (the reference) encodes the full link, not a bare path, at error correction level M.
  expect(svg).toBe(
    await QRCode.toString(url, {
      type: "svg",
      errorCorrectionLevel: "M",
      margin: 4,
      color: { dark: "#1c1917", light: "#ffffff" },
    }),
  );
});

test("the owner reads the inbox on a 390 and a 360 px phone: every section, stage tab and filter is on screen, and a request sent since the last visit is marked unread in other words than its stage", async ({
  page,
  browser,
}) => {
  test.setTimeout(120_000);
  await signIn(page, "owner@cinder-slate.test");
  for (const width of [390, 360]) {
    await page.setViewportSize({ width, height: 800 });
    await page.goto("/app/inbox");
    const sections = page.getByRole("navigation", { name: "Workspace" }).getByRole("link");
    expect(await sections.count()).toBeGreaterThanOrEqual(5);
    for (const link of await sections.all()) {
      const box = (await link.boundingBox())!;
      expect(box.x + box.width, `${await link.textContent()} at ${width} px`).toBeLessThanOrEqual(width);
    }
    const tabs = page.getByRole("navigation", { name: "Filter by stage" }).getByRole("link");
    expect(await tabs.count()).toBeGreaterThan(10);
    for (const tab of await tabs.all()) {
      const box = (await tab.boundingBox())!;
      expect(box.x, `${await tab.textContent()} at ${width} px`).toBeGreaterThanOrEqual(0);
      expect(box.x + box.width, `${await tab.textContent()} at ${width} px`).toBeLessThanOrEqual(width);
    }
    const filters = page.getByRole("form", { name: "Filter requests" });
    for (const control of await filters.locator("input:not([type=hidden]), select, button").all()) {
      const box = (await control.boundingBox())!;
      expect(box.x + box.width, `${await control.getAttribute("name")} at ${width} px`).toBeLessThanOrEqual(width);
    }
  }

  // A homeowner sends a request; the owner comes back to the inbox.
  const customer = "Ottilie Brackenridge";
  const homeowner = await browser.newContext();
  await sendRequest(await homeowner.newPage(), { name: customer, email: `ottilie.${Date.now()}@example.test` });
  await homeowner.close();
  await page.goto("/app/inbox");
  const row = page.getByRole("row", { name: new RegExp(customer) });
  // The stage says where the job is ("Request in"); the mark says the owner has not seen it yet.
  await expect(row).toContainText("Request in");
  await expect(row).toContainText("Unread since your last visit");
  await expect(row.getByText(/^New$/)).toHaveCount(0);
  await expect(page.getByRole("main").getByText(/\bnew requests?\b/i)).toHaveCount(0);
  await expect(page.getByText(/^1 unread request: sent since your last visit\.$/)).toBeVisible();
  // Not reloaded: a second visit would mark the request seen.
  await screenshotThreeWidths(page, "inbox", { reload: false });
});

test("a keyboard user skips the workspace's menu: the first Tab stop is the skip link, and it lands on the page's content", async ({
  page,
}) => {
  // WCAG 2.1 SC 2.4.1 Bypass Blocks.
  await signIn(page, "owner@cinder-slate.test");
  await page.goto("/app/inbox");
  await page.keyboard.press("Tab");
  const skip = page.getByRole("link", { name: "Skip to the content" });
  await expect(skip).toBeFocused();
  await expect(skip).toBeVisible();
  await page.keyboard.press("Enter");
  await expect(page.locator("main#content")).toBeFocused();
});
