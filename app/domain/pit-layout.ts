/**
 * Layout of every piece the pit preview draws, shared by the 3D scene and the 2D plan.
 * Pure TypeScript: no three.js here, so the plan drawing (rendered on the server too) can use it.
 *
 * Units: inches everywhere, and one scene unit is one inch (a 100 in patio is a 100-unit scene;
 * the camera's near/far planes are set for that).
 *
 * Coordinates:
 * - Plan: x east, y north, angles counter-clockwise from +x in radians (the usual maths frame).
 * - Scene (three.js, y up): scene x = plan x, scene z = −plan y, height is scene y, and a turn of
 *   θ about the vertical axis (`rotationY`) points a part's local radial axis along plan angle θ.
 * - Part outlines are given in a local frame: u radially outward from the part's origin, v along
 *   the ring (counter-clockwise). The origin of a wall unit is the middle of its back face, of a
 *   cap the middle of its inner edge, of a firebrick or border unit the middle of its inner face.
 *
 * Edge-distance convention (as in app/domain/ring.ts): a is the distance from the centre to the
 * middle of a wall unit's back face, so each unit's origin sits exactly at distance a on its radial
 * line, whether the ring is face-limited (V-gap at the back) or back-limited (V-joint at the face).
 */
import { firebrickInnerEdgeDistance } from "~/domain/liner";
import { EPS } from "~/domain/tolerance";

export type PitSceneInput = {
  wallUnit: { faceIn: number; backIn: number; depthIn: number; heightIn: number; colourHex: string };
  ring: {
    unitCount: number;
    courses: number;
    edgeDistanceIn: number;
    runningBondDeg: number;
    closure: null | { faceWidthIn: number; backWidthIn: number; angleDeg: number; countPerCourse: 1 | 2 };
  };
  caps: null | {
    count: number;
    innerWidthIn: number;
    outerWidthIn: number;
    innerEdgeDistanceIn: number;
    outerEdgeDistanceIn: number;
    thicknessIn: number;
    colourHex: string;
  };
  liner:
    | { kind: "none" }
    | { kind: "steel-ring"; outsideDiameterIn: number; heightIn: number }
    /** Bricks on edge: lengthIn along the ring, widthIn upright (one row), heightIn radial. */
    | { kind: "firebrick"; perRow: number; rows: number; lengthIn: number; widthIn: number; heightIn: number };
  /**
   * The border course as the engine laid it (app/domain/patio.ts): `borderWholeCount` units each
   * spanning `borderUnitAngleDeg` (square ends touching at the inner face, or ends cut so they touch
   * at the outer face), then `borderClosureCount` cut pieces sharing the rest of the circle, each
   * `lastBorderUnitLengthIn` long at the face that touches; `borderUnitLengthIn` is the unit's own length.
   */
  patio: null | {
    outsideRadiusIn: number;
    borderWidthIn: number;
    borderInnerEdgeDistanceIn: number;
    borderWholeCount: number;
    borderClosureCount: number;
    borderUnitAngleDeg: number;
    borderUnitLengthIn: number;
    lastBorderUnitLengthIn: number;
    borderColourHex: string;
    fieldColourHex: string;
  };
  /** Radius of the compacted base under the pit, from the plan (drawn when there is no patio), in. */
  basePadRadiusIn: number;
};

/** A point in plan, in (x east, y north). */
export type PlanPoint = [x: number, y: number];
export type PlanPolygon = PlanPoint[];

/** One instance of a repeated part: its origin in scene coordinates (in) and its turn about the vertical (rad). */
export type PartPlacement = {
  x: number;
  /** Height of the part's underside above the base, in. */
  y: number;
  z: number;
  rotationY: number;
  /** Course (wall units), row (firebrick) or 0 (caps, border units). */
  layer: number;
};

export type WallPlacements = { whole: PartPlacement[]; closures: PartPlacement[] };

/** Colours used when an input colour is missing or not a plain #rrggbb string: the one definition. */
export const FALLBACK_COLOURS = {
  wall: "#978873",
  cap: "#d6c9b7",
  border: "#8c7f70",
  field: "#c9bca9",
} as const;

