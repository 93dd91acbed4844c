import fc from "fast-check";
import { expect, test } from "vitest";
import { PlanGeometryError } from "~/domain/plan-geometry-error";
import {
  bowlDiameterForCount,
  findNeighbourRings,
  findRingForBowl,
  planRing,
  type RingPlan,
  type WallUnitSize,
} from "~/domain/ring";
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
  expect(plan.unitAngleDeg).toBeCloseTo(360 / 14, 12);
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
  const error = thrown(() =>
    planRing({ target: { bowlDiameterIn: 5000, fit: "at-least" }, wallUnit: UNIT, courses: 1 }),
  );
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
  const plan = planRing({
    target: { bowlDiameterIn: bowlDiameterForCount(UNIT, 14), fit: "exact" },
    wallUnit: UNIT,
    courses: 1,
  });
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
    const touchingRadius =
      plan.limitedBy === "face"
        ? Math.hypot(a + wallUnit.depthIn, wallUnit.faceIn / 2)
        : Math.hypot(a, wallUnit.backIn / 2);
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
      fc.record({
        faceIn: fc.double({ min: 4, max: 24, noNaN: true }),
        taper: fc.double({ min: 0, max: 1, noNaN: true }),
        depthIn: fc.double({ min: 2, max: 16, noNaN: true }),
      }),
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
        if (plan.closure.countPerCourse === 1)
          expect(plan.closure.faceWidthIn).toBeGreaterThanOrEqual(wallUnit.faceIn / 2 - 1e-9);
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

test("a bad wall unit, course count or unit count is refused with the field and the allowed range in words", () => {
  const refused = (fn: () => unknown) => {
    const error = thrown(fn);
    return [error.path, error.message];
  };
  expect(refused(() => ring(12, { ...UNIT, faceIn: 0 }))).toEqual([
    "wallUnit.faceIn",
    "The wall unit's face length must be a length above 0 in.",
  ]);
  expect(refused(() => ring(12, { ...UNIT, backIn: Number.NaN }))).toEqual([
    "wallUnit.backIn",
    "The wall unit's back length must be a length above 0 in.",
  ]);
  expect(refused(() => ring(12, { ...UNIT, depthIn: -8 }))).toEqual([
    "wallUnit.depthIn",
    "The wall unit's depth must be a length above 0 in.",
  ]);
  expect(refused(() => ring(12, { ...UNIT, heightIn: Infinity }))).toEqual([
    "wallUnit.heightIn",
    "The wall unit's height must be a length above 0 in.",
  ]);
  expect(refused(() => ring(12, { ...UNIT, backIn: 13 }))).toEqual([
    "wallUnit.backIn",
    "The back (13 in) cannot be longer than the face (12 in): the narrow end faces the fire.",
  ]);
  expect(ring(12, { ...UNIT, backIn: 12 }).limitedBy).toBe("back");
  const courses = "Courses must be a whole number from 1 to 12.";
  expect(refused(() => planRing({ target: { unitCount: 12 }, wallUnit: UNIT, courses: 0 }))).toEqual([
    "courses",
    courses,
  ]);
  expect(refused(() => planRing({ target: { unitCount: 12 }, wallUnit: UNIT, courses: 2.5 }))).toEqual([
    "courses",
    courses,
  ]);
  expect(planRing({ target: { unitCount: 12 }, wallUnit: UNIT, courses: 12 }).courses).toBe(12);
  expect(planRing({ target: { unitCount: 12 }, wallUnit: UNIT, courses: 1 }).bondOffsetIn).toBeNull();
  expect(refused(() => ring(2))).toEqual(["ring.unitCount", "Units per course must be a whole number from 3 to 200."]);
  expect([ring(3).unitCount, ring(200).unitCount]).toEqual([3, 200]);
  for (const bowlDiameterIn of [0, -5, Number.NaN]) {
    expect(refused(() => planRing({ target: { bowlDiameterIn, fit: "nearest" }, wallUnit: UNIT, courses: 1 }))).toEqual(
      ["ring.bowlDiameterIn", "The bowl diameter must be a length above 0 in."],
    );
  }
});

