import { expect, test } from "vitest";
import { computePlan, PlanGeometryError, type Plan } from "~/domain/plan";
import { PATIO, SUPPLY_PRICES, TYPICAL_PIT } from "./fixtures";

test("a plan survives a JSON round trip unchanged (it is sent as the API's response body)", () => {
  const plan = computePlan({ ...TYPICAL_PIT, patio: PATIO, site: { setbackFt: 30 } }, { supplyPrices: SUPPLY_PRICES });
  expect(JSON.parse(JSON.stringify(plan))).toEqual(plan);
});

test("the plan carries every field of its public contract", () => {
  const plan: Plan = computePlan({ ...TYPICAL_PIT, patio: PATIO }, { supplyPrices: SUPPLY_PRICES });
  expect(Object.keys(plan)).toEqual(
    expect.arrayContaining(["ring", "caps", "liner", "patio", "materials", "labour", "price", "warnings", "cautions"]),
  );
  expect(Object.keys(plan.ring)).toEqual(
    expect.arrayContaining([
      "unitCount", "unitsPerCourse", "courses", "totalUnits", "bowlDiameterIn", "outsideDiameterIn", "limitedBy",
      "faceGapIn", "backGapIn", "closure", "backTrimPerSideIn", "wallHeightIn", "runningBondDeg",
      "tightestBowlDiameterIn", "edgeDistanceIn", "neighbours",
    ]),
  );
  expect(Object.keys(plan.caps!)).toEqual(
    expect.arrayContaining([
      "count", "blankLengthIn", "blankDepthIn", "thicknessIn", "innerWidthIn", "outerWidthIn", "innerMarkIn",
      "outerMarkIn", "offSquareDeg", "sideCutLengthIn", "innerOverhangIn", "outerOverhangIn", "innerRadiusIn",
      "outerRadiusIn", "innerSagittaIn", "outerSagittaIn", "ripToDepthIn", "offcutShare", "spares", "jointIn",
    ]),
  );
  expect(Object.keys(plan.price!)).toEqual(expect.arrayContaining(["lowCents", "highCents", "breakdown"]));
  expect(Object.keys(plan.price!.breakdown)).toEqual(
    expect.arrayContaining([
      "materialsCents", "materialsTaxCents", "labourHours", "labourRateBasis", "labourCostRateCents", "labourBilledRateCents",
      "labourCents", "siteCosts", "directCents", "overheadPct", "overheadCents", "costCents", "profitBasis", "profitPct",
      "profitCents", "markupPct", "marginPct", "workPriceCents", "permitCents", "salesTaxBasis", "salesTaxPct",
      "salesTaxCents", "totalCents", "lowCents", "highCents", "lines",
    ]),
  );
  for (const line of plan.materials) expect(Object.keys(line)).toEqual(expect.arrayContaining(["item", "quantity", "unit"]));
  expect(Object.keys(plan.labour)).toEqual(expect.arrayContaining(["hours", "tasks"]));
});

test("the worked example end to end: a 14-unit ring of 12/8/8 units with 16 × 12 caps (derived here from the formulas)", () => {
  const plan = computePlan(TYPICAL_PIT);
  expect(plan.ring.bowlDiameterIn).toBeCloseTo(36.575, 3);
  expect(plan.ring.wallHeightIn).toBe(14.5);
  expect(plan.caps?.count).toBe(12);
  expect(plan.caps?.jointIn).toBe(3 / 16);
  expect(plan.liner).toMatchObject({ kind: "steel-ring", fits: true });
});

test("a pit without caps is as tall as its courses and orders no caps", () => {
  const plan = computePlan({ ...TYPICAL_PIT, cap: null });
  expect(plan.caps).toBeNull();
  expect(plan.ring.wallHeightIn).toBe(12);
  expect(plan.materials.some((m) => m.key === "cap")).toBe(false);
});

test("no liner means liner null and no liner on the order", () => {
  const plan = computePlan({ ...TYPICAL_PIT, liner: { kind: "none" } });
  expect(plan.liner).toBeNull();
  expect(plan.materials.some((m) => m.key === "steel-ring" || m.key === "firebrick")).toBe(false);
  const unset = computePlan({ ...TYPICAL_PIT, liner: undefined });
  expect(unset.liner).toBeNull();
});

test("a firebrick liner lines the wall below the caps", () => {
  const plan = computePlan({ ...TYPICAL_PIT, liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5, priceCents: 300 } });
  expect(plan.liner).toMatchObject({ kind: "firebrick", bricksPerRow: 10, rows: 3, totalBricks: 30 });
  expect(plan.materials.find((m) => m.key === "firebrick")?.quantity).toBe(32);
});

test("the site setback and the company's required setback drive the setback cautions", () => {
  const close = computePlan({ ...TYPICAL_PIT, site: { setbackFt: 20 } });
  expect(close.cautions.map((c) => c.code)).toContain("setback-too-close");
  const allowed = computePlan({ ...TYPICAL_PIT, site: { setbackFt: 20 } }, { factors: { requiredSetbackFt: 15 } });
  expect(allowed.cautions.map((c) => c.code)).not.toContain("setback-too-close");
});

test("geometry that cannot be built throws PlanGeometryError naming the field", () => {
  const cases: [Parameters<typeof computePlan>[0], string][] = [
    [{ ...TYPICAL_PIT, ring: { unitCount: 2 } }, "ring.unitCount"],
    [{ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, depthIn: 5 } }, "cap.depthIn"],
    [{ ...TYPICAL_PIT, patio: { ...PATIO, outsideRadiusIn: 30 } }, "patio.outsideRadiusIn"],
    [{ ...TYPICAL_PIT, liner: { kind: "steel-ring", outsideDiameterIn: 0, heightIn: 10 } }, "liner.outsideDiameterIn"],
    [{ ...TYPICAL_PIT, site: { setbackFt: -1 } }, "site.setbackFt"],
  ];
  for (const [input, path] of cases) {
    let caught: unknown;
    try {
      computePlan(input);
    } catch (error) {
      caught = error;
    }
    expect(caught, path).toBeInstanceOf(PlanGeometryError);
    expect((caught as PlanGeometryError).path).toBe(path);
    expect((caught as PlanGeometryError).message.length).toBeGreaterThan(10);
  }
});

test("the same input always gives the same plan (pure: no clock, no randomness)", () => {
  const input = { ...TYPICAL_PIT, patio: PATIO };
  expect(computePlan(input, { supplyPrices: SUPPLY_PRICES })).toEqual(computePlan(input, { supplyPrices: SUPPLY_PRICES }));
});
