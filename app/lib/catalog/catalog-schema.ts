import { z } from "zod";
import { toSingleLine } from "~/lib/format/clean-text";
import { CATALOG_KINDS, type CatalogKind } from "~/db/enums";
import { KIND_DIMENSIONS, type DimensionKey } from "~/lib/catalog/catalog-kinds";
import { fieldErrors, formLength, formNumber } from "~/lib/format/form-fields";
import { formatInches } from "~/domain/units";

const ALL_DIMENSIONS: DimensionKey[] = ["faceIn", "backIn", "depthIn", "heightIn", "lengthIn", "widthIn", "thicknessIn", "diameterIn"];

const baseSchema = z.object({
  kind: z.enum(CATALOG_KINDS, { error: "Choose what kind of item this is." }),
  name: z.string().overwrite(toSingleLine).trim().min(2, "Name must be 2 to 80 characters.").max(80, "Name must be 2 to 80 characters."),
  colourName: z.string().overwrite(toSingleLine).trim().max(40, "Colour name must be at most 40 characters.").default(""),
  colourHex: z
    .string()
    .trim()
    .regex(/^#[0-9a-fA-F]{6}$/, "Colour must be a hex value like #8a8178.")
    .default("#8a8178"),
  price: formNumber("Cost", 0, 100_000, "dollars").transform((dollars) => Math.round(dollars * 100)),
  isActive: z.boolean(),
});

export type CatalogItemInput = Omit<z.output<typeof baseSchema>, "price"> & {
  priceCents: number;
} & Partial<Record<DimensionKey, number | null>>;

/**
 * Parses the catalog form (strings from FormData). Dimensions are checked against the kind's own
 * list and ranges; unused dimensions are stored as null.
 */
export function parseCatalogForm(form: FormData):
  | { ok: true; value: CatalogItemInput }
  | { ok: false; errors: Record<string, string> } {
  const raw = Object.fromEntries([...form.entries()].filter(([, v]) => typeof v === "string")) as Record<string, string>;
  const base = baseSchema.safeParse({ ...raw, isActive: raw.isActive === "on" || raw.isActive === "true" });
  const errors: Record<string, string> = {};
  if (!base.success) {
    Object.assign(errors, fieldErrors(base.error));
  }
  const kind = (CATALOG_KINDS as readonly string[]).includes(raw.kind ?? "") ? (raw.kind as CatalogKind) : null;
  const dims: Partial<Record<DimensionKey, number | null>> = Object.fromEntries(ALL_DIMENSIONS.map((k) => [k, null]));
  for (const rule of kind ? KIND_DIMENSIONS[kind] : []) {
    const parsed = formLength(rule.label, rule.min, rule.max).safeParse(raw[rule.key] ?? "");
    if (parsed.success) dims[rule.key] = parsed.data;
    else errors[rule.key] = parsed.error.issues[0]?.message ?? `Check the ${rule.label.toLowerCase()}.`;
  }
  if (kind === "wall-unit" && dims.faceIn != null && dims.backIn != null && dims.backIn > dims.faceIn) {
    errors.backIn = `Back length must not be longer than the face (${formatInches(dims.faceIn)}): the narrow end faces the fire.`;
  }
  if (!base.success || Object.keys(errors).length > 0) return { ok: false, errors };
  const { price, ...rest } = base.data;
  return { ok: true, value: { ...rest, ...dims, priceCents: price } };
}