/** Firebrick and gravel are not chosen by the contractor; these read as buff brick and grey stone. */
export const FIREBRICK_COLOUR = "#d8b98a";
export const GRAVEL_COLOUR = "#7d776f";
export const STEEL_RING_COLOUR = "#4f4843";

const DEG = Math.PI / 180;

/** Returns `hex` when it is a #rrggbb colour, else `fallback` (inputs may come from stored catalogue rows). */
export function pickColour(hex: string | undefined, fallback: string): string {
  return typeof hex === "string" && /^#[0-9a-f]{6}$/i.test(hex) ? hex : fallback;
}

function wholeCount(n: number): number {
  return Number.isFinite(n) ? Math.max(0, Math.floor(n)) : 0;
}

/** Scene placement of a part whose origin lies at `distanceIn` from the centre on plan angle `angleRad`. */
function placeOnRadius(distanceIn: number, angleRad: number, heightIn: number, layer: number): PartPlacement {
  return {
    x: distanceIn * Math.cos(angleRad),
    y: heightIn,
    // Scene z points south: plan y = −z.
    z: -distanceIn * Math.sin(angleRad),
    rotationY: angleRad,
    layer,
  };
}

/** Plan angle (rad) a placement's radial axis points along; the inverse of `rotationY`'s meaning. */
export function planAngleOf(placement: PartPlacement): number {
  return Math.atan2(-placement.z, placement.x);
}

/** Converts a part's local outline (u radial, v along the ring, in) to plan coordinates (in) at its placement. */
export function toPlanPolygon(outline: PlanPolygon, placement: PartPlacement): PlanPolygon {
  const c = Math.cos(placement.rotationY);
  const s = Math.sin(placement.rotationY);
  const ox = placement.x;
  const oy = -placement.z;
  return outline.map(([u, v]) => [ox + u * c - v * s, oy + u * s + v * c]);
}

/*
 * Clips a local outline to the wedge of half-angle `halfAngle` whose apex is the pit centre, i.e.
 * the local point (−originDistance, 0). Sutherland–Hodgman against the wedge's two radial lines.
 * This is the cut a mason makes along radial lines: a closure unit, or the back corners trimmed off
 * whole units laid tighter than their backs allow.
 */
function clipToWedge(outline: PlanPolygon, originDistanceIn: number, halfAngle: number): PlanPolygon {
  if (halfAngle >= Math.PI / 2 - EPS) return outline;
  const sin = Math.sin(halfAngle);
  const cos = Math.cos(halfAngle);
  // Signed distance inside each radial line (positive = inside the wedge), in radial coordinates.
  const sides = [
    (p: PlanPoint) => (p[0] + originDistanceIn) * sin - p[1] * cos,
    (p: PlanPoint) => (p[0] + originDistanceIn) * sin + p[1] * cos,
  ];
  let polygon = outline;
  for (const inside of sides) {
    const next: PlanPolygon = [];
    for (let i = 0; i < polygon.length; i++) {
      const p = polygon[i];
      const q = polygon[(i + 1) % polygon.length];
      const dp = inside(p);
      const dq = inside(q);
      if (dp >= -EPS) next.push(p);
      if ((dp > EPS && dq < -EPS) || (dp < -EPS && dq > EPS)) {
        const t = dp / (dp - dq);
        next.push([p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])]);
      }
    }
    polygon = next;
  }
  // Drop repeated corners (a radial line through a corner yields it twice).
  return polygon.filter((p, i) => {
    const q = polygon[(i + 1) % polygon.length];
    return Math.hypot(p[0] - q[0], p[1] - q[1]) > 1e-7;
  });
}

/** The uncut tapered unit: back B at u = 0, face F at u = T (in), counter-clockwise. */
function uncutWallUnitOutline(wallUnit: PitSceneInput["wallUnit"]): PlanPolygon {
  const { faceIn: f, backIn: b, depthIn: t } = wallUnit;
  return [
    [0, -b / 2],
    [t, -f / 2],
    [t, f / 2],
    [0, b / 2],
  ];
}

