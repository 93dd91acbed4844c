/*
 * Every page, as every kind of visitor, at a desktop (1366 px) and a phone (390 px) width, checked by
 * axe-core (Deque's WCAG 2.x rules, the same engine browser extensions use) with zero violations;
 * and at 360 px (the narrowest common Android width) no page may scroll sideways (WCAG 2.1 SC 1.4.10
 * Reflow asks for no two-way scrolling at 320 CSS px; 360 px is the width most phones report).
 */
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { holdConsultTime, listMail, PAYMENTS_FAKE, sendRequest, signIn } from "./helpers";

type Finding = { url: string; width: number; rule: string; help: string; targets: string[] };

/** Opens each path and collects axe violations at 1366 and 390 px, and sideways scrolling at 360 px. */
async function auditPaths(page: Page, paths: string[]): Promise<{ violations: Finding[]; overflows: string[] }> {
  const violations: Finding[] = [];
  const overflows: string[] = [];
  for (const path of paths) {
    for (const width of [1366, 390, 360]) {
      await page.setViewportSize({ width, height: width > 400 ? 900 : 800 });
      await page.goto(path);
      await page.waitForLoadState("load");
      // Let hydration and the lazily loaded preview settle, so the checked page is the one people use.
      await page.waitForTimeout(250);
      if (width === 360) {
        const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
        if (overflow > 0) overflows.push(`${path} is ${overflow} px wider than a 360 px screen`);
        continue;
      }
      const result = await new AxeBuilder({ page }).analyze();
      for (const v of result.violations) {
        violations.push({
          url: path,
          width,
          rule: v.id,
          help: v.help,
          targets: v.nodes.slice(0, 4).map((n) => n.target.join(" ")),
        });
      }
    }
  }
  return { violations, overflows };
}

function expectClean({ violations, overflows }: { violations: Finding[]; overflows: string[] }) {
  expect([
    ...violations.map((v) => `${v.url} @${v.width}px ${v.rule}: ${v.help} → ${v.targets.join(" | ")}`),
    ...overflows,
  ]).toEqual([]);
}

/** The first lead links of the signed-in person's inbox or jobs list. */
async function leadPathFrom(page: Page, listPath: string): Promise<string> {
  await page.goto(listPath);
  const href = await page.getByRole("main").locator('a[href^="/app/leads/"]').first().getAttribute("href");
  return href!;
}

test.describe.configure({ timeout: 240_000 });

test("every public page has no accessibility violations and fits a 360 px phone, signed out", async ({ page }) => {
  expectClean(
    await auditPaths(page, [
      "/",
      "/login",
      "/c/cinder-slate",
      "/c/cinder-slate/sent/demo-cinder-slate-01",
      "/c/cinder-slate/consult/demo-cinder-slate-01",
      "/welcome/no-such-token",
      "/no-such-page",
    ]),
  );
});

test("every page a homeowner sees has no accessibility violations and fits a 360 px phone", async ({ page }) => {
  const email = `ada.${Date.now()}@example.test`;
  await sendRequest(page, { name: "Ada Penrose", email });
  const sentPath = new URL(page.url()).pathname;
  const consultPath = sentPath.replace("/sent/", "/consult/");
  await expect
    .poll(async () => (await listMail()).filter((m) => m.to.includes(email)).length, { timeout: 15_000 })
    .toBe(1);
  const link = /http:\/\/[^\s)\]]+\/welcome#[\w-]+/.exec(
    (await listMail()).find((m) => m.to.includes(email))!.text,
  )![0];
  const welcomePath = `${new URL(link).pathname}${new URL(link).hash}`;
  const before = await auditPaths(page, [welcomePath]);
  await page.goto(welcomePath);
  await page.getByLabel("New password").fill("a-long-garden-password");
  await page.getByLabel("Type it again").fill("a-long-garden-password");
  await page.getByRole("button", { name: "Save password and continue" }).click();
  await expect(page).toHaveURL(/\/my$/);

  // Book and pay a consult so the booked pages are checked too: a time on the third day or later, more
  // than a day away whatever the hour the suite runs, so the booking can still be moved.
  await page.goto(consultPath);
  await holdConsultTime(page, 20);
  await expect(page).toHaveURL(new RegExp(`^${PAYMENTS_FAKE}/pay/`));
  await page.getByLabel("Card number").fill("4242 4242 4242 4242");
  await page.getByLabel("Expiry (MM / YY)").fill("12 / 30");
  await page.getByLabel("Security code (CVC)").fill("123");
  await page.getByLabel("Name on card").fill("Ada Penrose");
  await page.getByRole("button", { name: /^Pay / }).click();
  await expect(page.getByRole("heading", { name: "Your design consult is booked" })).toBeVisible({ timeout: 20_000 });
  const donePath = new URL(page.url()).pathname + new URL(page.url()).search;

  await page.goto("/my");
  const movePath = await page.getByRole("link", { name: "Move to another time" }).getAttribute("href");
  const after = await auditPaths(page, ["/my", movePath!, sentPath, consultPath, donePath, "/c/cinder-slate"]);
  expectClean({
    violations: [...before.violations, ...after.violations],
    overflows: [...before.overflows, ...after.overflows],
  });
});

