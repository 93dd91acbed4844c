import { expect, test, type Browser, type Page } from "@playwright/test";
import { listMail, MAIL_FAKE, PAYMENTS_FAKE, screenshotBothWidths, signIn } from "./helpers";

async function payWith(page: Page, card: string, name: string) {
  await page.getByLabel("Card number").fill(card);
  await page.getByLabel("Expiry (MM / YY)").fill("12 / 30");
  await page.getByLabel("Security code (CVC)").fill("123");
  await page.getByLabel("Name on card").fill(name);
  await page.getByRole("button", { name: /^Pay / }).click();
}

async function openLead(page: Page, customer: string) {
  await page.goto(`/app/inbox?q=${encodeURIComponent(customer.split(" ").at(-1)!)}`);
  await page.getByRole("link", { name: customer }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(customer);
}

/** The proposal's link, as the homeowner received it by e-mail. */
async function linkFromMail(to: string, subject: RegExp): Promise<string> {
  let link = "";
  await expect
    .poll(
      async () => {
        const message = (await listMail()).find((m) => m.to.includes(to) && subject.test(m.subject));
        link = message?.text.match(/\/p\/[A-Za-z0-9_-]+/)?.[0] ?? "";
        return link;
      },
      { timeout: 15_000 },
    )
    .not.toBe("");
  return link;
}

async function asHomeowner(browser: Browser) {
  const context = await browser.newContext();
  return { context, page: await context.newPage() };
}

test("visit, proposal, signature and deposit: the estimator measures the yard and sends the proposal; the homeowner opens it, ticks an add-on, signs and pays with 4242…; staff see the job signed", async ({
  page,
  browser,
}) => {
  test.setTimeout(120_000);
  const customer = "Benedikt Farrow";
  await signIn(page, "estimator@cinder-slate.test");
  await openLead(page, customer);
  await expect(page.getByRole("heading", { name: "Measure the yard at the consult" })).toBeVisible();

  await page.getByRole("link", { name: "Record the site visit" }).click();
  await page.getByLabel("Nearest structure (house, shed, fence, deck)").fill("31");
  await page.getByLabel("Property line").fill("40");
  await page.getByLabel("Slope", { exact: true }).selectOption({ label: "Gentle slope (about 1–4 in in 4 ft)" });
  await page.getByLabel("Soil", { exact: true }).selectOption({ label: "Loam, firm" });
  await page.getByLabel("Access width").fill("48");
  await page.getByLabel("Utility marks").selectOption({ label: "Marked, none near the pit" });
  await page.getByLabel("Where the dug soil goes").selectOption({ label: "Haul it away" });
  await screenshotBothWidths(page, "site-visit");
  await page.getByRole("button", { name: "Save the site visit" }).click();
  await expect(page.getByRole("heading", { name: "Send the proposal" })).toBeVisible();
  await expect(page.getByRole("region", { name: "Site visit" })).toContainText("31 ft");
  await expect(page.getByRole("region", { name: "Timeline" })).toContainText("Consult booked → Yard measured");

  await page.getByRole("link", { name: "Write the proposal" }).click();
  await expect(page.getByRole("region", { name: "Scope of work (from the plan)" })).toContainText(
    "compact a base of crushed stone",
  );
  await page.getByLabel("Fixed price").fill("4,850");
  await page.getByLabel("Add-on 1", { exact: true }).fill("Firebrick lining");
  await page.getByLabel("Add-on 1 price").fill("640");
  await page.getByRole("button", { name: "Send the proposal" }).click();
  await expect(page.getByRole("heading", { name: "Waiting for the signature" })).toBeVisible();
  await expect(page.getByText("Benedikt has not opened the proposal yet.")).toBeVisible();

  const link = await linkFromMail("benedikt.farrow@example.test", /^Your fire pit proposal from/);
  const home = await asHomeowner(browser);
  await home.page.goto(link);
  await expect(home.page.getByRole("heading", { level: 1 })).toHaveText("A fire pit at 560 Quarry Ridge Drive");
  await expect(home.page.getByTestId("proposal-total")).toHaveText("$4,850.00");
  await expect(async () => {
    await home.page.getByLabel(/Firebrick lining/).check();
    await expect(home.page.getByTestId("proposal-total")).toHaveText("$5,490.00", { timeout: 1_000 });
  }).toPass({ timeout: 15_000 });
  // 30 % of $5,490.00 is $1,647.00.
  await expect(home.page.getByRole("button", { name: "Sign and pay the deposit of $1,647.00" })).toBeVisible();
  const pdfHref = await home.page.getByRole("link", { name: /Download the proposal as a PDF/ }).getAttribute("href");
  expect(pdfHref).toContain("addOns=a1");
  const pdf = await home.page.request.get(pdfHref!);
  expect(pdf.headers()["content-type"]).toBe("application/pdf");
  expect((await pdf.body()).subarray(0, 5).toString()).toBe("%PDF-");
  await screenshotBothWidths(home.page, "proposal");

  // Staff see it opened.
  await page.reload();
  await expect(page.getByText("Benedikt has opened the proposal.")).toBeVisible();

  // A signature without the consent ticked is refused, and focus goes to the summary saying why
  // (WCAG 2.1 SC 3.3.1), not back to the top of the page.
  await home.page.getByLabel("Your full name, as your signature").fill("Benedikt Farrow");
  await home.page.getByRole("button", { name: "Sign and pay the deposit of $1,647.00" }).click();
  const summary = home.page.getByRole("alert").filter({ hasText: "Not signed yet" });
  await expect(summary).toContainText("Tick the box to agree to sign electronically.");
  await expect(summary).toBeFocused();
  await home.page.getByRole("checkbox", { name: /I agree to sign this proposal electronically/ }).check();
  await home.page.getByRole("button", { name: "Sign and pay the deposit of $1,647.00" }).click();
  await expect(home.page).toHaveURL(new RegExp(`^${PAYMENTS_FAKE}/pay/`));
  await payWith(home.page, "4242 4242 4242 4242", "Benedikt Farrow");
  await expect(async () => {
    await home.page.reload();
    await expect(home.page.getByRole("heading", { name: "Signed and deposit paid" })).toBeVisible({ timeout: 1_000 });
  }).toPass({ timeout: 20_000 });
  await expect(home.page.getByText(/SHA-256 of the PDF you accepted: [0-9a-f]{64}/)).toBeVisible();
  await screenshotBothWidths(home.page, "proposal-signed");
  await home.context.close();

  // Both sides got the signed PDF.
  await expect
    .poll(
      async () =>
        (await listMail())
          .filter((m) => /^Signed: Proposal/.test(m.subject) || /signed Proposal/.test(m.subject))
          .filter((m) => m.text.includes("Benedikt")).length,
      { timeout: 15_000 },
    )
    .toBeGreaterThanOrEqual(2);
  const signedMail = (await listMail()).find(
    (m) => m.to.includes("benedikt.farrow@example.test") && /^Signed:/.test(m.subject),
  )!;
  const full = (await (await fetch(`${MAIL_FAKE}/_fake/messages/${signedMail.id}`)).json()) as {
    attachments: { filename: string; content: string }[];
  };
  expect(full.attachments[0]!.filename).toMatch(/-signed\.pdf$/);
  expect(Buffer.from(full.attachments[0]!.content, "base64").subarray(0, 5).toString()).toBe("%PDF-");

  await page.reload();
  await expect(page.getByRole("heading", { name: "Order the stone" })).toBeVisible();
  await expect(page.getByRole("list", { name: "Job progress" }).locator("[aria-current=step]")).toContainText("Signed");
  await expect(page.getByRole("region", { name: "Proposal and changes" })).toContainText("signed by Benedikt Farrow");
  await expect(page.getByRole("region", { name: "Proposal and changes" })).toContainText("deposit $1,647.00 paid");
  await screenshotBothWidths(page, "lead-signed");
  await page.goto("/app/inbox?status=signed");
  await expect(page.getByRole("link", { name: customer })).toBeVisible();
});

test("a declined card leaves the proposal signed but unpaid: nothing is charged, the homeowner can pay again, staff see it waiting for the deposit", async ({
  page,
  browser,
}) => {
  test.setTimeout(90_000);
  await signIn(page, "estimator@cinder-slate.test");
  await openLead(page, "Rafael Okonkwo-Reyes");
  const link = await page
    .getByRole("region", { name: "Proposal and changes" })
    .getByRole("link", { name: /^Proposal \d+-1$/ })
    .getAttribute("href");

  const home = await asHomeowner(browser);
  await home.page.goto(link!);
  // The measured 34 in side gate adds the narrow-access allowance.
  await expect(home.page.getByRole("region", { name: "Price" })).toContainText("Narrow access (34 in)");
  await home.page.getByLabel("Your full name, as your signature").fill("Rafael Okonkwo-Reyes");
  await home.page.getByRole("checkbox", { name: /I agree to sign/ }).check();
  await home.page.getByRole("button", { name: /^Sign and pay the deposit/ }).click();
  await expect(home.page).toHaveURL(new RegExp(`^${PAYMENTS_FAKE}/pay/`));
  await payWith(home.page, "4000 0000 0000 0002", "Rafael Okonkwo-Reyes");
  await expect(home.page.getByText("Your card was declined.")).toBeVisible();
  await home.page.getByRole("link", { name: "Cancel and go back" }).click();
  await expect(home.page.getByRole("heading", { name: "Signed: one step left, the deposit" })).toBeVisible();
  await expect(home.page.getByText(/You left the payment page, so nothing was charged/)).toBeVisible();
  await expect(home.page.getByRole("button", { name: /^Pay the deposit of/ })).toBeVisible();
  await home.context.close();

  await page.reload();
  await expect(page.getByRole("heading", { name: "Waiting for the deposit" })).toBeVisible();
  await expect(page.getByRole("region", { name: "Proposal and changes" })).toContainText(
    "signed, waiting for the deposit",
  );
});

test("an expired proposal says so plainly to the homeowner and can no longer be signed", async ({ page, browser }) => {
  await signIn(page, "estimator@cinder-slate.test");
  await openLead(page, "Ferdinand Lisle");
  const card = page.getByRole("region", { name: "Proposal and changes" });
  await expect(card).toContainText("expired unsigned");
  await expect(page.getByRole("heading", { name: "Send the proposal" })).toBeVisible();
  const link = await card.getByRole("link", { name: /^Proposal \d+-1$/ }).getAttribute("href");

  const home = await asHomeowner(browser);
  await home.page.goto(link!);
  await expect(home.page.getByRole("heading", { name: "This proposal has expired" })).toBeVisible();
  await expect(home.page.getByRole("button", { name: /^Sign/ })).toHaveCount(0);
  await screenshotBothWidths(home.page, "proposal-expired");
  // Posting a signature anyway is refused.
  const refused = await home.page.request.post(link!, {
    form: { intent: "sign", signerName: "Ferdinand Lisle", consent: "on" },
    headers: { Origin: new URL(home.page.url()).origin },
  });
  expect(refused.status()).toBe(409);
  await home.context.close();
});

test("a change order signed: staff revise a signed job's design and send the difference; the homeowner signs it and the job's total follows", async ({
  page,
  browser,
}) => {
  test.setTimeout(120_000);
  const customer = "Mirela Castellanos";
  await signIn(page, "owner@cinder-slate.test");
  await openLead(page, customer);
  await expect(page.getByRole("region", { name: "Proposal and changes" })).toContainText("$5,960.00");

  await page.getByRole("link", { name: "Revise the design" }).click();
  await expect(async () => {
    await page.getByRole("button", { name: "One course more" }).click();
    await expect(page.getByText(/^5 courses/)).toBeVisible({ timeout: 1_000 });
  }).toPass({ timeout: 20_000 });
  await page.getByRole("button", { name: "Save this revision" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(customer);

  await page.getByRole("link", { name: "Send a change order" }).click();
  await expect(page.getByRole("region", { name: /What changes/ })).toContainText("Build 5 courses");
  await page.getByLabel("Price difference").fill("450");
  await page.getByRole("button", { name: "Send the change order" }).click();
  await expect(page.getByRole("heading", { name: "Waiting for the change order's signature" })).toBeVisible();

  const link = await linkFromMail("mirela.c@example.test", /^A change order from/);
  const home = await asHomeowner(browser);
  await home.page.goto(link);
  await expect(home.page.getByRole("region", { name: "What changes" })).toContainText("Build 5 courses");
  await expect(home.page.getByRole("region", { name: "What changes" })).toContainText("$6,410.00");
  await home.page.getByLabel("Your full name, as your signature").fill("Mirela Castellanos");
  await home.page.getByRole("checkbox", { name: /I agree to sign this change order electronically/ }).check();
  await home.page.getByRole("button", { name: "Sign the change order" }).click();
  await expect(home.page.getByRole("heading", { name: "Change order signed" })).toBeVisible();
  await screenshotBothWidths(home.page, "change-order-signed");
  await home.context.close();

  await page.goto(page.url().replace(/\/change-order$/, ""));
  await expect(page.getByRole("heading", { name: "Order the stone" })).toBeVisible();
  const card = page.getByRole("region", { name: "Proposal and changes" });
  await expect(card.getByRole("definition").first()).toHaveText("$6,410.00");
});
