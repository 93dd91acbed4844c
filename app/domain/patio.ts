/**
 * A round paver patio around the pit: a border course of rectangular units on the outside edge,
 * and a field of pavers inside it, cut to a circle where it meets the border and to the pit's
 * outside face. Lengths in inches, areas in square feet, volumes in cubic yards.
 *
 * Border model (derived here from the regular-polygon formulas): the border units' outer faces
 * sit at edge distance R (the patio's outside radius) and their inner faces at r = R − w. A
 * rectangular unit laid on a circle meets its neighbours first at its inner corners, so each unit
 * spans θ = 2·atan(L / (2r)) around the centre and the course needs ceil(2π/θ) units, the last
 * one cut to fit. The outer joints open to a V, L·w/r wide.
 *
 * Field model: pavers fill the circle of radius R − w (struck with a trammel from the pit centre
 * to cut them), less the pit's footprint, taken as the circle through the middles of the pit's
 * faces (radius a + T). That circle is a little smaller than the true polygon, so the paver count
 * errs high, never low.
 */
import { PlanGeometryError } from "~/domain/plan-geometry-error";
import { formatInches } from "~/domain/units";

/** Cubic inches in a cubic yard: 36³ (NIST SP 811). */
export const IN3_PER_YD3 = 46_656;
/** Square inches in a square foot: 12² (NIST SP 811). */
export const IN2_PER_FT2 = 144;

export type PatioSpec = {
  outsideRadiusIn: number;
  border: { widthIn: number; lengthIn: number };
  paver: { lengthIn: number; widthIn: number };
};

export type PatioFactors = {
  paverWastePct: number;
  beddingSandDepthIn: number;
  sandTonsPerYd3: number;
  jointSandLbPerFt2: number;
  jointSandBagLb: number;
};

export type PatioPlan = {
  outsideRadiusIn: number;
  borderWidthIn: number;
  borderUnitCount: number;
  /** r = R − w: centre to the middle of the border units' inner faces, in. */
  borderInnerEdgeDistanceIn: number;
  /** Angle each whole border unit spans, degrees. */
  borderUnitAngleDeg: number;
  /** Open V-joint between border units at their outer faces, in. */
  borderOuterJointIn: number;
  /** Inner-face length of the last border unit, cut to close the course, in. */
  lastBorderUnitLengthIn: number;
  /** Trammel radius for cutting the field pavers against the border, in. */
  fieldCutRadiusIn: number;
  fieldAreaFt2: number;
  /** Field plus border: everything that gets bedding and joint sand, ft². */
  pavedAreaFt2: number;
  /** Field pavers, waste included, each. */
  paverCount: number;
  beddingSandYd3: number;
  beddingSandTons: number;
  jointSandBags: number;
};

/** Plans the patio around a pit of outside edge distance a + T (in, ft², yd³; counts rounded up). */
export function planPatio(args: {
  patio: PatioSpec;
  pitOutsideEdgeDistanceIn: number;
  pitOutsideCornerRadiusIn: number;
  factors: PatioFactors;
}): PatioPlan {
  const { patio, pitOutsideEdgeDistanceIn, pitOutsideCornerRadiusIn, factors } = args;
  const { outsideRadiusIn: R, border, paver } = patio;
  const sizes: [string, number][] = [
    ["patio.outsideRadiusIn", R],
    ["patio.border.widthIn", border.widthIn],
    ["patio.border.lengthIn", border.lengthIn],
    ["patio.paver.lengthIn", paver.lengthIn],
    ["patio.paver.widthIn", paver.widthIn],
  ];
  for (const [path, value] of sizes) {
    if (!Number.isFinite(value) || value <= 0) throw new PlanGeometryError(path, "This size must be a length above 0 in.");
  }
  const r = R - border.widthIn;
  // The border's inner edge must clear the pit's outside corners, or the field has no room at all.
  if (r <= pitOutsideCornerRadiusIn) {
    throw new PlanGeometryError(
      "patio.outsideRadiusIn",
      `The patio must reach past the pit and its border: its outside radius must be more than ${formatInches(pitOutsideCornerRadiusIn + border.widthIn)}.`,
    );
  }
  const unitAngle = 2 * Math.atan(border.lengthIn / (2 * r));
  const borderUnitCount = Math.ceil((2 * Math.PI) / unitAngle - 1e-9);
  const lastAngle = 2 * Math.PI - (borderUnitCount - 1) * unitAngle;

  const pitFootprintIn2 = Math.PI * pitOutsideEdgeDistanceIn ** 2;
  const fieldAreaIn2 = Math.PI * r * r - pitFootprintIn2;
  const pavedAreaIn2 = Math.PI * R * R - pitFootprintIn2;
  const paverCount = Math.max(
    0,
    Math.ceil((fieldAreaIn2 / (paver.lengthIn * paver.widthIn)) * (1 + factors.paverWastePct / 100) - 1e-9),
  );
  const beddingSandYd3 = (pavedAreaIn2 * factors.beddingSandDepthIn) / IN3_PER_YD3;
  const pavedAreaFt2 = pavedAreaIn2 / IN2_PER_FT2;
  return {
    outsideRadiusIn: R,
    borderWidthIn: border.widthIn,
    borderUnitCount,
    borderInnerEdgeDistanceIn: r,
    borderUnitAngleDeg: (unitAngle * 180) / Math.PI,
    borderOuterJointIn: (border.lengthIn * border.widthIn) / r,
    lastBorderUnitLengthIn: Math.min(border.lengthIn, 2 * r * Math.tan(lastAngle / 2)),
    fieldCutRadiusIn: r,
    fieldAreaFt2: fieldAreaIn2 / IN2_PER_FT2,
    pavedAreaFt2,
    paverCount,
    beddingSandYd3,
    beddingSandTons: beddingSandYd3 * factors.sandTonsPerYd3,
    jointSandBags: Math.max(0, Math.ceil((pavedAreaFt2 * factors.jointSandLbPerFt2) / factors.jointSandBagLb - 1e-9)),
  };
}
