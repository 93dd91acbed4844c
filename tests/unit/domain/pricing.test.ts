import fc from "fast-check";
import { expect, test } from "vitest";
import { DEFAULT_FACTORS, type CompanyFactors, type ProfitBasis } from "~/domain/factors";
import { computePlan } from "~/domain/plan";
import { priceFactor, priceJob, roundToStep } from "~/domain/pricing";
import type { MaterialLine } from "~/domain/quantities";
import { PATIO, SUPPLY_PRICES, TYPICAL_PIT } from "./fixtures";

test("a typical 3-course, 14-unit pit with 12 cut caps and a steel ring takes 8–14 labour-hours (two-person crew, from memory)", () => {
  const { labour } = computePlan(TYPICAL_PIT);
  expect(labour.hours).toBeGreaterThanOrEqual(8);
  expect(labour.hours).toBeLessThanOrEqual(14);
  expect(labour.hours).toBeCloseTo(
    labour.tasks.reduce((sum, t) => sum + t.hours, 0),
    9,
  );
});

test("with illustrative prices the typical pit is quoted within the very rough $1,500–4,500 installed range (mid-2020s US, from memory)", () => {
  const { price } = computePlan(TYPICAL_PIT, { supplyPrices: SUPPLY_PRICES });
  expect(price).not.toBeNull();
  expect(price?.lowCents).toBeGreaterThanOrEqual(150_000);
  expect(price?.highCents).toBeLessThanOrEqual(450_000);
});

const line = (
  key: MaterialLine["key"],
  item: string,
  quantity: number,
  unit: MaterialLine["unit"] = "each",
): MaterialLine => ({ key, item, quantity, unit });
const priced = (
  item: string,
  quantity: number,
  unit: MaterialLine["unit"],
  unitPriceCents: number,
  totalCents: number,
) => ({ item, quantity, unit, unitPriceCents, totalCents });

/*
 * Three jobs priced by hand. Every amount is integer cents, rounded to the nearest cent (halves up)
 * where the breakdown shows it. Markup and margin: markup = profit ÷ cost, margin = profit ÷ price,
 * so price = cost × (1 + markup) = cost ÷ (1 − margin) (the accounting definitions; common practice,
 * no source). Sales tax rules differ by state: the company says which base it uses.
 */
test("job A, by hand: 20 % markup on cost and a $75/h labour cost rate, nothing else", () => {
  // Materials: 45 × $6.50 = $292.50; 5.1 t × $45.00 = $229.50; total $522.00.
  // Labour at cost: 10 h × $75.00 = $750.00. Job cost $1,272.00.
  // Overhead 15 % of $1,272.00 = $190.80. Cost $1,462.80.
  // Markup 20 % of $1,462.80 = $292.56. Price of the work $1,755.36 = the estimate.
  // Effective margin: 292.56 ÷ 1,755.36 = 16.666…% → 16.67 %. Billed rate: 75 × 1.15 × 1.2 = $103.50/h.
  // Range ±12 %: 175,536 × 0.88 = 154,471.68 → 154,472 → down to $1,500; × 1.12 = 196,600.32 → up to $2,000.
  const price = priceJob({
    materials: [line("wall-unit", "Wall units", 45), line("aggregate", "Base aggregate", 5.1, "ton")],
    unitPrices: { "wall-unit": 650, aggregate: 4500 },
    labourHours: 10,
    factors: DEFAULT_FACTORS,
  });
  expect(price?.breakdown).toEqual({
    materialsCents: 52_200,
    materialsTaxCents: 0,
    labourHours: 10,
    labourRateBasis: "cost",
    labourCostRateCents: 7500,
    labourBilledRateCents: 10_350,
    labourCents: 75_000,
    siteCosts: [],
    directCents: 127_200,
    overheadPct: 15,
    overheadCents: 19_080,
    costCents: 146_280,
    profitBasis: "markup",
    profitPct: 20,
    profitCents: 29_256,
    markupPct: 20,
    marginPct: 16.67,
    workPriceCents: 175_536,
    permitCents: 0,
    salesTaxBasis: "materials",
    salesTaxPct: 0,
    salesTaxCents: 0,
    totalCents: 175_536,
    lowCents: 150_000,
    highCents: 200_000,
    lines: [priced("Wall units", 45, "each", 650, 29_250), priced("Base aggregate", 5.1, "ton", 4500, 22_950)],
  });
});

