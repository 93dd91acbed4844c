import fc from "fast-check";
import { expect, test } from "vitest";
import { PlanGeometryError } from "~/domain/plan-geometry-error";
import { bowlDiameterForCount, planRing, type RingPlan, type WallUnitSize } from "~/domain/ring";
import { clip, gapBetween, overlapArea, sectorPolygon, wallUnitPolygon, type FlatPolygon } from "./flatten-shapes";

// Illustrative tapered unit: 12 in face, 8 in back, 8 in deep, 4 in high.
const UNIT: WallUnitSize = { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4 };
const RECTANGULAR: WallUnitSize = { faceIn: 12, backIn: 12, depthIn: 8, heightIn: 4 };

const ring = (unitCount: number, wallUnit = UNIT) => planRing({ target: { unitCount }, wallUnit, courses: 3 });

function thrown(fn: () => unknown): PlanGeometryError {
  try {
    fn();
  } catch (error) {
    if (error instanceof PlanGeometryError) return error;
    throw error;
  }
  throw new Error("expected a PlanGeometryError");
}

// Builds every piece of one course as flatten-js polygons: whole units centred one unit angle
// apart, then the closure units, each clipped to the wedge between its two radial lines.
function layCourse(plan: RingPlan, wallUnit: WallUnitSize): { pieces: FlatPolygon[]; angles: number[] } {
  const a = plan.edgeDistanceIn;
  const unitAngle = (plan.unitAngleDeg * Math.PI) / 180;
  const reach = 4 * (a + wallUnit.depthIn);
  const pieces: FlatPolygon[] = [];
  const angles: number[] = [];
  let start = 0;
  const add = (angle: number) => {
    const centre = start + angle / 2;
    pieces.push(clip(wallUnitPolygon(a, wallUnit, centre), sectorPolygon(angle / 2, reach, centre)));
    angles.push(angle);
    start += angle;
  };
  for (let i = 0; i < plan.unitCount; i++) add(unitAngle);
  for (let i = 0; i < (plan.closure?.countPerCourse ?? 0); i++) add(((plan.closure?.angleDeg ?? 0) * Math.PI) / 180);
  return { pieces, angles };
}

test("the tightest 12/8/8 ring with both joints closed has a 32.000 in bowl: ID* = 2BT/(F − B) (derived here from the regular-polygon formulas)", () => {
  expect(ring(13).tightestBowlDiameterIn).toBeCloseTo(32, 3);
});

test("a 13-unit ring of 12/8/8 units has a 32.686 in bowl, face-limited (derived here from the regular-polygon formulas)", () => {
  const plan = ring(13);
  expect(plan.bowlDiameterIn).toBeCloseTo(32.686, 3);
  expect(plan.limitedBy).toBe("face");
});

test("a 14-unit ring of 12/8/8 units has a 36 9/16 in (36.575) bowl with 0.348 in back gaps (derived here from the regular-polygon formulas)", () => {
  const plan = ring(14);
  expect(plan.bowlDiameterIn).toBeCloseTo(36.575, 3);
  expect(plan.outsideDiameterIn).toBeCloseTo(52.575, 3);
  expect(plan.limitedBy).toBe("face");
  expect(plan.backGapIn).toBeCloseTo(0.348, 3);
  expect(plan.faceGapIn).toBe(0);
});

test("a 12-unit ring of 12/8/8 units is back-limited: 29.856 in bowl with 0.287 in open face joints (derived here from the regular-polygon formulas)", () => {
  const plan = ring(12);
  expect(plan.bowlDiameterIn).toBeCloseTo(29.856, 3);
  expect(plan.limitedBy).toBe("back");
  expect(plan.faceGapIn).toBeCloseTo(0.287, 3);
  expect(plan.backGapIn).toBe(0);
});

test("rectangular units always close at the back and open at the face; no tightest bowl exists (derived here from the formulas)", () => {
  for (const n of [6, 12, 24, 100]) {
    const plan = ring(n, RECTANGULAR);
    expect(plan.limitedBy).toBe("back");
    expect(plan.faceGapIn).toBeGreaterThan(0);
  }
  expect(ring(12, RECTANGULAR).tightestBowlDiameterIn).toBeNull();
});

