/*
 * The preview's layout checked against independent geometry: plan polygons are rebuilt as
 * @flatten-js/core polygons (reference library) and overlap is measured by its boolean
 * intersection, not by the layout's own formulas.
 */
import { BooleanOperations, Polygon, point } from "@flatten-js/core";
import fc from "fast-check";
import { expect, test } from "vitest";
import { planCaps } from "~/domain/caps";
import { DEFAULT_FACTORS, resolveFactors } from "~/domain/factors";
import { planPatio } from "~/domain/patio";
import { planRing, type WallUnitSize } from "~/domain/ring";
import {
  FRAME_FILL,
  drawPitPlan,
  frameCamera,
  measurePit,
  outlineBorderUnit,
  outlineCap,
  outlineClosureUnit,
  outlineWallUnit,
  placeBorderUnits,
  placeCaps,
  placeFirebrick,
  placeWallUnits,
  planAngleOf,
  projectPoint,
  sampleSceneOutline,
  shadeInstance,
  toPlanPolygon,
  type PartPlacement,
  type PitSceneInput,
  type PlanPolygon,
} from "~/domain/pit-layout";

// Illustrative tapered unit: 12 in face, 8 in back, 8 in deep, 4 in high.
const UNIT: WallUnitSize = { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4 };

function inputFor(ring: ReturnType<typeof planRing>, extra: Partial<PitSceneInput> = {}): PitSceneInput {
  return {
    wallUnit: { ...UNIT, colourHex: "#978873" },
    ring: {
      unitCount: ring.unitCount,
      courses: ring.courses,
      edgeDistanceIn: ring.edgeDistanceIn,
      runningBondDeg: ring.runningBondDeg,
      closure: ring.closure,
    },
    caps: null,
    liner: { kind: "none" },
    patio: null,
    // The engine's base: the wall's outside corners plus the company's reach past them.
    basePadRadiusIn: ring.outsideCornerRadiusIn + DEFAULT_FACTORS.baseBeyondFaceIn,
    ...extra,
  };
}

const wholeRing = (unitCount: number, courses = 3) =>
  inputFor(planRing({ target: { unitCount }, wallUnit: UNIT, courses }));
const exactRing = (bowlDiameterIn: number, courses = 3) =>
  inputFor(planRing({ target: { bowlDiameterIn, fit: "exact" }, wallUnit: UNIT, courses }));

// Worked-example caps: 16 × 12 in blanks, 2 in inner overhang, 3/16 in joints on an 18 in wall.
function withCaps(input: PitSceneInput): PitSceneInput {
  const caps = planCaps({
    edgeDistanceIn: input.ring.edgeDistanceIn,
    wallDepthIn: UNIT.depthIn,
    cap: { lengthIn: 16, depthIn: 12, thicknessIn: 2.5, innerOverhangIn: 2 },
    jointIn: 3 / 16,
    spares: 1,
  });
  return {
    ...input,
    caps: {
      count: caps.count,
      innerWidthIn: caps.innerWidthIn,
      outerWidthIn: caps.outerWidthIn,
      innerEdgeDistanceIn: caps.innerEdgeDistanceIn,
      outerEdgeDistanceIn: caps.outerEdgeDistanceIn,
      thicknessIn: caps.thicknessIn,
      colourHex: "#d6c9b7",
    },
  };
}

const FIREBRICK = { kind: "firebrick", perRow: 11, rows: 3, lengthIn: 9, widthIn: 4.5, heightIn: 2.5 } as const;
// A 7 ft patio edged with 6 × 12 in border units round the 14-unit ring, as the engine lays it:
// with the company's default joint limit the V-joints would open too wide, so every unit's end is
// cut to touch at the outer face; with a generous limit the units stay square-ended.
// Functions, not module constants, so each test runs the engine itself (what mutation testing needs).
const ring14 = () => planRing({ target: { unitCount: 14 }, wallUnit: UNIT, courses: 3 });
const BORDER_UNIT = { widthIn: 6, lengthIn: 12 };
const planBorder = (borderMaxJointIn: number) =>
  planPatio({
    patio: { outsideRadiusIn: 84, border: BORDER_UNIT, paver: { lengthIn: 8, widthIn: 4 } },
    pitOutsideEdgeDistanceIn: ring14().edgeDistanceIn + UNIT.depthIn,
    pitOutsideCornerRadiusIn: ring14().outsideCornerRadiusIn,
    factors: { ...resolveFactors(), borderMaxJointIn },
  });