test("the largest ring of 12/8/8 units is 200 a course, a 12/tan(0.9°) − 16 = 747.88 in bowl: past it a whole ring is refused, and an exact bowl needing more than 200 units too (regular-polygon apothem)", () => {
  expect(
    thrown(() => planRing({ target: { bowlDiameterIn: 760, fit: "at-least" }, wallUnit: UNIT, courses: 1 })).message,
  ).toBe("No ring of these units reaches a 760 in bowl: even 200 units a course make only 747 7/8 in.");
  expect(planRing({ target: { bowlDiameterIn: 747, fit: "at-least" }, wallUnit: UNIT, courses: 1 }).unitCount).toBe(
    200,
  );
  // Exact 760 in: each unit spans 2·atan(6/388) = 1.772°, so 203 would be needed.
  expect(
    thrown(() => planRing({ target: { bowlDiameterIn: 760, fit: "exact" }, wallUnit: UNIT, courses: 1 })).message,
  ).toBe("A 760 in bowl needs more than 200 of these units a course.");
});

test("an exact bowl too small for three pieces is refused: 100 in faces 1/2 in deep round a 1 in bowl span 2·atan(50) = 177.7° each, two close the circle to within a 0.08 in sliver", () => {
  const wide = { faceIn: 100, backIn: 1, depthIn: 0.5, heightIn: 4 };
  const error = thrown(() => planRing({ target: { bowlDiameterIn: 1, fit: "exact" }, wallUnit: wide, courses: 1 }));
  expect([error.path, error.message]).toEqual([
    "ring.bowlDiameterIn",
    "A 1 in bowl is too small for these units: a ring needs at least 3 a course.",
  ]);
});

test("'nearest' to a tiny bowl is the smallest ring, 3 units; a target exactly between two rings takes the larger (the rule: a tie still clears a liner sized to the target)", () => {
  expect(planRing({ target: { bowlDiameterIn: 1, fit: "nearest" }, wallUnit: UNIT, courses: 1 }).unitCount).toBe(3);
  const below = bowlDiameterForCount(UNIT, 13);
  const above = bowlDiameterForCount(UNIT, 14);
  const middle = (below + above) / 2;
  expect(middle - below).toBe(above - middle);
  expect(planRing({ target: { bowlDiameterIn: middle, fit: "nearest" }, wallUnit: UNIT, courses: 1 }).unitCount).toBe(
    14,
  );
  expect(
    planRing({ target: { bowlDiameterIn: middle - 0.01, fit: "nearest" }, wallUnit: UNIT, courses: 1 }).unitCount,
  ).toBe(13);
  // A target equal to a whole ring's bowl, 12/tan(π/14) − 16 = 36.5754 in, is met by that ring.
  expect(
    planRing({
      target: { bowlDiameterIn: 12 / Math.tan(Math.PI / 14) - 16, fit: "at-least" },
      wallUnit: UNIT,
      courses: 1,
    }).unitCount,
  ).toBe(14);
});

test("an exact 36.6 in bowl is a hair over the 14-unit ring: 14 units span 359.84°, the 0.075 in left is shared among the face joints, 2 × 26.3 × tan(0.0058°) = 0.0053 in each (derived here)", () => {
  const plan = planRing({ target: { bowlDiameterIn: 36.6, fit: "exact" }, wallUnit: UNIT, courses: 1 });
  expect(plan.closure).toBeNull();
  expect(plan.unitCount).toBe(14);
  expect(plan.unitAngleDeg).toBeCloseTo(360 / 14, 12);
  expect(plan.faceGapIn).toBeCloseTo(0.00533, 5);
});

test("an exact 36.5 in bowl just under the 14-unit ring: 13 whole units of 25.750° and one closure of 25.250°, 11.759 in at the face; its back would be 2 × 18.25 × tan 12.625° = 8.175 in, so it keeps the unit's whole 8 in back", () => {
  const plan = planRing({ target: { bowlDiameterIn: 36.5, fit: "exact" }, wallUnit: UNIT, courses: 1 });
  expect(plan.unitCount).toBe(13);
  expect(plan.closure?.countPerCourse).toBe(1);
  expect(plan.unitAngleDeg).toBeCloseTo(25.75, 4);
  expect(plan.closure?.angleDeg).toBeCloseTo(25.25, 4);
  expect(plan.closure?.faceWidthIn).toBeCloseTo(11.759, 3);
  expect(plan.closure?.backWidthIn).toBe(8);
});

