import { expect, test, type Page } from "@playwright/test";
import { MAIL_FAKE as MAIL, screenshotBothWidths, signIn } from "./helpers";

/** Counts distinct colours in a screenshot of an element, decoded by the browser itself. */
async function countColours(page: Page, selector: string): Promise<number> {
  const png = await page.locator(selector).screenshot();
  return page.evaluate(async (b64) => {
    const img = new Image();
    img.src = `data:image/png;base64,${b64}`;
    await img.decode();
    const canvas = document.createElement("canvas");
    canvas.width = img.width;
    canvas.height = img.height;
    const ctx = canvas.getContext("2d")!;
    ctx.drawImage(img, 0, 0);
    const data = ctx.getImageData(0, 0, img.width, img.height).data;
    const seen = new Set<number>();
    for (let i = 0; i < data.length; i += 4 * 7) seen.add((data[i]! << 16) | (data[i + 1]! << 8) | data[i + 2]!);
    return seen.size;
  }, png.toString("base64"));
}

async function waitForHydration(page: Page) {
  await expect(page.getByRole("button", { name: "Update the design" })).toHaveCount(0);
}

test("changing the bowl size updates the price and summary without a navigation, and a reload keeps the design", async ({
  page,
}) => {
  await page.goto("/c/cinder-slate?stone=&liner=none&units=14");
  await waitForHydration(page);
  await page.evaluate(() => ((window as unknown as { __marker: string }).__marker = "still-here"));
  const price = page.getByTestId("price-range");
  const before = await price.textContent();
  const bowl = page.getByTestId("plan-summary").getByText(/in$/).first();
  const bowlBefore = await bowl.textContent();

  const slider = page.getByRole("slider", { name: "Inside diameter" });
  await slider.focus();
  for (let i = 0; i < 4; i++) await page.keyboard.press("ArrowRight");
  await expect(price).not.toHaveText(before!);
  await expect(bowl).not.toHaveText(bowlBefore!);
  expect(await page.evaluate(() => (window as unknown as { __marker?: string }).__marker)).toBe("still-here");
  await expect(page).toHaveURL(/units=18/);

  const priceAfter = await price.textContent();
  await page.reload();
  await expect(page.getByTestId("price-range")).toHaveText(priceAfter!);
  await expect(page.getByRole("slider", { name: "Inside diameter" })).toHaveValue("18");
});

test("the 3D preview draws the pit from the plan (its pixels are not blank)", async ({ page }) => {
  await page.goto("/c/cinder-slate?patio=8&liner=firebrick");
  await expect
    .poll(
      () =>
        page.evaluate(
          () =>
            (window as unknown as { __emberwrightScene?: { drawCalls: number } }).__emberwrightScene?.drawCalls ?? 0,
        ),
      { timeout: 20_000 },
    )
    .toBeGreaterThan(0);
  const calls = await page.evaluate(
    () => (window as unknown as { __emberwrightScene: { drawCalls: number } }).__emberwrightScene.drawCalls,
  );
  expect(calls).toBeLessThan(30);
  expect(await countColours(page, "canvas")).toBeGreaterThan(20);
  await screenshotBothWidths(page, "configurator");
});

test("without WebGL the preview shows a dimensioned plan and the rest of the page works", async ({ page }) => {
  await page.addInitScript(() => {
    const original = HTMLCanvasElement.prototype.getContext;
    HTMLCanvasElement.prototype.getContext = function (this: HTMLCanvasElement, type: string, ...rest: unknown[]) {
      return type.startsWith("webgl") ? null : (original as (...a: unknown[]) => unknown).call(this, type, ...rest);
    } as typeof original;
  });
  await page.goto("/c/cinder-slate");
  await waitForHydration(page);
  await expect(page.getByText("3D preview unavailable on this device; showing the plan")).toBeVisible();
  await expect(page.getByRole("img", { name: /across/ }).first()).toBeVisible();
  await expect(page.locator("canvas")).toHaveCount(0);
  const before = await page.getByTestId("price-range").textContent();
  await page.getByRole("button", { name: "One course more" }).click();
  await expect(page.getByTestId("price-range")).not.toHaveText(before!);
});