/** Closure units in each course (0 when the ring has none). */
export function countClosuresPerCourse(ring: PitSceneInput["ring"]): number {
  return ring.closure ? ring.closure.countPerCourse : 0;
}

/**
 * Angle (rad) between neighbouring whole units. Without a closure the units share the circle
 * equally, 2π/N; with one, the closure pieces take their own angle and the whole units share the
 * rest (which is the unit angle the ring was planned with, so the closure fills exactly the leftover).
 */
export function measureUnitStepRad(ring: PitSceneInput["ring"]): number {
  const n = wholeCount(ring.unitCount);
  if (n === 0) return 0;
  const closureRad = ring.closure ? ring.closure.angleDeg * DEG * ring.closure.countPerCourse : 0;
  return Math.max(0, 2 * Math.PI - closureRad) / n;
}

/**
 * Local outline of a whole wall unit (in). The unit is clipped to its own wedge, so where the ring
 * is laid tighter than the backs allow, its back corners come out trimmed (as on site); in an
 * ordinary whole-unit ring nothing is cut.
 */
export function outlineWallUnit(input: PitSceneInput): PlanPolygon {
  const step = measureUnitStepRad(input.ring);
  const outline = uncutWallUnitOutline(input.wallUnit);
  return step > 0 ? clipToWedge(outline, input.ring.edgeDistanceIn, step / 2) : outline;
}

/**
 * Local outline of a closure unit (in): a whole unit cut along the two radial lines that bound the
 * closure's angle. Its face and back widths follow from that angle (they match the closure's
 * stated widths for a ring planned by app/domain/ring.ts). Null when the ring has no closure.
 */
export function outlineClosureUnit(input: PitSceneInput): PlanPolygon | null {
  const closure = input.ring.closure;
  if (!closure || !(closure.angleDeg > 0)) return null;
  return clipToWedge(uncutWallUnitOutline(input.wallUnit), input.ring.edgeDistanceIn, (closure.angleDeg * DEG) / 2);
}

/** Local outline of a cap (in): inner width c1 at u = 0, outer width c2 at u = a2 − a1. Null without caps. */
export function outlineCap(input: PitSceneInput): PlanPolygon | null {
  const caps = input.caps;
  if (!caps) return null;
  const depth = caps.outerEdgeDistanceIn - caps.innerEdgeDistanceIn;
  return [
    [0, -caps.innerWidthIn / 2],
    [depth, -caps.outerWidthIn / 2],
    [depth, caps.outerWidthIn / 2],
    [0, caps.innerWidthIn / 2],
  ];
}

/** Local outline of a firebrick on edge (in): radial thickness by length. Null without firebrick. */
export function outlineFirebrick(input: PitSceneInput): PlanPolygon | null {
  const liner = input.liner;
  if (liner.kind !== "firebrick") return null;
  const half = liner.lengthIn / 2;
  return [
    [0, -half],
    [liner.heightIn, -half],
    [liner.heightIn, half],
    [0, half],
  ];
}

type PatioInput = NonNullable<PitSceneInput["patio"]>;

/** Centre to the middle of the border units' inner faces, r = R − w (in), as the engine placed them. */
export function measureBorderInnerRadius(patio: PatioInput): number {
  return patio.borderInnerEdgeDistanceIn;
}

/** Angle (rad) each closure piece of the border spans: what the whole units leave of the circle, shared. */
function measureBorderClosureRad(patio: PatioInput): number {
  const closures = wholeCount(patio.borderClosureCount);
  if (closures === 0) return 0;
  return Math.max(0, 2 * Math.PI - wholeCount(patio.borderWholeCount) * patio.borderUnitAngleDeg * DEG) / closures;
}

/**
 * A border piece (in): a unit `lengthIn` long and w deep, inner face at u = 0, cut along the radial
 * lines of its share of the circle. Square-ended pieces touch at the inner corners and lose nothing;
 * pieces laid to touch at the outer face lose their inner corners, as their cut ends do on site.
 */
