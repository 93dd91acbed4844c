import Fraction from "fraction.js";
import { formatNumber } from "~/domain/number-text";
import { formatMm, type LengthUnit } from "~/domain/units";

/*
 * The engine writes its advice in inches and feet (the trade's own units in the US). When someone
 * has chosen millimetres, every length in those sentences is said again in metric here, at display
 * time, so the engine keeps one wording and the page follows the chosen unit.
 */

// A quantity as the engine writes it: "36 9/16", "5/8", "2.5" or "25".
const QUANTITY = String.raw`(?:\d+ \d+/\d+|\d+/\d+|\d+(?:\.\d+)?)`;
const RANGE_OR_ONE = new RegExp(
  String.raw`(${QUANTITY})(?:( to | or |–| – )(${QUANTITY}))? (in|ft)(²)?(?![A-Za-z])`,
  "g",
);

export const FT_TO_M = 0.3048;
const FT2_TO_M2 = FT_TO_M * FT_TO_M;

function parseQuantity(text: string): number {
  return text.split(" ").reduce((sum, part) => sum + new Fraction(part).valueOf(), 0);
}

function metres(value: number, digits = 1): string {
  return formatNumber(Math.round(value * 10 ** digits) / 10 ** digits, { maxFractionDigits: digits });
}

function sayInMetric(value: number, unit: "in" | "ft", isArea: boolean): { number: string; unit: string } {
  if (isArea) return { number: metres(value * FT2_TO_M2), unit: "m²" };
  if (unit === "ft") return { number: metres(value * FT_TO_M), unit: "m" };
  return { number: formatMm(value).replace(" mm", ""), unit: "mm" };
}

/** A sentence with inch and foot lengths (and ft² areas) said in the chosen unit; unchanged for inches. */
export function speakLengths(text: string, unit: LengthUnit): string {
  if (unit === "in") return text;
  return text.replace(
    RANGE_OR_ONE,
    (
      _match,
      first: string,
      joiner: string | undefined,
      second: string | undefined,
      from: "in" | "ft",
      squared: string | undefined,
    ) => {
      const a = sayInMetric(parseQuantity(first), from, Boolean(squared));
      if (!second) return `${a.number} ${a.unit}`;
      const b = sayInMetric(parseQuantity(second), from, Boolean(squared));
      return `${a.number}${joiner}${b.number} ${b.unit}`;
    },
  );
}

/** An area given in square feet, in the chosen unit: "57 ft²" or "5.3 m²". */
export function formatAreaFt2(areaFt2: number, unit: LengthUnit): string {
  return unit === "mm" ? `${metres(areaFt2 * FT2_TO_M2)} m²` : `${Math.round(areaFt2)} ft²`;
}

/**
 * A design summary kept in inches (the stored record the crew reads), said in the homeowner's
 * chosen unit: the same lines on the sent page, in the e-mail and on /my.
 */
export function summaryInUnit<T extends { label: string; value: string }>(lines: readonly T[], unit: LengthUnit): T[] {
  return lines.map((line) => ({ ...line, value: speakLengths(line.value, unit) }));
}
