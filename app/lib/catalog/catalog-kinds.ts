import type { CatalogKind } from "~/db/enums";

// Labels and size rules of each catalog kind; no zod here, so pages can import it cheaply.

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
  "refractory-mortar": { label: "Refractory mortar", plural: "Refractory mortar", priceUnit: "1 gal pail" },
  fill: { label: "Fill sand or pea gravel", plural: "Fill sand and pea gravel", priceUnit: "bag" },
  "edge-restraint": { label: "Edge restraint", plural: "Edge restraint", priceUnit: "piece" },
  "edge-spike": { label: "Edge spike", plural: "Edge spikes", priceUnit: "each" },
};

/** Every size a catalog item can have (inches); which ones a kind needs is in KIND_DIMENSIONS. */
export const DIMENSION_KEYS = [
  "faceIn",
  "backIn",
  "depthIn",
  "heightIn",
  "lengthIn",
  "widthIn",
  "thicknessIn",
  "diameterIn",
] as const;
export type DimensionKey = (typeof DIMENSION_KEYS)[number];

/** An item's sizes, null where its kind has no such size. */
export type CatalogSizes = Record<DimensionKey, number | null>;

/** The sizes of `item`, and nothing else of it. */
export function pickSizes({
  faceIn,
  backIn,
  depthIn,
  heightIn,
  lengthIn,
  widthIn,
  thicknessIn,
  diameterIn,
}: CatalogSizes): CatalogSizes {
  return { faceIn, backIn, depthIn, heightIn, lengthIn, widthIn, thicknessIn, diameterIn };
}

/** `short` names the size in a one-line summary ("face 11 in · back 7 1/2 in"), in the field's own words. */
type DimensionRule = { key: DimensionKey; label: string; short: string; hint: string; min: number; max: number };

const d = (
  key: DimensionKey,
  label: string,
  hint: string,
  min: number,
  max: number,
  short = label.toLowerCase(),
): DimensionRule => ({ key, label, short, hint, min, max });

/**
 * The dimensions each kind needs, with the range accepted (inches). Ranges cover every unit sold for this work with
 * room to spare.
 */
export const KIND_DIMENSIONS: Record<CatalogKind, DimensionRule[]> = {
  "wall-unit": [
    d("faceIn", "Face length", "The outer, exposed face", 2, 36, "face"),
    d("backIn", "Back length", "The face toward the fire; no longer than the face", 2, 36, "back"),
    d("depthIn", "Depth", "Front to back", 2, 24),
    d("heightIn", "Height", "One course", 1, 12),
  ],
  cap: [
    d("lengthIn", "Blank length", "Laid along the ring", 4, 48, "length"),
    d("depthIn", "Blank depth", "Across the wall, toward the fire", 4, 36, "depth"),
    d("thicknessIn", "Thickness", "", 0.5, 8),
  ],
  "steel-ring": [d("diameterIn", "Outside diameter", "", 12, 96), d("heightIn", "Height", "", 2, 36)],
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
  "refractory-mortar": [],
  fill: [],
  "edge-restraint": [],
  "edge-spike": [],
};

/**
 * An item's sizes with what each one is: [{ name: "face", value: "11 in" }, { name: "back", value: "7 1/2 in" }, …].
 */
export function describeSizes(
  kind: CatalogKind,
  sizes: Partial<Record<DimensionKey, number | null>>,
  format: (lengthIn: number) => string,
): { name: string; value: string }[] {
  return KIND_DIMENSIONS[kind].flatMap((rule) => {
    const value = sizes[rule.key];
    return typeof value === "number" ? [{ name: rule.short, value: format(value) }] : [];
  });
}

/** The sizes on one line: "face 11 in · back 7 1/2 in · depth 7 1/2 in · height 3 1/2 in". */
export const sizesText = (sizes: { name: string; value: string }[]): string =>
  sizes.map((s) => `${s.name} ${s.value}`).join(" · ");

/** "each" or "per ton": how a cost is quoted for one of the kind's units. */
export const perUnit = (priceUnit: string): string => (priceUnit === "each" ? "each" : `per ${priceUnit}`);