const JOB_B_FACTORS: CompanyFactors = {
  ...DEFAULT_FACTORS,
  labourRateBasis: "billed",
  labourRateCentsPerHour: 9500,
  overheadPct: 10,
  profitBasis: "margin",
  profitPct: 20,
  deliveryCents: 12_000,
  equipmentCents: 8500,
  disposalCents: 6000,
  permitCents: 7500,
  salesTaxPct: 8,
  salesTaxBasis: "materials",
};

test("job B, by hand: 20 % margin of price, a $95/h billed labour rate, site costs, a permit and tax on materials", () => {
  // Materials: 42 × $4.85 = $203.70; 13 × $9.50 = $123.50; 1 × $189.00; 3.4 t × $48.00 = $163.20;
  // 4 × $8.50 = $34.00; total $713.40. Sales tax 8 % on materials: $57.072 → $57.07.
  // Price factor: overhead then margin, 1.10 ÷ (1 − 0.20) = 1.375. The billed $95/h is worked back to
  // a cost of 95 ÷ 1.375 = $69.0909…/h; 11.25 h × 6,909.0909… = 77,727.27 → $777.27.
  // Site costs: delivery $120 + equipment $85 + disposal $60 = $265. Job cost 71,340 + 5,707 + 77,727 + 26,500 =
  // $1,812.74.
  // Overhead 10 % = 18,127.4 → $181.27. Cost $1,994.01.
  // Margin 20 % of the price: profit = cost × 20/80 = 49,850.25 → $498.50. Price of the work $2,492.51.
  // Check: 498.50 ÷ 2,492.51 = 20.00 % of the price, 498.50 ÷ 1,994.01 = 25.00 % on cost.
  // Labour in the price: 777.27 × 1.375 = $1,068.75 = 11.25 h × $95 (to the cent).
  // Permit $75.00 at cost, untaxed. Estimate $2,567.51.
  // Range ±12 %: 256,751 × 0.88 = 225,940.88 → down to $2,250; × 1.12 = 287,561.12 → up to $2,900.
  const price = priceJob({
    materials: [
      line("wall-unit", "Wall units", 42),
      line("cap", "Cap blanks", 13),
      line("steel-ring", "Steel ring", 1),
      line("aggregate", "Base aggregate", 3.4, "ton"),
      line("adhesive", "Adhesive", 4, "cartridge"),
    ],
    unitPrices: { "wall-unit": 485, cap: 950, "steel-ring": 18_900, aggregate: 4800, adhesive: 850 },
    labourHours: 11.25,
    factors: JOB_B_FACTORS,
  });
  expect(price?.breakdown).toEqual({
    materialsCents: 71_340,
    materialsTaxCents: 5707,
    labourHours: 11.25,
    labourRateBasis: "billed",
    labourCostRateCents: 6909,
    labourBilledRateCents: 9500,
    labourCents: 77_727,
    siteCosts: [
      { key: "delivery", label: "Delivery", cents: 12_000 },
      { key: "equipment", label: "Equipment hire", cents: 8500 },
      { key: "disposal", label: "Disposal", cents: 6000 },
    ],
    directCents: 181_274,
    overheadPct: 10,
    overheadCents: 18_127,
    costCents: 199_401,
    profitBasis: "margin",
    profitPct: 20,
    profitCents: 49_850,
    markupPct: 25,
    marginPct: 20,
    workPriceCents: 249_251,
    permitCents: 7500,
    salesTaxBasis: "materials",
    salesTaxPct: 8,
    salesTaxCents: 0,
    totalCents: 256_751,
    lowCents: 225_000,
    highCents: 290_000,
    lines: [
      priced("Wall units", 42, "each", 485, 20_370),
      priced("Cap blanks", 13, "each", 950, 12_350),
      priced("Steel ring", 1, "each", 18_900, 18_900),
      priced("Base aggregate", 3.4, "ton", 4800, 16_320),
      priced("Adhesive", 4, "cartridge", 850, 3400),
    ],
  });
});

