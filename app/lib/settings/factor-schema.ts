import { z } from "zod";
import type { CompanyFactors } from "~/domain/factors";
import { FACTOR_ROWS, MAX_MARGIN_PCT, type FactorKey, type FactorRow } from "~/lib/settings/factor-settings";
import { formLength, formNumber } from "~/lib/format/form-fields";

const rangeText = (value: number) => String(value);

function rowSchema(row: FactorRow): z.ZodType<number | string> {
  if (row.kind === "choice") {
    const values = row.options.map((o) => o.value);
    return z
      .string({ error: `Choose ${row.label.toLowerCase()}.` })
      .refine((v) => values.includes(v), `Choose one of the options for “${row.label}”.`);
  }
  // Lengths take tape readings and millimetres ("1 1/4", "32 mm"); other numbers are plain decimals.
  const number =
    row.unit === "in" || row.unit === "ft"
      ? formLength(row.label, row.min, row.max, row.unit)
      : formNumber(row.label, row.min, row.max, row.unit);
  if (row.kind === "money") return number.transform((dollars) => Math.round(dollars * 100));
  if (row.whole)
    return number.refine(
      (n) => Number.isInteger(n),
      `${row.label} must be a whole number from ${rangeText(row.min)} to ${rangeText(row.max)}.`,
    );
  return number;
}

/**
 * The factors form: one field per descriptor, named by its key, each checked against its range
 * (money typed in dollars, stored in cents). A margin of price must stay below MAX_MARGIN_PCT.
 */
export const factorSettingsSchema = z
  .object(
    Object.fromEntries(FACTOR_ROWS.map((row) => [row.key, rowSchema(row)])) as Record<
      FactorKey,
      z.ZodType<number | string>
    >,
  )
  .superRefine((values, ctx) => {
    if (values.profitBasis === "margin" && typeof values.profitPct === "number" && values.profitPct > MAX_MARGIN_PCT) {
      ctx.addIssue({
        code: "custom",
        path: ["profitPct"],
        message: `A margin of price must be between 0 and ${MAX_MARGIN_PCT} % (at 100 % the price would have no end).`,
      });
    }
  })
  .transform((values) => values as unknown as CompanyFactors);
