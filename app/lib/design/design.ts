import type { CatalogSizes } from "~/lib/catalog/catalog-kinds";
import { bowlDiameterForCount, MAX_COURSES, MIN_UNITS_PER_COURSE, type WallUnitSize } from "~/domain/ring";

/*
 * A homeowner's design: choices from one contractor's catalog, kept in the URL's search params so a
 * design can be bookmarked, shared and reloaded. Unknown or out-of-range values fall back to a
 * sensible choice rather than failing: a shared link should always open a working configurator.
 */

export type LinerKind = "none" | "steel-ring" | "firebrick";
export type DisplayUnit = "in" | "mm";

export type Design = {
  stoneId: number;
  /** Whole units per course; ignored when the bowl is sized to the steel ring. */
  unitCount: number;
  /** Size the bowl to the chosen steel ring insert (the smallest ring of units that clears it). */
  fitToRing: boolean;
  courses: number;
  capId: number | null;
  innerOverhangIn: number;
  linerKind: LinerKind;
  ringId: number | null;
  /** Patio radius in feet; 0 means no patio. */
  patioRadiusFt: number;
  paverId: number | null;
  borderId: number | null;
  /** Distance from the pit to the nearest building, deck or fence, ft; null when not given. */
  setbackFt: number | null;
  /** Distance to the property line, ft; null when not given. */
  propertyLineFt: number | null;
  /** Distance to overhanging branches or wires, ft; null when not given. */
  branchesFt: number | null;
  unit: DisplayUnit;
};

/** What the configurator needs to know of a catalog item (no prices). */
export type CatalogChoice = CatalogSizes & {
  id: number;
  kind: string;
  name: string;
  colourName: string;
  colourHex: string;
};

export const OVERHANG_STEP_IN = 0.25;
export const MAX_INNER_OVERHANG_IN = 3;
export const PATIO_RADIUS_FT = { min: 5, max: 16 } as const;
// Bowls a homeowner is offered: from a small wood-burning bowl to a big gathering pit (from memory:
// wood-burning bowls are usually 36–44 in).
export const OFFERED_BOWL_IN = { min: 24, max: 60 } as const;
const DEFAULT_BOWL_IN = 36;
const DEFAULT_SEAT_HEIGHT_IN = 16;

export function wallUnitSize(item: CatalogChoice): WallUnitSize {
  return {
    faceIn: item.faceIn ?? 0,
    backIn: item.backIn ?? 0,
    depthIn: item.depthIn ?? 0,
    heightIn: item.heightIn ?? 0,
  };
}

/** Whole-unit ring sizes offered for a stone: unit count and its exact bowl diameter (in). */
export function offeredRingSizes(item: CatalogChoice): { unitCount: number; bowlDiameterIn: number }[] {
  const unit = wallUnitSize(item);
  const sizes: { unitCount: number; bowlDiameterIn: number }[] = [];
  for (let n = MIN_UNITS_PER_COURSE; n <= 200; n++) {
    const bowlDiameterIn = bowlDiameterForCount(unit, n);
    if (bowlDiameterIn > OFFERED_BOWL_IN.max) break;
    if (bowlDiameterIn >= OFFERED_BOWL_IN.min) sizes.push({ unitCount: n, bowlDiameterIn });
  }
  return sizes;
}

/*
 * The patio size offered when a homeowner first asks for one: the pit's outside edge plus room for
 * a ring of chairs and a path behind them. Common practice, no source: chairs sit about 2 ft back
 * from the wall, take about 3 ft, and a path behind them wants about 1 ft more (6 ft in all).
 */
export const PATIO_CHAIR_ROOM_FT = 6;

/** The suggested patio radius (ft, half-foot steps within the offered range) for a pit this wide outside (in). */
export function suggestPatioRadiusFt(outsideDiameterIn: number | null): number {
  const pitRadiusFt = outsideDiameterIn && outsideDiameterIn > 0 ? outsideDiameterIn / 2 / 12 : 2;
  return clamp(Math.ceil((pitRadiusFt + PATIO_CHAIR_ROOM_FT) * 2) / 2, PATIO_RADIUS_FT.min, PATIO_RADIUS_FT.max);
}

function intParam(params: URLSearchParams, key: string): number | null {
  const raw = params.get(key);
  if (raw === null || !/^\d{1,6}$/.test(raw)) return null;
  return Number(raw);
}

function numberParam(params: URLSearchParams, key: string): number | null {
  const raw = params.get(key);
  if (raw === null || raw.trim() === "") return null;
  const n = Number(raw);
  return Number.isFinite(n) ? n : null;
}

const clamp = (v: number, min: number, max: number) => Math.min(max, Math.max(min, v));

function pickId(items: CatalogChoice[], wanted: number | null): number | null {
  if (wanted !== null && items.some((i) => i.id === wanted)) return wanted;
  return items[0]?.id ?? null;
}

