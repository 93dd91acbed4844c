/**
 * The materials list: what to order for the wall, caps, liner, base, glue and patio. Counts are
 * whole units rounded up; bulk materials are short tons rounded up to 0.1 t. Volumes use
 * 1 yd³ = 46,656 in³ and 1 ft² = 144 in² (NIST SP 811).
 */
import type { CapPlan } from "~/domain/caps";
import type { CompanyFactors } from "~/domain/factors";
import type { LinerPlan } from "~/domain/liner";
import { IN2_PER_FT2, IN3_PER_YD3, type PatioPlan } from "~/domain/patio";
import type { RingPlan } from "~/domain/ring";
import { formatInches } from "~/domain/units";

/** The catalog kinds a line can be priced from. */
export type MaterialKey =
  | "wall-unit"
  | "cap"
  | "steel-ring"
  | "firebrick"
  | "paver"
  | "border-unit"
  | "aggregate"
  | "adhesive"
  | "bedding-sand"
  | "joint-sand"
  | "refractory-mortar"
  | "fill"
  | "edge-restraint"
  | "edge-spike";

/** Supplies the plan orders that a company may not have priced yet: left out of the price, and said so. */
export const SUNDRY_KEYS: readonly MaterialKey[] = ["refractory-mortar", "fill", "edge-restraint", "edge-spike"];

export type MaterialUnit = "each" | "ton" | "cartridge" | "bag" | "pail" | "piece";

export type MaterialLine = { key: MaterialKey; item: string; quantity: number; unit: MaterialUnit; note?: string };

export type BaseEstimate = {
  /** Radius of the compacted disc under the pit: outside corners plus the reach past them, in. */
  radiusIn: number;
  /** Area of that disc, ft² (the patio's base is counted separately). */
  pitAreaFt2: number;
  /**
   * Radius of the patio's base: the paver edge plus max(patio base depth, the minimum reach), in; null without a patio.
   */
  patioRadiusIn: number | null;
  /** Area of the patio's base outside the pit's disc, ft² (0 without a patio). */
  patioAreaFt2: number;
  /** Soil dug out for both bases (bank volume, before swell), yd³. */
  excavatedYd3: number;
  compactedYd3: number;
  looseYd3: number;
  /** Loose volume plus waste, by weight, unrounded. */
  tons: number;
};

export type AdhesiveEstimate = {
  /** Wall courses glued to the one below, from the top (never the first course). */
  gluedCourses: number;
  /** True when the caps are glued to the top course. */
  gluedCaps: boolean;
  gluedLayers: number;
  beadIn: number;
  /** Bead one cartridge really lays: its nominal length times the yield, in. */
  beadPerCartridgeIn: number;
  cartridges: number;
};

/** Weight of a block of concrete of `volumeIn3` at `lbPerFt3` (1 ft³ = 1728 in³, NIST SP 811), lb. */
export function weighConcrete(volumeIn3: number, lbPerFt3: number): number {
  return (volumeIn3 / 1728) * lbPerFt3;
}

/** Rounds a bulk quantity up to the next 0.1 (tons). */
export function roundUpTenth(value: number): number {
  // The small allowance keeps float noise (0.30000000000000004) from adding a tenth.
  return Math.ceil(value * 10 - 1e-9) / 10;
}

/** Spares for a count: ceil(count × pct/100), at least `minimum` (whole units). */
export function countSpares(count: number, pct: number, minimum = 0): number {
  return Math.max(minimum, Math.ceil((count * pct) / 100 - 1e-9));
}

/**
 * Base aggregate under the pit and, with a patio, under the patio. The patio's base runs past the
 * paver edge by its own depth and never less than the company's minimum (ICPI Tech Spec 2:
 * at least the base depth, and 6 in); it has its own depth, not the pit's. yd³ and tons, unrounded.
 */