function patioFor(plan: ReturnType<typeof planBorder>) {
  return {
    outsideRadiusIn: plan.outsideRadiusIn,
    borderWidthIn: plan.borderWidthIn,
    borderInnerEdgeDistanceIn: plan.borderInnerEdgeDistanceIn,
    borderWholeCount: plan.borderWholeCount,
    borderClosureCount: plan.borderClosureCount,
    borderUnitAngleDeg: plan.borderUnitAngleDeg,
    borderUnitLengthIn: BORDER_UNIT.lengthIn,
    lastBorderUnitLengthIn: plan.lastBorderUnitLengthIn,
    borderColourHex: "#8c7f70",
    fieldColourHex: "#c9bca9",
  };
}
const taperedPlan = () => planBorder(DEFAULT_FACTORS.borderMaxJointIn);
const squarePlan = () => planBorder(2);

const flat = (polygon: PlanPolygon) => new Polygon(polygon.map(([x, y]) => point(x, y)));
const overlapArea = (p: PlanPolygon, q: PlanPolygon) => BooleanOperations.intersect(flat(p), flat(q)).area();
const distance = (p: PartPlacement) => Math.hypot(p.x, p.z);
const byAngle = (p: PlanPolygon) => Math.atan2(...(centroid(p).reverse() as [number, number]));
function centroid(p: PlanPolygon): [number, number] {
  return [p.reduce((s, q) => s + q[0], 0) / p.length, p.reduce((s, q) => s + q[1], 0) / p.length];
}

/** Area each plan piece shares with its neighbours around the ring (sorted by angle, wrapping). */
function neighbourOverlaps(pieces: PlanPolygon[]): number[] {
  const sorted = [...pieces].sort((p, q) => byAngle(p) - byAngle(q));
  return sorted.map((p, i) => overlapArea(p, sorted[(i + 1) % sorted.length]));
}

test("a 14-unit, 3-course ring lays 42 wall units and no closures", () => {
  const { whole, closures } = placeWallUnits(wholeRing(14, 3));
  expect(whole).toHaveLength(42);
  expect(closures).toHaveLength(0);
});

test("an exact 40 in bowl lays unitCount × courses whole units plus its closure units in every course", () => {
  const input = exactRing(40, 4);
  const closure = input.ring.closure;
  expect(closure).not.toBeNull();
  const { whole, closures } = placeWallUnits(input);
  expect(whole).toHaveLength(input.ring.unitCount * 4);
  expect(closures).toHaveLength(closure!.countPerCourse * 4);
});

test("every wall unit's back middle lies at edge distance a (to 1e-9 in), whole and closure alike", () => {
  for (const input of [wholeRing(12), wholeRing(14), wholeRing(23), exactRing(40), exactRing(33.3)]) {
    const { whole, closures } = placeWallUnits(input);
    for (const p of [...whole, ...closures])
      expect(Math.abs(distance(p) - input.ring.edgeDistanceIn)).toBeLessThan(1e-9);
  }
});

test("every wall unit is turned to face the centre: its back (local −u) points at the middle of the pit", () => {
  const input = exactRing(40);
  const { whole, closures } = placeWallUnits(input);
  for (const p of [...whole, ...closures]) {
    // Local −u after the turn about the vertical, in scene x/z: (−cos θ, +sin θ).
    const back = [-Math.cos(p.rotationY), Math.sin(p.rotationY)];
    const toCentre = [-p.x / distance(p), -p.z / distance(p)];
    expect(back[0]).toBeCloseTo(toCentre[0], 12);
    expect(back[1]).toBeCloseTo(toCentre[1], 12);
  }
});

