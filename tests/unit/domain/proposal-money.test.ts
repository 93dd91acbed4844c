import { expect, test } from "vitest";
import {
  basePriceCents,
  changeOrderDeltaCents,
  chooseAddOns,
  depositCents,
  jobTotals,
  proposalTotalCents,
} from "~/domain/proposal-money";

// A proposal's money in integer cents, worked by hand. Rounding half up to the cent is the usual
// commercial rule (common practice, no source).
const OFFERED = [
  { key: "screen", label: "Spark screen", cents: 18_900 },
  { key: "seat", label: "Seat wall", cents: 240_000 },
  { key: "lights", label: "Step lights", cents: 45_050 },
];

test("the base price is the fixed price plus each allowance: $4,200 + $350 + $500 = $5,050", () => {
  expect(basePriceCents(420_000, [{ cents: 35_000 }, { cents: 50_000 }])).toBe(505_000);
  expect(basePriceCents(420_000, [])).toBe(420_000);
});

test("add-ons come back in the proposal's order whatever order they were ticked in, and add to the total: $5,050 + $189 + $450.50 = $5,689.50", () => {
  const chosen = chooseAddOns(OFFERED, ["lights", "screen"]);
  expect(chosen.map((a) => a.key)).toEqual(["screen", "lights"]);
  expect(proposalTotalCents(505_000, chosen)).toBe(568_950);
  expect(chooseAddOns(OFFERED, [])).toEqual([]);
});

test("an add-on the proposal does not offer is refused by name", () => {
  expect(() => chooseAddOns(OFFERED, ["screen", "hot-tub", "pool"])).toThrow(
    new RangeError("Not an add-on of this proposal: hot-tub, pool"),
  );
});

test("a 30 % deposit rounds half up to the cent: 30 % of $123.45 is $37.035 → $37.04; of $5,689.50 it is $1,706.85", () => {
  expect(depositCents({ kind: "percent", basisPoints: 3000 }, 12_345)).toBe(3704);
  expect(depositCents({ kind: "percent", basisPoints: 3000 }, 568_950)).toBe(170_685);
  // 25 % of $0.01 is a quarter cent: rounds down to nothing.
  expect(depositCents({ kind: "percent", basisPoints: 2500 }, 1)).toBe(0);
});

test("a fixed deposit is that sum, never more than the total and never below nothing", () => {
  expect(depositCents({ kind: "fixed", cents: 100_000 }, 568_950)).toBe(100_000);
  expect(depositCents({ kind: "fixed", cents: 100_000 }, 60_000)).toBe(60_000);
  expect(depositCents({ kind: "fixed", cents: -500 }, 60_000)).toBe(0);
});

test("change orders move the contract and the balance, never the deposit: $5,689.50 signed, $1,706.85 down, +$450 and −$189 → $5,950.50, balance $4,243.65", () => {
  expect(changeOrderDeltaCents(568_950, 613_950)).toBe(45_000);
  expect(changeOrderDeltaCents(613_950, 595_050)).toBe(-18_900);
  expect(jobTotals({ totalCents: 568_950, depositCents: 170_685 }, [45_000, -18_900])).toEqual({
    contractCents: 595_050,
    depositCents: 170_685,
    balanceCents: 424_365,
  });
  expect(jobTotals({ totalCents: 100_000, depositCents: 30_000 }, [-80_000])).toEqual({
    contractCents: 20_000,
    depositCents: 30_000,
    balanceCents: -10_000,
  });
});
