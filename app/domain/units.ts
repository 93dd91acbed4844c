/**
 * Length units for the estimating engine. The engine works in inches throughout; millimetres
 * only appear at the edges (display and parsing). 1 in = 25.4 mm exactly (NIST SP 811).
 */
import Fraction from "fraction.js";

/** Millimetres per inch, exact by definition (NIST SP 811, appendix B). */
export const IN_TO_MM = 25.4;

/** Inches per foot, exact (NIST SP 811). */
export const IN_PER_FT = 12;

export type LengthUnit = "in" | "mm";

/** Converts inches to millimetres (exact factor, no rounding). */
export function inToMm(lengthIn: number): number {
  return lengthIn * IN_TO_MM;
}

/** Converts millimetres to inches (exact factor, no rounding). */
export function mmToIn(lengthMm: number): number {
  return lengthMm / IN_TO_MM;
}

/** Formats inches as a mixed fraction rounded to the nearest 1/16 in, e.g. "36 9/16 in". */
export function formatInches(lengthIn: number): string {
  // Tape measures in the trade read to 1/16 in; fraction.js reduces 10/16 to 5/8 exactly.
  const sixteenths = Math.round(Math.abs(lengthIn) * 16);
  if (sixteenths === 0) return "0 in";
  const sign = lengthIn < 0 ? "-" : "";
  const whole = Math.floor(sixteenths / 16);
  const rest = new Fraction(sixteenths % 16, 16);
  if (rest.n === 0n) return `${sign}${whole} in`;
  const fraction = `${rest.n}/${rest.d}`;
  return whole === 0 ? `${sign}${fraction} in` : `${sign}${whole} ${fraction} in`;
}

/** Formats inches as whole millimetres, e.g. 36.575 in → "929 mm" (rounded half away from zero). */
export function formatMm(lengthIn: number): string {
  const mm = Math.round(Math.abs(inToMm(lengthIn)));
  return mm === 0 ? "0 mm" : `${lengthIn < 0 ? "-" : ""}${mm} mm`;
}

/** Formats inches in the chosen unit: 1/16 in fractions or whole millimetres. */
export function formatLength(lengthIn: number, unit: LengthUnit): string {
  return unit === "mm" ? formatMm(lengthIn) : formatInches(lengthIn);
}

const UNIT_TO_IN: Record<string, number> = {
  "": 1,
  in: 1,
  inch: 1,
  inches: 1,
  '"': 1,
  ft: IN_PER_FT,
  "'": IN_PER_FT,
  mm: 1 / IN_TO_MM,
  cm: 10 / IN_TO_MM,
  m: 1000 / IN_TO_MM,
};

// A number, then an optional fraction (separated by a space or a hyphen, as tape readings are
// written: "36 9/16", "36-9/16"), or a bare fraction ("9/16"), then an optional unit.
const LENGTH_PATTERN =
  /^(-)?\s*(?:(\d+(?:\.\d+)?|\.\d+)(?:(?:\s+|\s*-\s*)(\d+)\s*\/\s*(\d+))?|(\d+)\s*\/\s*(\d+))\s*(in|inch|inches|"|ft|'|mm|cm|m)?\.?$/i;

/** Parses a typed length ("36 9/16", "36-9/16 in", "930 mm", "93 cm") into inches; null when unreadable. */
export function parseLength(text: string): number | null {
  const match = LENGTH_PATTERN.exec(text.trim());
  if (!match) return null;
  const [, minus, decimal, fracNum, fracDen, bareNum, bareDen, unitText] = match;
  let value: number;
  if (decimal !== undefined) {
    value = Number(decimal);
    if (fracNum !== undefined) {
      const den = Number(fracDen);
      // A mixed number's fraction must be proper ("36 9/16", not "36 17/16") and follow a whole number.
      if (den === 0 || Number(fracNum) >= den || decimal.includes(".")) return null;
      value += Number(fracNum) / den;
    }
  } else {
    const den = Number(bareDen);
    if (den === 0) return null;
    value = Number(bareNum) / den;
  }
  const factor = UNIT_TO_IN[(unitText ?? "").toLowerCase()];
  const lengthIn = (minus ? -1 : 1) * value * factor;
  return Number.isFinite(lengthIn) ? lengthIn : null;
}