test("three courses of 14 units with 2 1/2 in caps: 42 units, 14 1/2 in wall, courses turned 12.857° (half a unit, common practice)", () => {
  const plan = planRing({ target: { unitCount: 14 }, wallUnit: UNIT, courses: 3, capThicknessIn: 2.5 });
  expect(plan.totalUnits).toBe(42);
  expect(plan.wallHeightIn).toBe(14.5);
  expect(plan.runningBondDeg).toBeCloseTo(180 / 14, 12);
  expect(plan.neighbours.below?.unitCount).toBe(13);
  expect(plan.neighbours.above?.unitCount).toBe(15);
});

test("asking for at least a 36 in bowl gives 14 units (36.575 in); nearest to 34 in gives 13 (derived here from the formulas)", () => {
  const atLeast = planRing({ target: { bowlDiameterIn: 36, fit: "at-least" }, wallUnit: UNIT, courses: 1 });
  expect(atLeast.unitCount).toBe(14);
  expect(atLeast.neighbours.below).toEqual({ unitCount: 13, bowlDiameterIn: bowlDiameterForCount(UNIT, 13) });
  const nearest = planRing({ target: { bowlDiameterIn: 34, fit: "nearest" }, wallUnit: UNIT, courses: 1 });
  expect(nearest.unitCount).toBe(13);
});

test("a bowl target no ring can reach is refused on ring.bowlDiameterIn", () => {
  const error = thrown(() => planRing({ target: { bowlDiameterIn: 5000, fit: "at-least" }, wallUnit: UNIT, courses: 1 }));
  expect(error.path).toBe("ring.bowlDiameterIn");
  expect(error.message).toMatch(/No ring of these units reaches/);
});

test("impossible inputs name the field to blame", () => {
  expect(thrown(() => ring(2)).path).toBe("ring.unitCount");
  expect(thrown(() => ring(201)).path).toBe("ring.unitCount");
  expect(thrown(() => ring(12.5)).path).toBe("ring.unitCount");
  expect(thrown(() => ring(12, { ...UNIT, backIn: 13 })).path).toBe("wallUnit.backIn");
  expect(thrown(() => ring(12, { ...UNIT, depthIn: 0 })).path).toBe("wallUnit.depthIn");
  expect(thrown(() => planRing({ target: { unitCount: 12 }, wallUnit: UNIT, courses: 13 })).path).toBe("courses");
});

test("an exact 34 in bowl: 12 whole units and two equal closure units, face joints closed, no back trim (derived here from the formulas)", () => {
  const plan = planRing({ target: { bowlDiameterIn: 34, fit: "exact" }, wallUnit: UNIT, courses: 2 });
  const a = 17;
  const unitAngle = 2 * Math.atan(12 / (2 * (a + 8)));
  const leftover = 2 * Math.PI - 13 * unitAngle; // 13 whole units fit, leaving under half a unit
  const closureAngle = (leftover + unitAngle) / 2;
  expect(plan.bowlDiameterIn).toBe(34);
  expect(plan.unitCount).toBe(12);
  expect(plan.closure?.countPerCourse).toBe(2);
  expect(plan.unitsPerCourse).toBe(14);
  expect(plan.totalUnits).toBe(28);
  expect(plan.closure?.angleDeg).toBeCloseTo((closureAngle * 180) / Math.PI, 9);
  expect(plan.closure?.faceWidthIn).toBeCloseTo(2 * (a + 8) * Math.tan(closureAngle / 2), 9);
  expect(plan.backTrimPerSideIn).toBe(0);
  expect(plan.backGapIn).toBeCloseTo((a * 12) / (a + 8) - 8, 9);
  expect(plan.neighbours.below?.unitCount).toBe(13);
  expect(plan.neighbours.above?.unitCount).toBe(14);
});

test("an exact 30 in bowl, tighter than ID* = 32 in, trims every back corner (derived here from the formulas)", () => {
  const plan = planRing({ target: { bowlDiameterIn: 30, fit: "exact" }, wallUnit: UNIT, courses: 1 });
  expect(plan.backTrimPerSideIn).toBeCloseTo((8 - (15 * 12) / 23) / 2, 9);
  expect(plan.limitedBy).toBe("face");
  expect(plan.closure).not.toBeNull();
});

