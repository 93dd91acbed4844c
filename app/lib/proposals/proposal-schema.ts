import { z } from "zod";
import type { AddOn } from "~/domain/proposal-money";
import { formatNumber } from "~/domain/number-text";
import { addCalendarDays } from "~/domain/build-schedule";

/*
 * The office's proposal forms. Money is typed in dollars ("4,850" or "4850.00") and kept in integer
 * cents; every message names its field and what is allowed.
 */

export const MAX_ADD_ONS = 4;

/** How long a proposal or change order may stay open: a year at most (a date years out is a typo). */
export const MAX_VALID_DAYS = 365;
const VALID_UNTIL_FORMAT = "Valid until must be a date like 2026-12-31.";

/** What is wrong with an offer's last day, seen from the company's today; null when it is fine. */
export function validUntilProblem(value: string, today: string): string | null {
  if (!z.iso.date().safeParse(value).success) return VALID_UNTIL_FORMAT;
  if (value <= today) return "Valid until must be after today.";
  const last = addCalendarDays(today, MAX_VALID_DAYS);
  if (value > last) return `Valid until must be within a year, by ${last}.`;
  return null;
}

/** Dollars as typed, without sign or "$": commas only between thousands ("4,850", not "4,8,5,0"). */
export const DOLLARS_TYPED = /^(\d{1,3}(,\d{3})+|\d+)(\.\d{1,2})?$/;

/** Dollars as typed → integer cents, within a range of whole dollars. */
export function formMoneyCents(label: string, minDollars: number, maxDollars: number) {
  const range = `${label} must be between $${formatNumber(minDollars, { maxFractionDigits: 3 })} and $${formatNumber(maxDollars, { maxFractionDigits: 3 })}.`;
  return z
    .string({ error: `Enter the ${label.toLowerCase()}.` })
    .trim()
    .min(1, `Enter the ${label.toLowerCase()}.`)
    .transform((s, ctx) => {
      const dollars = s.replace(/^\$/, "");
      const cleaned = DOLLARS_TYPED.test(dollars) ? dollars.replace(/,/g, "") : "";
      if (!/^\d+(\.\d{1,2})?$/.test(cleaned)) {
        ctx.addIssue({ code: "custom", message: `${label} must be an amount in dollars, like 4,850 or 4850.00.` });
        return z.NEVER;
      }
      const [whole, fraction = ""] = cleaned.split(".");
      return Number(whole) * 100 + Number(fraction.padEnd(2, "0"));
    })
    .pipe(
      z
        .number()
        .min(minDollars * 100, range)
        .max(maxDollars * 100, range),
    );
}

const textBlock = (label: string) =>
  z
    .string()
    .trim()
    .min(1, `Write what is ${label} (one line each).`)
    .max(3000, `${label[0]!.toUpperCase()}${label.slice(1)} must be at most 3,000 characters.`);

/** The compose form: fixed price, expiry, included and excluded, and up to four add-ons (label and price). */
export function parseComposeForm(
  fields: Record<string, string>,
  today: string,
):
  | {
      ok: true;
      value: { fixedPriceCents: number; validUntil: string; included: string; excluded: string; addOns: AddOn[] };
    }
  | { ok: false; errors: Record<string, string> } {
  const errors: Record<string, string> = {};
  const base = z
    .object({
      fixedPrice: formMoneyCents("Fixed price", 100, 500_000),
      validUntil: z.string({ error: VALID_UNTIL_FORMAT }).superRefine((value, context) => {
        const problem = validUntilProblem(value, today);
        if (problem) context.addIssue({ code: "custom", message: problem });
      }),
      included: textBlock("included"),
      excluded: textBlock("not included"),
    })
    .safeParse(fields);
  if (!base.success) for (const issue of base.error.issues) errors[String(issue.path[0])] ??= issue.message;
  const addOns: AddOn[] = [];
  for (let i = 1; i <= MAX_ADD_ONS; i++) {
    const label = (fields[`addOnLabel${i}`] ?? "").trim();
    const price = (fields[`addOnPrice${i}`] ?? "").trim();
    if (!label && !price) continue;
    if (label.length < 3 || label.length > 120) {
      errors[`addOnLabel${i}`] = `Add-on ${i} needs a name of 3 to 120 characters.`;
      continue;
    }
    const cents = formMoneyCents(`Add-on ${i}'s price`, 1, 100_000).safeParse(price);
    if (!cents.success) {
      errors[`addOnPrice${i}`] = cents.error.issues[0]!.message;
      continue;
    }
    addOns.push({ key: `a${i}`, label, cents: cents.data });
  }
  if (!base.success || Object.keys(errors).length) return { ok: false, errors };
  return {
    ok: true,
    value: {
      fixedPriceCents: base.data.fixedPrice,
      validUntil: base.data.validUntil,
      included: base.data.included,
      excluded: base.data.excluded,
      addOns,
    },
  };
}

/** Withdrawing a proposal: which one and why. */
export const withdrawSchema = z.object({
  proposalId: z
    .string()
    .regex(/^\d{1,9}$/, { error: "Choose a proposal to withdraw." })
    .transform(Number),
  reason: z
    .string()
    .trim()
    .min(3, "Say why it is withdrawn (3 to 200 characters).")
    .max(200, "Say why it is withdrawn (3 to 200 characters)."),
});

/** The add-on keys a homeowner chose when signing, as stored with the proposal (JSON). */
export const chosenAddOnsSchema = z.array(z.string());
