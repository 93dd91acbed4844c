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
      "unitCount",
      "unitsPerCourse",
      "courses",
      "totalUnits",
      "bowlDiameterIn",
      "outsideDiameterIn",
      "limitedBy",
      "faceGapIn",
      "backGapIn",
      "closure",
      "backTrimPerSideIn",
      "wallHeightIn",
      "runningBondDeg",
      "tightestBowlDiameterIn",
      "edgeDistanceIn",
      "neighbours",
    ]),
  );
  expect(Object.keys(plan.caps!)).toEqual(
    expect.arrayContaining([
      "count",
      "blankLengthIn",
      "blankDepthIn",
      "thicknessIn",
      "innerWidthIn",
      "outerWidthIn",
      "innerMarkIn",
      "outerMarkIn",
      "offSquareDeg",
      "sideCutLengthIn",
      "innerOverhangIn",
      "outerOverhangIn",
      "innerRadiusIn",
      "outerRadiusIn",
      "innerSagittaIn",
      "outerSagittaIn",
      "ripToDepthIn",
      "offcutShare",
      "spares",
      "jointIn",
    ]),
  );
  expect(Object.keys(plan.price!)).toEqual(expect.arrayContaining(["lowCents", "highCents", "breakdown"]));
  expect(Object.keys(plan.price!.breakdown)).toEqual(
    expect.arrayContaining([
      "materialsCents",
      "materialsTaxCents",
      "labourHours",
      "labourRateBasis",
      "labourCostRateCents",
      "labourBilledRateCents",
      "labourCents",
      "siteCosts",
      "directCents",
      "overheadPct",
      "overheadCents",
      "costCents",
      "profitBasis",
      "profitPct",
      "profitCents",
      "markupPct",
      "marginPct",
      "workPriceCents",
      "permitCents",
      "salesTaxBasis",
      "salesTaxPct",
      "salesTaxCents",
      "totalCents",
      "lowCents",
      "highCents",
      "lines",
    ]),
  );
  for (const line of plan.materials)
    expect(Object.keys(line)).toEqual(expect.arrayContaining(["item", "quantity", "unit"]));
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
  // A bowl left unlined is told to line it, not to keep a liner it does not have.
  const lineTheBowl = (plan: Plan) => plan.cautions.find((c) => c.code === "line-the-bowl")?.message;
  expect(lineTheBowl(unset)).toMatch(/^This bowl has no liner\./);
  expect(lineTheBowl(plan)).toMatch(/^This bowl has no liner\./);
  expect(lineTheBowl(computePlan(TYPICAL_PIT))).toMatch(/^Keep the liner in place/);
});

test("a sundry whose price is not a number counts as unpriced: it is named and left out, and the job is still priced", () => {
  // The steel ring's gravel fill is a sundry (bags of pea gravel); the fixture's supply prices leave it out.
  const notANumber = computePlan(TYPICAL_PIT, { supplyPrices: { ...SUPPLY_PRICES, fillPerBagCents: Number.NaN } });
  expect(notANumber.unpricedItems).toEqual(["Pea gravel"]);
  expect(notANumber.price).not.toBeNull();
  // The same price as leaving the fill unpriced; a real price puts it on the bill.
  expect(notANumber.price).toEqual(computePlan(TYPICAL_PIT, { supplyPrices: SUPPLY_PRICES }).price);
  const priced = computePlan(TYPICAL_PIT, { supplyPrices: { ...SUPPLY_PRICES, fillPerBagCents: 600 } });
  expect(priced.unpricedItems).toEqual([]);
  expect(priced.price!.breakdown.materialsCents).toBeGreaterThan(notANumber.price!.breakdown.materialsCents);
});

test("a firebrick liner lines the wall below the caps", () => {
  const plan = computePlan({
    ...TYPICAL_PIT,
    liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5, priceCents: 300 },
  });
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
  expect(computePlan(input, { supplyPrices: SUPPLY_PRICES })).toEqual(
    computePlan(input, { supplyPrices: SUPPLY_PRICES }),
  );
});

test("every liner size and site distance is checked by name: lengths above 0 in, distances of 0 ft or more", () => {
  const refused = (input: Parameters<typeof computePlan>[0]) => {
    try {
      computePlan(input);
    } catch (error) {
      if (error instanceof PlanGeometryError) return [error.path, error.message];
      throw error;
    }
    return null;
  };
  const size = "This size must be a length above 0 in.";
  expect(
    refused({ ...TYPICAL_PIT, liner: { kind: "steel-ring", outsideDiameterIn: 35, heightIn: Number.NaN } }),
  ).toEqual(["liner.heightIn", size]);
  const brick = { kind: "firebrick" as const, lengthIn: 9, widthIn: 4.5, heightIn: 2.5 };
  expect(refused({ ...TYPICAL_PIT, liner: { ...brick, lengthIn: 0 } })).toEqual(["liner.lengthIn", size]);
  expect(refused({ ...TYPICAL_PIT, liner: { ...brick, widthIn: -1 } })).toEqual(["liner.widthIn", size]);
  expect(refused({ ...TYPICAL_PIT, liner: { ...brick, heightIn: Infinity } })).toEqual(["liner.heightIn", size]);
  expect(refused({ ...TYPICAL_PIT, site: { setbackFt: -1 } })).toEqual([
    "site.setbackFt",
    "The setback must be a distance of 0 ft or more.",
  ]);
  expect(refused({ ...TYPICAL_PIT, site: { propertyLineFt: -0.5 } })).toEqual([
    "site.propertyLineFt",
    "The distance to the property line must be a distance of 0 ft or more.",
  ]);
  expect(refused({ ...TYPICAL_PIT, site: { branchesFt: Number.NaN } })).toEqual([
    "site.branchesFt",
    "The distance to overhanging branches must be a distance of 0 ft or more.",
  ]);
  expect(refused({ ...TYPICAL_PIT, site: { setbackFt: 0, propertyLineFt: 0, branchesFt: 0 } })).toBeNull();
});

