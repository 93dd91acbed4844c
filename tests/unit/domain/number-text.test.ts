/*
 * The ICU-free number text against the runtime's own Intl.NumberFormat (ECMA-402, en-US, as built
 * into Node's ICU), which the pages used before: same digits, same grouping, same rounding, same sign.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { formatDollars, formatNumber } from "~/domain/number-text";
import { formatMoney, formatMoneyWhole } from "~/lib/format/money";

const intl = (value: number, min: number, max: number) =>
  new Intl.NumberFormat("en-US", { minimumFractionDigits: min, maximumFractionDigits: max }).format(value);
const intlUsd = (dollars: number, digits: number) =>
  new Intl.NumberFormat("en-US", {
    style: "currency",
    currency: "USD",
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
  }).format(dollars);

describe("formatNumber (checked against Intl.NumberFormat en-US)", () => {
  it("writes worked values as Intl does", () => {
    const cases: [number, number, number][] = [
      [0, 0, 0],
      [999, 0, 0],
      [1000, 0, 0],
      [1234567.891, 0, 2],
      [12.5, 0, 1],
      [1.005, 0, 2], // Intl rounds the shortest decimal form "1.005", not the binary 1.00499…: up
      [2.5, 0, 0], // a true half: away from zero
      [-2.5, 0, 0],
      [-0.04, 0, 1], // rounds to zero: Intl keeps the minus sign ("-0")
      [-0, 0, 0],
      [5e-324, 0, 3],
      [0.9996, 0, 3],
      [999.9996, 0, 3],
      [0.1 + 0.2, 2, 2],
      [1e20, 0, 0],
    ];
    for (const [value, min, max] of cases)
      expect(formatNumber(value, { minFractionDigits: min, maxFractionDigits: max }), `${value}`).toBe(
        intl(value, min, max),
      );
  });

  it("agrees with Intl for any finite number below 1e15 and 0–3 fraction digits", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -1e15, max: 1e15, noNaN: true }),
        fc.integer({ min: 0, max: 3 }),
        fc.integer({ min: 0, max: 3 }),
        (value, a, b) => {
          const [min, max] = a <= b ? [a, b] : [b, a];
          expect(formatNumber(value, { minFractionDigits: min, maxFractionDigits: max })).toBe(intl(value, min, max));
        },
      ),
      { numRuns: 5000 },
    );
  });

  it("agrees with Intl on lengths rounded to tenths, the way the pages feed it", () => {
    fc.assert(
      fc.property(fc.integer({ min: -1_000_000, max: 1_000_000 }), (tenths) => {
        expect(formatNumber(tenths / 10, { maxFractionDigits: 1 })).toBe(intl(tenths / 10, 0, 1));
      }),
    );
  });
});

describe("money text (checked against Intl's USD currency format)", () => {
  it("writes cents and whole dollars as Intl does, negatives included", () => {
    fc.assert(
      fc.property(fc.integer({ min: -10_000_000_000, max: 10_000_000_000 }), (cents) => {
        expect(formatMoney(cents)).toBe(intlUsd(cents / 100, 2));
        expect(formatMoneyWhole(cents)).toBe(intlUsd(Math.round(cents / 100), 0));
      }),
      { numRuns: 5000 },
    );
    expect(formatMoney(123450)).toBe("$1,234.50");
    expect(formatMoneyWhole(125049)).toBe("$1,250");
    expect(formatDollars(-12, 2)).toBe("-$12.00");
    expect(formatDollars(-0.001, 2)).toBe(intlUsd(-0.001, 2));
  });
});