test("whole units of an uncut ring stand on 2πi/N, and courses sit one unit height apart", () => {
  const input = wholeRing(14, 3);
  const { whole } = placeWallUnits(input);
  const first = whole.filter((p) => p.layer === 0);
  first.forEach((p, i) => expect(p.rotationY).toBeCloseTo((2 * Math.PI * i) / 14, 12));
  expect(new Set(whole.map((p) => p.y))).toEqual(new Set([0, 4, 8]));
});

test("odd courses are turned by the running bond the plan chose (half a unit for whole rings, common practice); even courses are not", () => {
  for (const input of [wholeRing(14, 4), exactRing(40, 4)]) {
    const { whole, closures } = placeWallUnits(input);
    const bond = (input.ring.runningBondDeg * Math.PI) / 180;
    for (const set of [whole, closures]) {
      const course = (k: number) => set.filter((p) => p.layer === k);
      course(1).forEach((p, i) => expect(p.rotationY - course(0)[i].rotationY).toBeCloseTo(bond, 12));
      course(2).forEach((p, i) => expect(p.rotationY).toBeCloseTo(course(0)[i].rotationY, 12));
      course(3).forEach((p, i) => expect(p.rotationY - course(0)[i].rotationY).toBeCloseTo(bond, 12));
    }
  }
});

test("with a closure, whole units step by the planned unit angle and the closures fill exactly the rest of the circle", () => {
  const planned = planRing({ target: { bowlDiameterIn: 40, fit: "exact" }, wallUnit: UNIT, courses: 1 });
  const input = inputFor(planned);
  const { whole, closures } = placeWallUnits(input);
  const step = whole[1].rotationY - whole[0].rotationY;
  expect(step).toBeCloseTo((planned.unitAngleDeg * Math.PI) / 180, 12);
  const closureRad = (input.ring.closure!.angleDeg * Math.PI) / 180;
  const last = whole[whole.length - 1].rotationY;
  const end = closures[closures.length - 1].rotationY + closureRad / 2;
  expect(end - (whole[0].rotationY - step / 2)).toBeCloseTo(2 * Math.PI, 12);
  expect(closures[0].rotationY - last).toBeCloseTo(step / 2 + closureRad / 2, 12);
});

test("the closure outline is a unit cut along radial lines: its face and back widths match the ring plan's closure (derived here from the formulas)", () => {
  for (const bowl of [33.3, 40, 44.5]) {
    const input = exactRing(bowl, 1);
    const closure = input.ring.closure!;
    expect(closure).not.toBeNull();
    const outline = outlineClosureUnit(input)!;
    const at = (u: number) => outline.filter(([x]) => Math.abs(x - u) < 1e-9).map(([, v]) => v);
    const width = (u: number) => Math.max(...at(u)) - Math.min(...at(u));
    expect(width(UNIT.depthIn)).toBeCloseTo(closure.faceWidthIn, 9);
    expect(width(0)).toBeCloseTo(closure.backWidthIn, 9);
  }
});

test("neighbouring plan polygons of one course do not overlap (flatten-js boolean intersection), whole-unit and closure rings", () => {
  // A 30 in exact bowl is tighter than the backs allow (ID* = 32 in), so its units come out trimmed.
  for (const input of [
    wholeRing(12),
    wholeRing(13),
    wholeRing(14),
    wholeRing(30),
    exactRing(30),
    exactRing(33.3),
    exactRing(40),
    exactRing(44.5),
  ]) {
    const { whole, closures } = placeWallUnits(input);
    const unit = outlineWallUnit(input);
    const closure = outlineClosureUnit(input);
    for (const course of [0, 1]) {
      const pieces = [
        ...whole.filter((p) => p.layer === course).map((p) => toPlanPolygon(unit, p)),
        ...(closure ? closures.filter((p) => p.layer === course).map((p) => toPlanPolygon(closure, p)) : []),
      ];
      for (const area of neighbourOverlaps(pieces)) expect(area).toBeLessThan(1e-6);
    }
  }
});