function outlineBorderPiece(patio: PatioInput, lengthIn: number, spanRad: number): PlanPolygon {
  const half = lengthIn / 2;
  const w = patio.borderWidthIn;
  const piece: PlanPolygon = [
    [0, -half],
    [w, -half],
    [w, half],
    [0, half],
  ];
  return spanRad > 0 ? clipToWedge(piece, measureBorderInnerRadius(patio), spanRad / 2) : piece;
}

/** Local outline of a whole border unit (in). Null without a patio. */
export function outlineBorderUnit(input: PitSceneInput): PlanPolygon | null {
  const patio = input.patio;
  return patio ? outlineBorderPiece(patio, patio.borderUnitLengthIn, patio.borderUnitAngleDeg * DEG) : null;
}

/** Local outline of a cut piece that closes the border course (in). Null without a patio or closures. */
export function outlineBorderClosure(input: PitSceneInput): PlanPolygon | null {
  const patio = input.patio;
  if (!patio || wholeCount(patio.borderClosureCount) === 0) return null;
  return outlineBorderPiece(patio, patio.lastBorderUnitLengthIn, measureBorderClosureRad(patio));
}

/** Turn (rad) of a course: every other course turns by the running bond so joints never line up. */
export function measureCourseTurnRad(ring: PitSceneInput["ring"], course: number): number {
  return course % 2 === 1 ? ring.runningBondDeg * DEG : 0;
}

/**
 * Every wall unit of every course (scene in, rad). In course k, whole unit i is centred on
 * turn(k) + i·step; the closure units follow the last whole unit and fill the rest of the circle.
 * Without a closure step = 2π/N, so units stand on 2πi/N (+ the running bond on odd courses).
 */
export function placeWallUnits(input: PitSceneInput): WallPlacements {
  const { ring, wallUnit } = input;
  const n = wholeCount(ring.unitCount);
  const courses = wholeCount(ring.courses);
  const closure = ring.closure;
  const closureRad = closure ? closure.angleDeg * DEG : 0;
  const closureCount = closureRad > 0 ? countClosuresPerCourse(ring) : 0;
  const step = measureUnitStepRad(ring);
  const a = ring.edgeDistanceIn;
  const whole: PartPlacement[] = [];
  const closures: PartPlacement[] = [];
  for (let k = 0; k < courses; k++) {
    const turn = measureCourseTurnRad(ring, k);
    const y = k * wallUnit.heightIn;
    for (let i = 0; i < n; i++) whole.push(placeOnRadius(a, turn + i * step, y, k));
    // The last whole unit ends half a step past its centre; the closures start there.
    let start = turn + (n - 0.5) * step;
    for (let j = 0; j < closureCount; j++) {
      closures.push(placeOnRadius(a, start + closureRad / 2, y, k));
      start += closureRad;
    }
  }
  return { whole, closures };
}

/** Height (in) of the top of the wall below the caps: courses × unit height. */
export function measureWallTopIn(input: PitSceneInput): number {
  return wholeCount(input.ring.courses) * input.wallUnit.heightIn;
}

/** The caps, centred on 2πi/N_c with their inner-edge middles at a1, on top of the wall (scene in, rad). */
export function placeCaps(input: PitSceneInput): PartPlacement[] {
  const caps = input.caps;
  if (!caps) return [];
  const n = wholeCount(caps.count);
  const y = measureWallTopIn(input);
  return Array.from({ length: n }, (_, i) => placeOnRadius(caps.innerEdgeDistanceIn, (2 * Math.PI * i) / n, y, 0));
}

/**
 * Centre to the middle of the firebrick's fire-side faces (in): fire-side corners touching,
 * a_in = L / (2·tan(π/M)), the model of app/domain/liner.ts. 0 when there is no firebrick.
 */
export function measureFirebrickInnerEdgeDistance(input: PitSceneInput): number {
  const liner = input.liner;
  if (liner.kind !== "firebrick" || wholeCount(liner.perRow) < 3) return 0;
  return firebrickInnerEdgeDistance(liner.lengthIn, wholeCount(liner.perRow));
}

