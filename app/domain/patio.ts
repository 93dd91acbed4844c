/**
 * A round paver patio around the pit: a border course of rectangular units on the outside edge,
 * and a field of pavers inside it, cut to a circle where it meets the border and to the pit's
 * outside face. Lengths in inches, areas in square feet, volumes in cubic yards.
 *
 * Border model (derived here from the regular-polygon formulas): the border units' outer faces
 * sit at edge distance R (the patio's outside radius) and their inner faces at r = R − w.
 *  - Square-ended units laid on the circle meet first at their inner corners: each spans
 *    θ = 2·atan(L / (2r)) and the outer joints open to a V, L·w/r wide.
 *  - When that V is wider than the company's limit (ICPI, from memory: paver joints 1/16–3/16 in),
 *    one end of every unit is cut θ off square, θ = 2·atan(L / (2R)): the outer corners touch and
 *    each cut end meets the next unit's square end flush, so no joint opens past the sanded joint.
 * The course closes with one cut piece; when that piece would be narrower than the company's
 * minimum share of a unit, it and one whole unit are cut into two equal pieces instead (the same
 * rule as the wall's closure units; common practice, no source).
 *
 * Field model: pavers fill the circle of radius R − w (struck with a trammel from the pit centre
 * to cut them), less the pit's footprint, taken as the circle through the middles of the pit's
 * faces (radius a + T). That circle is a little smaller than the true polygon, so the paver count
 * errs high, never low. Pavers are counted on a stack-bond grid with a joint line through the pit
 * centre: every grid cell wholly inside the field is a whole paver, every cell a boundary circle
 * crosses is a cut paver (its offcut is not reused), and breakage spares go on top.
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
  /** Breakage spares on top of whole and cut pavers, %. */
  paverWasteFloorPct: number;
  /** Widest outer V-joint allowed between border units, in. */
  borderMaxJointIn: number;
  /** Narrowest cut border piece, % of a unit's length. */
  minCutPiecePct: number;
  edgeSpikeSpacingIn: number;
  edgeRestraintPieceFt: number;
  beddingSandDepthIn: number;
  sandTonsPerYd3: number;
  jointSandLbPerFt2: number;
  jointSandBagLb: number;
};

export type PatioPlan = {
  outsideRadiusIn: number;
  borderWidthIn: number;
  /** Pieces in the border course (whole and cut). */
  borderUnitCount: number;
  /** Whole units (tapered or square-ended) in the course. */
  borderWholeCount: number;
  /** Cut pieces closing the course: 1, or 2 equal ones when one would be too narrow. */
  borderClosureCount: 1 | 2 | 0;
  /** Square-ended units with V-joints, or every unit cut one end θ off square. */
  borderLayout: "square" | "tapered";
  /** Taper cut at one end of every unit, degrees off square (null for square-ended units). */
  borderTaperDeg: number | null;
  /** Border saw cuts: one per tapered unit plus the closure pieces' cuts. */
  borderCuts: number;
  /** r = R − w: centre to the middle of the border units' inner faces, in. */
  borderInnerEdgeDistanceIn: number;
  /** Angle each whole border unit spans, degrees. */
  borderUnitAngleDeg: number;
  /** Open V-joint between border units at their outer faces, in (0 when tapered). */
  borderOuterJointIn: number;
  /** Length of each cut closure piece, at the face that touches (inner for square ends, outer for tapered), in. */
  lastBorderUnitLengthIn: number;
  /** Trammel radius for cutting the field pavers against the border, in. */
  fieldCutRadiusIn: number;
  fieldAreaFt2: number;
  /** Field plus border: everything that gets bedding and joint sand, ft². */
  pavedAreaFt2: number;
  /** Field pavers, waste included, each. */
  paverCount: number;
  /** Grid cells wholly inside the field, and cells a boundary circle crosses (each takes a whole paver). */
  wholePaverCount: number;
  cutPaverCount: number;
  /** Waste the count carries over the field's area in pavers, % (cuts and breakage). */
  paverWastePct: number;
  /** Edge restraint round the outside: length, pieces and spikes. */
  edgeRestraintIn: number;
  edgeRestraintPieces: number;
  edgeSpikes: number;
  beddingSandYd3: number;
  beddingSandTons: number;
  jointSandBags: number;
};

/**
 * Pavers on a stack-bond grid (l × w cells, a joint line through the centre) over the ring between
 * the radii `innerIn` and `outerIn`: cells wholly inside are whole pavers, cells a circle crosses
 * are cut ones (nearest and farthest points of a cell from the centre decide; derived here).
 */
