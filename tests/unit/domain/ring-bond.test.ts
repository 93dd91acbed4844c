/*
 * Running bond of exact-bowl rings, checked against reference geometry worked here and not taken
 * from the engine: each course's pieces are real chords at the face (corners as 2D points), the turn
 * is searched by brute force over the whole circle, and offsets are plain distances between points.
 * Rule checked (common practice, no source; see the trade notes): alternate courses turn so that
 * every joint falls as far as possible from the joints below; joints should sit about 3 in or more
 * apart along the face.
 */
import { expect, test } from "vitest";
import { planRing, type RingPlan, type WallUnitSize } from "~/domain/ring";

// Illustrative tapered unit: 12 in face, 8 in back, 8 in deep, 4 in high.
const UNIT: WallUnitSize = { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4 };
const RAD = Math.PI / 180;

const exact = (bowlDiameterIn: number, courses = 2) =>
  planRing({ target: { bowlDiameterIn, fit: "exact" }, wallUnit: UNIT, courses });

/** The angle each piece of a course spans round the centre (rad): whole units, then closures. */
function pieceAngles(plan: RingPlan): number[] {
  const closures = plan.closure ? plan.closure.countPerCourse : 0;
  return [
    ...Array<number>(plan.unitCount).fill(plan.unitAngleDeg * RAD),
    ...Array<number>(closures).fill((plan.closure?.angleDeg ?? 0) * RAD),
  ];
}

type Point = { x: number; y: number };
type Piece = { from: number; to: number; first: Point; last: Point };

/** A course turned by `turn` rad: each piece's face is the chord at edge distance d between its radial lines. */
function faceChords(pieces: number[], d: number, turn: number): Piece[] {
  const out: Piece[] = [];
  let from = turn;
  for (const span of pieces) {
    const to = from + span;
    const r = d / Math.cos(span / 2); // centre to a face corner
    out.push({
      from,
      to,
      first: { x: r * Math.cos(from), y: r * Math.sin(from) },
      last: { x: r * Math.cos(to), y: r * Math.sin(to) },
    });
    from = to;
  }
  return out;
}

/** Where the radial line at `angle` crosses the segment p–q (2D line intersection). */
function crossing(angle: number, p: Point, q: Point): Point {
  const u = { x: Math.cos(angle), y: Math.sin(angle) };
  const e = { x: q.x - p.x, y: q.y - p.y };
  // Solve t·u = p + s·e for s.
  const s = (u.y * p.x - u.x * p.y) / (u.x * e.y - u.y * e.x);
  return { x: p.x + s * e.x, y: p.y + s * e.y };
}

