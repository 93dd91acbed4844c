import type { CapInput, LinerInput, PatioInput, WallUnitInput } from "~/domain/plan";
import type { CatalogSizes } from "~/lib/catalog/catalog-kinds";

/*
 * The one mapping from a catalog item to the part the engine takes: its sizes, its name, its price
 * (when the caller may see prices) and its colour (for the drawing). The plan API, the browser's
 * instant redraw and the stored record of each plan all build their parts here.
 */

/** What the mapping reads of a catalog item: a full row, or the public choice without a price. */
export type CatalogItemSizes = CatalogSizes & {
  kind: string;
  name: string;
  colourHex: string;
  priceCents?: number;
};

/** The colour the drawing gives a part, #rrggbb as the catalog stores it. */
type Drawn = { colourHex?: string };

export type WallUnitPart = WallUnitInput & Drawn;
/** A cap blank; the overhangs are choices for one pit and are added by the caller. */
export type CapBlankPart = Omit<CapInput, "innerOverhangIn" | "outerOverhangIn"> & Drawn;
export type SteelRingPart = Extract<LinerInput, { kind: "steel-ring" }> & Drawn;
export type FirebrickPart = Extract<LinerInput, { kind: "firebrick" }> & Drawn;
export type BorderPart = PatioInput["border"] & Drawn;
export type PaverPart = PatioInput["paver"] & Drawn;

export type PartByKind = {
  "wall-unit": WallUnitPart;
  cap: CapBlankPart;
  "steel-ring": SteelRingPart;
  firebrick: FirebrickPart;
  "border-unit": BorderPart;
  paver: PaverPart;
};

export type PartKind = keyof PartByKind;

const isSize = (value: number | null): value is number => value !== null && Number.isFinite(value) && value > 0;

function labelled(item: CatalogItemSizes) {
  return {
    name: item.name,
    colourHex: item.colourHex,
    ...(item.priceCents !== undefined ? { priceCents: item.priceCents } : {}),
  };
}

const BUILDERS: { [K in PartKind]: (item: CatalogItemSizes) => PartByKind[K] | null } = {
  "wall-unit": (item) =>
    isSize(item.faceIn) && isSize(item.backIn) && isSize(item.depthIn) && isSize(item.heightIn)
      ? { faceIn: item.faceIn, backIn: item.backIn, depthIn: item.depthIn, heightIn: item.heightIn, ...labelled(item) }
      : null,
  cap: (item) =>
    isSize(item.lengthIn) && isSize(item.depthIn) && isSize(item.thicknessIn)
      ? { lengthIn: item.lengthIn, depthIn: item.depthIn, thicknessIn: item.thicknessIn, ...labelled(item) }
      : null,
  "steel-ring": (item) =>
    isSize(item.diameterIn) && isSize(item.heightIn)
      ? { kind: "steel-ring", outsideDiameterIn: item.diameterIn, heightIn: item.heightIn, ...labelled(item) }
      : null,
  firebrick: (item) =>
    isSize(item.lengthIn) && isSize(item.widthIn) && isSize(item.heightIn)
      ? {
          kind: "firebrick",
          lengthIn: item.lengthIn,
          widthIn: item.widthIn,
          heightIn: item.heightIn,
          ...labelled(item),
        }
      : null,
  "border-unit": (item) =>
    isSize(item.widthIn) && isSize(item.lengthIn)
      ? { widthIn: item.widthIn, lengthIn: item.lengthIn, ...labelled(item) }
      : null,
  paver: (item) =>
    isSize(item.lengthIn) && isSize(item.widthIn)
      ? { lengthIn: item.lengthIn, widthIn: item.widthIn, ...labelled(item) }
      : null,
};

/** The engine part for a catalog item of kind `kind`; null when the item is another kind or lacks a size. */
export function toEnginePart<K extends PartKind>(item: CatalogItemSizes | undefined, kind: K): PartByKind[K] | null {
  if (!item || item.kind !== kind) return null;
  return BUILDERS[kind](item);
}
