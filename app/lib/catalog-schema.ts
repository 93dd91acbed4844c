import { z } from "zod";
import { CATALOG_KINDS, type CatalogKind } from "~/db/schema";

/** What each kind is called on screen, and what its price is per. */
export const KIND_INFO: Record<CatalogKind, { label: string; plural: string; priceUnit: string }> = {
  "wall-unit": { label: "Wall unit", plural: "Wall units", priceUnit: "each" },
  cap: { label: "Cap", plural: "Caps", priceUnit: "each" },
  "steel-ring": { label: "Steel ring insert", plural: "Steel ring inserts", priceUnit: "each" },
  firebrick: { label: "Firebrick", plural: "Firebrick", priceUnit: "each" },
  paver: { label: "Patio paver", plural: "Patio pavers", priceUnit: "each" },
  "border-unit": { label: "Border unit", plural: "Border units", priceUnit: "each" },
  aggregate: { label: "Base aggregate", plural: "Base aggregate", priceUnit: "ton" },
  adhesive: { label: "Adhesive", plural: "Adhesive", priceUnit: "cartridge" },
  "bedding-sand": { label: "Bedding sand", plural: "Bedding sand", priceUnit: "ton" },
  "joint-sand": { label: "Joint sand", plural: "Joint sand", priceUnit: "bag" },
};

export type DimensionKey = "faceIn" | "backIn" | "depthIn" | "heightIn" | "lengthIn" | "widthIn" | "thicknessIn" | "diameterIn";

type DimensionRule = { key: DimensionKey; label: string; hint: string; min: number; max: number };

const d = (key: DimensionKey, label: string, hint: string, min: number, max: number): DimensionRule => ({ key, label, hint, min, max });

/** The dimensions each kind needs, with the range accepted (inches). Ranges cover every unit sold for this work with room to spare. */
export const KIND_DIMENSIONS: Record<CatalogKind, DimensionRule[]> = {
  "wall-unit": [
    d("faceIn", "Face length", "The outer, exposed face", 2, 36),
    d("backIn", "Back length", "The face toward the fire; no longer than the face", 2, 36),
    d("depthIn", "Depth", "Front to back", 2, 24),
    d("heightIn", "Height", "One course", 1, 12),
  ],
  cap: [
    d("lengthIn", "Blank length", "Laid along the ring", 4, 48),
    d("depthIn", "Blank depth", "Across the wall, toward the fire", 4, 36),
    d("thicknessIn", "Thickness", "", 0.5, 8),
  ],
  "steel-ring": [
    d("diameterIn", "Outside diameter", "", 12, 96),
    d("heightIn", "Height", "", 2, 36),
  ],
  firebrick: [
    d("lengthIn", "Length", "A straight is 9 in", 4, 18),
    d("widthIn", "Width", "A straight is 4 1/2 in", 1, 9),
    d("heightIn", "Thickness", "A straight is 2 1/2 in; a split 1 1/4 in", 0.5, 6),
  ],
  paver: [
    d("lengthIn", "Length", "", 2, 36),
    d("widthIn", "Width", "", 2, 36),
    d("thicknessIn", "Thickness", "", 1, 6),
  ],
  "border-unit": [
    d("lengthIn", "Length", "Laid along the circle", 2, 36),
    d("widthIn", "Width", "The border course's width", 2, 36),
    d("thicknessIn", "Thickness", "", 1, 6),
  ],
  aggregate: [],
  adhesive: [],
  "bedding-sand": [],
  "joint-sand": [],
};

const ALL_DIMENSIONS: DimensionKey[] = ["faceIn", "backIn", "depthIn", "heightIn", "lengthIn", "widthIn", "thicknessIn", "diameterIn"];

function formNumber(label: string, min: number, max: number, unit: string) {
  return z
    .string({ error: `Enter the ${label.toLowerCase()}.` })
    .trim()
    .min(1, `Enter the ${label.toLowerCase()}.`)
    .transform((s, ctx) => {
      const n = Number(s);
      if (!Number.isFinite(n)) {
        ctx.addIssue({ code: "custom", message: `${label} must be a number${unit ? ` in ${unit}` : ""}.` });
        return z.NEVER;
      }
      return n;
    })
    .pipe(
      z
        .number()
        .min(min, `${label} must be between ${min} and ${max}${unit ? ` ${unit}` : ""}.`)
        .max(max, `${label} must be between ${min} and ${max}${unit ? ` ${unit}` : ""}.`),
    );
}

const baseSchema = z.object({
  kind: z.enum(CATALOG_KINDS, { error: "Choose what kind of item this is." }),
  name: z.string().trim().min(2, "Name must be 2 to 80 characters.").max(80, "Name must be 2 to 80 characters."),
  colourName: z.string().trim().max(40, "Colour name must be at most 40 characters.").default(""),
  colourHex: z
    .string()
    .trim()
    .regex(/^#[0-9a-fA-F]{6}$/, "Colour must be a hex value like #8a8178.")
    .default("#8a8178"),
  price: formNumber("Price", 0, 100_000, "dollars").transform((dollars) => Math.round(dollars * 100)),
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
    for (const issue of base.error.issues) errors[String(issue.path[0] ?? "form")] ??= issue.message;
  }
  const kind = (CATALOG_KINDS as readonly string[]).includes(raw.kind ?? "") ? (raw.kind as CatalogKind) : null;
  const dims: Partial<Record<DimensionKey, number | null>> = Object.fromEntries(ALL_DIMENSIONS.map((k) => [k, null]));
  for (const rule of kind ? KIND_DIMENSIONS[kind] : []) {
    const parsed = formNumber(rule.label, rule.min, rule.max, "in").safeParse(raw[rule.key] ?? "");
    if (parsed.success) dims[rule.key] = parsed.data;
    else errors[rule.key] = parsed.error.issues[0]?.message ?? `Check the ${rule.label.toLowerCase()}.`;
  }
  if (kind === "wall-unit" && dims.faceIn != null && dims.backIn != null && dims.backIn > dims.faceIn) {
    errors.backIn = `Back length must not be longer than the face (${dims.faceIn} in): the narrow end faces the fire.`;
  }
  if (!base.success || Object.keys(errors).length > 0) return { ok: false, errors };
  const { price, ...rest } = base.data;
  return { ok: true, value: { ...rest, ...dims, priceCents: price } };
}
