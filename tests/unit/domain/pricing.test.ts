import fc from "fast-check";
import { expect, test } from "vitest";
import { DEFAULT_FACTORS } from "~/domain/factors";
import { computePlan } from "~/domain/plan";
import { priceJob, roundToStep } from "~/domain/pricing";
import type { MaterialLine } from "~/domain/quantities";
import { PATIO, SUPPLY_PRICES, TYPICAL_PIT } from "./fixtures";

test("a typical 3-course, 14-unit pit with 12 cut caps and a steel ring takes 8–14 labour-hours (two-person crew, from memory)", () => {
  const { labour } = computePlan(TYPICAL_PIT);
  expect(labour.hours).toBeGreaterThanOrEqual(8);
  expect(labour.hours).toBeLessThanOrEqual(14);
  expect(labour.hours).toBeCloseTo(labour.tasks.reduce((sum, t) => sum + t.hours, 0), 9);
});

test("with illustrative prices the typical pit is quoted within the very rough $1,500–4,500 installed range (mid-2020s US, from memory)", () => {
  const { price } = computePlan(TYPICAL_PIT, { supplyPrices: SUPPLY_PRICES });
  expect(price).not.toBeNull();
  expect(price?.lowCents).toBeGreaterThanOrEqual(150_000);
  expect(price?.highCents).toBeLessThanOrEqual(450_000);
});

test("every cap takes two side cuts; a rip adds one more (derived here from the cap layout)", () => {
  const plain = computePlan(TYPICAL_PIT);
  expect(plain.labour.sawCuts).toBe(24);
  const ripped = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, outerOverhangIn: 1 } });
  // Ripped to 11 in deep (a2 = 27.2875), 11 caps are 15.829 in outside, leaving marks of 0.085 in,
  // under the 1/4 in kept from a corner, so 12 are the fewest (14.429 in). 14, the wall's count,
  // wastes 1 − (7.243 + 12.264)/2 × 11 / (16 × 12) = 44.1 % against 34.2 % for 12: 9.9 points more,
  // within the 10 allowed (trapezoid areas worked here), so the caps match the wall's 14 units.
  expect(ripped.caps?.fewestCount).toBe(12);
  expect(ripped.caps?.count).toBe(14);
  expect(ripped.labour.sawCuts).toBe(3 * 14);
});

test("closure units take two cuts each and back-trimmed units two more each (derived here from the ring layout)", () => {
  const exact = computePlan({ ...TYPICAL_PIT, cap: null, ring: { bowlDiameterIn: 30, fit: "exact" } });
  const { closure, unitCount, courses } = exact.ring;
  expect(exact.ring.backTrimPerSideIn).toBeGreaterThan(0);
  expect(exact.labour.sawCuts).toBe(2 * (closure?.countPerCourse ?? 0) * courses + 2 * unitCount * courses);
});

test("the price adds overhead on materials and labour, then margin on top, in whole cents, and rounds the range out to $50", () => {
  const materials: MaterialLine[] = [
    { key: "wall-unit", item: "Wall units", quantity: 45, unit: "each" },
    { key: "aggregate", item: "Base aggregate", quantity: 5.1, unit: "ton" },
  ];
  const price = priceJob({
    materials,
    unitPrices: { "wall-unit": 650, aggregate: 4500 },
    labourHours: 10,
    factors: DEFAULT_FACTORS,
  });
  expect(price?.breakdown).toEqual({
    materialsCents: 29_250 + 22_950,
    labourHours: 10,
    labourCents: 75_000,
    overheadCents: 19_080, // 15 % of 127,200
    marginCents: 29_256, // 20 % of 146,280
    totalCents: 175_536,
    lowCents: 150_000, // 175,536 × 0.88 = 154,472 → down to $1,500
    highCents: 200_000, // 175,536 × 1.12 = 196,600 → up to $2,000
    lines: [
      { item: "Wall units", quantity: 45, unit: "each", unitPriceCents: 650, totalCents: 29_250 },
      { item: "Base aggregate", quantity: 5.1, unit: "ton", unitPriceCents: 4500, totalCents: 22_950 },
    ],
  });
});

test("no price is given when any needed price is missing", () => {
  expect(computePlan(TYPICAL_PIT).price).toBeNull();
  const noCapPrice = { ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, priceCents: undefined } };
  expect(computePlan(noCapPrice, { supplyPrices: SUPPLY_PRICES }).price).toBeNull();
  expect(computePlan(TYPICAL_PIT, { supplyPrices: { ...SUPPLY_PRICES, adhesivePerCartridgeCents: null } }).price).toBeNull();
});

test("a patio job is priced only with the patio's own supplies priced too", () => {
  const withPatio = { ...TYPICAL_PIT, patio: PATIO };
  expect(computePlan(withPatio, { supplyPrices: { ...SUPPLY_PRICES, jointSandPerBagCents: undefined } }).price).toBeNull();
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
        marginPct: fc.double({ min: 0, max: 100, noNaN: true }),
        priceSpreadPct: fc.double({ min: 0, max: 50, noNaN: true }),
        priceRoundCents: fc.constantFrom(1, 100, 2500, 5000, 10_000),
      }),
      fc.integer({ min: 0, max: 50_000 }),
      (unitCount, courses, factors, unitPriceCents) => {
        const plan = computePlan(
          { ...TYPICAL_PIT, ring: { unitCount }, courses, wallUnit: { ...TYPICAL_PIT.wallUnit, priceCents: unitPriceCents } },
          { factors, supplyPrices: SUPPLY_PRICES },
        );
        const price = plan.price!;
        const { breakdown } = price;
        for (const cents of [price.lowCents, price.highCents, breakdown.materialsCents, breakdown.labourCents, breakdown.overheadCents, breakdown.marginCents, breakdown.totalCents]) {
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