test("an exact bowl equal to a whole ring's bowl needs no closure unit", () => {
  const plan = planRing({ target: { bowlDiameterIn: bowlDiameterForCount(UNIT, 14), fit: "exact" }, wallUnit: UNIT, courses: 1 });
  expect(plan.closure).toBeNull();
  expect(plan.unitCount).toBe(14);
});

test("whole-unit rings laid out with flatten-js never overlap; face corners meet when face-limited, back corners when back-limited (@flatten-js/core as reference)", () => {
  for (const [n, wallUnit] of [
    [12, UNIT],
    [13, UNIT],
    [14, UNIT],
    [20, UNIT],
    [10, RECTANGULAR],
  ] as const) {
    const plan = ring(n, wallUnit);
    const a = plan.edgeDistanceIn;
    const step = (2 * Math.PI) / n;
    const first = wallUnitPolygon(a, wallUnit, 0);
    const second = wallUnitPolygon(a, wallUnit, step);
    expect(overlapArea(first, second)).toBeLessThan(1e-9);
    expect(gapBetween(first, second)).toBeLessThan(1e-9);
    // The corners that touch sit on the bisector between the two units.
    const touchingRadius = plan.limitedBy === "face" ? Math.hypot(a + wallUnit.depthIn, wallUnit.faceIn / 2) : Math.hypot(a, wallUnit.backIn / 2);
    const corner = { x: touchingRadius * Math.cos(step / 2), y: touchingRadius * Math.sin(step / 2) };
    const onFirst = first.vertices.some((v) => Math.hypot(v.x - corner.x, v.y - corner.y) < 1e-9);
    const onSecond = second.vertices.some((v) => Math.hypot(v.x - corner.x, v.y - corner.y) < 1e-9);
    expect(onFirst && onSecond, `${n} units`).toBe(true);
  }
});

test("an exact-bowl course laid out with flatten-js closes the circle without overlaps; closure faces and trimmed backs measure as stated (@flatten-js/core as reference)", () => {
  for (const bowlDiameterIn of [30, 34, 35.2, 40, 44.4]) {
    const plan = planRing({ target: { bowlDiameterIn, fit: "exact" }, wallUnit: UNIT, courses: 1 });
    const { pieces, angles } = layCourse(plan, UNIT);
    expect(angles.reduce((sum, x) => sum + x, 0)).toBeCloseTo(2 * Math.PI, 9);
    for (let i = 0; i < pieces.length; i++) {
      const next = pieces[(i + 1) % pieces.length];
      expect(overlapArea(pieces[i], next)).toBeLessThan(1e-9);
      // Whole units touch exactly. Beside a closure the two face corners sit on the same radial
      // cut but at slightly different radii (chords of different angles), leaving a hairline
      // well under 1/32 in.
      const isBesideClosure = i >= plan.unitCount - 1;
      expect(gapBetween(pieces[i], next)).toBeLessThan(isBesideClosure ? 1 / 32 : 1e-9);
    }
    // Every piece's outer face is a chord at edge distance a + T: measure the closure's face.
    if (plan.closure) {
      const closure = pieces[pieces.length - 1];
      const faceX = plan.edgeDistanceIn + UNIT.depthIn;
      const centre = angles.slice(0, -1).reduce((s, x) => s + x, 0) + angles[angles.length - 1] / 2;
      const local = closure.vertices.map((v) => ({
        x: v.x * Math.cos(-centre) - v.y * Math.sin(-centre),
        y: v.x * Math.sin(-centre) + v.y * Math.cos(-centre),
      }));
      const face = local.filter((v) => Math.abs(v.x - faceX) < 1e-6).map((v) => v.y);
      expect(Math.max(...face) - Math.min(...face)).toBeCloseTo(plan.closure.faceWidthIn, 6);
      const back = local.filter((v) => Math.abs(v.x - plan.edgeDistanceIn) < 1e-6).map((v) => v.y);
      expect(Math.max(...back) - Math.min(...back)).toBeCloseTo(plan.closure.backWidthIn, 6);
    }
    if (plan.backTrimPerSideIn > 0) {
      const whole = pieces[0];
      const full = wallUnitPolygon(plan.edgeDistanceIn, UNIT, angles[0] / 2);
      expect(full.area() - whole.area()).toBeGreaterThan(0);
    }
  }
});

