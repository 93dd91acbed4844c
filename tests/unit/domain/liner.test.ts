import { expect, test } from "vitest";
import { DEFAULT_FACTORS } from "~/domain/factors";
import { firebrickInnerEdgeDistance, planFirebrick, planSteelRing } from "~/domain/liner";
import { gapBetween, overlapArea, rectanglePolygon } from "./flatten-shapes";

// A "9 in straight" firebrick: 9 × 4½ × 2½ in (supplier literature; ASTM C27 sets no sizes).
const STRAIGHT = { lengthIn: 9, widthIn: 4.5, heightIn: 2.5 };
// The 14-unit ring of 12/8/8 tapered units: past the tightest bowl the 12 in faces close, so they are
// the sides of a regular 14-gon (apothem 6/tan(π/14), any geometry handbook) and the bowl is twice the
// apothem less the 8 in depth: 12/tan(π/14) − 16 = 36.575 in.
const BOWL_14 = 12 / Math.tan(Math.PI / 14) - 16;

test("a 36 in steel ring leaves 0.288 in each side in a 36.575 in bowl: under the 1/2 in needed for ±1/8 in unit tolerance (ASTM C1372, from memory) plus steel growth of 36 × 6.5e-6 × 800 ≈ 0.19 in (carbon steel's published coefficient), so it does not fit by default", () => {
  expect(36 * 6.5e-6 * 800).toBeCloseTo(0.187, 3);
  const plan = planSteelRing({
    bowlDiameterIn: BOWL_14,
    insert: { outsideDiameterIn: 36, heightIn: 10 },
    minGapIn: DEFAULT_FACTORS.linerMinGapIn,
  });
  expect(DEFAULT_FACTORS.linerMinGapIn).toBe(0.5);
  expect(plan.gapIn).toBeCloseTo(0.288, 3);
  expect(plan.fits).toBe(false);
  expect(plan.requiredBowlDiameterIn).toBe(37);
});