test("for any exact bowl from 30 to 60 in, no two pieces of a course overlap (flatten-js, property)", () => {
  fc.assert(
    fc.property(fc.double({ min: 30, max: 60, noNaN: true }), (bowl) => {
      const input = exactRing(bowl, 1);
      const { whole, closures } = placeWallUnits(input);
      const closure = outlineClosureUnit(input);
      const pieces = [
        ...whole.map((p) => toPlanPolygon(outlineWallUnit(input), p)),
        ...(closure ? closures.map((p) => toPlanPolygon(closure, p)) : []),
      ];
      return neighbourOverlaps(pieces).every((area) => area < 1e-6);
    }),
    { numRuns: 40 },
  );
});

test("caps sit on the wall with their inner-edge middles at a1, centred on 2πi/N_c, and never overlap (flatten-js)", () => {
  const input = withCaps(wholeRing(14, 3));
  const caps = placeCaps(input);
  expect(caps).toHaveLength(input.caps!.count);
  caps.forEach((p, i) => {
    expect(Math.abs(distance(p) - input.caps!.innerEdgeDistanceIn)).toBeLessThan(1e-9);
    expect(p.rotationY).toBeCloseTo((2 * Math.PI * i) / caps.length, 12);
    expect(planAngleOf(p)).toBeCloseTo(Math.atan2(Math.sin(p.rotationY), Math.cos(p.rotationY)), 12);
    expect(p.y).toBe(12);
  });
  const outline = outlineCap(input)!;
  for (const area of neighbourOverlaps(caps.map((p) => toPlanPolygon(outline, p)))) expect(area).toBeLessThan(1e-6);
});

test("cap outlines reach a2 at the middle of their outer edges (edge-distance convention)", () => {
  const input = withCaps(wholeRing(14));
  const polygon = toPlanPolygon(outlineCap(input)!, placeCaps(input)[0]);
  const [x, y] = [(polygon[1][0] + polygon[2][0]) / 2, (polygon[1][1] + polygon[2][1]) / 2];
  expect(Math.hypot(x, y)).toBeCloseTo(input.caps!.outerEdgeDistanceIn, 12);
});

test("firebrick count is perRow × rows; rows stack one brick width apart, every other row turned half a brick", () => {
  const input = { ...wholeRing(14), liner: FIREBRICK };
  const bricks = placeFirebrick(input);
  expect(bricks).toHaveLength(11 * 3);
  expect(new Set(bricks.map((p) => p.y))).toEqual(new Set([0, 4.5, 9]));
  const row1 = bricks.filter((p) => p.layer === 1);
  expect(row1[0].rotationY).toBeCloseTo(Math.PI / 11, 12);
  // Fire-side corners touching: a_in = L / (2·tan(π/M)) (regular-polygon chord, Machinery's Handbook).
  for (const p of bricks) expect(distance(p)).toBeCloseTo(9 / (2 * Math.tan(Math.PI / 11)), 9);
});

test("the border is drawn as the engine laid it: its piece count, inner faces at r, no two overlapping (flatten-js)", () => {
  const [tapered, square] = [taperedPlan(), squarePlan()];
  expect(tapered.borderLayout).toBe("tapered");
  expect(square.borderLayout).toBe("square");
  for (const plan of [tapered, square]) {
    const input = { ...wholeRing(14), patio: patioFor(plan) };
    const { whole, closure } = placeBorderUnits(input);
    expect(whole.length + closure.length).toBe(plan.borderUnitCount);
    for (const p of [...whole, ...closure]) expect(distance(p)).toBeCloseTo(plan.borderInnerEdgeDistanceIn, 12);
    const pieces = drawPitPlan(input).borderUnits;
    expect(pieces).toHaveLength(plan.borderUnitCount);
    for (const area of neighbourOverlaps(pieces)) expect(area).toBeLessThan(1e-6);
  }
});

const gap = (p: [number, number], q: [number, number]) => Math.hypot(p[0] - q[0], p[1] - q[1]);
const farthest = (polygon: PlanPolygon) => Math.max(...polygon.map(([x, y]) => Math.hypot(x, y)));