test("job C, by hand: 30 % markup, sales tax on the price (a half cent rounds up) and a permit passed through", () => {
  // Materials: 16 × $7.40 = $118.40; 8 × $14.20 = $113.60; 1.9 t × $45.00 = $85.50; 3 × $7.90 = $23.70;
  // 60 firebrick × $3.10 = $186.00; total $527.20. No tax on materials (the tax is on the price).
  // Labour at cost: 9.5 h × $60.00 = $570.00. Job cost $1,097.20.
  // Overhead 12 % = 13,166.4 → $131.66. Cost $1,228.86. Markup 30 % = 36,865.8 → $368.66.
  // Price of the work $1,597.52 (margin 368.66 ÷ 1,597.52 = 23.077…% → 23.08 %; markup 30.00 %).
  // Sales tax 6.25 % of $1,597.52 = 9,984.5 → $99.85 (half a cent rounds up). Permit $150.00, untaxed.
  // Estimate 159,752 + 15,000 + 9,985 = $1,847.37. Billed rate: 60 × 1.12 × 1.30 = $87.36/h.
  // Range ±10 % rounded to $100: 166,263.3 → down to $1,600; 203,210.7 → up to $2,100.
  const factors: CompanyFactors = {
    ...DEFAULT_FACTORS,
    labourRateCentsPerHour: 6000,
    overheadPct: 12,
    profitPct: 30,
    permitCents: 15_000,
    salesTaxPct: 6.25,
    salesTaxBasis: "price",
    priceSpreadPct: 10,
    priceRoundCents: 10_000,
  };
  const price = priceJob({
    materials: [
      line("wall-unit", "Wall units", 16),
      line("cap", "Cap blanks", 8),
      line("aggregate", "Base aggregate", 1.9, "ton"),
      line("adhesive", "Adhesive", 3, "cartridge"),
      line("firebrick", "Firebrick", 60),
    ],
    unitPrices: { "wall-unit": 740, cap: 1420, aggregate: 4500, adhesive: 790, firebrick: 310 },
    labourHours: 9.5,
    factors,
  });
  const b = price!.breakdown;
  expect({
    materials: b.materialsCents,
    materialsTax: b.materialsTaxCents,
    labour: b.labourCents,
    direct: b.directCents,
  }).toEqual({
    materials: 52_720,
    materialsTax: 0,
    labour: 57_000,
    direct: 109_720,
  });
  expect({ overhead: b.overheadCents, cost: b.costCents, profit: b.profitCents, work: b.workPriceCents }).toEqual({
    overhead: 13_166,
    cost: 122_886,
    profit: 36_866,
    work: 159_752,
  });
  expect({
    markup: b.markupPct,
    margin: b.marginPct,
    costRate: b.labourCostRateCents,
    billedRate: b.labourBilledRateCents,
  }).toEqual({
    markup: 30,
    margin: 23.08,
    costRate: 6000,
    billedRate: 8736,
  });
  expect({
    permit: b.permitCents,
    tax: b.salesTaxCents,
    total: b.totalCents,
    low: b.lowCents,
    high: b.highCents,
  }).toEqual({
    permit: 15_000,
    tax: 9985,
    total: 184_737,
    low: 160_000,
    high: 210_000,
  });
  expect(b.siteCosts).toEqual([]);
});

test("a 25 % markup on cost and a 20 % margin of price give the same price (margin = markup ÷ (1 + markup); accounting definitions, common practice)", () => {
  const materials = [line("wall-unit", "Wall units", 40)];
  const markup = priceJob({
    materials,
    unitPrices: { "wall-unit": 1000 },
    labourHours: 8,
    factors: { ...DEFAULT_FACTORS, profitBasis: "markup", profitPct: 25 },
  })!;
  const margin = priceJob({
    materials,
    unitPrices: { "wall-unit": 1000 },
    labourHours: 8,
    factors: { ...DEFAULT_FACTORS, profitBasis: "margin", profitPct: 20 },
  })!;
  // 40 × $10 + 8 h × $75 = $1,000; overhead 15 % → cost $1,150; + 25 % = $1,437.50; $1,150 ÷ 0.8 = $1,437.50.
  expect(markup.breakdown.totalCents).toBe(143_750);
  expect(margin.breakdown.totalCents).toBe(143_750);
  expect([margin.breakdown.markupPct, margin.breakdown.marginPct]).toEqual([25, 20]);
  expect([markup.breakdown.markupPct, markup.breakdown.marginPct]).toEqual([25, 20]);
});

