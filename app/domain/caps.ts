/**
 * Wedge (keystone) caps cut from rectangular blanks, all identical, ringing the top of the wall.
 *
 * Edge-distance convention as in ring.ts: distances from the pit centre to the middle of an edge.
 * The blank's long edges run along the ring; its depth W runs radially. With the wall's back edge
 * distance a and inner overhang o_i (measured from the middle of the wall's back face):
 *   inner edge a1 = a − o_i, outer edge a2 = a1 + W, outer overhang o_o = W − T − o_i.
 * Each side cut sits j/2 off the radial joint line, which shortens every chord by j / cos(π/N)
 * (derived here from the regular-polygon chord c = 2a·tan(π/N), Machinery's Handbook,
 * "Segments of a Circle"). The cap count is the smallest N ≥ 3 whose outer width fits the blank,
 * since fewer caps means fewer cuts and less waste (common practice, no source).
 */
import { PlanGeometryError } from "~/domain/plan-geometry-error";
import { formatInches } from "~/domain/units";

const MIN_CAPS = 3;
// Far beyond any real pit (a 600 in ring of 4 in blanks needs under 1000), it only stops the search.
const MAX_CAPS = 2000;
const EPS_IN = 1e-9;

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
  /** How far the outer arc falls short of the straight outer edge at each corner, in. */
  outerSagittaIn: number;
  /** Angle each arc subtends at the pit centre, degrees. */
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
};

/** Width (in) of a cap edge at edge distance r for n caps with joint j: 2r·tan(π/n) − j/cos(π/n). */
export function capEdgeWidth(edgeDistanceIn: number, capCount: number, jointIn: number): number {
  const half = Math.PI / capCount;
  return 2 * edgeDistanceIn * Math.tan(half) - jointIn / Math.cos(half);
}

/** Plans the cap ring on a wall with back edge distance a and depth T (all in, degrees; unrounded). */
export function planCaps(args: {
  edgeDistanceIn: number;
  wallDepthIn: number;
  cap: CapBlank;
  jointIn: number;
  spares: number;
}): CapPlan {
  const { edgeDistanceIn: a, wallDepthIn: t, cap, jointIn: j, spares } = args;
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

  let count = MIN_CAPS;
  while (count <= MAX_CAPS && capEdgeWidth(a2, count, j) > l + EPS_IN) count++;
  if (count > MAX_CAPS) {
    throw new PlanGeometryError("cap.lengthIn", "The cap blanks are too short for this ring.");
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
  // (the arc bows outward, into the cap). Outer arc: struck at a2 through the middle of the outer
  // edge, cutting the corners back. Sagitta h = r − √(r² − (c/2)²) (Machinery's Handbook,
  // "Segments of a Circle"), with the arc's half-angle from sin(α/2) = (c/2)/r.
  const innerRadiusIn = Math.hypot(a1, c1 / 2);
  const innerHalfArc = Math.atan2(c1 / 2, a1);
  const outerRadiusIn = a2;
  const outerHalfArc = Math.asin(Math.min(1, c2 / 2 / a2));
  const capAreaIn2 = ((c1 + c2) / 2) * capDepthIn;
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
    innerSagittaIn: innerRadiusIn - a1,
    outerSagittaIn: a2 - Math.sqrt(a2 * a2 - (c2 / 2) ** 2),
    innerArcDeg: (2 * innerHalfArc * 180) / Math.PI,
    outerArcDeg: (2 * outerHalfArc * 180) / Math.PI,
    innerArcLengthIn: innerRadiusIn * 2 * innerHalfArc,
    outerArcLengthIn: outerRadiusIn * 2 * outerHalfArc,
    ripToDepthIn,
    offcutShare: 1 - capAreaIn2 / (l * w),
    spares,
    jointIn: j,
    outerCornerRadiusIn: Math.hypot(a2, c2 / 2),
  };
}