test("the 200-unit ring is the last neighbour and the last ring that reaches a target; past it there is no ring above (regular-polygon apothem, 12/tan(π/N) − 16)", () => {
  const ring199 = 12 / Math.tan(Math.PI / 199) - 16;
  const ring200 = 12 / Math.tan(Math.PI / 200) - 16;
  expect(bowlDiameterForCount(UNIT, 200)).toBeCloseTo(ring200, 9);
  const between = (ring199 + ring200) / 2;
  expect(findNeighbourRings(UNIT, between)).toEqual({
    below: { unitCount: 199, bowlDiameterIn: expect.closeTo(ring199, 9) as number },
    above: { unitCount: 200, bowlDiameterIn: expect.closeTo(ring200, 9) as number },
  });
  expect(findRingForBowl(UNIT, between)).toEqual({
    unitCount: 200,
    bowlDiameterIn: expect.closeTo(ring200, 9) as number,
  });
  // Past the largest ring: the 200-unit ring is below and nothing is above; no ring reaches it.
  expect(findNeighbourRings(UNIT, 760)).toEqual({
    below: { unitCount: 200, bowlDiameterIn: expect.closeTo(ring200, 9) as number },
    above: null,
  });
  expect(findRingForBowl(UNIT, 760)).toBeNull();
  // The 200-unit ring itself has only a neighbour below.
  expect(planRing({ target: { unitCount: 200 }, wallUnit: UNIT, courses: 1 }).neighbours).toEqual({
    below: { unitCount: 199, bowlDiameterIn: expect.closeTo(ring199, 9) as number },
    above: null,
  });
  // A target exactly the largest ring's bowl is met by it.
  expect(
    planRing({
      target: { bowlDiameterIn: bowlDiameterForCount(UNIT, 200), fit: "at-least" },
      wallUnit: UNIT,
      courses: 1,
    }).unitCount,
  ).toBe(200);
});

test("an exact bowl equal to the largest or the smallest whole ring is laid as that ring: 200 units of 12/8/8, 3 units with 100 in faces (2·atan(50 / 28.87) = 120° each)", () => {
  const largest = planRing({
    target: { bowlDiameterIn: bowlDiameterForCount(UNIT, 200), fit: "exact" },
    wallUnit: UNIT,
    courses: 1,
  });
  expect([largest.unitCount, largest.unitsPerCourse, largest.closure]).toEqual([200, 200, null]);
  const wide = { faceIn: 100, backIn: 1, depthIn: 0.5, heightIn: 4 };
  // Face corners touching: a = 100 / (2·tan 60°) − 0.5 = 28.3675 in, a 56.735 in bowl.
  expect(bowlDiameterForCount(wide, 3)).toBeCloseTo(56.735, 3);
  const smallest = planRing({
    target: { bowlDiameterIn: bowlDiameterForCount(wide, 3), fit: "exact" },
    wallUnit: wide,
    courses: 1,
  });
  expect([smallest.unitCount, smallest.unitsPerCourse, smallest.closure]).toEqual([3, 3, null]);
});

test("an exact bowl just past the largest ring is refused on ring.bowlDiameterIn: at 748 in each unit spans 2·atan(6 / 382) = 1.7998°, 200 leave 0.374 in, and the closure would be the 201st piece (regular-polygon chord)", () => {
  for (const bowlDiameterIn of [748, 750, 760]) {
    const error = thrown(() => planRing({ target: { bowlDiameterIn, fit: "exact" }, wallUnit: UNIT, courses: 1 }));
    expect([error.path, error.message]).toEqual([
      "ring.bowlDiameterIn",
      `A ${bowlDiameterIn} in bowl needs more than 200 of these units a course.`,
    ]);
  }
});
