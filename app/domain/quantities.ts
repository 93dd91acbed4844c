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
  | "joint-sand";

export type MaterialUnit = "each" | "ton" | "cartridge" | "bag";

export type MaterialLine = { key: MaterialKey; item: string; quantity: number; unit: MaterialUnit; note?: string };

export type BaseEstimate = {
  /** Radius of the compacted disc under the pit: outside corners plus the reach past them, in. */
  radiusIn: number;
  /** Area of that disc, ft² (the patio's base is counted separately). */
  pitAreaFt2: number;
  compactedYd3: number;
  looseYd3: number;
  /** Loose volume plus waste, by weight, unrounded. */
  tons: number;
};

export type AdhesiveEstimate = { gluedLayers: number; beadIn: number; cartridges: number };

/** Rounds a bulk quantity up to the next 0.1 (tons). */
export function roundUpTenth(value: number): number {
  // The small allowance keeps float noise (0.30000000000000004) from adding a tenth.
  return Math.ceil(value * 10 - 1e-9) / 10;
}

/** Spares for a count: ceil(count × pct/100), at least `minimum` (whole units). */
export function countSpares(count: number, pct: number, minimum = 0): number {
  return Math.max(minimum, Math.ceil((count * pct) / 100 - 1e-9));
}

/** Base aggregate under the pit (and under the patio, when there is one): yd³ and tons, unrounded. */
export function estimateBase(args: { ring: RingPlan; patio: PatioPlan | null; factors: CompanyFactors }): BaseEstimate {
  const { ring, patio, factors } = args;
  // Measured from the outside corners, so the base reaches the full distance past every part of the wall.
  const radiusIn = ring.outsideCornerRadiusIn + factors.baseBeyondFaceIn;
  const pitAreaIn2 = Math.PI * radiusIn ** 2;
  const patioOnlyAreaIn2 = patio ? Math.max(0, Math.PI * patio.outsideRadiusIn ** 2 - pitAreaIn2) : 0;
  const compactedIn3 = pitAreaIn2 * factors.baseDepthIn + patioOnlyAreaIn2 * factors.patioBaseDepthIn;
  const compactedYd3 = compactedIn3 / IN3_PER_YD3;
  const looseYd3 = compactedYd3 * factors.baseLooseFactor;
  return {
    radiusIn,
    pitAreaFt2: pitAreaIn2 / IN2_PER_FT2,
    compactedYd3,
    looseYd3,
    tons: looseYd3 * (1 + factors.baseWastePct / 100) * factors.baseTonsPerYd3,
  };
}

/*
 * Glue: one glued layer for each course glued to the one below (the top `gluedCourses`, never the
 * first course, which sits on the base) and one for the caps on the top course. Each layer runs
 * `adhesiveBeadsPerUnit` beads along every unit, each about as long as the unit's mean length
 * (F + B)/2, which is also the wall's circumference at mid-depth divided by the unit count.
 */
/** Adhesive cartridges for the glued layers (bead length in, cartridges rounded up). */
export function estimateAdhesive(args: {
  ring: RingPlan;
  wallUnit: { faceIn: number; backIn: number };
  hasCaps: boolean;
  factors: CompanyFactors;
}): AdhesiveEstimate {
  const { ring, wallUnit, hasCaps, factors } = args;
  const gluedLayers = Math.max(0, Math.min(factors.gluedCourses, ring.courses - 1)) + (hasCaps ? 1 : 0);
  const beadIn =
    gluedLayers * ring.unitsPerCourse * ((wallUnit.faceIn + wallUnit.backIn) / 2) * factors.adhesiveBeadsPerUnit;
  const cartridges = Math.max(0, Math.ceil(beadIn / factors.adhesiveBeadInPerCartridge - 1e-9));
  return { gluedLayers, beadIn, cartridges };
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
    lines.push({
      key: "firebrick",
      item: args.linerName ?? "Firebrick",
      quantity: liner.totalBricks + spares,
      unit: "each",
      note: `${liner.rows} rows of ${liner.bricksPerRow} on edge, plus ${spares} spare`,
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
      item: "Masonry adhesive, 10.1 fl oz",
      quantity: adhesive.cartridges,
      unit: "cartridge",
      note: `${adhesive.gluedLayers} glued layer${adhesive.gluedLayers === 1 ? "" : "s"}`,
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
        note: `${factors.paverWastePct} % for cuts included`,
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
    );
  }
  return lines;
}