export function countGridPavers(
  paver: { lengthIn: number; widthIn: number },
  innerIn: number,
  outerIn: number,
): { whole: number; cut: number } {
  const { lengthIn: lx, widthIn: ly } = paver;
  let whole = 0;
  let cut = 0;
  const nx = Math.ceil(outerIn / lx);
  const ny = Math.ceil(outerIn / ly);
  // One quadrant, times four: the grid is symmetric about both joint lines through the centre.
  for (let i = 0; i < nx; i++) {
    for (let k = 0; k < ny; k++) {
      const near = Math.hypot(i * lx, k * ly);
      const far = Math.hypot((i + 1) * lx, (k + 1) * ly);
      if (near >= outerIn - 1e-9 || far <= innerIn + 1e-9) continue;
      if (near >= innerIn - 1e-9 && far <= outerIn + 1e-9) whole++;
      else cut++;
    }
  }
  return { whole: 4 * whole, cut: 4 * cut };
}

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
    if (!Number.isFinite(value) || value <= 0)
      throw new PlanGeometryError(path, "This size must be a length above 0 in.");
  }
  const r = R - border.widthIn;
  // The border's inner edge must clear the pit's outside corners, or the field has no room at all.
  if (r <= pitOutsideCornerRadiusIn) {
    throw new PlanGeometryError(
      "patio.outsideRadiusIn",
      `The patio must reach past the pit and its border: its outside radius must be more than ${formatInches(pitOutsideCornerRadiusIn + border.widthIn)}.`,
    );
  }
  const l = border.lengthIn;
  const squareJointIn = (l * border.widthIn) / r;
  const tapered = squareJointIn > factors.borderMaxJointIn + 1e-9;
  // Square ends touch at the inner face (radius r); tapered units touch at the outer face (R).
  const touchRadius = tapered ? R : r;
  const unitAngle = 2 * Math.atan(l / (2 * touchRadius));
  const fullCount = Math.floor((2 * Math.PI) / unitAngle + 1e-9);
  const leftoverAngle = Math.max(0, 2 * Math.PI - fullCount * unitAngle);
  const pieceAt = (angle: number) => 2 * touchRadius * Math.tan(angle / 2);
  const leftoverIn = pieceAt(leftoverAngle);
  let borderWholeCount = fullCount;
  let borderClosureCount: 0 | 1 | 2 = 0;
  let lastBorderUnitLengthIn = l;
  if (leftoverIn > 1 / 8) {
    if (leftoverIn >= (l * factors.minCutPiecePct) / 100 - 1e-9) {
      borderClosureCount = 1;
      lastBorderUnitLengthIn = leftoverIn;
    } else {
      borderWholeCount = fullCount - 1;
      borderClosureCount = 2;
      lastBorderUnitLengthIn = pieceAt((leftoverAngle + unitAngle) / 2);
    }
  }
  const borderUnitCount = borderWholeCount + borderClosureCount;
  // A tapered unit takes one cut; a closure piece one more (a tapered one is cut at both ends).
  const borderCuts = (tapered ? borderWholeCount : 0) + borderClosureCount * (tapered ? 2 : 1);

  const pitFootprintIn2 = Math.PI * pitOutsideEdgeDistanceIn ** 2;
  const fieldAreaIn2 = Math.PI * r * r - pitFootprintIn2;
  const pavedAreaIn2 = Math.PI * R * R - pitFootprintIn2;
  const { whole: wholePaverCount, cut: cutPaverCount } = countGridPavers(paver, pitOutsideEdgeDistanceIn, r);
  const paverCount = Math.ceil((wholePaverCount + cutPaverCount) * (1 + factors.paverWasteFloorPct / 100) - 1e-9);
  const fieldPavers = fieldAreaIn2 / (paver.lengthIn * paver.widthIn);
  const edgeRestraintIn = 2 * Math.PI * R;
  const beddingSandYd3 = (pavedAreaIn2 * factors.beddingSandDepthIn) / IN3_PER_YD3;
  const pavedAreaFt2 = pavedAreaIn2 / IN2_PER_FT2;
  return {
    outsideRadiusIn: R,
    borderWidthIn: border.widthIn,
    borderUnitCount,
    borderWholeCount,
    borderClosureCount,
    borderLayout: tapered ? "tapered" : "square",
    borderTaperDeg: tapered ? (unitAngle * 180) / Math.PI : null,
    borderCuts,
    borderInnerEdgeDistanceIn: r,
    borderUnitAngleDeg: (unitAngle * 180) / Math.PI,
    borderOuterJointIn: tapered ? 0 : squareJointIn,
    lastBorderUnitLengthIn,
    fieldCutRadiusIn: r,
    fieldAreaFt2: fieldAreaIn2 / IN2_PER_FT2,
    pavedAreaFt2,
    paverCount,
    wholePaverCount,
    cutPaverCount,
    paverWastePct: fieldPavers > 0 ? (paverCount / fieldPavers - 1) * 100 : 0,
    edgeRestraintIn,
    edgeRestraintPieces: Math.ceil(edgeRestraintIn / (factors.edgeRestraintPieceFt * 12) - 1e-9),
    edgeSpikes: Math.ceil(edgeRestraintIn / factors.edgeSpikeSpacingIn - 1e-9),
    beddingSandYd3,
    beddingSandTons: beddingSandYd3 * factors.sandTonsPerYd3,
    jointSandBags: Math.max(0, Math.ceil((pavedAreaFt2 * factors.jointSandLbPerFt2) / factors.jointSandBagLb - 1e-9)),
  };
}
