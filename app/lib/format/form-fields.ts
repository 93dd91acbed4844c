import { z } from "zod";

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