/** Reads a design from search params against a company's catalog; every field gets a valid value. */
export function parseDesign(params: URLSearchParams, catalog: CatalogChoice[]): Design | null {
  const ofKind = (kind: string) => catalog.filter((i) => i.kind === kind);
  const stones = ofKind("wall-unit");
  const tapered = stones.filter((s) => (s.faceIn ?? 0) > (s.backIn ?? 0));
  const stoneId = pickId(stones, intParam(params, "stone")) ?? null;
  if (stoneId === null) return null;
  const stone = stones.find((s) => s.id === stoneId) ?? tapered[0] ?? stones[0]!;

  const sizes = offeredRingSizes(stone);
  const defaultCount = sizes.find((s) => s.bowlDiameterIn >= DEFAULT_BOWL_IN)?.unitCount ?? sizes[0]?.unitCount ?? 12;
  const askedCount = intParam(params, "units");
  const unitCount = askedCount !== null ? clamp(askedCount, MIN_UNITS_PER_COURSE, 200) : defaultCount;

  const heightIn = stone.heightIn ?? 4;
  const defaultCourses = clamp(Math.round(DEFAULT_SEAT_HEIGHT_IN / heightIn), 1, MAX_COURSES);
  const courses = clamp(intParam(params, "courses") ?? defaultCourses, 1, MAX_COURSES);

  const caps = ofKind("cap");
  const capParam = params.get("cap");
  const capId = capParam === "none" ? null : pickId(caps, intParam(params, "cap"));

  const overhang = numberParam(params, "overhang");
  // By default the cap reaches about 2 in past the outside face and gives the rest to the fire side
  // (outward 1–2 in, inward 0–2 in is usual; common practice, no source).
  const cap = caps.find((c) => c.id === capId);
  const defaultOverhang = cap ? clamp((cap.depthIn ?? 0) - (stone.depthIn ?? 0) - 2, 0, 2) : 1;
  const innerOverhangIn = clamp(
    Math.round((overhang ?? defaultOverhang) / OVERHANG_STEP_IN) * OVERHANG_STEP_IN,
    0,
    MAX_INNER_OVERHANG_IN,
  );

  const rings = ofKind("steel-ring");
  const bricks = ofKind("firebrick");
  const linerParam = params.get("liner");
  let linerKind: LinerKind =
    linerParam === "none" || linerParam === "firebrick" || linerParam === "steel-ring"
      ? linerParam
      : rings.length
        ? "steel-ring"
        : "none";
  if (linerKind === "steel-ring" && rings.length === 0) linerKind = "none";
  if (linerKind === "firebrick" && bricks.length === 0) linerKind = "none";
  const ringId = pickId(rings, intParam(params, "ring"));
  const fitToRing = linerKind === "steel-ring" && (params.get("fit") ?? (askedCount === null ? "ring" : "")) === "ring";

  const pavers = ofKind("paver");
  const borders = ofKind("border-unit");
  const patio = numberParam(params, "patio");
  const patioRadiusFt =
    patio === null || patio <= 0 || pavers.length === 0 || borders.length === 0
      ? 0
      : clamp(Math.round(patio * 2) / 2, PATIO_RADIUS_FT.min, PATIO_RADIUS_FT.max);

  const distance = (key: string) => {
    const value = numberParam(params, key);
    // To a tenth of a foot: a distance typed in metres comes back as the same metres.
    return value === null ? null : clamp(Math.round(value * 10) / 10, 0, 500);
  };
  return {
    stoneId: stone.id,
    unitCount,
    fitToRing,
    courses,
    capId,
    innerOverhangIn,
    linerKind,
    ringId,
    patioRadiusFt,
    paverId: pickId(pavers, intParam(params, "paver")),
    borderId: pickId(borders, intParam(params, "border")),
    setbackFt: distance("setback"),
    propertyLineFt: distance("propertyLine"),
    branchesFt: distance("branches"),
    unit: params.get("unit") === "mm" ? "mm" : "in",
  };
}

/** Writes a design to search params; parseDesign(designToSearchParams(d)) gives d back. */
export function designToSearchParams(design: Design): URLSearchParams {
  const params = new URLSearchParams();
  params.set("stone", String(design.stoneId));
  params.set("units", String(design.unitCount));
  if (design.fitToRing) params.set("fit", "ring");
  params.set("courses", String(design.courses));
  params.set("cap", design.capId === null ? "none" : String(design.capId));
  params.set("overhang", String(design.innerOverhangIn));
  params.set("liner", design.linerKind);
  if (design.ringId !== null) params.set("ring", String(design.ringId));
  params.set("patio", String(design.patioRadiusFt));
  if (design.paverId !== null) params.set("paver", String(design.paverId));
  if (design.borderId !== null) params.set("border", String(design.borderId));
  if (design.setbackFt !== null) params.set("setback", String(design.setbackFt));
  if (design.propertyLineFt !== null) params.set("propertyLine", String(design.propertyLineFt));
  if (design.branchesFt !== null) params.set("branches", String(design.branchesFt));
  params.set("unit", design.unit);
  return params;
}