test("the bowl grows with every unit added, from 3 to 200 units (property, derived here from the formulas)", () => {
  fc.assert(
    fc.property(
      fc.record({ faceIn: fc.double({ min: 4, max: 24, noNaN: true }), taper: fc.double({ min: 0, max: 1, noNaN: true }), depthIn: fc.double({ min: 2, max: 16, noNaN: true }) }),
      fc.integer({ min: 3, max: 199 }),
      ({ faceIn, taper, depthIn }, n) => {
        const unit = { faceIn, backIn: faceIn * (0.3 + 0.7 * taper), depthIn, heightIn: 4 };
        expect(bowlDiameterForCount(unit, n + 1)).toBeGreaterThan(bowlDiameterForCount(unit, n));
      },
    ),
  );
});

const realisticUnit = fc
  .record({
    faceIn: fc.double({ min: 8, max: 18, noNaN: true }),
    backShare: fc.double({ min: 0.5, max: 1, noNaN: true }),
    depthIn: fc.double({ min: 5, max: 12, noNaN: true }),
  })
  .map(({ faceIn, backShare, depthIn }) => ({ faceIn, backIn: faceIn * backShare, depthIn, heightIn: 4 }));

test("'at-least' never returns a smaller bowl than asked, and the ring below it is too small (property)", () => {
  fc.assert(
    fc.property(realisticUnit, fc.double({ min: 12, max: 120, noNaN: true }), (wallUnit, bowlDiameterIn) => {
      const plan = planRing({ target: { bowlDiameterIn, fit: "at-least" }, wallUnit, courses: 1 });
      expect(plan.bowlDiameterIn).toBeGreaterThanOrEqual(bowlDiameterIn - 1e-9);
      if (plan.neighbours.below) expect(plan.neighbours.below.bowlDiameterIn).toBeLessThan(bowlDiameterIn);
    }),
  );
});

test("'nearest' is never farther from the target than either neighbouring ring (property)", () => {
  fc.assert(
    fc.property(realisticUnit, fc.double({ min: 12, max: 120, noNaN: true }), (wallUnit, bowlDiameterIn) => {
      const plan = planRing({ target: { bowlDiameterIn, fit: "nearest" }, wallUnit, courses: 1 });
      const miss = Math.abs(plan.bowlDiameterIn - bowlDiameterIn);
      for (const other of [plan.neighbours.below, plan.neighbours.above]) {
        if (other) expect(miss).toBeLessThanOrEqual(Math.abs(other.bowlDiameterIn - bowlDiameterIn) + 1e-9);
      }
    }),
  );
});

test("an exact bowl's whole units and closures always add up to 360° with closures between half and one unit wide (property)", () => {
  fc.assert(
    fc.property(realisticUnit, fc.double({ min: 20, max: 120, noNaN: true }), (wallUnit, bowlDiameterIn) => {
      const plan = planRing({ target: { bowlDiameterIn, fit: "exact" }, wallUnit, courses: 1 });
      const unitDeg = plan.unitAngleDeg;
      const closureDeg = (plan.closure?.angleDeg ?? 0) * (plan.closure?.countPerCourse ?? 0);
      const spreadDeg = plan.closure ? 0 : 360 - plan.unitCount * unitDeg;
      expect(plan.unitCount * unitDeg + closureDeg + spreadDeg).toBeCloseTo(360, 9);
      expect(plan.bowlDiameterIn).toBe(bowlDiameterIn);
      if (plan.closure) {
        // A single closure is at least half a unit at the face; split closures at least half a unit's angle.
        if (plan.closure.countPerCourse === 1) expect(plan.closure.faceWidthIn).toBeGreaterThanOrEqual(wallUnit.faceIn / 2 - 1e-9);
        expect(plan.closure.angleDeg).toBeGreaterThanOrEqual(plan.unitAngleDeg / 2 - 1e-9);
        expect(plan.closure.faceWidthIn).toBeLessThanOrEqual(wallUnit.faceIn + 1e-9);
        expect(plan.closure.backWidthIn).toBeLessThanOrEqual(wallUnit.backIn + 1e-9);
      } else {
        expect(plan.faceGapIn).toBeLessThan(0.125);
      }
      const { below, above } = plan.neighbours;
      if (below) expect(below.bowlDiameterIn).toBeLessThan(bowlDiameterIn);
      if (above) expect(above.bowlDiameterIn).toBeGreaterThan(bowlDiameterIn);
    }),
  );
});