export function estimateBase(args: { ring: RingPlan; patio: PatioPlan | null; factors: CompanyFactors }): BaseEstimate {
  const { ring, patio, factors } = args;
  // Measured from the outside corners, so the base reaches the full distance past every part of the wall.
  const radiusIn = ring.outsideCornerRadiusIn + factors.baseBeyondFaceIn;
  const pitAreaIn2 = Math.PI * radiusIn ** 2;
  const patioRadiusIn = patio
    ? patio.outsideRadiusIn + Math.max(factors.patioBaseDepthIn, factors.patioBaseBeyondEdgeMinIn)
    : null;
  const patioOnlyAreaIn2 = patioRadiusIn !== null ? Math.max(0, Math.PI * patioRadiusIn ** 2 - pitAreaIn2) : 0;
  const compactedIn3 = pitAreaIn2 * factors.baseDepthIn + patioOnlyAreaIn2 * factors.patioBaseDepthIn;
  const compactedYd3 = compactedIn3 / IN3_PER_YD3;
  const looseYd3 = compactedYd3 * factors.baseLooseFactor;
  // Dug to the base's depth; under the patio also to the bedding sand's (paver thickness not known here).
  const excavatedIn3 =
    pitAreaIn2 * factors.baseDepthIn + patioOnlyAreaIn2 * (factors.patioBaseDepthIn + factors.beddingSandDepthIn);
  return {
    radiusIn,
    pitAreaFt2: pitAreaIn2 / IN2_PER_FT2,
    patioRadiusIn,
    patioAreaFt2: patioOnlyAreaIn2 / IN2_PER_FT2,
    excavatedYd3: excavatedIn3 / IN3_PER_YD3,
    compactedYd3,
    looseYd3,
    tons: looseYd3 * (1 + factors.baseWastePct / 100) * factors.baseTonsPerYd3,
  };
}

/*
 * Glue: one glued layer for each course glued to the one below (the top `gluedCourses`, never the
 * first course, which sits on the base) and one for the caps on the top course when they are glued.
 * Each layer runs `adhesiveBeadsPerUnit` beads along every PIECE of the course, each about as long
 * as that piece's mean length: (F + B)/2 for a whole unit (less any back trims), (face + back)/2 for
 * a closure unit. A cartridge lays its nominal bead length times the yield, since some always stays
 * in the tube (common practice, no source). Cartridges round up.
 */
/** Adhesive cartridges for the glued layers (bead length in, cartridges rounded up). */
export function estimateAdhesive(args: {
  ring: RingPlan;
  wallUnit: { faceIn: number; backIn: number };
  hasCaps: boolean;
  factors: CompanyFactors;
}): AdhesiveEstimate {
  const { ring, wallUnit, hasCaps, factors } = args;
  const gluedCourses = Math.max(0, Math.min(Math.floor(factors.gluedCourses), ring.courses - 1));
  const gluedCaps = hasCaps && factors.glueCaps >= 1;
  const gluedLayers = gluedCourses + (gluedCaps ? 1 : 0);
  const wholeMeanIn = (wallUnit.faceIn + wallUnit.backIn - 2 * ring.backTrimPerSideIn) / 2;
  const closureMeanIn = ring.closure ? (ring.closure.faceWidthIn + ring.closure.backWidthIn) / 2 : 0;
  const courseBeadIn =
    (ring.unitCount * wholeMeanIn + (ring.closure?.countPerCourse ?? 0) * closureMeanIn) * factors.adhesiveBeadsPerUnit;
  const beadIn = gluedLayers * courseBeadIn;
  const beadPerCartridgeIn = factors.adhesiveBeadInPerCartridge * (factors.adhesiveYieldPct / 100);
  const cartridges = beadIn > 0 ? Math.ceil(beadIn / beadPerCartridgeIn - 1e-9) : 0;
  return { gluedCourses, gluedCaps, gluedLayers, beadIn, beadPerCartridgeIn, cartridges };
}

