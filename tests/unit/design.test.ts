import fc from "fast-check";
import { expect, test } from "vitest";
import { offeredRingSizes, parseDesign, designToSearchParams, type CatalogChoice } from "~/lib/design/design";
import { toCatalogChoice } from "~/lib/design/configurator.server";
import { demoCompany } from "./support/demo";

async function demoCatalog(): Promise<CatalogChoice[]> {
  return (await demoCompany()).catalog.map(toCatalogChoice);
}

test("an empty address opens a sized, lined design: the smallest ring that clears the first steel ring insert", async () => {
  const catalog = await demoCatalog();
  const design = parseDesign(new URLSearchParams(), catalog)!;
  expect(design.linerKind).toBe("steel-ring");
  expect(design.fitToRing).toBe(true);
  expect(catalog.find((i) => i.id === design.stoneId)?.kind).toBe("wall-unit");
  expect(design.patioRadiusFt).toBe(0);
});

test("every design survives a trip through the address bar (fast-check round trip)", async () => {
  const catalog = await demoCatalog();
  const ids = (kind: string) => catalog.filter((i) => i.kind === kind).map((i) => i.id);
  const designArb = fc.record({
    stone: fc.constantFrom(...ids("wall-unit")),
    units: fc.integer({ min: 3, max: 200 }),
    fit: fc.boolean(),
    courses: fc.integer({ min: 1, max: 12 }),
    cap: fc.constantFrom("none", ...ids("cap").map(String)),
    overhang: fc.integer({ min: 0, max: 12 }).map((q) => q / 4),
    liner: fc.constantFrom("none", "firebrick", "steel-ring"),
    ring: fc.constantFrom(...ids("steel-ring")),
    patio: fc.constantFrom(0, 5, 8.5, 16),
    setback: fc.option(fc.integer({ min: 0, max: 500 }), { nil: undefined }),
    unit: fc.constantFrom("in", "mm"),
  });
  fc.assert(
    fc.property(designArb, (raw) => {
      const params = new URLSearchParams();
      for (const [k, v] of Object.entries(raw))
        if (v !== undefined && v !== false) params.set(k, v === true ? "ring" : String(v));
      const design = parseDesign(params, catalog)!;
      expect(parseDesign(designToSearchParams(design), catalog)).toEqual(design);
    }),
    { numRuns: 300 },
  );
});

test("hostile or unknown values in the address fall back to valid choices", async () => {
  const catalog = await demoCatalog();
  const design = parseDesign(
    new URLSearchParams(
      "stone=99999&units=-4&courses=900&cap=abc&overhang=NaN&liner=lava&patio=1e9&setback=-20&unit=furlong",
    ),
    catalog,
  )!;
  expect(catalog.some((i) => i.id === design.stoneId && i.kind === "wall-unit")).toBe(true);
  expect(design.courses).toBe(12);
  expect(design.unit).toBe("in");
  expect(design.patioRadiusFt).toBe(16);
  expect(design.setbackFt).toBe(0);
  expect(design.innerOverhangIn).toBeGreaterThanOrEqual(0);
});

test("a distance typed in metres keeps its tenth of a foot, so it reads back as the same metres", async () => {
  const catalog = await demoCatalog();
  // 3 m = 9.843 ft (0.3048 m to the foot exactly, NIST SP 811), kept as 9.8 ft; 9.8 ft = 2.987 m,
  // 3.0 m to a tenth. Whole feet (10 ft = 3.048 m) would have shown the reader 3.0 then 3.0 but
  // 2.5 m (8.2 ft) would have come back as 8 ft = 2.4 m.
  const design = parseDesign(new URLSearchParams("setback=9.8&propertyLine=8.2&branches=8.24"), catalog)!;
  expect(design.setbackFt).toBe(9.8);
  expect(design.propertyLineFt).toBe(8.2);
  expect(design.branchesFt).toBe(8.2);
  expect(Math.round(design.propertyLineFt! * 0.3048 * 10) / 10).toBe(2.5);
});

test("the bowl slider offers one whole-unit ring per unit count, each bowl larger than the last", async () => {
  const catalog = await demoCatalog();
  const stone = catalog.find((i) => i.name === "Hearthline Taper")!;
  const sizes = offeredRingSizes(stone);
  for (let i = 1; i < sizes.length; i++) {
    expect(sizes[i]!.unitCount).toBe(sizes[i - 1]!.unitCount + 1);
    expect(sizes[i]!.bowlDiameterIn).toBeGreaterThan(sizes[i - 1]!.bowlDiameterIn);
  }
  // 14 units of 12/8/8 make a 36.575 in bowl (worked example, derived from the polygon formulas).
  expect(sizes.find((s) => s.unitCount === 14)?.bowlDiameterIn).toBeCloseTo(36.575, 3);
});

test("the browser's instant redraw computes the same ring and caps as the server's priced answer", async () => {
  const { planLocally } = await import("~/lib/design/design-plan");
  const { planForDesign } = await import("~/lib/design/configurator.server");
  const catalog = await demoCatalog();
  for (const query of ["", "units=18&courses=3&liner=none", "liner=firebrick&patio=9&units=16", "cap=none&units=12"]) {
    const design = parseDesign(new URLSearchParams(query), catalog)!;
    const local = planLocally(design, catalog)!;
    const { plan: server } = await planForDesign("cinder-slate", design, catalog);
    expect(local.ring).toEqual(server!.ring);
    expect(local.caps).toEqual(server!.caps);
    expect(local.patio).toEqual(server!.patio);
    expect(local.price).toBeNull();
  }
});
