/**
 * Numbers written the en-US way ("12,345.5") without the browser's Intl.NumberFormat. The first
 * Intl number format a page builds loads the locale's data: 50–130 ms of one task on a fast desktop
 * here, four times that on a phone, right while the configurator starts. These are all the forms the
 * pages need, written exactly as Intl writes them: the number's shortest decimal form rounded half
 * away from zero (1.005 → "1.01"), and a minus sign on any negative number, even one that rounds to 0.
 */
export type NumberTextOptions = { minFractionDigits?: number; maxFractionDigits?: number };

const DECIMAL = /^(\d+)(?:\.(\d+))?(?:e([+-]\d+))?$/;

/** The digits of `abs` (≥ 0) rounded to `max` fraction digits, split at the decimal point. */
function roundedParts(abs: number, max: number): { whole: string; fraction: string } {
  const [, intPart = "0", fracPart = "", exponent = "0"] = DECIMAL.exec(String(abs)) ?? [];
  let digits = intPart + fracPart;
  let point = intPart.length + Number(exponent);
  if (point < 0) {
    digits = "0".repeat(-point) + digits;
    point = 0;
  }
  digits = digits.padEnd(point + max, "0");
  const keep = point + max;
  if (digits.length > keep) {
    const roundsUp = digits[keep]! >= "5";
    digits = digits.slice(0, keep);
    if (roundsUp) {
      const next = (BigInt(digits || "0") + 1n).toString().padStart(keep, "0");
      if (next.length > keep) point += 1;
      digits = next;
    }
  }
  return { whole: digits.slice(0, point).replace(/^0+(?=\d)/, "") || "0", fraction: digits.slice(point) };
}

/** `value` with thousands separators and between min and max fraction digits (defaults 0 and 0). */
export function formatNumber(value: number, { minFractionDigits = 0, maxFractionDigits = 0 }: NumberTextOptions = {}) {
  if (Number.isNaN(value)) return "NaN";
  const sign = value < 0 || Object.is(value, -0) ? "-" : "";
  if (!Number.isFinite(value)) return `${sign}∞`;
  const max = Math.max(minFractionDigits, maxFractionDigits);
  const { whole, fraction } = roundedParts(Math.abs(value), max);
  let shown = fraction.replace(/0+$/, "");
  if (shown.length < minFractionDigits) shown = shown.padEnd(minFractionDigits, "0");
  return `${sign}${whole.replace(/\B(?=(\d{3})+$)/g, ",")}${shown ? `.${shown}` : ""}`;
}

/** Dollars as "$1,234.50" (two digits) or "$1,235" (none); a negative amount as "-$12.00", as Intl writes it. */
export function formatDollars(dollars: number, fractionDigits: 0 | 2): string {
  const text = formatNumber(dollars, { minFractionDigits: fractionDigits, maxFractionDigits: fractionDigits });
  return text.startsWith("-") ? `-$${text.slice(1)}` : `$${text}`;
}