test("a 36.2 in steel ring does not clear a 36.575 in bowl with a 1/4 in gap each side", () => {
  const plan = planSteelRing({
    bowlDiameterIn: BOWL_14,
    insert: { outsideDiameterIn: 36.2, heightIn: 10 },
    minGapIn: 0.25,
  });
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

test("the lining never stands above the block: 4 courses of 4 in under caps leave 16 − 1/8 = 15 7/8 in; rows of 4½ + 1/16 in give 3 whole rows (13 11/16 in) and a top row ripped to 15 7/8 − 13 11/16 − 1/16 = 2 1/8 in, one rip per brick (common practice, no source)", () => {
  const plan = planFirebrick({
    bowlDiameterIn: 40,
    linedHeightIn: 16 - 0.125,
    brick: STRAIGHT,
    jointIn: 1 / 16,
    minRipIn: 1,
  });
  expect(plan.fullRows).toBe(3);
  expect(plan.rippedRows).toBe(1);
  expect(plan.ripHeightIn).toBeCloseTo(2.125, 12);
  expect(plan.builtHeightIn).toBeCloseTo(15.875, 12);
  expect(plan.ripCuts).toBe(plan.bricksPerRow);
  expect(plan.totalBricks).toBe(4 * plan.bricksPerRow);
  // Rounding rows up (the old rule) would have stood 4 × 4 9/16 = 18 1/4 in, 2 1/4 in proud of the block.
  expect(plan.builtHeightIn).toBeLessThanOrEqual(16 - 0.125);
});

test("a strip under the smallest rip is left out and the lining stops a little lower: 12 in lined, 2 whole rows of 4 9/16 in leave 2 7/8 − 1/16 in, above 1 in, so a row is ripped; 9.3 in lined leaves 3/16 in, so none (common practice, no source)", () => {
  expect(
    planFirebrick({ bowlDiameterIn: 40, linedHeightIn: 12, brick: STRAIGHT, jointIn: 1 / 16, minRipIn: 1 }).ripHeightIn,
  ).toBeCloseTo(12 - 2 * 4.5625 - 0.0625, 12);
  const low = planFirebrick({ bowlDiameterIn: 40, linedHeightIn: 9.3, brick: STRAIGHT, jointIn: 1 / 16, minRipIn: 1 });
  expect(low.rippedRows).toBe(0);
  expect(low.rows).toBe(2);
  expect(low.builtHeightIn).toBeCloseTo(9.125, 12);
});

test("a steel ring whose top sits more than 1 in under the caps is raised on a gravel bed to the lined height, and the bed and gap are ordered as fill (common practice, no source; 1 ft³ = 1728 in³, NIST SP 811)", () => {
  // 14-unit ring: a = 18.2875 in; inside polygon 14 × a² × tan(π/14) (regular-polygon area).
  const a = BOWL_14 / 2;
  const insideIn2 = 14 * a * a * Math.tan(Math.PI / 14);
  const plan = planSteelRing({
    bowlDiameterIn: BOWL_14,
    insert: { outsideDiameterIn: 35, heightIn: 10 },
    minGapIn: 0.5,
    linedHeightIn: 11.875,
    wallSides: 14,
    raiseOverIn: 1,
  });
  expect(plan.bedDepthIn).toBeCloseTo(1.875, 12);
  const fillIn3 = (insideIn2 - Math.PI * 17.5 ** 2) * 10 + insideIn2 * 1.875;
  expect(plan.fillFt3).toBeCloseTo(fillIn3 / 1728, 9);
  const close = planSteelRing({
    bowlDiameterIn: BOWL_14,
    insert: { outsideDiameterIn: 35, heightIn: 11 },
    minGapIn: 0.5,
    linedHeightIn: 11.875,
    wallSides: 14,
    raiseOverIn: 1,
  });
  expect(close.bedDepthIn).toBe(0);
});

test("a 36 in ring in a 40 in bowl with nothing else said: 2 in each side, as tall as the lining, no bed; the gap to its own top is the round bowl less the ring, (π·20² − π·18²) × 10 = 2387.6 in³ = 1.382 ft³ (circle area; 1 ft³ = 1728 in³, NIST SP 811)", () => {
  const plan = planSteelRing({ bowlDiameterIn: 40, insert: { outsideDiameterIn: 36, heightIn: 10 }, minGapIn: 0.5 });
  expect(plan).toMatchObject({
    kind: "steel-ring",
    outsideDiameterIn: 36,
    heightIn: 10,
    fits: true,
    gapIn: 2,
    requiredBowlDiameterIn: 37,
    minGapIn: 0.5,
    linedHeightIn: 10,
    bedDepthIn: 0,
    tooTall: false,
  });
  expect(plan.fillFt3).toBeCloseTo(1.3817, 4);
});

test("a bowl exactly the ring plus twice the gap clears it; a ring 1/8 in over the lined height is too tall, one exactly at it is not; a ring exactly the raise limit under the caps stays on the floor (common practice, no source)", () => {
  expect(
    planSteelRing({ bowlDiameterIn: 37, insert: { outsideDiameterIn: 36, heightIn: 10 }, minGapIn: 0.5 }).fits,
  ).toBe(true);
  expect(
    planSteelRing({ bowlDiameterIn: 36.99, insert: { outsideDiameterIn: 36, heightIn: 10 }, minGapIn: 0.5 }).fits,
  ).toBe(false);
  const tall = planSteelRing({
    bowlDiameterIn: 40,
    insert: { outsideDiameterIn: 36, heightIn: 12 },
    minGapIn: 0.5,
    linedHeightIn: 11.875,
    raiseOverIn: 1,
  });
  expect([tall.tooTall, tall.bedDepthIn]).toEqual([true, 0]);
  expect(
    planSteelRing({
      bowlDiameterIn: 40,
      insert: { outsideDiameterIn: 36, heightIn: 11.875 },
      minGapIn: 0.5,
      linedHeightIn: 11.875,
    }).tooTall,
  ).toBe(false);
  expect(
    planSteelRing({
      bowlDiameterIn: 40,
      insert: { outsideDiameterIn: 36, heightIn: 10 },
      minGapIn: 0.5,
      linedHeightIn: 11,
      raiseOverIn: 1,
    }).bedDepthIn,
  ).toBe(0);
  expect(
    planSteelRing({
      bowlDiameterIn: 40,
      insert: { outsideDiameterIn: 36, heightIn: 10 },
      minGapIn: 0.5,
      linedHeightIn: 11.25,
      raiseOverIn: 1,
    }).bedDepthIn,
  ).toBe(1.25);
});

/*
 * The firebrick lining of a 40 in bowl inside 15 wall pieces, worked by hand (regular-polygon
 * apothem a = L/(2 tan(π/M)) and area M·a²·tan(π/M), Machinery's Handbook; 1 ft³ = 1728 in³):
 * 12 bricks a row: a_in = 9/(2 × 0.267949) = 16.794 in; outer faces at 19.294 in; the V-joint at the
 * back 2 × 19.294 × 0.267949 − 9 = 1.340 in; the gap to the wall 20 − 19.294 = 0.706 in.
 * Rows (1/16 in joints, 15 7/8 in lined): 3 whole and a 2 1/8 in rip. Mortar: beds 4 × 9 × 2.5 × 1/16
 * = 5.625, heads (3 × 4.5 + 2.125) × 2.5 × (1/16 + 0.670) = 28.608, × 12 = 410.8 in³.
 * Sand: wall polygon 15 × 20² × tan 12° = 1275.34 in² less the lining 12 × 19.294² × tan 15° =
 * 1196.97 in² = 78.37 in² × 15.875 in = 1244.1 in³ = 0.720 ft³; against a round bowl (no sides given)
 * π × 20² = 1256.64 in², 59.67 in² × 15.875 = 947.3 in³ = 0.548 ft³.
 */
test("firebrick in a 40 in bowl of 15 pieces: 12 a row, 1.340 in V-joints, 0.706 in to the wall, 410.8 in³ of mortar and 0.720 ft³ of sand (worked by hand)", () => {
  const args = { bowlDiameterIn: 40, linedHeightIn: 15.875, brick: STRAIGHT, jointIn: 1 / 16, minRipIn: 1 };
  const plan = planFirebrick({ ...args, wallSides: 15 });
  expect(plan).toMatchObject({
    fits: true,
    bricksPerRow: 12,
    fullRows: 3,
    rippedRows: 1,
    rows: 4,
    totalBricks: 48,
    ripCuts: 12,
    rowHeightIn: 4.5,
    thicknessIn: 2.5,
    jointIn: 1 / 16,
    linedHeightIn: 15.875,
  });
  expect(plan.innerEdgeDistanceIn).toBeCloseTo(16.794, 3);
  expect(plan.fireboxDiameterIn).toBeCloseTo(33.588, 3);
  expect(plan.outerJointIn).toBeCloseTo(1.34, 3);
  expect(plan.gapToWallIn).toBeCloseTo(0.706, 3);
  expect(plan.mortarIn3).toBeCloseTo(410.8, 1);
  expect(plan.fillFt3).toBeCloseTo(0.72, 3);
  expect(planFirebrick(args).fillFt3).toBeCloseTo(0.548, 3);
});

test("firebrick defaults: no joint and a 1 in smallest rip; 10 in lined takes 2 rows of 4 1/2 in and a 1 in rip, 9.9 in leaves 0.9 in out; with no joint only the V-joints take mortar, 12 × 10 in × 2.5 × 1.340/2 = 200.96 in³ (common practice, no source)", () => {
  const ten = planFirebrick({ bowlDiameterIn: 40, linedHeightIn: 10, brick: STRAIGHT });
  expect([ten.jointIn, ten.fullRows, ten.ripHeightIn, ten.rows, ten.builtHeightIn]).toEqual([0, 2, 1, 3, 10]);
  expect(ten.mortarIn3).toBeCloseTo(200.96, 2);
  const under = planFirebrick({ bowlDiameterIn: 40, linedHeightIn: 9.9, brick: STRAIGHT });
  expect([under.fullRows, under.ripHeightIn, under.rows, under.builtHeightIn]).toEqual([2, null, 2, 9]);
});

test("a lining too low for one row does not fit, though the bowl would take 12 a row: nothing is ordered", () => {
  const plan = planFirebrick({ bowlDiameterIn: 40, linedHeightIn: 0.5, brick: STRAIGHT, jointIn: 1 / 16 });
  expect(plan).toMatchObject({
    fits: false,
    bricksPerRow: 12,
    fullRows: 0,
    rows: 0,
    totalBricks: 0,
    ripCuts: 0,
    builtHeightIn: 0,
    mortarIn3: 0,
    fillFt3: 0,
    fireboxDiameterIn: 0,
    outerJointIn: 0,
    gapToWallIn: 0,
    innerEdgeDistanceIn: 0,
  });
});

test("a lined height of exactly three rows takes three rows, whatever the float noise: 3 × (4 1/2 + 0.15) = 13.95 in, though 13.95 / 4.65 computes as 2.9999999999999996", () => {
  expect(13.95 / 4.65).toBeLessThan(3);
  const plan = planFirebrick({ bowlDiameterIn: 40, linedHeightIn: 13.95, brick: STRAIGHT, jointIn: 0.15 });
  expect([plan.fullRows, plan.rippedRows, plan.rows]).toEqual([3, 0, 3]);
  expect(plan.builtHeightIn).toBeCloseTo(13.95, 12);
});

test("inside a three-sided wall the fill is measured against the triangle, 3·a²·tan 60° = 5.196 a² (regular-polygon area, Machinery's Handbook), not the circle", () => {
  // a = 20: triangle 2078.46 in²; a 36 in ring 1017.88 in², 10 in tall: 10,605.8 in³ = 6.138 ft³.
  expect(
    planSteelRing({ bowlDiameterIn: 40, insert: { outsideDiameterIn: 36, heightIn: 10 }, minGapIn: 0.5, wallSides: 3 })
      .fillFt3,
  ).toBeCloseTo(6.1376, 3);
  // Firebrick, 12 a row (a_in + t = 19.294 in): (2078.46 − 1196.97) in² × 10 in lined (2 rows and a 1 in rip) = 8814.9
  // in³ = 5.101 ft³.
  expect(planFirebrick({ bowlDiameterIn: 40, linedHeightIn: 10, brick: STRAIGHT, wallSides: 3 }).fillFt3).toBeCloseTo(
    5.101,
    2,
  );
});