/** The firebrick, row by row from the bowl floor, odd rows turned half a brick (scene in, rad). */
export function placeFirebrick(input: PitSceneInput): PartPlacement[] {
  const liner = input.liner;
  if (liner.kind !== "firebrick") return [];
  const m = wholeCount(liner.perRow);
  const rows = wholeCount(liner.rows);
  if (m < 3) return [];
  const r = measureFirebrickInnerEdgeDistance(input);
  const placements: PartPlacement[] = [];
  for (let row = 0; row < rows; row++) {
    // Bricks are bonded like the wall: joints of one row land on the middles of the row below.
    const turn = row % 2 === 1 ? Math.PI / m : 0;
    for (let i = 0; i < m; i++)
      placements.push(placeOnRadius(r, turn + (2 * Math.PI * i) / m, row * liner.widthIn, row));
  }
  return placements;
}

export type BorderPlacements = { whole: PartPlacement[]; closure: PartPlacement[] };

/**
 * The border course on the base (scene in, rad), as the engine laid it: whole unit i centred on
 * i·θ, then the cut pieces side by side in what is left of the circle (inner faces at r).
 */
export function placeBorderUnits(input: PitSceneInput): BorderPlacements {
  const patio = input.patio;
  if (!patio) return { whole: [], closure: [] };
  const r = measureBorderInnerRadius(patio);
  const step = patio.borderUnitAngleDeg * DEG;
  const wholeUnits = wholeCount(patio.borderWholeCount);
  const whole = Array.from({ length: wholeUnits }, (_, i) => placeOnRadius(r, i * step, 0, 0));
  const closureRad = measureBorderClosureRad(patio);
  const start = (wholeUnits - 0.5) * step;
  const closure = Array.from({ length: wholeCount(patio.borderClosureCount) }, (_, j) =>
    placeOnRadius(r, start + (j + 0.5) * closureRad, 0, 0),
  );
  return { whole, closure };
}

/** Farthest a local outline reaches from the centre (in) when its origin sits at `originDistanceIn`. */
function measureReach(outline: PlanPolygon | null, originDistanceIn: number): number {
  if (!outline) return 0;
  return Math.max(0, ...outline.map(([u, v]) => Math.hypot(originDistanceIn + u, v)));
}

export type PitMeasurements = {
  /** ID = 2a, in. */
  bowlDiameterIn: number;
  /** OD = 2(a + T), measured to the middles of the faces, in. */
  outsideDiameterIn: number;
  /** Centre to the wall's farthest (face) corner, in. */
  wallCornerRadiusIn: number;
  /** Top of the wall below the caps, in. */
  wallTopIn: number;
  /** Top of the caps (or of the wall without caps), in. */
  topIn: number;
  /** Radius of the base pad drawn when there is no patio: the plan's own base radius, in. */
  basePadRadiusIn: number;
  /** Farthest anything reaches from the centre in plan: wall, caps, base pad or patio, in. */
  extentRadiusIn: number;
  /** Radius of the gravel floor: out to the back corners, so it fills any V-gaps behind the units, in. */
  gravelRadiusIn: number;
  /** Patio field radius R − w, or null without a patio, in. */
  fieldRadiusIn: number | null;
};