test("square-ended units touch at their inner corners and open the engine's outer V-joint (chord 2w·sin(θ/2), regular polygon)", () => {
  const SQUARE_PLAN = squarePlan();
  const input = { ...wholeRing(14), patio: patioFor(SQUARE_PLAN) };
  const outline = outlineBorderUnit(input)!;
  expect(outline).toHaveLength(4);
  const [first, second] = placeBorderUnits(input).whole.map((p) => toPlanPolygon(outline, p));
  // Outline corners: [0] inner −v, [1] outer −v, [2] outer +v, [3] inner +v (counter-clockwise).
  expect(gap(first![3]!, second![0]!)).toBeLessThan(1e-9);
  const outerGap = gap(first![2]!, second![1]!);
  expect(outerGap).toBeCloseTo(2 * BORDER_UNIT.widthIn * Math.sin((SQUARE_PLAN.borderUnitAngleDeg * Math.PI) / 360), 9);
  // The engine states the small-angle form L·w/r; within 1 % here.
  expect(Math.abs(outerGap / SQUARE_PLAN.borderOuterJointIn - 1)).toBeLessThan(0.01);
});

test("units cut to touch at the outer face close every joint there, and the course reaches the patio's edge R", () => {
  const input = { ...wholeRing(14), patio: patioFor(taperedPlan()) };
  const pieces = drawPitPlan(input).borderUnits.sort((p, q) => byAngle(p) - byAngle(q));
  for (const piece of pieces)
    expect(farthest(piece)).toBeLessThanOrEqual(Math.hypot(84, BORDER_UNIT.lengthIn / 2) + 1e-9);
  const outline = outlineBorderUnit(input)!;
  const [first, second] = placeBorderUnits(input).whole.map((p) => toPlanPolygon(outline, p));
  // The outer corners of neighbours meet: the shared radial cut leaves no V.
  const outerCorners = (polygon: PlanPolygon) =>
    polygon.filter(([x, y]) => Math.abs(Math.hypot(x, y) - Math.hypot(84, 6)) < 1e-6);
  const [a, b] = [outerCorners(first!), outerCorners(second!)];
  expect(Math.min(...a.flatMap((p) => b.map((q) => gap(p, q))))).toBeLessThan(1e-9);
});

test("without a patio the base pad is the plan's own base radius, so a company's reach past the wall shows", () => {
  const input = { ...wholeRing(14), basePadRadiusIn: ring14().outsideCornerRadiusIn + 10 };
  expect(measurePit(input).basePadRadiusIn).toBeCloseTo(ring14().outsideCornerRadiusIn + 10, 12);
  expect(measurePit(input).extentRadiusIn).toBeCloseTo(ring14().outsideCornerRadiusIn + 10, 12);
});

test("no patio, no caps, no liner: nothing but the wall is placed", () => {
  const input = wholeRing(14);
  expect(placeCaps(input)).toEqual([]);
  expect(placeFirebrick(input)).toEqual([]);
  expect(placeBorderUnits(input)).toEqual({ whole: [], closure: [] });
  const plan = drawPitPlan(input);
  expect(plan.wallUnits).toHaveLength(14);
  expect(plan.caps).toEqual([]);
  expect(plan.steelRingRadiusIn).toBeNull();
});

test("a 14-unit 12/8/8 ring measures a 36.575 in bowl and 52.575 in outside (derived here from the regular-polygon formulas)", () => {
  const m = measurePit(withCaps(wholeRing(14, 3)));
  expect(m.bowlDiameterIn).toBeCloseTo(36.575, 3);
  expect(m.outsideDiameterIn).toBeCloseTo(52.575, 3);
  expect(m.wallTopIn).toBe(12);
  expect(m.topIn).toBe(14.5);
});

