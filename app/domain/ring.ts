/**
 * The wall: straight tapered units set around a centre form a regular polygon.
 *
 * Edge-distance convention: every length from the centre is measured to the MIDDLE of a unit's
 * straight face (the polygon's apothem), never to its corners. `a` is the distance from the centre
 * to the middle of a unit's back face (the face toward the fire), so the bowl diameter is ID = 2a
 * and the outside diameter OD = 2(a + T), T = unit depth. A circle of diameter ID just fits the bowl.
 *
 * Formulas (derived here from the regular-polygon chord c = 2a·tan(π/N), Machinery's Handbook,
 * "Segments of a Circle"), face length F, back length B, depth T, N units per course:
 *   back corners touching  a_back(N) = B / (2·tan(π/N))
 *   face corners touching  a_face(N) = F / (2·tan(π/N)) − T
 *   a = max(a_back, a_face): whichever pair of corners meets first holds the ring open.
 *   Both joints closed only at a* = B·T / (F − B) (F > B), i.e. ID* = 2BT / (F − B).
 * Both a_back and a_face grow with N, so the bowl grows strictly with the unit count.
 */
import { PlanGeometryError } from "~/domain/plan-geometry-error";
import { EPS as EPS_IN } from "~/domain/tolerance";
import { formatInches } from "~/domain/units";

export const MIN_UNITS_PER_COURSE = 3;
export const MAX_UNITS_PER_COURSE = 200;
export const MAX_COURSES = 12;

/**
 * A leftover narrower than this at the face (in) is not worth a closure unit: it is shared out
 * among the face joints instead. Common practice, no source: about two sanded joints' width.
 */
export const MIN_CLOSURE_FACE_IN = 0.125;

export type WallUnitSize = { faceIn: number; backIn: number; depthIn: number; heightIn: number };

export type RingFit = "at-least" | "nearest" | "exact";

export type RingTarget = { unitCount: number } | { bowlDiameterIn: number; fit: RingFit };

export type RingClosure = {
  /** Face (outer) width of each closure unit, in. */
  faceWidthIn: number;
  /** Back width of each closure unit, in (never more than the unit's own back). */
  backWidthIn: number;
  /** Angle between the two radial cuts, degrees. */
  angleDeg: number;
  /** Closure units in each course: 1, or 2 equal ones when a single one would be a sliver. */
  countPerCourse: 1 | 2;
};

export type RingNeighbour = { unitCount: number; bowlDiameterIn: number };

export type RingPlan = {
  /** Whole (uncut) units in each course. */
  unitCount: number;
  /** Pieces in each course: whole units plus closure units. */
  unitsPerCourse: number;
  courses: number;
  /** Every piece of every course, closure units included (each is cut from a whole unit). */
  totalUnits: number;
  bowlDiameterIn: number;
  outsideDiameterIn: number;
  limitedBy: "face" | "back";
  /** Open V-joint at the face between neighbours, in (0 when face corners touch). */
  faceGapIn: number;
  /** V-gap at the back between neighbours, in (0 when back corners touch or are trimmed). */
  backGapIn: number;
  closure: RingClosure | null;
  /** Trimmed off each back corner of every unit so the face joints can close, in. */
  backTrimPerSideIn: number;
  /** Courses × unit height, plus the cap thickness when there are caps, in. */
  wallHeightIn: number;
  /**
   * Every other course turns by this much so its joints fall between those below, degrees: half a
   * unit for a whole-unit ring; with closure units, the turn that keeps every joint farthest from
   * the joints below (the closures of alternate courses then sit apart).
   */
  runningBondDeg: number;
  /**
   * Smallest distance along the outside face between a joint and the nearest joint of the course above or below, in;
   * null for one course.
   */
  bondOffsetIn: number | null;
  /** Angle each whole unit spans round the centre, degrees (360/N without closure units). */
  unitAngleDeg: number;
  /**
   * With closure units: how far round the even courses' closure starts from the odd courses', in whole units plus a
   * part of one (null without closures).
   */
  bondClosureShift: { wholeUnits: number; partFaceIn: number } | null;
  /** ID* = 2BT/(F − B): the tightest bowl with both joints closed; null for rectangular units. */
  tightestBowlDiameterIn: number | null;
  /** a: centre to the middle of a unit's back face, in. */
  edgeDistanceIn: number;
  /** Centre to a unit's outer (face) corner, in: the ring's footprint reaches this far. */
  outsideCornerRadiusIn: number;
  /** The whole-unit rings with the next smaller and next larger bowl. */
  neighbours: { below: RingNeighbour | null; above: RingNeighbour | null };
};