test("a homeowner sends a request with two photos, both e-mails arrive, the link sets a password and /my shows it; another homeowner cannot see it", async ({
  page,
  browser,
}) => {
  const stamp = Date.now();
  const email = `hazel.${stamp}@example.test`;
  await page.goto("/c/cinder-slate?units=15&courses=4");
  await waitForHydration(page);
  await page.getByLabel("Your name").fill("Hazel Quinlan");
  await page.getByLabel("E-mail", { exact: true }).fill(email);
  await page.getByLabel("Phone", { exact: true }).fill("(970) 555-0191");
  await page.getByLabel("Street address").fill("7 Birchwood Court");
  await page.getByLabel("Town").fill("Millbrook Falls");
  await page.getByLabel(/Photos of the spot/).setInputFiles([
    {
      name: "yard.png",
      mimeType: "image/png",
      buffer: Buffer.from(
        "89504e470d0a1a0a0000000d494844520000000200000002080600000072b60d240000000970485973000003e8000003e801b57b526b0000001149444154089963385161f31f8419600c00588c09edd7703b820000000049454e44ae426082",
        "hex",
      ),
    },
    {
      name: "corner.png",
      mimeType: "image/png",
      buffer: Buffer.from(
        "89504e470d0a1a0a0000000d494844520000000200000002080600000072b60d240000000970485973000003e8000003e801b57b526b0000001149444154089963385161f31f8419600c00588c09edd7703b820000000049454e44ae426082",
        "hex",
      ),
    },
  ]);
  await page.getByLabel(/may contact me/).check();
  await page.getByRole("button", { name: "Send my request" }).click();
  await expect(page.getByRole("heading", { name: /Thank you, Hazel/ })).toBeVisible();
  await expect(page.getByText(/15 units a course/)).toBeVisible();
  await screenshotBothWidths(page, "request-sent");

  type Message = { id: string; to: string[]; subject: string; text: string };
  const findMail = async () => (await (await fetch(`${MAIL}/_fake/messages`)).json()) as Message[];
  await expect
    .poll(async () => (await findMail()).filter((m) => m.to.includes(email)).length, { timeout: 15_000 })
    .toBe(1);
  await expect
    .poll(
      async () =>
        (await findMail()).filter((m) => m.subject === "New fire-pit request: Hazel Quinlan, Millbrook Falls").length,
      { timeout: 15_000 },
    )
    .toBe(1);
  const welcome = (await findMail()).find((m) => m.to.includes(email))!;
  // The token rides in the fragment: no request line (and so no access log) ever carries it.
  const link = /http:\/\/[^\s)\]]+\/welcome#[\w-]+/.exec(welcome.text)![0];
  const linkPath = (url: string) => `${new URL(url).pathname}${new URL(url).hash}`;

  await page.goto(linkPath(link));
  await page.getByLabel("New password").fill("a-long-garden-password");
  await page.getByLabel("Type it again").fill("a-long-garden-password");
  await page.getByRole("button", { name: "Save password and continue" }).click();
  await expect(page).toHaveURL(/\/my$/);
  await expect(page.getByRole("heading", { name: /Request sent/ })).toBeVisible();
  const photos = page.getByRole("list", { name: "Your yard photos" }).getByRole("img");
  await expect(photos).toHaveCount(2);
  const photoUrl = await photos.first().getAttribute("src");
  expect((await page.request.get(photoUrl!)).headers()["x-content-type-options"]).toBe("nosniff");
  await screenshotBothWidths(page, "my-requests");

  // The link works once.
  const again = await browser.newContext();
  const againPage = await again.newPage();
  await againPage.goto(linkPath(link));
  await expect(againPage.getByRole("heading", { name: "This link no longer works" })).toBeVisible();
  await again.close();

  // A second homeowner sees only their own (empty) list and cannot open the first one's photo.
  const other = await browser.newContext();
  const otherPage = await other.newPage();
  const otherEmail = `ivo.${stamp}@example.test`;
  await otherPage.goto("/c/cinder-slate");
  await expect(otherPage.getByRole("button", { name: "Update the design" })).toHaveCount(0);
  await otherPage.getByLabel("Your name").fill("Ivo Szabo");
  await otherPage.getByLabel("E-mail", { exact: true }).fill(otherEmail);
  await otherPage.getByLabel("Phone", { exact: true }).fill("(970) 555-0123");
  await otherPage.getByLabel("Street address").fill("2 Quarry Road");
  await otherPage.getByLabel("Town").fill("Cedar Hollow");
  await otherPage.getByLabel(/may contact me/).check();
  await otherPage.getByRole("button", { name: "Send my request" }).click();
  await expect(otherPage.getByRole("heading", { name: /Thank you, Ivo/ })).toBeVisible();
  await expect
    .poll(async () => (await findMail()).filter((m) => m.to.includes(otherEmail)).length, { timeout: 15_000 })
    .toBe(1);
  const otherLink = /http:\/\/[^\s)\]]+\/welcome#[\w-]+/.exec(
    (await findMail()).find((m) => m.to.includes(otherEmail))!.text,
  )![0];
  await otherPage.goto(linkPath(otherLink));
  await otherPage.getByLabel("New password").fill("another-long-password");
  await otherPage.getByLabel("Type it again").fill("another-long-password");
  await otherPage.getByRole("button", { name: "Save password and continue" }).click();
  await expect(otherPage).toHaveURL(/\/my$/);
  await expect(otherPage.getByText("Hazel")).toHaveCount(0);
  expect((await otherPage.request.get(photoUrl!)).status()).toBe(404);
  await other.close();
});

test("a homeowner who signs in is not let into the staff workspace", async ({ page }) => {
  await signIn(page, "nobody@example.test", "no-such-account");
  await page.goto("/app/catalog");
  await expect(page).toHaveURL(/\/login/);
});
