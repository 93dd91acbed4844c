/*
 * A homeowner on the configurator and the request form, one test each, named after what the person
 * did: the preview and price in view while designing, notes beside their fields, the bowl slider
 * and the steel ring, sizing a patio, phone photos, the chosen unit after sending, phone numbers,
 * and the keyboard's way through the stone cards and the preview.
 */
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import sharp from "sharp";
import { listMail, sendRequest, signIn } from "./helpers";

async function openConfigurator(page: Page, query = "") {
  await page.goto(`/c/cinder-slate${query}`);
  // The no-JavaScript button goes once React has hydrated the page.
  await expect(page.getByRole("button", { name: "Update the design" })).toHaveCount(0);
}

const price = (page: Page) => page.getByTestId("price-range");
const bowlSlider = (page: Page) => page.getByRole("slider", { name: /Inside diameter/ });

/** Whether an element lies wholly inside the viewport. */
async function isWhollyInView(page: Page, selector: string) {
  return page.evaluate((sel) => {
    const box = document.querySelector(sel)!.getBoundingClientRect();
    return box.top >= 0 && box.bottom <= window.innerHeight && box.height > 0;
  }, selector);
}

test("a homeowner on a desktop scrolls down to the distances: the preview and the price stay in view and follow the changes", async ({
  page,
}) => {
  await page.setViewportSize({ width: 1366, height: 768 });
  await openConfigurator(page);
  const setback = page.getByLabel("Distance to the nearest building, deck or fence");
  await setback.scrollIntoViewIfNeeded();
  expect(await page.evaluate(() => window.scrollY)).toBeGreaterThan(300);
  expect(await isWhollyInView(page, "[data-testid=price-range]")).toBe(true);
  expect(await isWhollyInView(page, "[data-preview]")).toBe(true);
  // Still in view after a change made down here, and showing it.
  const before = await page.getByTestId("plan-summary").textContent();
  await page.getByRole("button", { name: "One course more" }).click();
  await expect(page.getByTestId("plan-summary")).not.toHaveText(before!);
  expect(await isWhollyInView(page, "[data-testid=price-range]")).toBe(true);
});

test("a homeowner on a phone moves the bowl slider far below the preview: a price strip stays at the top and shows the new size", async ({
  page,
}) => {
  await page.setViewportSize({ width: 390, height: 844 });
  await openConfigurator(page, "?units=14");
  await expect(page.getByTestId("preview-strip")).toHaveCount(0);
  const slider = bowlSlider(page);
  await slider.scrollIntoViewIfNeeded();
  const strip = page.getByTestId("preview-strip");
  await expect(strip).toBeVisible();
  await expect(strip).toContainText("$");
  const sizeBefore = await strip.textContent();
  await slider.focus();
  await page.keyboard.press("ArrowRight");
  await page.keyboard.press("ArrowRight");
  await expect(strip).not.toHaveText(sizeBefore!);
  // The strip covers nothing the homeowner is using.
  const stripBox = (await strip.boundingBox())!;
  const sliderBox = (await slider.boundingBox())!;
  expect(sliderBox.y).toBeGreaterThanOrEqual(stripBox.y + stripBox.height);
  // Back at the top the preview itself is in view, and the strip goes.
  await page.evaluate(() => window.scrollTo(0, 0));
  await expect(strip).toHaveCount(0);
});

test("a homeowner types a setback closer than the contractor works to: the note appears beside the field and stays in the safety list", async ({
  page,
}) => {
  await openConfigurator(page);
  const setback = page.getByLabel("Distance to the nearest building, deck or fence");
  await expect(setback).toHaveAccessibleDescription(/Your contractor works to at least \d+ ft/);
  await setback.fill("10");
  await expect(setback).toHaveAccessibleDescription(
    /10 ft from the nearest building or combustible, closer than the \d+ ft required/,
  );
  await expect(setback).toHaveAttribute("aria-invalid", "true");
  // Beside the field: the note is the field's next sibling block, not somewhere down the page.
  const note = page.getByText(/The spot chosen is 10 ft from the nearest building/).first();
  const fieldBox = (await setback.boundingBox())!;
  const noteBox = (await note.boundingBox())!;
  expect(noteBox.y - (fieldBox.y + fieldBox.height)).toBeLessThan(80);
  await expect(page.locator('li[data-code="setback-too-close"]')).toHaveCount(1);
  await setback.fill("40");
  await expect(setback).not.toHaveAttribute("aria-invalid", "true");
  await expect(page.locator('li[data-code="setback-too-close"]')).toHaveCount(0);
});

