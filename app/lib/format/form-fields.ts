import { z } from "zod";
import { formatLengthInput, formatMm, LENGTH_EXAMPLES, parseLength, type TypedLengthUnit } from "~/domain/units";

/** Field name → its first message, for showing each error beside its field. */
export function fieldErrors(error: z.ZodError, fallbackKey = "form"): Record<string, string> {
  const errors: Record<string, string> = {};
  for (const issue of error.issues) errors[String(issue.path[0] ?? fallbackKey)] ??= issue.message;
  return errors;
}

/**
 * A number typed into a form field (a string), checked against a range; every message names the
 * field and the allowed range, e.g. "Depth must be between 2 and 24 in."
 */
export function formNumber(label: string, min: number, max: number, unit = "") {
  const suffix = unit ? ` ${unit}` : "";
  const range = `${label} must be between ${min} and ${max}${suffix}.`;
  return z
    .string({ error: `Enter the ${label.toLowerCase()}.` })
    .trim()
    .min(1, `Enter the ${label.toLowerCase()}.`)
    .transform((s, ctx) => {
      const n = Number(s);
      if (!Number.isFinite(n)) {
        ctx.addIssue({ code: "custom", message: `${label} must be a number.` });
        return z.NEVER;
      }
      return n;
    })
    .pipe(z.number().min(min, range).max(max, range));
}

// Said once for every length field's hint and messages; kept beside the parser, out of this zod module.
export { LENGTH_EXAMPLES };

/**
 * A length typed into a form field: a tape reading in inches ("12 1/4", "12-1/4", "49/4", "12.25"),
 * or with its unit ("311 mm", "31 cm", "1 ft"); a bare number is in `unit`. Checked against the range
 * (given in `unit`), returned in `unit`. Every message names the field and what is allowed.
 */
export function formLength(label: string, min: number, max: number, unit: TypedLengthUnit = "in") {
  const toIn = unit === "ft" ? 12 : 1;
  const metres = (n: number) => String(Math.round(n * 0.3048 * 10) / 10); // 1 ft = 0.3048 m exactly (NIST SP 811)
  const metric =
    unit === "ft" ? `${metres(min)}–${metres(max)} m` : `${formatMm(min).replace(" mm", "")}–${formatMm(max)}`;
  const show = (n: number) => (unit === "in" ? formatLengthInput(n) : String(n));
  const range = `${label} must be between ${show(min)} and ${show(max)} ${unit} (${metric}).`;
  return (
    z
      .string({ error: `Enter the ${label.toLowerCase()}.` })
      .trim()
      .min(1, `Enter the ${label.toLowerCase()}.`)
      .transform((s, ctx) => {
        const lengthIn = parseLength(s, unit);
        if (lengthIn === null) {
          ctx.addIssue({
            code: "custom",
            message: `${label} must be a length, like ${unit === "ft" ? "10, 10 1/2, 10.5 ft or 3.2 m" : LENGTH_EXAMPLES}.`,
          });
          return z.NEVER;
        }
        return lengthIn / toIn;
      })
      // A hair of float error from the mm conversion must not refuse a length typed at the limit.
      .pipe(
        z
          .number()
          .min(min - 1e-9, range)
          .max(max + 1e-9, range),
      )
  );
}

/**
 * A record id posted by a form (a hidden field): a positive whole number of at most 9 digits.
 * "abc", "", "0", "-1", "1e3" and "0x10" are all refused with the message, so no handler ever
 * queries with NaN or a coerced surprise.
 */
export function formId(message: string) {
  return z
    .string({ error: message })
    .trim()
    .regex(/^[1-9]\d{0,8}$/, { error: message })
    .transform(Number);
}