test("catalog names carry through to the order", () => {
  const plan = computePlan({
    ...TYPICAL_PIT,
    wallUnit: { ...TYPICAL_PIT.wallUnit, name: "Taper block" },
    cap: { ...TYPICAL_PIT.cap!, name: "Cap 16" },
    liner: { kind: "steel-ring", outsideDiameterIn: 35, heightIn: 10, name: "Ring 35" },
    patio: { ...PATIO, border: { ...PATIO.border, name: "Edge 6×12" }, paver: { ...PATIO.paver, name: "Paver 4×8" } },
  } as Parameters<typeof computePlan>[0]);
  const item = (key: string) => plan.materials.find((m) => m.key === key)?.item;
  expect([item("wall-unit"), item("cap"), item("steel-ring"), item("border-unit"), item("paver")]).toEqual([
    "Taper block",
    "Cap 16",
    "Ring 35",
    "Edge 6×12",
    "Paver 4×8",
  ]);
  const bricks = computePlan({
    ...TYPICAL_PIT,
    liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5, name: "Straights" },
  } as Parameters<typeof computePlan>[0]);
  expect(bricks.materials.find((m) => m.key === "firebrick")?.item).toBe("Straights");
});

test("without caps the lining may reach the top of the block: 3 courses of 4 in line 12 in, two whole rows of 4 9/16 in and a 12 − 9.125 − 1/16 = 2 13/16 in rip; with caps 1/8 in less (common practice, no source)", () => {
  const bare = computePlan({
    ...TYPICAL_PIT,
    cap: null,
    liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5 },
  });
  expect(bare.liner).toMatchObject({ kind: "firebrick", linedHeightIn: 12, fullRows: 2, ripHeightIn: 2.8125 });
  const capped = computePlan({
    ...TYPICAL_PIT,
    liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5 },
  });
  expect(capped.liner).toMatchObject({ kind: "firebrick", linedHeightIn: 11.875, fullRows: 2, ripHeightIn: 2.6875 });
});

test("the plan hands the company's limits and the job's own figures to the cautions and warnings", () => {
  // 14 in blanks reach 4 in out at the middle (14 − 8 − 2): over the default 3 in, within a company's 5 in.
  const deep = { ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, depthIn: 14 } };
  expect(computePlan(deep).warnings.map((w) => w.code)).toContain("cap-overhang-outside-large");
  expect(computePlan(deep, { factors: { capMaxOuterOverhangIn: 4 } }).warnings.map((w) => w.code)).toContain(
    "cap-overhang-outside-large",
  );
  expect(computePlan(deep, { factors: { capMaxOuterOverhangIn: 5 } }).warnings.map((w) => w.code)).not.toContain(
    "cap-overhang-outside-large",
  );
  const caution = (plan: ReturnType<typeof computePlan>, code: string) =>
    plan.cautions.find((c) => c.code === code)?.message ?? "";
  const plan = computePlan(
    { ...TYPICAL_PIT, site: { setbackFt: 40, propertyLineFt: 4, branchesFt: 6 } },
    { factors: { requiredPropertyLineFt: 5, requiredBranchClearanceFt: 8 } },
  );
  expect(plan.cautions.map((c) => c.code)).toEqual(
    expect.arrayContaining(["property-line-too-close", "branches-too-close"]),
  );
  expect(caution(plan, "setback")).toMatch(/, 5 ft from the property line and 8 ft from overhanging branches/);
  // Job A's weights (26.30 lb units, 39.44 lb blanks at 142 lb/ft³) and arced caps to cut by hand.
  expect(caution(plan, "heavy-lifting")).toMatch(
    /^Each wall unit weighs about 26 lb and each cap blank about 39 lb \(at about 142 lb\/ft³/,
  );
  expect(caution(plan, "wet-cutting")).toMatch(/respirator/);
  expect(caution(computePlan({ ...TYPICAL_PIT, cap: null }), "wet-cutting")).not.toMatch(/respirator/);
  // The fire's opening is the 35 in ring's: under 3 ft, no recreational-fire caution (IFC §202).
  expect(plan.fireOpeningIn).toBe(35);
});

test("a custom cap joint is used: 1/4 in joints take j/cos 15° = 0.259 in off every 12-cap edge (regular-polygon chord)", () => {
  const plan = computePlan({ ...TYPICAL_PIT, jointIn: 0.25 });
  expect(plan.caps?.jointIn).toBe(0.25);
  // c2 = 2 × 28.2877 × tan 15° − 0.25 / cos 15° = 15.159 − 0.259 = 14.900 in.
  expect(plan.caps?.outerWidthIn).toBeCloseTo(14.9, 2);
});

test("a refused plan's error says what it is by name, so logs and the API can tell it from a crash", () => {
  const error = new PlanGeometryError("ring.unitCount", "Units per course must be a whole number from 3 to 200.");
  expect(error.name).toBe("PlanGeometryError");
  expect(String(error)).toBe("PlanGeometryError: Units per course must be a whole number from 3 to 200.");
  expect(error).toBeInstanceOf(Error);
});