test("a homeowner with the bowl sized to the steel ring tabs to the bowl slider and moves it: the box unticks and the page says why", async ({
  page,
}) => {
  await openConfigurator(page);
  const fit = page.getByLabel("Size the bowl to fit my steel ring insert");
  await expect(fit).toBeChecked();
  const slider = bowlSlider(page);
  await expect(slider).toBeEnabled();
  await expect(slider).toHaveAccessibleDescription(
    /The bowl follows the .+ Moving the slider picks your own size instead/,
  );
  // The keyboard reaches it: one Shift+Tab back from the box.
  await fit.focus();
  await page.keyboard.press("Shift+Tab");
  await expect(slider).toBeFocused();
  const bowlBefore = await slider.getAttribute("aria-valuetext");
  await page.keyboard.press("ArrowRight");
  await expect(fit).not.toBeChecked();
  await expect(slider).not.toHaveAttribute("aria-valuetext", bowlBefore!);
  await expect(
    page.getByText(/The bowl is the size you picked\. Tick the box to size it to the .+ again\./),
  ).toBeVisible();
  await fit.check();
  await expect(slider).toHaveAttribute("aria-valuetext", bowlBefore!);
});

test("a homeowner ticks the patio: asked for its size first with a suggestion, and the price changes only once they add it", async ({
  page,
}) => {
  await openConfigurator(page);
  await expect(price(page)).toContainText("$");
  const before = await price(page).textContent();
  await page.getByLabel("Add a round patio").check();
  await expect(page.getByText("How big a patio?")).toBeVisible();
  // The suggestion: the pit's outside edge plus about 6 ft for chairs and a path (common practice, no source).
  await expect(page.getByText(/We suggest \d+(\.5)? ft out from the centre/)).toBeVisible();
  const draft = page.getByRole("slider", { name: /Patio radius/ });
  await draft.focus();
  await page.keyboard.press("ArrowLeft");
  await page.keyboard.press("ArrowLeft");
  // Nothing priced yet: the design (and so the address bar) has no patio.
  await page.waitForTimeout(400);
  await expect(price(page)).toHaveText(before!);
  expect(Number(new URL(page.url()).searchParams.get("patio") ?? "0")).toBe(0);
  const radius = (await draft.getAttribute("aria-valuetext"))!.match(/^([\d.]+) ft/)![1]!;
  await page.getByRole("button", { name: `Add a ${radius} ft patio` }).click();
  await expect(price(page)).not.toHaveText(before!);
  expect(new URL(page.url()).searchParams.get("patio")).toBe(radius);
  await expect(page.getByTestId("plan-summary")).toContainText("Patio");
  // Unticking takes it out again.
  await page.getByLabel("Add a round patio").uncheck();
  await expect(price(page)).toHaveText(before!);
});