/** Key sizes of the pit as drawn (in, unrounded). */
export function measurePit(input: PitSceneInput): PitMeasurements {
  const a = input.ring.edgeDistanceIn;
  const t = input.wallUnit.depthIn;
  const wallCornerRadiusIn = Math.max(
    measureReach(outlineWallUnit(input), a),
    measureReach(outlineClosureUnit(input), a),
  );
  const capReach = input.caps ? measureReach(outlineCap(input), input.caps.innerEdgeDistanceIn) : 0;
  const borderReach = input.patio
    ? Math.max(
        measureReach(outlineBorderUnit(input), measureBorderInnerRadius(input.patio)),
        measureReach(outlineBorderClosure(input), measureBorderInnerRadius(input.patio)),
      )
    : 0;
  const wallTopIn = measureWallTopIn(input);
  const n = wholeCount(input.ring.unitCount) + countClosuresPerCourse(input.ring);
  const backCorner = n >= 3 ? a / Math.cos(Math.PI / n) : a;
  const basePadRadiusIn = input.basePadRadiusIn;
  return {
    bowlDiameterIn: 2 * a,
    outsideDiameterIn: 2 * (a + t),
    wallCornerRadiusIn,
    wallTopIn,
    topIn: wallTopIn + (input.caps ? input.caps.thicknessIn : 0),
    basePadRadiusIn,
    extentRadiusIn: Math.max(
      input.patio ? 0 : basePadRadiusIn,
      wallCornerRadiusIn,
      capReach,
      borderReach,
      input.patio?.outsideRadiusIn ?? 0,
      a,
    ),
    gravelRadiusIn: Math.max(a, backCorner),
    fieldRadiusIn: input.patio ? measureBorderInnerRadius(input.patio) : null,
  };
}

export type PitPlanDrawing = {
  /** Whole wall units of the first course, plan in. */
  wallUnits: PlanPolygon[];
  /** Closure units of the first course, plan in. */
  closureUnits: PlanPolygon[];
  caps: PlanPolygon[];
  /** Firebrick of the first row, plan in. */
  firebrick: PlanPolygon[];
  borderUnits: PlanPolygon[];
  steelRingRadiusIn: number | null;
  measurements: PitMeasurements;
};

/** Plan outlines (in) of the first course, caps, first firebrick row and border, for the 2D drawing. */
export function drawPitPlan(input: PitSceneInput): PitPlanDrawing {
  const walls = placeWallUnits(input);
  const firstCourse = (p: PartPlacement) => p.layer === 0;
  const unit = outlineWallUnit(input);
  const closure = outlineClosureUnit(input);
  const cap = outlineCap(input);
  const brick = outlineFirebrick(input);
  const border = outlineBorderUnit(input);
  const borderClosure = outlineBorderClosure(input);
  const borderPlacements = placeBorderUnits(input);
  return {
    wallUnits: walls.whole.filter(firstCourse).map((p) => toPlanPolygon(unit, p)),
    closureUnits: closure ? walls.closures.filter(firstCourse).map((p) => toPlanPolygon(closure, p)) : [],
    caps: cap ? placeCaps(input).map((p) => toPlanPolygon(cap, p)) : [],
    firebrick: brick
      ? placeFirebrick(input)
          .filter(firstCourse)
          .map((p) => toPlanPolygon(brick, p))
      : [],
    borderUnits: [
      ...(border ? borderPlacements.whole.map((p) => toPlanPolygon(border, p)) : []),
      ...(borderClosure ? borderPlacements.closure.map((p) => toPlanPolygon(borderClosure, p)) : []),
    ],
    steelRingRadiusIn: input.liner.kind === "steel-ring" ? input.liner.outsideDiameterIn / 2 : null,
    measurements: measurePit(input),
  };
}

export type CameraFraming = {
  position: [x: number, y: number, z: number];
  target: [x: number, y: number, z: number];
  /** Camera clipping planes for this scene size, in. */
  near: number;
  far: number;
};

type Vec3 = [x: number, y: number, z: number];

const sub = (p: Vec3, q: Vec3): Vec3 => [p[0] - q[0], p[1] - q[1], p[2] - q[2]];
const dot = (p: Vec3, q: Vec3) => p[0] * q[0] + p[1] * q[1] + p[2] * q[2];
const cross = (p: Vec3, q: Vec3): Vec3 => [
  p[1] * q[2] - p[2] * q[1],
  p[2] * q[0] - p[0] * q[2],
  p[0] * q[1] - p[1] * q[0],
];
function normalise(p: Vec3): Vec3 {
  const length = Math.hypot(...p) || 1;
  return [p[0] / length, p[1] / length, p[2] / length];
}

/**
 * Where a point (scene in) lands in a perspective view from `position` looking at `target` (y up):
 * horizontal and vertical offsets as tangents of the angle off the view axis, and its depth (in).
 */
