import { expect, test } from "vitest";
import { firebrickInnerEdgeDistance, planFirebrick, planSteelRing } from "~/domain/liner";
import { bowlDiameterForCount } from "~/domain/ring";
import { gapBetween, overlapArea, rectanglePolygon } from "./flatten-shapes";

// A "9 in straight" firebrick: 9 × 4½ × 2½ in (supplier literature; ASTM C27 sets no sizes).
const STRAIGHT = { lengthIn: 9, widthIn: 4.5, heightIn: 2.5 };
// 14 units of 12/8/8: a 36.575 in bowl (derived here from the regular-polygon formulas).
const BOWL_14 = bowlDiameterForCount({ faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4 }, 14);

test("a 36 in steel ring clears a 36.575 in bowl with 0.288 in of gravel each side (minimum 1/4 in, common practice)", () => {
  const plan = planSteelRing({ bowlDiameterIn: BOWL_14, insert: { outsideDiameterIn: 36, heightIn: 10 }, minGapIn: 0.25 });
  expect(plan.fits).toBe(true);
  expect(plan.gapIn).toBeCloseTo(0.288, 3);
  expect(plan.requiredBowlDiameterIn).toBe(36.5);
});

test("a 36.2 in steel ring does not clear a 36.575 in bowl with a 1/4 in gap each side", () => {
  const plan = planSteelRing({ bowlDiameterIn: BOWL_14, insert: { outsideDiameterIn: 36.2, heightIn: 10 }, minGapIn: 0.25 });
  expect(plan.fits).toBe(false);
  expect(plan.gapIn).toBeCloseTo(0.188, 3);
});

test("a ring of 9 in firebricks with touching corners has edge distance a = 9/(2·tan(π/N)); its corners sit on a circle where the chord 2r·sin(α/2) is 9 in (Machinery's Handbook, Segments of a Circle)", () => {
  for (const n of [8, 10, 12, 16]) {
    const a = firebrickInnerEdgeDistance(9, n);
    expect(a).toBeCloseTo(9 / (2 * Math.tan(Math.PI / n)), 12);
    const cornerRadius = a / Math.cos(Math.PI / n);
    expect(2 * cornerRadius * Math.sin(Math.PI / n)).toBeCloseTo(9, 12);
  }
});

test("a 36.575 in bowl takes 10 straights a row on edge, 3 rows for a 12 in wall: 30 firebricks (derived here from the formulas)", () => {
  const plan = planFirebrick({ bowlDiameterIn: BOWL_14, linedHeightIn: 12, brick: STRAIGHT });
  expect(plan.fits).toBe(true);
  expect(plan.bricksPerRow).toBe(10);
  expect(plan.rows).toBe(3);
  expect(plan.totalBricks).toBe(30);
  expect(plan.innerEdgeDistanceIn).toBeCloseTo(9 / (2 * Math.tan(Math.PI / 10)), 12);
  expect(plan.fireboxDiameterIn).toBeCloseTo(27.699, 3);
  expect(plan.gapToWallIn).toBeGreaterThanOrEqual(0);
});

test("the firebrick ring laid out with flatten-js: fire-side corners touch, no overlaps, every brick inside the bowl, and one more brick would not fit (@flatten-js/core as reference)", () => {
  for (const bowlDiameterIn of [BOWL_14, 30, 44, 60]) {
    const plan = planFirebrick({ bowlDiameterIn, linedHeightIn: 12, brick: STRAIGHT });
    const step = (2 * Math.PI) / plan.bricksPerRow;
    const bricks = Array.from({ length: plan.bricksPerRow }, (_, k) =>
      rectanglePolygon(plan.innerEdgeDistanceIn, STRAIGHT.heightIn, STRAIGHT.lengthIn, k * step),
    );
    for (let k = 0; k < bricks.length; k++) {
      expect(overlapArea(bricks[k], bricks[(k + 1) % bricks.length])).toBeLessThan(1e-9);
      expect(gapBetween(bricks[k], bricks[(k + 1) % bricks.length])).toBeLessThan(1e-9);
      for (const v of bricks[k].vertices) expect(Math.hypot(v.x, v.y)).toBeLessThanOrEqual(bowlDiameterIn / 2 + 1e-9);
    }
    const more = firebrickInnerEdgeDistance(9, plan.bricksPerRow + 1);
    expect(Math.hypot(more + STRAIGHT.heightIn, 4.5)).toBeGreaterThan(bowlDiameterIn / 2);
  }
});

test("a bowl too small for three bricks reports that firebrick does not fit", () => {
  const plan = planFirebrick({ bowlDiameterIn: 12, linedHeightIn: 12, brick: STRAIGHT });
  expect(plan.fits).toBe(false);
  expect(plan.totalBricks).toBe(0);
});

test("rows round up: a 12.5 in wall needs 3 rows of 4½ in, a 13.6 in wall 4 (whole rows, common practice)", () => {
  expect(planFirebrick({ bowlDiameterIn: 40, linedHeightIn: 12.5, brick: STRAIGHT }).rows).toBe(3);
  expect(planFirebrick({ bowlDiameterIn: 40, linedHeightIn: 13.6, brick: STRAIGHT }).rows).toBe(4);
  expect(planFirebrick({ bowlDiameterIn: 40, linedHeightIn: 13.5, brick: STRAIGHT }).rows).toBe(3);
});
