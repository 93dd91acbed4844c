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

/** How a length may be typed (what parseLength reads), said once for every length field's hint and messages. */
export const LENGTH_EXAMPLES = "12 1/4, 12-1/4, 49/4, 12.25 or 311 mm";

/** Formats inches in the chosen unit: 1/16 in fractions or whole millimetres. */
export function formatLength(lengthIn: number, unit: LengthUnit): string {
  return unit === "mm" ? formatMm(lengthIn) : formatInches(lengthIn);
}

/**
 * Inches in one of each unit a length may be typed in, as exact fractions (NIST SP 811: 1 in = 25.4 mm = 127/5 mm, 1 ft
 * = 12 in).
 */
const UNIT_TO_IN: Record<string, Fraction> = {
  in: new Fraction(1),
  inch: new Fraction(1),
  inches: new Fraction(1),
  '"': new Fraction(1),
  ft: new Fraction(IN_PER_FT),
  feet: new Fraction(IN_PER_FT),
  foot: new Fraction(IN_PER_FT),
  "'": new Fraction(IN_PER_FT),
  mm: new Fraction(5, 127),
  cm: new Fraction(50, 127),
  m: new Fraction(5000, 127),
};

/** The units a bare number may stand for in a form field. */
export type TypedLengthUnit = "in" | "ft";

// A number, then an optional fraction (separated by a space or a hyphen, as tape readings are
// written: "36 9/16", "36-9/16"), or a bare fraction ("9/16", "49/4"), then an optional unit.
const LENGTH_PATTERN =
  /^(-)?\s*(?:(\d+(?:\.\d+)?|\.\d+)(?:(?:\s+|\s*-\s*)(\d+)\s*\/\s*(\d+))?|(\d+)\s*\/\s*(\d+))\s*(in|inch|inches|"|ft|feet|foot|'|mm|cm|m)?\.?$/i;

/**
 * Parses a typed length ("36 9/16", "36-9/16 in", "49/4", "930 mm", "93 cm", "3 ft") into inches,
 * exactly (fraction.js arithmetic, then one conversion to a float); null when unreadable. A number
 * with no unit is in `bareUnit` (inches unless the field is in feet).
 */
export function parseLength(text: string, bareUnit: TypedLengthUnit = "in"): number | null {
  const match = LENGTH_PATTERN.exec(text.trim());
  if (!match) return null;
  const [, minus, decimal, fracNum, fracDen, bareNum, bareDen, unitText] = match;
  let value: Fraction;
  if (decimal !== undefined) {
    value = new Fraction(decimal);
    if (fracNum !== undefined) {
      // A mixed number's fraction must be proper ("36 9/16", not "36 17/16") and follow a whole number.
      if (Number(fracDen) === 0 || Number(fracNum) >= Number(fracDen) || decimal.includes(".")) return null;
      value = value.add(new Fraction(Number(fracNum), Number(fracDen)));
    }
  } else {
    if (Number(bareDen) === 0) return null;
    value = new Fraction(Number(bareNum), Number(bareDen));
  }
  const factor = UNIT_TO_IN[(unitText ?? bareUnit).toLowerCase()];
  const lengthIn = value
    .mul(factor)
    .mul(minus ? -1 : 1)
    .valueOf();
  return Number.isFinite(lengthIn) ? lengthIn : null;
}

/**
 * A stored length in inches as a person would type it back: a mixed fraction when it falls on a
 * 1/64 in mark ("12 1/4"), otherwise a decimal to 1/10,000 in ("12.2441"), so saving the form
 * unchanged never moves the value by more than that.
 */
export function formatLengthInput(lengthIn: number): string {
  const sixtyFourths = lengthIn * 64;
  if (Math.abs(sixtyFourths - Math.round(sixtyFourths)) > 1e-9) return String(Math.round(lengthIn * 10_000) / 10_000);
  const exact = new Fraction(Math.round(sixtyFourths), 64);
  return exact.toFraction(true);
}