test("every page the owner sees has no accessibility violations and fits a 360 px phone", async ({ page }) => {
  await signIn(page, "owner@cinder-slate.test");
  const lead = await leadPathFrom(page, "/app/inbox");
  const job = await leadPathFrom(page, "/app/jobs");
  expectClean(
    await auditPaths(page, [
      "/app/inbox",
      "/app/inbox?status=new&q=a",
      lead,
      `${lead}/design`,
      "/app/jobs",
      `${job}/cut-sheet`,
      "/app/schedule",
      "/app/consult-hours",
      "/app/catalog",
      "/app/catalog/new",
      "/app/catalog/1",
      "/app/team",
      "/app/settings",
      "/app/settings/factors",
      "/app/attention",
      "/app/no-such-page",
    ]),
  );
});

// Apart from the owner's walk above, which is long already.
test("every supplier page the owner sees has no accessibility violations and fits a 360 px phone", async ({ page }) => {
  await signIn(page, "owner@cinder-slate.test");
  const job = await leadPathFrom(page, "/app/jobs");
  // The seed sends the stone-ordered job's orders, so the first one exists.
  expectClean(
    await auditPaths(page, [
      "/app/suppliers",
      "/app/supplier-orders",
      "/app/supplier-orders/1",
      `${job}/supplier-orders`,
    ]),
  );
});

test("the build pages have no accessibility violations and fit a 360 px phone", async ({ page }) => {
  await signIn(page, "owner@cinder-slate.test");
  const job = await leadPathFrom(page, "/app/jobs");
  expectClean(await auditPaths(page, [`${job}/build`, "/app/calendar"]));
});

test("every page the estimator sees has no accessibility violations and fits a 360 px phone", async ({ page }) => {
  await signIn(page, "estimator@cinder-slate.test");
  const lead = await leadPathFrom(page, "/app/inbox");
  expectClean(
    await auditPaths(page, [
      "/app/inbox",
      lead,
      `${lead}/design`,
      "/app/schedule",
      "/app/consult-hours",
      "/app/catalog",
      "/app/jobs",
    ]),
  );
});

test("every page the crew sees has no accessibility violations and fits a 360 px phone", async ({ page }) => {
  await signIn(page, "crew@cinder-slate.test");
  const job = await leadPathFrom(page, "/app/jobs");
  expectClean(
    await auditPaths(page, ["/app/jobs", job, `${job}/cut-sheet`, "/app/catalog", "/app/catalog/1", "/app/calendar"]),
  );
});

test("the monthly report and the seeded built jobs' pages have no accessibility violations and fit a 360 px phone", async ({
  page,
}) => {
  await signIn(page, "owner@cinder-slate.test");
  // A built job with its balance due and job cost (seeded), found through the inbox's stage tab.
  await page.goto("/app/inbox?status=built");
  const built = await page.getByRole("main").getByRole("link", { name: "Perpetua Vance" }).first().getAttribute("href");
  expectClean(await auditPaths(page, ["/app/reports", built!]));
});
