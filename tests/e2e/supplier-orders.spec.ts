/*
 * A signed job's stone ordered from the yard: the owner drafts the supplier orders from the job,
 * sends the yard's order (the e-mail fake receives it with the order as a PDF and a CSV), marks it
 * confirmed and then delivered; each step is on the job's timeline. Each page is checked by axe-core
 * at 1366 and 390 px and for sideways scrolling at 360 px, and screenshotted at all three widths.
 */
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { listMail, MAIL_FAKE, signIn } from "./helpers";

/**
 * Screenshots at 1366, 390 and 360 px into data/screens; no axe violations at 1366 and 390; no sideways scroll at 360.
 */
async function checkPage(page: Page, name: string) {
  for (const width of [1366, 390, 360]) {
    await page.setViewportSize({ width, height: width > 400 ? 900 : 800 });
    await page.screenshot({ path: `data/screens/${name}-${width}.png`, fullPage: true });
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow, `${name} at ${width} px scrolls sideways`).toBeLessThanOrEqual(0);
    if (width !== 360) {
      const result = await new AxeBuilder({ page }).analyze();
      expect(
        result.violations.map(
          (v) => `${name} @${width}px ${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(" | ")}`,
        ),
      ).toEqual([]);
    }
  }
  await page.setViewportSize({ width: 1366, height: 900 });
}

