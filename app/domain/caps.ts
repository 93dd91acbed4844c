/**
 * Wedge (keystone) caps cut from rectangular blanks, all identical, ringing the top of the wall.
 *
 * Edge-distance convention as in ring.ts: distances from the pit centre to the middle of an edge.
 * The blank's long edges run along the ring; its depth W runs radially. With the wall's back edge
 * distance a and inner overhang o_i (measured from the middle of the wall's back face):
 *   inner edge a1 = a − o_i, outer edge a2 = a1 + W, outer overhang o_o = W − T − o_i.
 * Each side cut sits j/2 off the radial joint line, which shortens every chord by j / cos(π/N)
 * (derived here from the regular-polygon chord c = 2a·tan(π/N), Machinery's Handbook,
 * "Segments of a Circle"). The cap count is the smallest N ≥ 3 whose outer width fits the blank
 * with every mark at least the company's minimum from a corner (factory corners chip and are rarely
 * square), since fewer caps means fewer cuts and less waste; a count that matches the wall's units
 * (or divides them) is preferred when it fits and wastes at most a few points more, so cap joints
 * can sit centred over the units (common practice, no source).
 *
 * Arcs: every edge of a cap ends on its two side cuts. A side cut runs parallel to the radial joint
 * line at π/N, j/2 inside it, so a circle of radius r meets it at β = π/N − asin(j/(2r)) from the
 * cap's centre line (derived here); the arc between the cuts subtends 2β, its chord is 2r·sin β,
 * its rise h = r(1 − cos β) and its length l = π·r·(2β in degrees)/180 (Machinery's Handbook,
 * "Segments of a Circle").
 */
import { PlanGeometryError } from "~/domain/plan-geometry-error";
import { EPS as EPS_IN } from "~/domain/tolerance";
import { formatInches } from "~/domain/units";

const MIN_CAPS = 3;
// Far beyond any real pit (a 600 in ring of 4 in blanks needs under 1000), it only stops the search.
const MAX_CAPS = 2000;

export type CapBlank = {
  /** Blank length L, laid along the ring, in. */
  lengthIn: number;
  /** Blank depth W, across the wall, in. */
  depthIn: number;
  thicknessIn: number;
  /** o_i: how far the cap reaches past the wall's back face toward the fire, in. */
  innerOverhangIn: number;
  /** o_o when asked for: the blank is ripped to T + o_i + o_o deep. Otherwise the whole depth is used. */
  outerOverhangIn?: number;
};

export type CapPlan = {
  /** N_c: caps in the ring, all identical. */
  count: number;
  blankLengthIn: number;
  blankDepthIn: number;
  thicknessIn: number;
  /** Depth of the finished cap (blank depth, or the rip depth), in. */
  capDepthIn: number;
  /** c1: straight inner edge, in. */
  innerWidthIn: number;
  /** c2: straight outer edge, in. */
  outerWidthIn: number;
  /** (L − c1)/2: mark in from each corner along the inner long edge, in. */
  innerMarkIn: number;
  /** (L − c2)/2: mark in from each corner along the outer long edge, in. */
  outerMarkIn: number;
  /** Each side cut runs this far off square to the long edges: 180/N_c degrees. */
  offSquareDeg: number;
  /** Length of each side cut, W / cos(π/N_c), in. */
  sideCutLengthIn: number;
  innerOverhangIn: number;
  outerOverhangIn: number;
  /** a1: centre to the middle of the caps' inner edges, in. */
  innerEdgeDistanceIn: number;
  /** a2: centre to the middle of the caps' outer edges, in. */
  outerEdgeDistanceIn: number;
  /** Trammel radius for an arced inner edge: the arc through the cap's two inner corners, in. */
  innerRadiusIn: number;
  /** Trammel radius for an arced outer edge: a2, the arc through the middle of the outer edge, in. */
  outerRadiusIn: number;
  /** How far the inner arc bows into the cap past the straight inner edge, at its middle, in. */
  innerSagittaIn: number;
  /** Rise of the outer arc above its chord between the side cuts, r(1 − cos β), in. */
  outerSagittaIn: number;
  /** Along each side cut, from the outer corner to where the arced outer edge meets it, in. */
  outerCornerTrimIn: number;
  /** Angle each arc subtends at the pit centre between the two side cuts, degrees. */
  innerArcDeg: number;
  outerArcDeg: number;
  /** Arc lengths along the curved edges, in. */
  innerArcLengthIn: number;
  outerArcLengthIn: number;
  /** Rip each blank to this depth before the side cuts, in; null when the whole depth is used. */
  ripToDepthIn: number | null;
  /** Share of each blank that ends as offcut, 0–1 (trapezoid area against the whole blank). */
  offcutShare: number;
  /** Extra blanks for breakage and a bad cut. */
  spares: number;
  jointIn: number;
  /** Centre to the caps' outer corners, in: the cap ring's footprint reaches this far. */
  outerCornerRadiusIn: number;
  /** c1/2 and c2/2: marks each side of the blank's centre line (for blanks that are not exactly nominal), in. */
  innerHalfWidthIn: number;
  outerHalfWidthIn: number;
  /** The fewest caps that fit, and the offcut share of that count (0–1), shown beside the chosen count. */
  fewestCount: number;
  fewestOffcutShare: number;
  /** Why this count: the fewest that fit, or a count matching the wall's units (or dividing them). */
  countReason: "fewest" | "matches-wall";
  /**
   * Overhangs along a straight cap against the wall's faces, whatever the caps' turn over the units,
   * in (negative: the wall shows). Outer: least where the cap's mid-edge passes a wall corner, most
   * at a cap corner over a mid-face. Inner (toward the fire): least at a cap corner over the middle
   * of a unit's back, most at the cap's mid-edge over a back corner.
   */
  overhangRange: { outerMinIn: number; outerMaxIn: number; innerMinIn: number; innerMaxIn: number };
  /** The same with arced edges: inner struck at innerRadiusIn, outer at a2. */
  arcedOverhangRange: { outerMinIn: number; outerMaxIn: number; innerMinIn: number; innerMaxIn: number };
};