test("a homeowner sends a big phone photo: it goes up upright, at most 2560 px, without its location, with a progress bar", async ({
  page,
}) => {
  // A 4032 × 3024 landscape JPEG marked "rotate 90° clockwise to view" (EXIF Orientation 6, as phones
  // write a portrait shot) with a GPS position, as a phone camera would save it.
  const photo = await sharp({
    create: {
      width: 4032,
      height: 3024,
      channels: 3,
      background: { r: 120, g: 140, b: 90 },
      noise: { type: "gaussian", mean: 128, sigma: 30 },
    },
  })
    .jpeg({ quality: 92 })
    .withMetadata({
      orientation: 6,
      exif: {
        IFD3: {
          GPSLatitudeRef: "N",
          GPSLatitude: "44/1 30/1 0/1",
          GPSLongitudeRef: "W",
          GPSLongitude: "93/1 10/1 0/1",
        },
      },
    })
    .toBuffer();
  const original = await sharp(photo).metadata();
  expect(original.orientation).toBe(6);
  expect(original.exif).toBeDefined();

  await openConfigurator(page);
  const email = `nadia.${Date.now()}@example.test`;
  await page.getByLabel("Your name").fill("Nadia Orlov");
  await page.getByLabel("E-mail", { exact: true }).fill(email);
  await page.getByLabel("Phone", { exact: true }).fill("(970) 555-0164");
  await page.getByLabel("Street address").fill("3 Ferncliff Row");
  await page.getByLabel("Town").fill("Millbrook Falls");
  await page
    .getByLabel(/Photos of the spot/)
    .setInputFiles({ name: "IMG_4410.jpg", mimeType: "image/jpeg", buffer: photo });
  await page.getByLabel(/may contact me/).check();
  // Notes whether the progress bar ever showed (a loopback upload is over in moments), and keeps the
  // photo exactly as the page hands it to XMLHttpRequest (the page moves on without a reload).
  await page.evaluate(() => {
    const w = window as unknown as { sawProgress: boolean; sentPhotos: File[] };
    w.sawProgress = false;
    w.sentPhotos = [];
    new MutationObserver(() => {
      if (document.querySelector("[data-testid=upload-progress] progress")) w.sawProgress = true;
    }).observe(document.body, { childList: true, subtree: true });
    const send = XMLHttpRequest.prototype.send;
    XMLHttpRequest.prototype.send = function (body) {
      if (body instanceof FormData) w.sentPhotos = body.getAll("photos").filter((p): p is File => p instanceof File);
      return send.call(this, body);
    };
  });
  await page.getByRole("button", { name: "Send my request" }).click();
  await expect(page.getByRole("heading", { name: /Thank you, Nadia/ })).toBeVisible();
  expect(new URL(page.url()).pathname).toMatch(/^\/c\/cinder-slate\/sent\//);
  expect(await page.evaluate(() => (window as unknown as { sawProgress: boolean }).sawProgress)).toBe(true);

  const photos = await page.evaluate(async () =>
    Promise.all(
      (window as unknown as { sentPhotos: File[] }).sentPhotos.map(async (f) => {
        const bytes = new Uint8Array(await f.arrayBuffer());
        let text = "";
        for (let i = 0; i < bytes.length; i += 0x8000) text += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
        return { filename: f.name, type: f.type, base64: btoa(text) };
      }),
    ),
  );
  expect(photos).toHaveLength(1);
  expect(photos[0]!.filename).toBe("IMG_4410.jpg");
  expect(photos[0]!.type).toBe("image/jpeg");
  const data = Buffer.from(photos[0]!.base64, "base64");
  const shrunk = await sharp(data).metadata();
  expect(shrunk.format).toBe("jpeg");
  // Upright: the portrait shot is now 1920 wide and 2560 high in its own pixels, with no orientation to apply.
  expect([shrunk.width, shrunk.height]).toEqual([1920, 2560]);
  expect(shrunk.orientation).toBeUndefined();
  expect(shrunk.exif).toBeUndefined();
  expect(data.length).toBeLessThan(photo.length / 2);
  await expect
    .poll(async () => (await listMail()).filter((m) => m.to.includes(email)).length, { timeout: 15_000 })
    .toBe(1);
});

test("a homeowner designing in millimetres sends a request: the sent page and /my say the design in millimetres and metres", async ({
  page,
}) => {
  const email = `tomasz.${Date.now()}@example.test`;
  await sendRequest(page, { name: "Tomasz Weller", email }, "?unit=mm&units=15&setback=30");
  const design = page.getByRole("region", { name: "Your design" });
  await expect(design).toContainText(/\d+ mm across inside/);
  await expect(design).toContainText("9.1 m to the nearest building"); // 30 ft × 0.3048 = 9.144 m
  await expect(design).not.toContainText(/\d in\b/);
  await expect(design).not.toContainText(/\d ft\b/);

  await expect
    .poll(async () => (await listMail()).filter((m) => m.to.includes(email)).length, { timeout: 15_000 })
    .toBe(1);
  const welcome = (await listMail()).find((m) => m.to.includes(email))!;
  expect(welcome.text).toMatch(/\d+ mm across inside/);
  const link = /http:\/\/[^\s)\]]+\/welcome#[\w-]+/.exec(welcome.text)![0];
  await page.goto(`${new URL(link).pathname}${new URL(link).hash}`);
  await page.getByLabel("New password").fill("a-long-garden-password");
  await page.getByLabel("Type it again").fill("a-long-garden-password");
  await page.getByRole("button", { name: "Save password and continue" }).click();
  await expect(page).toHaveURL(/\/my$/);
  const request = page.getByRole("article").first();
  await expect(request).toContainText(/\d+ mm across inside/);
  await expect(request).not.toContainText(/\d in\b/);
});

