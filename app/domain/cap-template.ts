/**
 * The full-size outline of one wedge cap on its rectangular blank, for a paper template the crew
 * tapes to a blank and marks from. Pure geometry in inches.
 *
 * Template frame: x runs along the blank's length from its inner-left corner, y runs across its
 * depth from the inner (fire-side) long edge outward. The pit centre sits at (L/2, −a1), since the
 * cap's inner edge is a1 from the centre (edge-distance convention, see caps.ts and ring.ts).
 * Corners follow from the marks: (L − c1)/2 in from each end on the inner edge, (L − c2)/2 on the
 * outer edge (regular-polygon chord c = 2a·tan(π/N), Machinery's Handbook, "Segments of a Circle").
 */
import type { CapPlan } from "~/domain/caps";

export type TemplatePoint = [x: number, y: number];

export type CapTemplateInput = Pick<
  CapPlan,
  | "count"
  | "blankLengthIn"
  | "blankDepthIn"
  | "capDepthIn"
  | "innerWidthIn"
  | "outerWidthIn"
  | "innerMarkIn"
  | "outerMarkIn"
  | "innerEdgeDistanceIn"
  | "outerEdgeDistanceIn"
  | "innerRadiusIn"
  | "outerRadiusIn"
  | "ripToDepthIn"
  | "jointIn"
  | "innerArcDeg"
  | "outerArcDeg"
>;

export type CapTemplate = {
  blankLengthIn: number;
  blankDepthIn: number;
  /** The finished cap's depth: the blank's, or the rip depth. */
  capDepthIn: number;
  /** y of the rip line, or null when the blank's whole depth is used. */
  ripLineIn: number | null;
  /** The cut outline, inner-left, inner-right, outer-right, outer-left (straight edges). */
  corners: [TemplatePoint, TemplatePoint, TemplatePoint, TemplatePoint];
  /** The pit centre in the template frame (off the blank, toward the fire). */
  centre: TemplatePoint;
  /** Optional arced inner edge through both inner corners, radius innerRadiusIn, sampled left to right. */
  innerArc: TemplatePoint[];
  /** Optional arced outer edge at radius a2, from side cut to side cut, sampled left to right. */
  outerArc: TemplatePoint[];
};

const ARC_SAMPLES = 40;

function sampleArc(centre: TemplatePoint, radiusIn: number, halfAngle: number): TemplatePoint[] {
  const points: TemplatePoint[] = [];
  for (let i = 0; i <= ARC_SAMPLES; i++) {
    // Angle measured from the radial line through the middle of the cap (the template's +y axis).
    const t = -halfAngle + (2 * halfAngle * i) / ARC_SAMPLES;
    points.push([centre[0] + radiusIn * Math.sin(t), centre[1] + radiusIn * Math.cos(t)]);
  }
  return points;
}

/** Lays one cap out on its blank (in, unrounded): corners from the marks, arcs from the pit centre. */
export function layoutCapTemplate(caps: CapTemplateInput): CapTemplate {
  const l = caps.blankLengthIn;
  const d = caps.capDepthIn;
  const m1 = caps.innerMarkIn;
  const m2 = caps.outerMarkIn;
  const centre: TemplatePoint = [l / 2, -caps.innerEdgeDistanceIn];
  // Each arc runs between the side cuts (the angles the cap plan gives, see caps.ts), never past them.
  const innerHalf = (caps.innerArcDeg * Math.PI) / 360;
  const outerHalf = (caps.outerArcDeg * Math.PI) / 360;
  return {
    blankLengthIn: l,
    blankDepthIn: caps.blankDepthIn,
    capDepthIn: d,
    ripLineIn: caps.ripToDepthIn,
    corners: [
      [m1, 0],
      [l - m1, 0],
      [l - m2, d],
      [m2, d],
    ],
    centre,
    innerArc: sampleArc(centre, caps.innerRadiusIn, innerHalf),
    outerArc: sampleArc(centre, caps.outerRadiusIn, outerHalf),
  };
}
