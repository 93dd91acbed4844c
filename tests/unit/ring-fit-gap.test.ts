/*
 * "Size the bowl to fit my steel ring" leaves the company's own gap round the insert, not the
 * default. The gap is a company setting because units vary about ±1/8 in (ASTM C1372, from memory)
 * and steel grows when hot (linear expansion ~6.5×10⁻⁶/°F, published); the gravel backfill needs room.
 *
 * Worked by hand for the demo's Hearthline Taper (face 12, back 8, depth 8 in) round the Heavy Ring 42
 * (42 in across): past the tightest bowl the faces close, so the face is a side of a regular n-gon
 * whose apothem is (12/2)/tan(π/n) and the bowl is 2 × (apothem − depth) = 12/tan(π/n) − 16
 * (regular polygon apothem, any geometry handbook):
 *   n = 15: 12/tan(12°)     − 16 = 12/0.212557 − 16 = 40.456 in
 *   n = 16: 12/tan(11.25°)  − 16 = 12/0.198912 − 16 = 44.328 in
 *   n = 17: 12/tan(10.588°) − 16 = 12/0.186932 − 16 = 48.194 in
 * Default gap 1/2 in: the bowl must reach 42 + 2 × 0.5 = 43 in → 16 units, gap (44.328 − 42)/2 = 1.164 in.
 * A company gap of 1 1/2 in: the bowl must reach 42 + 2 × 1.5 = 45 in → 17 units, gap (48.194 − 42)/2 = 3.097 in.
 */
import { eq } from "drizzle-orm";
import { beforeAll, expect, test } from "vitest";
import { companies } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { loader as configuratorLoader } from "~/routes/configurator";
import { demoCompany, routeArgs } from "./support/demo";

type Loaded = {
  design: { fitToRing: boolean; unitCount: number };
  plan: {
    ring: { unitsPerCourse: number; bowlDiameterIn: number };
    liner: { kind: string; gapIn: number; fits: boolean };
  };
};

let companyId = 0;
let ringId = 0;

beforeAll(async () => {
  const { company, byName } = await demoCompany();
  companyId = company.id;
  ringId = byName("Heavy Ring 42").id;
});

async function sizedToRing(gapIn: number | null): Promise<Loaded> {
  await db
    .update(companies)
    .set({ factorsJson: gapIn === null ? "{}" : JSON.stringify({ linerMinGapIn: gapIn }) })
    .where(eq(companies.id, companyId));
  const { byName } = await demoCompany();
  const query = new URLSearchParams({
    stone: String(byName("Hearthline Taper").id),
    liner: "steel-ring",
    ring: String(ringId),
    fit: "ring",
  });
  const request = new Request(`http://localhost/c/cinder-slate?${query}`);
  return (await configuratorLoader(routeArgs(request, { companySlug: "cinder-slate" }))) as unknown as Loaded;
}

test("sized to the ring with the default 1/2 in gap: 16 units, a 44.328 in bowl, 1.164 in each side", async () => {
  const loaded = await sizedToRing(null);
  expect(loaded.design.fitToRing).toBe(true);
  expect(loaded.plan.ring.unitsPerCourse).toBe(16);
  expect(loaded.plan.ring.bowlDiameterIn).toBeCloseTo(44.328, 3);
  expect(loaded.plan.liner).toMatchObject({ kind: "steel-ring", fits: true });
  expect(loaded.plan.liner.gapIn).toBeCloseTo(1.164, 3);
});

test("sized to the ring with the company's 1 1/2 in gap: 17 units, a 48.194 in bowl, 3.097 in each side", async () => {
  const loaded = await sizedToRing(1.5);
  expect(loaded.plan.ring.unitsPerCourse).toBe(17);
  expect(loaded.plan.ring.bowlDiameterIn).toBeCloseTo(48.194, 3);
  expect(loaded.plan.liner).toMatchObject({ kind: "steel-ring", fits: true });
  expect(loaded.plan.liner.gapIn).toBeCloseTo(3.097, 3);
});

test("the browser's instant redraw sizes the bowl with the same company gap as the server", async () => {
  const { planLocally } = await import("~/lib/design/design-plan");
  const loaded = (await sizedToRing(1.5)) as Loaded & { catalog: never[]; factors: Record<string, unknown> };
  expect(loaded.factors.linerMinGapIn).toBe(1.5);
  const local = planLocally(loaded.design as never, loaded.catalog, loaded.factors);
  expect(local!.ring.unitsPerCourse).toBe(17);
  expect(local!.ring.bowlDiameterIn).toBeCloseTo(48.194, 3);
});