/** Width (in) of a cap edge at edge distance r for n caps with joint j: 2r·tan(π/n) − j/cos(π/n). */
export function capEdgeWidth(edgeDistanceIn: number, capCount: number, jointIn: number): number {
  const half = Math.PI / capCount;
  return 2 * edgeDistanceIn * Math.tan(half) - jointIn / Math.cos(half);
}

/** Share of a blank L × W lost when a cap of widths c1, c2 and depth d is cut from it (0–1). */
function offcutOf(c1: number, c2: number, depthIn: number, l: number, w: number): number {
  return 1 - (((c1 + c2) / 2) * depthIn) / (l * w);
}

/** Plans the cap ring on a wall with back edge distance a and depth T (all in, degrees; unrounded). */
export function planCaps(args: {
  edgeDistanceIn: number;
  wallDepthIn: number;
  cap: CapBlank;
  jointIn: number;
  spares: number;
  /** No mark closer than this to a blank's corner, in (0: the factory corner may be used). */
  minMarkIn?: number;
  /** Pieces in the wall's top course; with it a matching cap count is preferred and overhangs are ranged. */
  wallSides?: number;
  /** Centre to the wall's outside and back corners, in (for the overhang range). */
  wallOutsideCornerRadiusIn?: number;
  wallBackCornerRadiusIn?: number;
  /** A matching count may waste at most this many more points of each blank than the fewest, %. */
  matchMaxExtraOffcutPct?: number;
}): CapPlan {
  const { edgeDistanceIn: a, wallDepthIn: t, cap, jointIn: j, spares } = args;
  const minMarkIn = args.minMarkIn ?? 0;
  const { lengthIn: l, depthIn: w, innerOverhangIn: oi } = cap;
  const positive: [keyof CapBlank, string][] = [
    ["lengthIn", "length"],
    ["depthIn", "depth"],
    ["thicknessIn", "thickness"],
  ];
  for (const [key, label] of positive) {
    const value = cap[key] as number;
    if (!Number.isFinite(value) || value <= 0) {
      throw new PlanGeometryError(`cap.${key}`, `The cap's ${label} must be a length above 0 in.`);
    }
  }
  if (!Number.isFinite(oi) || oi < 0) {
    throw new PlanGeometryError("cap.innerOverhangIn", "The inner overhang must be 0 in or more.");
  }
  if (!Number.isFinite(j) || j < 0) {
    throw new PlanGeometryError("jointIn", "The joint must be 0 in or more.");
  }
  const a1 = a - oi;
  if (a1 <= EPS_IN) {
    throw new PlanGeometryError(
      "cap.innerOverhangIn",
      `The bowl is too small for this inner overhang: the caps would meet in the middle. Keep the overhang under ${formatInches(a)}.`,
    );
  }

  let capDepthIn = w;
  let ripToDepthIn: number | null = null;
  if (cap.outerOverhangIn !== undefined) {
    const oo = cap.outerOverhangIn;
    if (!Number.isFinite(oo) || oo < 0) {
      throw new PlanGeometryError("cap.outerOverhangIn", "The outer overhang must be 0 in or more.");
    }
    const neededIn = t + oi + oo;
    if (neededIn > w + EPS_IN) {
      throw new PlanGeometryError(
        "cap.outerOverhangIn",
        `A ${formatInches(oo)} outer overhang needs blanks at least ${formatInches(neededIn)} deep; these are ${formatInches(w)}. The most these blanks give is ${formatInches(Math.max(0, w - t - oi))}.`,
      );
    }
    capDepthIn = neededIn;
    if (neededIn < w - EPS_IN) ripToDepthIn = neededIn;
  }
  // A cap must rest on at least half the wall's depth; a shorter outer reach is only a warning.
  if (capDepthIn - oi < t / 2 - EPS_IN) {
    throw new PlanGeometryError(
      "cap.depthIn",
      `The cap is not deep enough to sit on the wall: with a ${formatInches(oi)} inner overhang it needs to be at least ${formatInches(oi + t / 2)} deep to rest on half the wall, and ${formatInches(oi + t)} to cover it.`,
    );
  }
  const a2 = a1 + capDepthIn;

  const usableIn = l - 2 * minMarkIn;
  let fewestCount = MIN_CAPS;
  while (fewestCount <= MAX_CAPS && capEdgeWidth(a2, fewestCount, j) > usableIn + EPS_IN) fewestCount++;
  if (fewestCount > MAX_CAPS) {
    throw new PlanGeometryError("cap.lengthIn", "The cap blanks are too short for this ring.");
  }
  const offcutFor = (n: number) => offcutOf(capEdgeWidth(a1, n, j), capEdgeWidth(a2, n, j), capDepthIn, l, w);
  const fewestOffcutShare = offcutFor(fewestCount);
  let count = fewestCount;
  let countReason: CapPlan["countReason"] = "fewest";
  const sides = args.wallSides;
  if (sides !== undefined && sides >= MIN_CAPS && sides % fewestCount !== 0) {
    const extra = (args.matchMaxExtraOffcutPct ?? 0) / 100;
    for (let n = fewestCount + 1; n <= sides; n++) {
      if (sides % n !== 0) continue;
      if (offcutFor(n) <= fewestOffcutShare + extra + EPS_IN) {
        count = n;
        countReason = "matches-wall";
      }
      break;
    }
  } else if (sides !== undefined && sides % fewestCount === 0) {
    countReason = "matches-wall";
  }
  const c1 = capEdgeWidth(a1, count, j);
  const c2 = capEdgeWidth(a2, count, j);
  if (c1 <= EPS_IN) {
    throw new PlanGeometryError(
      "cap.innerOverhangIn",
      "The caps would come to a point at their inner edge: make the inner overhang or the joint smaller.",
    );
  }

  const half = Math.PI / count;
  // Inner arc: struck through both inner corners from the pit centre, so it only removes stone
  // (the arc bows outward, into the cap); its ends are the corners, on the side cuts. Outer arc:
  // struck at a2 through the middle of the outer edge, cutting the corners back to the side cuts.
  const innerRadiusIn = Math.hypot(a1, c1 / 2);
  const halfArcBetweenCuts = (r: number) => half - Math.asin(Math.min(1, j / (2 * r)));
  const innerHalfArc = halfArcBetweenCuts(innerRadiusIn);
  const outerRadiusIn = a2;
  const outerHalfArc = halfArcBetweenCuts(a2);
  const outerArcEnd: [number, number] = [a2 * Math.sin(outerHalfArc), a2 * Math.cos(outerHalfArc)];
  const outerCornerTrimIn = Math.hypot(c2 / 2 - outerArcEnd[0], a2 - outerArcEnd[1]);
  const outerCornerRadiusIn = Math.hypot(a2, c2 / 2);
  const wallOutside = t + a;
  const wallOutsideCorner = args.wallOutsideCornerRadiusIn ?? wallOutside;
  const wallBackCorner = args.wallBackCornerRadiusIn ?? a;
  const overhangRange = {
    outerMinIn: a2 - wallOutsideCorner,
    outerMaxIn: outerCornerRadiusIn - wallOutside,
    innerMinIn: a - innerRadiusIn,
    innerMaxIn: wallBackCorner - a1,
  };
  const arcedOverhangRange = {
    outerMinIn: a2 - wallOutsideCorner,
    outerMaxIn: a2 - wallOutside,
    innerMinIn: a - innerRadiusIn,
    innerMaxIn: wallBackCorner - innerRadiusIn,
  };
  return {
    count,
    blankLengthIn: l,
    blankDepthIn: w,
    thicknessIn: cap.thicknessIn,
    capDepthIn,
    innerWidthIn: c1,
    outerWidthIn: c2,
    innerMarkIn: (l - c1) / 2,
    outerMarkIn: (l - c2) / 2,
    offSquareDeg: 180 / count,
    sideCutLengthIn: capDepthIn / Math.cos(half),
    innerOverhangIn: oi,
    outerOverhangIn: capDepthIn - t - oi,
    innerEdgeDistanceIn: a1,
    outerEdgeDistanceIn: a2,
    innerRadiusIn,
    outerRadiusIn,
    innerSagittaIn: innerRadiusIn * (1 - Math.cos(innerHalfArc)),
    outerSagittaIn: a2 * (1 - Math.cos(outerHalfArc)),
    outerCornerTrimIn,
    innerArcDeg: (2 * innerHalfArc * 180) / Math.PI,
    outerArcDeg: (2 * outerHalfArc * 180) / Math.PI,
    innerArcLengthIn: innerRadiusIn * 2 * innerHalfArc,
    outerArcLengthIn: outerRadiusIn * 2 * outerHalfArc,
    ripToDepthIn,
    offcutShare: offcutOf(c1, c2, capDepthIn, l, w),
    spares,
    jointIn: j,
    outerCornerRadiusIn,
    innerHalfWidthIn: c1 / 2,
    outerHalfWidthIn: c2 / 2,
    fewestCount,
    fewestOffcutShare,
    countReason,
    overhangRange,
    arcedOverhangRange,
  };
}