/** Back edge distance a (in) of a whole-unit ring of `unitCount` units, and which corners touch. */
export function measureWholeRing(
  wallUnit: WallUnitSize,
  unitCount: number,
): { edgeDistanceIn: number; limitedBy: "face" | "back" } {
  const tanHalf = Math.tan(Math.PI / unitCount);
  const backIn = wallUnit.backIn / (2 * tanHalf);
  const faceIn = wallUnit.faceIn / (2 * tanHalf) - wallUnit.depthIn;
  return faceIn >= backIn
    ? { edgeDistanceIn: faceIn, limitedBy: "face" }
    : { edgeDistanceIn: backIn, limitedBy: "back" };
}

/** Bowl diameter ID = 2a (in) of a whole-unit ring, unrounded. */
export function bowlDiameterForCount(wallUnit: WallUnitSize, unitCount: number): number {
  return 2 * measureWholeRing(wallUnit, unitCount).edgeDistanceIn;
}

/** Tightest bowl with face and back joints both closed, ID* = 2BT/(F − B) in; null when F ≤ B. */
export function tightestBowlDiameter(wallUnit: WallUnitSize): number | null {
  const taperIn = wallUnit.faceIn - wallUnit.backIn;
  return taperIn > EPS_IN ? (2 * wallUnit.backIn * wallUnit.depthIn) / taperIn : null;
}

/** Whole-unit rings whose bowls bracket `bowlDiameterIn` (strictly smaller / strictly larger), in. */
export function findNeighbourRings(
  wallUnit: WallUnitSize,
  bowlDiameterIn: number,
): { below: RingNeighbour | null; above: RingNeighbour | null } {
  let below: RingNeighbour | null = null;
  for (let n = MIN_UNITS_PER_COURSE; n <= MAX_UNITS_PER_COURSE; n++) {
    const id = bowlDiameterForCount(wallUnit, n);
    if (id < bowlDiameterIn - EPS_IN) below = { unitCount: n, bowlDiameterIn: id };
    else if (id > bowlDiameterIn + EPS_IN) return { below, above: { unitCount: n, bowlDiameterIn: id } };
  }
  return { below, above: null };
}

/** The smallest whole-unit ring whose bowl is at least `bowlDiameterIn` (in); null when none reaches it. */
export function findRingForBowl(wallUnit: WallUnitSize, bowlDiameterIn: number): RingNeighbour | null {
  for (let n = MIN_UNITS_PER_COURSE; n <= MAX_UNITS_PER_COURSE; n++) {
    const id = bowlDiameterForCount(wallUnit, n);
    if (id >= bowlDiameterIn - EPS_IN) return { unitCount: n, bowlDiameterIn: id };
  }
  return null;
}

function checkWallUnit(wallUnit: WallUnitSize): void {
  const sizes: [keyof WallUnitSize, string][] = [
    ["faceIn", "face length"],
    ["backIn", "back length"],
    ["depthIn", "depth"],
    ["heightIn", "height"],
  ];
  for (const [key, label] of sizes) {
    const value = wallUnit[key];
    if (!Number.isFinite(value) || value <= 0) {
      throw new PlanGeometryError(`wallUnit.${key}`, `The wall unit's ${label} must be a length above 0 in.`);
    }
  }
  if (wallUnit.backIn > wallUnit.faceIn + EPS_IN) {
    throw new PlanGeometryError(
      "wallUnit.backIn",
      `The back (${wallUnit.backIn} in) cannot be longer than the face (${wallUnit.faceIn} in): the narrow end faces the fire.`,
    );
  }
}