test("the camera's view holds the whole pit and patio, in portrait and landscape, and stands no farther back than needed", () => {
  for (const input of [
    withCaps({ ...wholeRing(14), patio: patioFor(taperedPlan()) }),
    withCaps(wholeRing(14)),
    wholeRing(30, 6),
  ]) {
    for (const aspect of [0.6, 1, 1.8]) {
      const framing = frameCamera(input, aspect, 35);
      const tanV = Math.tan((35 * Math.PI) / 360);
      const tanH = tanV * aspect;
      const projected = sampleSceneOutline(input).map((p) => projectPoint(p, framing.position, framing.target));
      for (const q of projected) {
        expect(q.depth).toBeGreaterThan(framing.near);
        expect(q.depth).toBeLessThan(framing.far);
        expect(Math.abs(q.x)).toBeLessThanOrEqual(tanH * FRAME_FILL + 1e-9);
        expect(Math.abs(q.y)).toBeLessThanOrEqual(tanV * FRAME_FILL + 1e-9);
      }
      // Tight: somewhere the scene reaches the margin.
      const reach = Math.max(...projected.map((q) => Math.max(Math.abs(q.x) / tanH, Math.abs(q.y) / tanV)));
      expect(reach).toBeGreaterThan(FRAME_FILL - 1e-3);
    }
  }
});

test("the plan drawing holds the first course, its closure, the caps, the first firebrick row and the steel ring's circle, and nothing that is not there", () => {
  // An exact 40 in bowl: 14 whole units and one closure a course (worked in the ring tests).
  const input = { ...withCaps(exactRing(40)), liner: FIREBRICK };
  const drawing = drawPitPlan(input);
  expect(drawing.wallUnits).toHaveLength(input.ring.unitCount);
  expect(drawing.closureUnits).toHaveLength(1);
  expect(drawing.caps).toHaveLength(input.caps!.count);
  expect(drawing.firebrick).toHaveLength(11);
  expect(drawing.steelRingRadiusIn).toBeNull();
  // Every piece is a real polygon whose corners lie between the bowl and the caps' outer corners.
  const reach = Math.hypot(input.caps!.outerEdgeDistanceIn, input.caps!.outerWidthIn / 2);
  for (const polygon of [...drawing.wallUnits, ...drawing.closureUnits, ...drawing.caps]) {
    expect(polygon.length).toBeGreaterThanOrEqual(4);
    for (const [x, y] of polygon) {
      expect(Math.hypot(x, y)).toBeGreaterThanOrEqual(input.caps!.innerEdgeDistanceIn - 1e-9);
      expect(Math.hypot(x, y)).toBeLessThanOrEqual(reach + 1e-9);
    }
  }
  // The firebrick's fire-side corners touch: a_in = 9 / (2·tan(π/11)) from the centre to each brick's inner face.
  const aIn = 9 / (2 * Math.tan(Math.PI / 11));
  for (const brick of drawing.firebrick) {
    const nearest = Math.min(...brick.map(([x, y]) => Math.hypot(x, y)));
    expect(nearest).toBeGreaterThanOrEqual(aIn - 1e-9);
    expect(nearest).toBeLessThanOrEqual(aIn / Math.cos(Math.PI / 11) + 1e-9);
  }
  // A 35 in steel ring is drawn as a circle of radius 17.5 in.
  const ring = drawPitPlan({ ...wholeRing(14), liner: { kind: "steel-ring", outsideDiameterIn: 35, heightIn: 10 } });
  expect(ring.steelRingRadiusIn).toBe(17.5);
  // A whole ring with nothing else: no closures, caps, firebrick or border.
  const bare = drawPitPlan(wholeRing(14));
  expect([bare.closureUnits, bare.caps, bare.firebrick, bare.borderUnits]).toEqual([[], [], [], []]);
  expect(bare.wallUnits).toHaveLength(14);
});

test("each unit's shade is steady and stays within 0.92–1.06, spread over the range: index 0 is the darkest, 0.92", () => {
  expect(shadeInstance(0)).toBe(0.92);
  const shades = Array.from({ length: 2000 }, (_, i) => shadeInstance(i));
  expect(Math.min(...shades)).toBeGreaterThanOrEqual(0.92);
  expect(Math.max(...shades)).toBeLessThanOrEqual(1.06);
  expect(new Set(shades).size).toBeGreaterThan(1990);
  // Spread: the mean of a well-mixed hash sits near the middle of the range, 0.99.
  expect(shades.reduce((s, x) => s + x, 0) / shades.length).toBeCloseTo(0.99, 2);
  expect(shadeInstance(7, 3)).toBe(shadeInstance(7, 3));
  expect(shadeInstance(7, 3)).not.toBe(shadeInstance(7, 0));
});