test("a homeowner types 'call me' as their phone: told beside the field; a real number reaches the office in E.164 and reads formatted", async ({
  page,
}) => {
  await openConfigurator(page);
  const email = `odette.${Date.now()}@example.test`;
  await page.getByLabel("Your name").fill("Odette Vasquez-Lind");
  await page.getByLabel("E-mail", { exact: true }).fill(email);
  const phone = page.getByLabel("Phone", { exact: true });
  await phone.fill("call me");
  await page.getByLabel("Street address").fill("88 Tamarack Lane");
  await page.getByLabel("Town").fill("Harrow Bend");
  await page.getByLabel(/may contact me/).check();
  await page.getByRole("button", { name: "Send my request" }).click();
  await expect(page.getByRole("alert").first()).toBeFocused();
  await expect(phone).toHaveAttribute("aria-invalid", "true");
  await expect(phone).toHaveAccessibleDescription(/Enter your phone number with its area code, like \(217\) 555-0142/);
  await expect(page).toHaveURL(/\/c\/cinder-slate(\?|$)/);
  // What was typed is kept; only the phone needs changing.
  await expect(page.getByLabel("Your name")).toHaveValue("Odette Vasquez-Lind");
  await phone.fill("970.555.0188");
  await page.getByRole("button", { name: "Send my request" }).click();
  await expect(page.getByRole("heading", { name: /Thank you, Odette/ })).toBeVisible();

  await signIn(page, "owner@cinder-slate.test");
  await page.goto(`/app/inbox?q=${encodeURIComponent("Odette Vasquez-Lind")}`);
  await page
    .getByRole("link", { name: /Odette Vasquez-Lind/ })
    .first()
    .click();
  // NANP number typed with dots; stored as +19705550188 (ITU-T E.164), shown the North American way.
  const call = page.getByRole("link", { name: "(970) 555-0188" });
  await expect(call).toBeVisible();
  await expect(call).toHaveAttribute("href", "tel:+19705550188");
});

test("a keyboard user tabs to the chosen stone, the 3D view and the plan: each says what it is, and focus looks unlike the chosen border", async ({
  page,
}) => {
  await openConfigurator(page);
  const chosen = page.locator("label:has(input[name=stone]:checked)");
  const radio = chosen.locator("input[name=stone]");
  // Reach the stone cards with the keyboard, from the units switch just before the form.
  await page.getByRole("button", { name: "Millimetres" }).focus();
  for (let i = 0; i < 30 && !(await radio.evaluate((el) => el === document.activeElement)); i++)
    await page.keyboard.press("Tab");
  await expect(radio).toBeFocused();
  const look = await chosen.evaluate((el) => {
    const s = getComputedStyle(el);
    return {
      outlineStyle: s.outlineStyle,
      outlineColor: s.outlineColor,
      outlineWidth: s.outlineWidth,
      borderColor: s.borderTopColor,
    };
  });
  expect(look.outlineStyle).toBe("dashed");
  expect(look.outlineWidth).toBe("3px");
  expect(look.outlineColor).not.toBe(look.borderColor);
  await expect(chosen).toContainText("Chosen");

  // The 3D view: a text alternative with the design's sizes, and reachable by Tab.
  const scene = page.locator('[data-preview="3d"] [role="img"]');
  await expect(scene).toHaveAttribute("aria-label", /3D view of the fire pit: Bowl .+ across inside/, {
    timeout: 20_000,
  });
  await expect(scene).toHaveAttribute("tabindex", "0");
  // The plan view: chosen from the keyboard, then reachable by Tab with its own description.
  await page.getByRole("button", { name: "Plan view" }).focus();
  await page.keyboard.press("Enter");
  const plan = page.locator('[data-preview="plan"] svg[role="img"]');
  await expect(plan).toBeVisible();
  await page.getByRole("button", { name: "3D view" }).focus();
  await page.keyboard.press("Shift+Tab");
  await expect(plan).toBeFocused();
  await expect(plan).toHaveAttribute("aria-label", /bowl/i);
});

test("a homeowner mid-design (price strip showing, a patio being sized, a setback note) meets axe-core at desktop and phone widths", async ({
  page,
}) => {
  for (const width of [1366, 390]) {
    await page.setViewportSize({ width, height: width > 400 ? 768 : 844 });
    await openConfigurator(page, "?setback=10");
    await page.getByLabel("Add a round patio").check();
    await expect(page.getByText("How big a patio?")).toBeVisible();
    await page.getByLabel("Distance to the nearest building, deck or fence").scrollIntoViewIfNeeded();
    if (width < 1024) await expect(page.getByTestId("preview-strip")).toBeVisible();
    const result = await new AxeBuilder({ page }).analyze();
    expect(
      result.violations.map(
        (v) => `@${width}px ${v.id}: ${v.help} → ${v.nodes.map((n) => n.target.join(" ")).join(" | ")}`,
      ),
    ).toEqual([]);
    expect(await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(0);
  }
});
