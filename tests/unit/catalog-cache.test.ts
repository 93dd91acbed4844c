/*
 * The per-process catalog cache stays correct when another process changes the catalog or the
 * company's settings. "Another process" is a second database client on the same file, writing
 * without going through this process's modules (so nothing here is told about the change).
 */
import { eq } from "drizzle-orm";
import { afterAll, expect, test } from "vitest";
import { catalogItems, companies } from "~/db/schema";
import { computePlan } from "~/domain/plan";
import { loadOfferedCatalog } from "~/lib/catalog/catalog.server";
import { openDatabase } from "~/lib/platform/db.server";
import { resolvePlanRequest } from "~/lib/design/plan.server";
import { planRequestSchema } from "~/lib/design/plan-schema";
import { action } from "~/routes/api/plan";
import { demoCompany, routeArgs } from "./support/demo";

const other = openDatabase(process.env.DATABASE_URL!);
afterAll(() => other.client.close());

async function postPlan(body: unknown) {
  const request = new Request("http://localhost/api/plan", {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify(body),
  });
  const response = (await action(routeArgs(request))) as Response;
  return { status: response.status, json: await response.json() };
}

async function planBody() {
  const { byName } = await demoCompany();
  return {
    company: "cinder-slate",
    ring: { bowlDiameterIn: 36, fit: "at-least" },
    wallUnit: { id: byName("Hearthline Taper").id },
    courses: 4,
    cap: { id: byName("Sill Cap 16").id, innerOverhangIn: 1 },
  };
}

test("an unchanged company and catalog are served from memory: two reads give the very same objects", async () => {
  await demoCompany();
  const first = await loadOfferedCatalog("cinder-slate");
  const second = await loadOfferedCatalog("cinder-slate");
  expect(second!.catalog).toBe(first!.catalog);
  expect(second!.company).toBe(first!.company);
  expect(await loadOfferedCatalog("no-such-company")).toBeNull();
});

test("a price changed by another process is used by this process's next plan", async () => {
  const { byName } = await demoCompany();
  const body = await planBody();
  const before = await postPlan(body);
  expect(before.status).toBe(200);
  const unit = byName("Hearthline Taper");
  await other.db
    .update(catalogItems)
    .set({ priceCents: unit.priceCents * 5 })
    .where(eq(catalogItems.id, unit.id));

  const after = await postPlan(body);
  expect(after.status).toBe(200);
  expect(after.json.price.lowCents).toBeGreaterThan(before.json.price.lowCents);
  // The same answer as the engine run on the stored rows (read fresh by the second client).
  const [company] = await other.db.select().from(companies).where(eq(companies.slug, "cinder-slate"));
  const stored = await other.db.select().from(catalogItems).where(eq(catalogItems.companyId, company!.id));
  expect(stored.find((i) => i.id === unit.id)!.priceCents).toBe(unit.priceCents * 5);
  const resolved = await resolvePlanRequest(planRequestSchema.parse(body));
  expect(resolved.input.wallUnit.priceCents).toBe(unit.priceCents * 5);
  const expected = computePlan(resolved.input, { factors: resolved.factors, supplyPrices: resolved.supplyPrices });
  expect(after.json.price).toEqual({ lowCents: expected.price!.lowCents, highCents: expected.price!.highCents });
});

test("an item withdrawn by another process is no longer offered to the next plan (422 naming the field)", async () => {
  const { byName } = await demoCompany();
  const body = await planBody();
  expect((await postPlan(body)).status).toBe(200);
  const cap = byName("Sill Cap 16");
  await other.db.update(catalogItems).set({ isActive: false }).where(eq(catalogItems.id, cap.id));
  const after = await postPlan(body);
  expect(after.status).toBe(422);
  expect(after.json.errors[0].path).toBe("cap.id");
  await other.db.update(catalogItems).set({ isActive: true }).where(eq(catalogItems.id, cap.id));
  expect((await postPlan(body)).status).toBe(200);
});

test("company settings changed by another process (labour rate, margin) price the next plan", async () => {
  await demoCompany();
  const body = await planBody();
  const before = await postPlan(body);
  await other.db
    .update(companies)
    .set({ labourRateCents: 30_000, marginPct: 45 })
    .where(eq(companies.slug, "cinder-slate"));
  const after = await postPlan(body);
  expect(after.json.price.lowCents).toBeGreaterThan(before.json.price.lowCents);
  const offered = await loadOfferedCatalog("cinder-slate");
  expect(offered!.company.labourRateCents).toBe(30_000);
  expect(offered!.company.marginPct).toBe(45);
});

test("every insert, update and delete of a catalog item, and every change to the company row, raises that company's cache version once, and only that company's", async () => {
  const { company } = await demoCompany();
  const [north] = await other.db.select().from(companies).where(eq(companies.slug, "north-ridge"));
  const versions = async () =>
    Object.fromEntries(
      (await other.db.select({ id: companies.id, v: companies.cacheVersion }).from(companies)).map((r) => [r.id, r.v]),
    );
  const v0 = await versions();
  const [row] = await other.db
    .insert(catalogItems)
    .values({ companyId: company.id, kind: "aggregate", name: "Version Probe Gravel", priceCents: 4_000 })
    .returning();
  const v1 = await versions();
  expect(v1[company.id]).toBe(v0[company.id]! + 1);
  await other.db.update(catalogItems).set({ priceCents: 4_100 }).where(eq(catalogItems.id, row!.id));
  const v2 = await versions();
  expect(v2[company.id]).toBe(v1[company.id]! + 1);
  await other.db.delete(catalogItems).where(eq(catalogItems.id, row!.id));
  const v3 = await versions();
  expect(v3[company.id]).toBe(v2[company.id]! + 1);
  await other.db.update(companies).set({ town: "Millbrook" }).where(eq(companies.id, company.id));
  const v4 = await versions();
  expect(v4[company.id]).toBe(v3[company.id]! + 1);
  expect(v4[north!.id]).toBe(v0[north!.id]);
});