test("signed job → supplier orders drafted → the yard's order sent (PDF and CSV arrive) → marked confirmed → delivered; two jobs' same-week drafts combined", async ({
  page,
}) => {
  test.setTimeout(120_000);
  const customer = "Mirela Castellanos";
  await signIn(page, "owner@cinder-slate.test");
  await page.goto("/app/inbox?q=Castellanos");
  await page.getByRole("link", { name: customer }).click();
  await expect(page.getByRole("heading", { name: "Order the stone" })).toBeVisible();
  await page.getByRole("link", { name: "Supplier orders" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("Supplier orders");
  // The job's material order, rounded for each supplier before anything is drafted.
  await expect(page.getByRole("heading", { name: "Millbrook Stone Yard" })).toBeVisible();
  const yardLines = page.getByRole("region", { name: "Lines for Millbrook Stone Yard" });
  await expect(yardLines.getByRole("row", { name: /Ridgeback Taper/ })).toContainText(/\d+ pallets?/);
  await expect(yardLines.getByRole("row", { name: /Crushed base/ })).toContainText(/\d+(\.5)? tons?/);
  await checkPage(page, "supplier-orders-job");

  await page.getByLabel("Requested delivery date").fill("2099-01-01");
  await page.getByRole("button", { name: /^Draft 2 orders$/ }).click();
  await expect(page.getByText("Delivery date must be within a year.")).toBeVisible();
  const inAWeek = await page.evaluate(() => new Date(Date.now() + 7 * 86_400_000).toISOString().slice(0, 10));
  // As the pages say it: "Wed, Dec 9, 2026".
  const shown = new Intl.DateTimeFormat("en-US", {
    weekday: "short",
    month: "short",
    day: "numeric",
    year: "numeric",
    timeZone: "UTC",
  }).format(new Date(`${inAWeek}T12:00:00Z`));
  await page.getByLabel("Requested delivery date").fill(inAWeek);
  await page.getByRole("button", { name: /^Draft 2 orders$/ }).click();
  await expect(page.getByRole("status")).toHaveText("2 orders drafted. Open each to send it.");
  await page.getByRole("link", { name: /to Millbrook Stone Yard$/ }).click();

  await expect(page.getByTestId("order-state")).toHaveText("Draft");
  await expect(
    page.getByRole("heading", { name: `Deliver ${shown} to 305 Kestrel Avenue, Copperfield Mills` }),
  ).toBeVisible();
  await expect(page.getByText(/^Access: Narrowest way in from where the truck parks/)).toBeVisible();
  const number = (await page.getByRole("heading", { level: 1 }).textContent())!.match(/SO-\d{4}/)![0];
  await checkPage(page, "supplier-order-draft");

  await page.getByRole("button", { name: "Send to Millbrook Stone Yard" }).click();
  await expect(page.getByTestId("order-state")).toHaveText("Sent");
  await expect(page.getByRole("status")).toContainText("on its way to the supplier");

  // The yard received the order with both files.
  let mailId = "";
  await expect
    .poll(
      async () => {
        mailId =
          (await listMail()).find(
            (m) => m.to.includes("orders@millbrook-stone.test") && m.subject.startsWith(`Order ${number} `),
          )?.id ?? "";
        return mailId;
      },
      { timeout: 20_000 },
    )
    .not.toBe("");
  const full = (await (await fetch(`${MAIL_FAKE}/_fake/messages/${mailId}`)).json()) as {
    text: string;
    attachments: { filename: string; content: string }[];
  };
  const lower = number.toLowerCase();
  expect(full.attachments.map((a) => a.filename)).toEqual([`${lower}.pdf`, `${lower}.csv`]);
  expect(Buffer.from(full.attachments[0]!.content, "base64").subarray(0, 5).toString()).toBe("%PDF-");
  const csv = Buffer.from(full.attachments[1]!.content, "base64").toString();
  expect(csv.split("\r\n")[0]).toBe(
    "order,job,delivery_date,site_address,item,order_quantity,order_unit,planned_quantity,planned_unit,weight_lb",
  );
  expect(csv).toContain(`${number},`);
  expect(csv).toContain(",Ridgeback Taper,");
  expect(full.text).toContain("305 Kestrel Avenue, Copperfield Mills");

  await page.getByLabel("Their reference or who confirmed").fill("Ref 4471, Dana at the desk");
  await page.getByRole("button", { name: "Mark confirmed" }).click();
  await expect(page.getByTestId("order-state")).toHaveText("Confirmed by the supplier");
  await checkPage(page, "supplier-order-confirmed");
  await page.getByRole("button", { name: "Mark delivered" }).click();
  await expect(page.getByTestId("order-state")).toHaveText("Delivered");

  // Every step is on the job's timeline, and the job moved to "Stone ordered".
  await page.getByRole("link", { name: customer }).click();
  const timeline = page.getByRole("region", { name: "Timeline" });
  await expect(timeline).toContainText(`${number} to Millbrook Stone Yard drafted for delivery ${shown}`);
  await expect(timeline).toContainText(
    `${number} sent to Millbrook Stone Yard (orders@millbrook-stone.test) with the PDF and CSV`,
  );
  await expect(timeline).toContainText(`${number} confirmed by Millbrook Stone Yard: Ref 4471, Dana at the desk`);
  await expect(timeline).toContainText(`${number} delivered.`);
  await expect(page.getByRole("heading", { name: "Book the build" })).toBeVisible();

  // A second signed job's hearth supplies for the same week: the two drafts to Kestrel combine into one order.
  await page.goto("/app/inbox?q=Wren");
  await page.getByRole("link", { name: "Tobias Wren" }).click();
  await page.getByRole("link", { name: "Supplier orders" }).click();
  await page.getByLabel("Requested delivery date").fill(inAWeek);
  await page.getByRole("button", { name: /^Draft (2 orders|the order)$/ }).click();
  await expect(page.getByRole("status")).toContainText("drafted");
  await page.goto("/app/supplier-orders");
  const combine = page.getByRole("region", { name: "Combine drafts" });
  await expect(combine).toContainText("Kestrel Hearth Supply");
  await checkPage(page, "supplier-orders-list");
  await combine.getByRole("button", { name: /^Combine SO-\d{4} and SO-\d{4}$/ }).click();
  await expect(page.getByRole("status")).toHaveText("Combined: one order for every delivery below.");
  await expect(
    page.getByRole("heading", { name: `Deliver ${shown} to 305 Kestrel Avenue, Copperfield Mills` }),
  ).toBeVisible();
  await expect(
    page.getByRole("heading", { name: `Deliver ${shown} to 11 Cinderbrook Lane, Millbrook Falls` }),
  ).toBeVisible();
  await checkPage(page, "supplier-order-combined");

  await page.goto("/app/suppliers");
  await checkPage(page, "suppliers");
  await page.goto("/app/catalog");
  await page.getByRole("link", { name: "Ridgeback Taper" }).click();
  await expect(page.getByLabel("Pieces on a full pallet")).toHaveValue("90");
  await checkPage(page, "catalog-item-ordering");
});
