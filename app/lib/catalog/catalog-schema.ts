import { z } from "zod";
import { toSingleLine } from "~/lib/format/clean-text";
import { CATALOG_KINDS, isOneOf, ORDER_UNITS } from "~/db/enums";
import { PACK_UNITS } from "~/domain/supplier-order";
import { DIMENSION_KEYS, KIND_DIMENSIONS, type DimensionKey } from "~/lib/catalog/catalog-kinds";
import { fieldErrors, formId, formLength, formNumber } from "~/lib/format/form-fields";
import { ORDER_UNIT_LABEL } from "~/lib/suppliers/order-units";
import { formatInches } from "~/domain/units";

/**
 * A form field that may be left blank (or left out): blank gives `blank`, anything else must pass `schema`, whose
 * message is kept.
 */
function blankOr<T, B>(schema: z.ZodType<T, string>, blank: B) {
  return z
    .string()
    .default("")
    .transform((value, ctx): T | B => {
      if (value.trim() === "") return blank;
      const parsed = schema.safeParse(value);
      if (parsed.success) return parsed.data;
      ctx.addIssue({ code: "custom", message: parsed.error.issues[0]?.message ?? "Check this field." });
      return z.NEVER;
    });
}

const baseSchema = z.object({
  kind: z.enum(CATALOG_KINDS, { error: "Choose what kind of item this is." }),
  name: z
    .string()
    .overwrite(toSingleLine)
    .trim()
    .min(2, "Name must be 2 to 80 characters.")
    .max(80, "Name must be 2 to 80 characters."),
  colourName: z
    .string()
    .overwrite(toSingleLine)
    .trim()
    .max(40, "Colour name must be at most 40 characters.")
    .default(""),
  colourHex: z
    .string()
    .trim()
    .regex(/^#[0-9a-fA-F]{6}$/, "Colour must be a hex value like #8a8178.")
    .default("#8a8178"),
  price: formNumber("Cost", 0, 100_000, "dollars").transform((dollars) => Math.round(dollars * 100)),
  isActive: z.boolean(),
  // How the yard sells it. Blank fields keep the simple case: no supplier, sold each, weight unknown.
  supplierId: blankOr(formId("Choose a supplier from the list."), null),
  orderUnit: z.enum(ORDER_UNITS, { error: "Choose how the yard sells it from the list." }).prefault("each"),
  unitsPerOrderUnit: blankOr(formNumber("Units per order unit", 0.01, 100_000), 1),
  orderUnitWeightLb: blankOr(formNumber("Weight of one order unit", 0.01, 100_000, "lb"), null),
});

type OrderingKey = "supplierId" | "orderUnit" | "unitsPerOrderUnit" | "orderUnitWeightLb";
// The ordering fields are optional for callers that write items in code (the defaults apply).
export type CatalogItemInput = Omit<z.output<typeof baseSchema>, "price" | OrderingKey> &
  Partial<Pick<z.output<typeof baseSchema>, OrderingKey>> & {
    priceCents: number;
  } & Partial<Record<DimensionKey, number | null>>;

/**
 * Parses the catalog form (strings from FormData). Dimensions are checked against the kind's own
 * list and ranges; unused dimensions are stored as null.
 */
export function parseCatalogForm(
  form: FormData,
): { ok: true; value: CatalogItemInput } | { ok: false; errors: Record<string, string> } {
  const raw = Object.fromEntries(
    [...form.entries()].filter((entry): entry is [string, string] => typeof entry[1] === "string"),
  );
  const base = baseSchema.safeParse({ ...raw, isActive: raw.isActive === "on" || raw.isActive === "true" });
  const errors: Record<string, string> = {};
  if (!base.success) {
    Object.assign(errors, fieldErrors(base.error));
  }
  const kind = isOneOf(CATALOG_KINDS, raw.kind) ? raw.kind : null;
  const dims: Partial<Record<DimensionKey, number | null>> = Object.fromEntries(DIMENSION_KEYS.map((k) => [k, null]));
  for (const rule of kind ? KIND_DIMENSIONS[kind] : []) {
    const parsed = formLength(rule.label, rule.min, rule.max).safeParse(raw[rule.key] ?? "");
    if (parsed.success) dims[rule.key] = parsed.data;
    else errors[rule.key] = parsed.error.issues[0]?.message ?? `Check the ${rule.label.toLowerCase()}.`;
  }
  if (kind === "wall-unit" && dims.faceIn != null && dims.backIn != null && dims.backIn > dims.faceIn) {
    errors.backIn = `Back length must not be longer than the face (${formatInches(dims.faceIn)}): the narrow end faces the fire.`;
  }
  if (base.success && PACK_UNITS.includes(base.data.orderUnit) && !Number.isInteger(base.data.unitsPerOrderUnit)) {
    errors.unitsPerOrderUnit = `${ORDER_UNIT_LABEL[base.data.orderUnit].per} must be a whole number.`;
  }
  if (!base.success || Object.keys(errors).length > 0) return { ok: false, errors };
  const { price, ...rest } = base.data;
  return { ok: true, value: { ...rest, ...dims, priceCents: price } };
}