test("a 22 % margin is 22 % of the price, not a 22 % markup that comes to 18 % of it", () => {
  const factors: CompanyFactors = { ...DEFAULT_FACTORS, overheadPct: 0, profitBasis: "margin", profitPct: 22 };
  const { breakdown } = priceJob({ materials: [], unitPrices: {}, labourHours: 10, factors })!;
  // Cost $750.00; price = 750 ÷ 0.78 = $961.538… → profit 21,153.85 → $211.54, 22.00 % of $961.54.
  expect(breakdown.profitCents).toBe(21_154);
  expect(breakdown.workPriceCents).toBe(96_154);
  expect(breakdown.marginPct).toBe(22);
  // The same 22 % taken as a markup: 750 × 0.22 = $165.00 of $915.00, 18.03 % of the price.
  const asMarkup = priceJob({
    materials: [],
    unitPrices: {},
    labourHours: 10,
    factors: { ...factors, profitBasis: "markup" },
  })!.breakdown;
  expect([asMarkup.profitCents, asMarkup.marginPct]).toEqual([16_500, 18.03]);
});

test("the price factor is (1 + overhead)(1 + markup), or (1 + overhead) ÷ (1 − margin); a margin of 100 % has no price", () => {
  expect(priceFactor({ overheadPct: 15, profitPct: 20, profitBasis: "markup" })).toBeCloseTo(1.38, 12);
  expect(priceFactor({ overheadPct: 10, profitPct: 20, profitBasis: "margin" })).toBeCloseTo(1.375, 12);
  expect(priceFactor({ overheadPct: 0, profitPct: 0, profitBasis: "margin" })).toBe(1);
  expect(priceFactor({ overheadPct: 0, profitPct: 100, profitBasis: "margin" })).toBeNull();
  expect(priceFactor({ overheadPct: 0, profitPct: 100, profitBasis: "markup" })).toBe(2);
  const factors: CompanyFactors = { ...DEFAULT_FACTORS, profitBasis: "margin", profitPct: 100 };
  expect(priceJob({ materials: [], unitPrices: {}, labourHours: 1, factors })).toBeNull();
});

test("a billed labour rate comes to that rate per hour in the price of the work, within the three roundings (property)", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 1000, max: 30_000 }),
      fc.double({ min: 0.25, max: 60, noNaN: true }),
      fc.double({ min: 0, max: 50, noNaN: true }),
      fc.constantFrom<ProfitBasis>("markup", "margin"),
      fc.double({ min: 0, max: 60, noNaN: true }),
      (rate, hours, overheadPct, profitBasis, profitPct) => {
        const factors: CompanyFactors = {
          ...DEFAULT_FACTORS,
          labourRateBasis: "billed",
          labourRateCentsPerHour: rate,
          overheadPct,
          profitBasis,
          profitPct,
        };
        const { breakdown } = priceJob({ materials: [], unitPrices: {}, labourHours: hours, factors })!;
        // With labour the only cost, the price of the work is the labour as billed, but for three roundings of
        // ≤ ½ cent each: labour at cost (carried through overhead ≤ 1.5 and a margin's 1 ÷ (1 − 0.6) = 2.5),
        // overhead (carried through 2.5) and profit: ½ × 1.5 × 2.5 + ½ × 2.5 + ½ = 3.625 cents at most.
        expect(Math.abs(breakdown.workPriceCents - hours * rate)).toBeLessThanOrEqual(3.625 + 1e-9);
        expect(breakdown.labourBilledRateCents).toBe(rate);
      },
    ),
  );
});

test("no price is given when any needed price is missing", () => {
  expect(computePlan(TYPICAL_PIT).price).toBeNull();
  const noCapPrice = { ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, priceCents: undefined } };
  expect(computePlan(noCapPrice, { supplyPrices: SUPPLY_PRICES }).price).toBeNull();
  expect(
    computePlan(TYPICAL_PIT, { supplyPrices: { ...SUPPLY_PRICES, adhesivePerCartridgeCents: null } }).price,
  ).toBeNull();
});