function chooseWholeCount(wallUnit: WallUnitSize, bowlDiameterIn: number, fit: "at-least" | "nearest"): number {
  const largestIn = bowlDiameterForCount(wallUnit, MAX_UNITS_PER_COURSE);
  if (bowlDiameterIn > largestIn + EPS_IN) {
    throw new PlanGeometryError(
      "ring.bowlDiameterIn",
      `No ring of these units reaches a ${formatInches(bowlDiameterIn)} bowl: even ${MAX_UNITS_PER_COURSE} units a course make only ${formatInches(largestIn)}.`,
    );
  }
  const atLeast = findRingForBowl(wallUnit, bowlDiameterIn);
  if (!atLeast) return MAX_UNITS_PER_COURSE;
  const n = atLeast.unitCount;
  if (fit === "at-least" || n === MIN_UNITS_PER_COURSE) return n;
  // Nearest: the ring just under the target wins only when strictly closer; a tie goes to the
  // larger bowl, which still clears a liner sized to the target.
  const previousIn = bowlDiameterForCount(wallUnit, n - 1);
  return bowlDiameterIn - previousIn < atLeast.bowlDiameterIn - bowlDiameterIn ? n - 1 : n;
}

type CourseLayout = Pick<
  RingPlan,
  | "unitCount"
  | "unitsPerCourse"
  | "edgeDistanceIn"
  | "limitedBy"
  | "faceGapIn"
  | "backGapIn"
  | "closure"
  | "backTrimPerSideIn"
  | "runningBondDeg"
  | "bondOffsetIn"
  | "bondClosureShift"
  | "unitAngleDeg"
  | "outsideCornerRadiusIn"
>;

type BareLayout = Omit<CourseLayout, "runningBondDeg" | "bondOffsetIn" | "bondClosureShift">;

/*
 * Running bond (derived here). One course is a sequence of pieces round the circle: the whole
 * units, each spanning the same angle, then the closure units. Its joints sit at the piece
 * boundaries J. The next course repeats the sequence turned by ρ; every joint of one course is then
 * |j + ρ − j'| from a joint j' of the other, for all pairs. The ρ that keeps the nearest pair
 * farthest apart is the middle of the widest gap between the sorted differences j' − j (mod 2π).
 * For a whole-unit ring the differences are the multiples of 2π/N and ρ is half a unit, as usual.
 */
function pieceAngles(unitCount: number, closure: RingClosure | null): number[] {
  const closureRad = closure ? (closure.angleDeg * Math.PI) / 180 : 0;
  const closures = closure ? closure.countPerCourse : 0;
  const step = (2 * Math.PI - closureRad * closures) / unitCount;
  return [...Array<number>(unitCount).fill(step), ...Array<number>(closures).fill(closureRad)];
}

function jointAngles(pieces: number[]): number[] {
  const joints: number[] = [];
  let at = 0;
  for (const piece of pieces) {
    joints.push(at);
    at += piece;
  }
  return joints;
}