export function projectPoint(point: Vec3, position: Vec3, target: Vec3): { x: number; y: number; depth: number } {
  const forward = normalise(sub(target, position));
  const right = normalise(cross(forward, [0, 1, 0]));
  const up = cross(right, forward);
  const v = sub(point, position);
  const depth = dot(v, forward);
  return { x: dot(v, right) / depth, y: dot(v, up) / depth, depth };
}

/** Points (scene in) outlining everything drawn: the rim of the ground footprint and the rim of the pit's top. */
export function sampleSceneOutline(input: PitSceneInput): Vec3[] {
  const m = measurePit(input);
  const capReach = input.caps ? measureReach(outlineCap(input), input.caps.innerEdgeDistanceIn) : 0;
  const topReach = Math.max(m.wallCornerRadiusIn, capReach);
  const points: Vec3[] = [];
  for (let i = 0; i < 48; i++) {
    const t = (2 * Math.PI * i) / 48;
    points.push([m.extentRadiusIn * Math.cos(t), 0, m.extentRadiusIn * Math.sin(t)]);
    points.push([topReach * Math.cos(t), m.topIn, topReach * Math.sin(t)]);
  }
  return points;
}

/** Share of the view's half-width and half-height the scene may fill; the rest is margin. */
export const FRAME_FILL = 0.9;

/**
 * Camera looking down at the pit from the south-east, 35° above the ground, just far enough that
 * the pit, caps and patio fill no more than FRAME_FILL of the view for this aspect ratio and
 * vertical field of view (bisection on the distance, projecting the scene's outline). In, degrees.
 */
export function frameCamera(input: PitSceneInput, aspect: number, fovDeg: number): CameraFraming {
  const { extentRadiusIn, topIn } = measurePit(input);
  const safeAspect = Number.isFinite(aspect) && aspect > 0 ? aspect : 1;
  const tanV = Math.tan((fovDeg * DEG) / 2) * FRAME_FILL;
  const tanH = Math.tan((fovDeg * DEG) / 2) * safeAspect * FRAME_FILL;
  const elevation = 35 * DEG;
  // 40° east of south; scene +z is plan south.
  const azimuth = 40 * DEG;
  const target: Vec3 = [0, topIn * 0.3, 0];
  const direction: Vec3 = [
    Math.cos(elevation) * Math.sin(azimuth),
    Math.sin(elevation),
    Math.cos(elevation) * Math.cos(azimuth),
  ];
  const positionAt = (d: number): Vec3 => [
    target[0] + d * direction[0],
    target[1] + d * direction[1],
    target[2] + d * direction[2],
  ];
  const outline = sampleSceneOutline(input);
  const fits = (d: number) => {
    const position = positionAt(d);
    return outline.every((p) => {
      const q = projectPoint(p, position, target);
      return q.depth > 0 && Math.abs(q.x) <= tanH && Math.abs(q.y) <= tanV;
    });
  };
  const radius = Math.max(Math.hypot(extentRadiusIn, topIn), 1);
  let low = 0;
  let high = radius * 2;
  while (!fits(high)) high *= 2;
  for (let i = 0; i < 40; i++) {
    const mid = (low + high) / 2;
    if (fits(mid)) high = mid;
    else low = mid;
  }
  return {
    position: positionAt(high),
    target,
    near: Math.max(0.5, high / 100),
    far: high * 10 + radius * 2,
  };
}

/**
 * A steady brightness factor (about 0.92–1.06) for instance `index`, so neighbouring units read as
 * separate pieces the way real batches vary; deterministic, so the picture never flickers.
 */
export function shadeInstance(index: number, salt = 0): number {
  // Integer hash (Thomas Wang style mix); any well-spread hash would do.
  let h = (index * 374761393 + salt * 668265263) | 0;
  h = Math.imul(h ^ (h >>> 13), 1274126177);
  h ^= h >>> 16;
  return 0.92 + ((h >>> 0) / 0xffffffff) * 0.14;
}