test("a patio job is priced only with the patio's own supplies priced too", () => {
  const withPatio = { ...TYPICAL_PIT, patio: PATIO };
  expect(
    computePlan(withPatio, { supplyPrices: { ...SUPPLY_PRICES, jointSandPerBagCents: undefined } }).price,
  ).toBeNull();
  expect(computePlan(withPatio, { supplyPrices: SUPPLY_PRICES }).price).not.toBeNull();
});

test("range rounding goes down for the low end and up for the high end", () => {
  expect(roundToStep(154_472, 5000, "down")).toBe(150_000);
  expect(roundToStep(196_600, 5000, "up")).toBe(200_000);
  expect(roundToStep(200_000, 5000, "up")).toBe(200_000);
  expect(roundToStep(12_345, 0, "up")).toBe(12_345);
});

test("prices are whole cents and low ≤ total ≤ high for any rates and job (property)", () => {
  fc.assert(
    fc.property(
      fc.integer({ min: 6, max: 40 }),
      fc.integer({ min: 1, max: 12 }),
      fc.record({
        labourRateCentsPerHour: fc.integer({ min: 0, max: 50_000 }),
        overheadPct: fc.double({ min: 0, max: 100, noNaN: true }),
        profitBasis: fc.constantFrom<ProfitBasis>("markup", "margin"),
        profitPct: fc.double({ min: 0, max: 90, noNaN: true }),
        labourRateBasis: fc.constantFrom("cost" as const, "billed" as const),
        salesTaxBasis: fc.constantFrom("materials" as const, "price" as const),
        salesTaxPct: fc.double({ min: 0, max: 20, noNaN: true }),
        deliveryCents: fc.integer({ min: 0, max: 500_000 }),
        permitCents: fc.integer({ min: 0, max: 500_000 }),
        priceSpreadPct: fc.double({ min: 0, max: 50, noNaN: true }),
        priceRoundCents: fc.constantFrom(1, 100, 2500, 5000, 10_000),
      }),
      fc.integer({ min: 0, max: 50_000 }),
      (unitCount, courses, factors, unitPriceCents) => {
        const plan = computePlan(
          {
            ...TYPICAL_PIT,
            ring: { unitCount },
            courses,
            wallUnit: { ...TYPICAL_PIT.wallUnit, priceCents: unitPriceCents },
          },
          { factors, supplyPrices: SUPPLY_PRICES },
        );
        const price = plan.price!;
        const { breakdown } = price;
        for (const cents of [
          price.lowCents,
          price.highCents,
          breakdown.materialsCents,
          breakdown.labourCents,
          breakdown.overheadCents,
          breakdown.profitCents,
          breakdown.salesTaxCents,
          breakdown.materialsTaxCents,
          breakdown.totalCents,
        ]) {
          expect(Number.isInteger(cents)).toBe(true);
        }
        for (const line of breakdown.lines) expect(Number.isInteger(line.totalCents)).toBe(true);
        expect(price.lowCents).toBeLessThanOrEqual(breakdown.totalCents);
        expect(breakdown.totalCents).toBeLessThanOrEqual(price.highCents);
        expect(price.lowCents % factors.priceRoundCents).toBe(0);
        expect(price.highCents % factors.priceRoundCents).toBe(0);
      },
    ),
  );
});

test("a line without a usable unit price leaves the job unpriced: missing, null, not a number or endless", () => {
  const materials = [line("wall-unit", "Wall units", 10)];
  for (const price of [undefined, null, Number.NaN, Number.POSITIVE_INFINITY]) {
    expect(
      priceJob({ materials, unitPrices: { "wall-unit": price }, labourHours: 1, factors: DEFAULT_FACTORS }),
      String(price),
    ).toBeNull();
  }
  expect(
    priceJob({ materials, unitPrices: { "wall-unit": 0 }, labourHours: 1, factors: DEFAULT_FACTORS })?.breakdown
      .materialsCents,
  ).toBe(0);
});

test("a job that costs nothing shows 0 % markup and margin, not a division by zero", () => {
  const { breakdown } = priceJob({ materials: [], unitPrices: {}, labourHours: 0, factors: DEFAULT_FACTORS })!;
  expect([breakdown.totalCents, breakdown.markupPct, breakdown.marginPct]).toEqual([0, 0, 0]);
});