const wrap = (angle: number) => ((angle % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);

/** The turn ρ (rad) of alternate courses that keeps their joints farthest from each other. */
export function findBondTurn(pieces: number[]): number {
  const joints = jointAngles(pieces);
  const differences = joints.flatMap((j) => joints.map((k) => wrap(k - j))).sort((x, y) => x - y);
  differences.push(differences[0]! + 2 * Math.PI);
  let best = 0;
  let turn = 0;
  for (let i = 0; i + 1 < differences.length; i++) {
    const gap = differences[i + 1]! - differences[i]!;
    if (gap > best + 1e-9) {
      best = gap;
      turn = differences[i]! + gap / 2;
    }
  }
  return turn;
}

/**
 * Smallest distance along the outside face (in) between a joint of the course turned by `turn` and
 * the joints of the course below it, and the other way round: each joint is projected onto the face
 * of the piece it lands on, d·tan(φ − centre), d = a + T, and measured to that piece's two ends.
 */
export function measureBondOffset(pieces: number[], turn: number, faceDistanceIn: number): number {
  const joints = jointAngles(pieces);
  const oneWay = (shift: number) => {
    let nearest = Infinity;
    for (const joint of joints) {
      const at = wrap(joint + shift);
      let start = 0;
      for (const piece of pieces) {
        if (at >= start - 1e-12 && at <= start + piece + 1e-12) {
          const centre = start + piece / 2;
          const x = faceDistanceIn * Math.tan(at - centre);
          const end = faceDistanceIn * Math.tan(piece / 2);
          nearest = Math.min(nearest, end - Math.abs(x));
          break;
        }
        start += piece;
      }
    }
    return nearest;
  };
  return Math.max(0, Math.min(oneWay(turn), oneWay(-turn)));
}

function layBond(
  layout: Omit<CourseLayout, "runningBondDeg" | "bondOffsetIn" | "bondClosureShift">,
  depthIn: number,
  courses: number,
) {
  const pieces = pieceAngles(layout.unitCount, layout.closure);
  const turn = layout.closure ? findBondTurn(pieces) : Math.PI / layout.unitCount;
  const faceDistanceIn = layout.edgeDistanceIn + depthIn;
  const step = pieces[0]!;
  const wholeUnits = Math.floor(turn / step + 1e-9);
  const partAngle = turn - wholeUnits * step;
  return {
    runningBondDeg: (turn * 180) / Math.PI,
    bondOffsetIn: courses > 1 ? measureBondOffset(pieces, turn, faceDistanceIn) : null,
    bondClosureShift: layout.closure
      ? {
          wholeUnits,
          // Along the face of the unit where the shift ends, from its first joint.
          partFaceIn: faceDistanceIn * (Math.tan(partAngle - step / 2) + Math.tan(step / 2)),
        }
      : null,
  };
}

function layWholeRing(wallUnit: WallUnitSize, unitCount: number): BareLayout {
  const { edgeDistanceIn: a, limitedBy } = measureWholeRing(wallUnit, unitCount);
  const tanHalf = Math.tan(Math.PI / unitCount);
  const t = wallUnit.depthIn;
  return {
    unitCount,
    unitsPerCourse: unitCount,
    edgeDistanceIn: a,
    limitedBy,
    faceGapIn: limitedBy === "back" ? Math.max(0, 2 * (a + t) * tanHalf - wallUnit.faceIn) : 0,
    backGapIn: limitedBy === "face" ? Math.max(0, 2 * a * tanHalf - wallUnit.backIn) : 0,
    closure: null,
    backTrimPerSideIn: 0,
    unitAngleDeg: 360 / unitCount,
    outsideCornerRadiusIn: Math.hypot(a + t, wallUnit.faceIn / 2),
  };
}

/*
 * Exact bowl: the ring is laid at the asked edge distance a with every FACE joint closed (the
 * face is what the customer sees). Each whole unit then spans θ = 2·atan(F / (2(a + T))) around
 * the centre. If the backs would collide at that angle (a < a*, always for rectangular units),
 * every unit has its back corners trimmed by (B − 2a·tan(θ/2))/2 a side. The leftover angle
 * φ = 2π − N_full·θ is filled by a closure unit cut along the two radial lines that bound it, so its
 * face is 2(a + T)·tan(φ/2) wide. Rules (common practice, no source):
 *  - a leftover under MIN_CLOSURE_FACE_IN at the face is shared among the face joints, no closure;
 *  - a closure must be at least half a unit wide at the face; a narrower leftover is instead split,
 *    with one whole unit, into two equal closure units, each spanning between half and a whole
 *    unit's angle (so about half a unit wide or more, never a sliver).
 * Beside a closure the two face corners lie on the same radial cut but at slightly different
 * radii (chords of different angles end at different distances), leaving a hairline at the face.
 */
function layExactRing(wallUnit: WallUnitSize, bowlDiameterIn: number): BareLayout {
  const { faceIn: f, backIn: b, depthIn: t } = wallUnit;
  const a = bowlDiameterIn / 2;
  if (!Number.isFinite(a) || a <= 0) {
    throw new PlanGeometryError("ring.bowlDiameterIn", "The bowl diameter must be a length above 0 in.");
  }
  const halfAngle = Math.atan(f / (2 * (a + t)));
  const unitAngle = 2 * halfAngle;
  const backChordIn = (a * f) / (a + t); // 2a·tan(θ/2): the back length that would just touch
  const backTrimPerSideIn = Math.max(0, (b - backChordIn) / 2);
  const backGapIn = Math.max(0, backChordIn - b);
  const fullCount = Math.floor((2 * Math.PI) / unitAngle + 1e-9);
  if (fullCount > MAX_UNITS_PER_COURSE) {
    throw new PlanGeometryError(
      "ring.bowlDiameterIn",
      `A ${formatInches(bowlDiameterIn)} bowl needs more than ${MAX_UNITS_PER_COURSE} of these units a course.`,
    );
  }
  const leftoverAngle = Math.max(0, 2 * Math.PI - fullCount * unitAngle);
  const faceWidthAt = (angle: number) => 2 * (a + t) * Math.tan(angle / 2);
  const leftoverFaceIn = faceWidthAt(leftoverAngle);
  let unitCount = fullCount;
  let closure: RingClosure | null = null;
  let faceGapIn = 0;
  if (leftoverFaceIn < MIN_CLOSURE_FACE_IN) {
    faceGapIn = fullCount > 0 ? faceWidthAt(leftoverAngle / fullCount) : 0;
  } else {
    const isSliver = leftoverFaceIn < f / 2;
    const closureAngle = isSliver ? (leftoverAngle + unitAngle) / 2 : leftoverAngle;
    if (isSliver) unitCount = fullCount - 1;
    closure = {
      faceWidthIn: faceWidthAt(closureAngle),
      backWidthIn: Math.min(b, 2 * a * Math.tan(closureAngle / 2)),
      angleDeg: (closureAngle * 180) / Math.PI,
      countPerCourse: isSliver ? 2 : 1,
    };
  }
  const unitsPerCourse = unitCount + (closure?.countPerCourse ?? 0);
  if (unitsPerCourse > MAX_UNITS_PER_COURSE) {
    throw new PlanGeometryError(
      "ring.bowlDiameterIn",
      `A ${formatInches(bowlDiameterIn)} bowl needs more than ${MAX_UNITS_PER_COURSE} of these units a course.`,
    );
  }
  if (unitsPerCourse < MIN_UNITS_PER_COURSE) {
    throw new PlanGeometryError(
      "ring.bowlDiameterIn",
      `A ${formatInches(bowlDiameterIn)} bowl is too small for these units: a ring needs at least ${MIN_UNITS_PER_COURSE} a course.`,
    );
  }
  return {
    unitCount,
    unitsPerCourse,
    edgeDistanceIn: a,
    limitedBy: "face",
    faceGapIn,
    backGapIn,
    closure,
    backTrimPerSideIn,
    unitAngleDeg: closure ? (unitAngle * 180) / Math.PI : 360 / unitCount,
    outsideCornerRadiusIn: Math.hypot(a + t, f / 2),
  };
}

/**
 * Lays out the wall ring (all lengths in, angles degrees, unrounded); throws PlanGeometryError when it cannot be built.
 */
export function planRing(args: {
  target: RingTarget;
  wallUnit: WallUnitSize;
  courses: number;
  /** Cap thickness added to the wall height, in; 0 when there are no caps. */
  capThicknessIn?: number;
}): RingPlan {
  const { target, wallUnit, courses } = args;
  checkWallUnit(wallUnit);
  if (!Number.isInteger(courses) || courses < 1 || courses > MAX_COURSES) {
    throw new PlanGeometryError("courses", `Courses must be a whole number from 1 to ${MAX_COURSES}.`);
  }
  let layout: BareLayout;
  if ("unitCount" in target) {
    const n = target.unitCount;
    if (!Number.isInteger(n) || n < MIN_UNITS_PER_COURSE || n > MAX_UNITS_PER_COURSE) {
      throw new PlanGeometryError(
        "ring.unitCount",
        `Units per course must be a whole number from ${MIN_UNITS_PER_COURSE} to ${MAX_UNITS_PER_COURSE}.`,
      );
    }
    layout = layWholeRing(wallUnit, n);
  } else {
    if (!Number.isFinite(target.bowlDiameterIn) || target.bowlDiameterIn <= 0) {
      throw new PlanGeometryError("ring.bowlDiameterIn", "The bowl diameter must be a length above 0 in.");
    }
    layout =
      target.fit === "exact"
        ? layExactRing(wallUnit, target.bowlDiameterIn)
        : layWholeRing(wallUnit, chooseWholeCount(wallUnit, target.bowlDiameterIn, target.fit));
  }
  const bowlDiameterIn = 2 * layout.edgeDistanceIn;
  return {
    ...layout,
    ...layBond(layout, wallUnit.depthIn, courses),
    courses,
    totalUnits: layout.unitsPerCourse * courses,
    bowlDiameterIn,
    outsideDiameterIn: 2 * (layout.edgeDistanceIn + wallUnit.depthIn),
    wallHeightIn: courses * wallUnit.heightIn + (args.capThicknessIn ?? 0),
    tightestBowlDiameterIn: tightestBowlDiameter(wallUnit),
    neighbours: findNeighbourRings(wallUnit, bowlDiameterIn),
  };
}