const distance = (p: Point, q: Point) => Math.hypot(p.x - q.x, p.y - q.y);
const norm = (angle: number) => ((angle % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);

/** Nearest distance along the face of the course `below` from each joint of `above` to a joint below. */
function nearestAlongFace(above: Piece[], below: Piece[]): number {
  let nearest = Infinity;
  for (const joint of above) {
    const at = norm(joint.from);
    const piece = below.find((p) => {
      const start = norm(p.from);
      const span = p.to - p.from;
      return norm(at - start) <= span + 1e-12;
    })!;
    const hit = crossing(at, piece.first, piece.last);
    nearest = Math.min(nearest, distance(hit, piece.first), distance(hit, piece.last));
  }
  return nearest;
}

/** Smallest angle between any joint of a course and any joint of the same course turned by `turn`. */
function nearestJointAngle(pieces: number[], turn: number): number {
  const joints: number[] = [];
  let at = 0;
  for (const span of pieces) {
    joints.push(at);
    at += span;
  }
  let nearest = Infinity;
  for (const j of joints) {
    for (const k of joints) {
      const diff = norm(j + turn - k);
      nearest = Math.min(nearest, diff, 2 * Math.PI - diff);
    }
  }
  return nearest;
}

// Exact bowls of 12/8/8 units with one closure (35.2, 36.5, 40, 48 in) and with two (30, 34, 44.4, 60 in).
const BOWLS = [30, 34, 35.2, 36.5, 40, 44.4, 48, 60];

test("an exact ring's alternate courses turn by the angle that keeps joints farthest apart: no turn found by a brute-force search over the circle (every 0.05°) does better (derived here)", () => {
  for (const bowl of BOWLS) {
    const plan = exact(bowl);
    const pieces = pieceAngles(plan);
    let best = 0;
    for (let step = 0; step < 7_200; step++) best = Math.max(best, nearestJointAngle(pieces, step * 0.05 * RAD));
    const engine = nearestJointAngle(pieces, plan.runningBondDeg * RAD);
    // The grid can miss the optimum by at most half its step (0.025°) on either side.
    expect(engine).toBeGreaterThanOrEqual(best - 1e-9);
    expect(engine).toBeLessThan(best + 0.025 * RAD + 1e-9);
    // A real turn: alternate courses never sit joint on joint.
    expect(engine).toBeGreaterThan(2 * RAD);
  }
});

test("an exact ring's smallest joint offset is the nearest distance along the face, measured between points of the two courses' face chords, both ways (derived here)", () => {
  for (const bowl of BOWLS) {
    const plan = exact(bowl);
    const pieces = pieceAngles(plan);
    const d = plan.edgeDistanceIn + UNIT.depthIn;
    const lower = faceChords(pieces, d, 0);
    const upper = faceChords(pieces, d, plan.runningBondDeg * RAD);
    const expected = Math.min(nearestAlongFace(upper, lower), nearestAlongFace(lower, upper));
    expect(plan.bondOffsetIn).toBeCloseTo(expected, 9);
    // Common practice, no source: about 3 in or more between joints of neighbouring courses.
    expect(plan.bondOffsetIn!).toBeGreaterThan(3);
  }
});

test("an exact 34 in bowl (12 units of 26.99° and two closures of 18.05°): alternate courses turn 9.026°, half a closure, and no joint comes within 3.971 in of one below (derived here)", () => {
  // θ = 2·atan(12 / (2 × 25)) = 26.9915°; 13θ leaves 9.1107°, under half a unit, so two closures of
  // (9.1107 + 26.9915) / 2 = 18.0511° replace the 13th unit. The joints of a course differ by
  // multiples of θ and by those plus one or two closures; the widest gap between those differences
  // runs from 0 to 18.0511°, so the best turn is its middle, 9.0256°.
  const plan = exact(34);
  const theta = 2 * Math.atan(6 / 25);
  const closure = (2 * Math.PI - 13 * theta + theta) / 2;
  expect(plan.runningBondDeg).toBeCloseTo(closure / 2 / RAD, 9);
  expect(plan.runningBondDeg).toBeCloseTo(9.0256, 4);
  // The closest pair: a joint of the turned course lands mid-way across an 18.0511° closure below,
  // whose face is a chord at d = 25 in, 25 × tan 9.0256° = 3.971 in from either end. A joint landing
  // 9.0256° into a whole unit is 25 × (tan 13.4957° − tan 4.4701°) = 25 × (0.24 − 0.07818) = 4.046 in
  // from that unit's first corner, farther.
  expect(plan.bondOffsetIn).toBeCloseTo(25 * Math.tan(closure / 2), 9);
  expect(plan.bondOffsetIn).toBeCloseTo(3.9711, 4);
});

test("where the even courses' closure starts: the radial line of the turn crosses the face of the first unit 4.046 in from its first corner for a 34 in bowl, measured as a distance between points (derived here)", () => {
  for (const bowl of BOWLS) {
    const plan = exact(bowl);
    const pieces = pieceAngles(plan);
    const d = plan.edgeDistanceIn + UNIT.depthIn;
    const lower = faceChords(pieces, d, 0);
    const turn = plan.runningBondDeg * RAD;
    const shift = plan.bondClosureShift!;
    // The whole units passed, then the part of the next one.
    const unit = lower[shift.wholeUnits]!;
    expect(turn).toBeGreaterThanOrEqual(unit.from - 1e-12);
    expect(turn).toBeLessThan(unit.to);
    expect(shift.partFaceIn).toBeCloseTo(distance(crossing(turn, unit.first, unit.last), unit.first), 9);
  }
  // 34 in: 25 × (tan(9.0256° − 13.4957°) + tan 13.4957°) = 25 × (−0.07818 + 0.24) = 4.046 in.
  expect(exact(34).bondClosureShift).toEqual({ wholeUnits: 0, partFaceIn: expect.closeTo(4.0456, 4) as number });
});

test("a whole-unit ring turns by half a unit and has no closure shift: 14 units of 12/8/8 turn 12.857°, each joint lands mid-face, 6 in from the joints below (common practice, no source)", () => {
  const plan = planRing({ target: { unitCount: 14 }, wallUnit: UNIT, courses: 2 });
  expect(plan.runningBondDeg).toBeCloseTo(180 / 14, 12);
  expect(plan.bondClosureShift).toBeNull();
  // Face-limited: the face chord is the unit's 12 in face, and half of it is 6 in.
  expect(plan.bondOffsetIn).toBeCloseTo(6, 9);
  // Back-limited, 12 units: the face chord is 2(a + T)·tan 15° = 12.287 in with the open joint, half is 6.144 in.
  const back = planRing({ target: { unitCount: 12 }, wallUnit: UNIT, courses: 2 });
  const d = back.edgeDistanceIn + UNIT.depthIn;
  expect(back.bondOffsetIn).toBeCloseTo(d * Math.tan(Math.PI / 12), 9);
  expect(back.bondOffsetIn).toBeCloseTo(6.1436, 3);
});