/** Lists what to order (whole counts rounded up, tons rounded up to 0.1 t). */
export function listMaterials(args: {
  ring: RingPlan;
  wallUnit: { faceIn: number; backIn: number; name?: string };
  caps: CapPlan | null;
  capName?: string;
  liner: LinerPlan | null;
  linerName?: string;
  patio: PatioPlan | null;
  borderName?: string;
  paverName?: string;
  base: BaseEstimate;
  adhesive: AdhesiveEstimate;
  factors: CompanyFactors;
}): MaterialLine[] {
  const { ring, caps, liner, patio, base, adhesive, factors } = args;
  const lines: MaterialLine[] = [];

  const wallSpares = countSpares(ring.totalUnits, factors.wallUnitSparePct, factors.wallUnitMinSpares);
  const closureNote = ring.closure
    ? `, ${ring.closure.countPerCourse * ring.courses} of them cut down as closure units`
    : "";
  lines.push({
    key: "wall-unit",
    item: args.wallUnit.name ?? "Wall units",
    quantity: ring.totalUnits + wallSpares,
    unit: "each",
    note: `${ring.courses} courses of ${ring.unitsPerCourse}${closureNote}, plus ${wallSpares} spare`,
  });

  if (caps) {
    lines.push({
      key: "cap",
      item: args.capName ?? "Cap blanks",
      quantity: caps.count + caps.spares,
      unit: "each",
      note: `${caps.count} caps cut from ${formatInches(caps.blankLengthIn)} × ${formatInches(caps.blankDepthIn)} blanks, plus ${caps.spares} spare`,
    });
  }

  // Listed even when it does not clear the bowl: the warning says so, and the order still needs one.
  if (liner?.kind === "steel-ring") {
    lines.push({ key: "steel-ring", item: args.linerName ?? "Steel ring insert", quantity: 1, unit: "each" });
  }
  if (liner?.kind === "firebrick" && liner.fits) {
    const spares = countSpares(liner.totalBricks, factors.firebrickSparePct);
    const ripped = liner.rippedRows ? `, the top row ripped to ${formatInches(liner.ripHeightIn ?? 0)}` : "";
    lines.push({
      key: "firebrick",
      item: args.linerName ?? "Firebrick",
      quantity: liner.totalBricks + spares,
      unit: "each",
      note: `${liner.rows} rows of ${liner.bricksPerRow} on edge${ripped}, plus ${spares} spare`,
    });
    // One US gallon = 231 in³ exactly (NIST SP 811); a pail holds one gallon.
    const pails = Math.ceil(liner.mortarIn3 / (231 * (factors.refractoryMortarYieldPct / 100)) - 1e-9);
    lines.push({
      key: "refractory-mortar",
      item: "Refractory mortar, 1 gal pail",
      quantity: Math.max(1, pails),
      unit: "pail",
      note: `${formatInches(liner.jointIn)} joints, ${Math.round(liner.mortarIn3)} in³; not ordinary mortar`,
    });
  }
  if (liner && liner.fits && liner.fillFt3 > 0) {
    lines.push({
      key: "fill",
      item: liner.kind === "steel-ring" ? "Pea gravel" : "Sand",
      quantity: Math.ceil(liner.fillFt3 / factors.fillBagFt3 - 1e-9),
      unit: "bag",
      note:
        liner.kind === "steel-ring" && liner.bedDepthIn > 0
          ? `${liner.fillFt3.toFixed(1)} ft³: a ${formatInches(liner.bedDepthIn)} bed under the ring and the gap round it`
          : `${liner.fillFt3.toFixed(1)} ft³ between the ${liner.kind === "steel-ring" ? "ring" : "firebrick"} and the wall`,
    });
  }

  lines.push({
    key: "aggregate",
    item: "Base aggregate",
    quantity: roundUpTenth(base.tons),
    unit: "ton",
    note: `${base.compactedYd3.toFixed(2)} yd³ compacted${patio ? " under the pit and the patio" : ""}`,
  });

  if (adhesive.cartridges > 0) {
    lines.push({
      key: "adhesive",
      item: "Heat-rated masonry adhesive, 10.1 fl oz",
      quantity: adhesive.cartridges,
      unit: "cartridge",
      note: `${[adhesive.gluedCourses ? `top ${adhesive.gluedCourses === 1 ? "course" : `${adhesive.gluedCourses} courses`}` : "", adhesive.gluedCaps ? "caps" : ""].filter(Boolean).join(" and ")}: ${Math.round(adhesive.beadIn)} in of bead`,
    });
  }

  if (patio) {
    const borderSpares = countSpares(patio.borderUnitCount, factors.borderUnitSparePct, 1);
    lines.push(
      {
        key: "paver",
        item: args.paverName ?? "Patio pavers",
        quantity: patio.paverCount,
        unit: "each",
        note: `${patio.wholePaverCount} whole, ${patio.cutPaverCount} cut, ${factors.paverWasteFloorPct} % spare: ${Math.round(patio.paverWastePct)} % over the area`,
      },
      {
        key: "border-unit",
        item: args.borderName ?? "Border units",
        quantity: patio.borderUnitCount + borderSpares,
        unit: "each",
        note: `${patio.borderUnitCount} in the course, plus ${borderSpares} spare`,
      },
      { key: "bedding-sand", item: "Bedding sand", quantity: roundUpTenth(patio.beddingSandTons), unit: "ton" },
      { key: "joint-sand", item: "Joint sand", quantity: patio.jointSandBags, unit: "bag" },
      {
        key: "edge-restraint",
        item: `Edge restraint, ${factors.edgeRestraintPieceFt} ft`,
        quantity: patio.edgeRestraintPieces,
        unit: "piece",
        note: `${(patio.edgeRestraintIn / 12).toFixed(1)} ft round the patio`,
      },
      {
        key: "edge-spike",
        item: "Edge spikes",
        quantity: patio.edgeSpikes,
        unit: "each",
        note: `one every ${formatInches(factors.edgeSpikeSpacingIn)}`,
      },
    );
  }
  return lines;
}
