import { expect, test } from "vitest";
import { Polygon, point } from "@flatten-js/core";
import { IN3_PER_YD3, countGridPavers, planPatio, type PatioFactors } from "~/domain/patio";
import { PlanGeometryError } from "~/domain/plan-geometry-error";
import { gapBetween, overlapArea, rectanglePolygon } from "./flatten-shapes";

const FACTORS: PatioFactors = {
  paverWasteFloorPct: 5,
  borderMaxJointIn: 0.1875,
  minCutPiecePct: 33,
  edgeSpikeSpacingIn: 12,
  edgeRestraintPieceFt: 8,
  beddingSandDepthIn: 1,
  sandTonsPerYd3: 1.35,
  jointSandLbPerFt2: 1,
  jointSandBagLb: 50,
};
// A 16 ft patio: 96 in outside radius, 6 × 12 in border units, 4 × 8 in pavers, around a pit with
// its faces 26.288 in from the centre (14 units of 12/8/8, derived here).
const PATIO = { outsideRadiusIn: 96, border: { widthIn: 6, lengthIn: 12 }, paver: { lengthIn: 8, widthIn: 4 } };
const PIT = { pitOutsideEdgeDistanceIn: 26.288, pitOutsideCornerRadiusIn: 26.97 };
const plan = () => planPatio({ patio: PATIO, ...PIT, factors: FACTORS });

// A 30 ft patio with 4 × 8 in border units: on r = 176 in the square-ended V-joints open
// 8 × 4 / 176 = 0.182 in, inside the 3/16 in limit (ICPI, from memory: joints 1/16–3/16 in).
const WIDE = { outsideRadiusIn: 180, border: { widthIn: 4, lengthIn: 8 }, paver: { lengthIn: 8, widthIn: 4 } };

test("square-ended border units stay square while their V-joint is within 3/16 in: 4 × 8 units on a 176 in circle open 0.182 in; 138 whole units leave 2.03 in, under a third of a unit, so 137 whole and two equal pieces of 5.01 in close the course (ICPI joints, from memory; closure rule common practice, no source)", () => {
  const patio = planPatio({ patio: WIDE, ...PIT, factors: FACTORS });
  expect(patio.borderLayout).toBe("square");
  expect(patio.borderOuterJointIn).toBeCloseTo(32 / 176, 12);
  const theta = 2 * Math.atan(8 / 352); // inner corners touch: chord 8 at edge distance 176
  expect(Math.floor((2 * Math.PI) / theta)).toBe(138);
  expect(patio.borderWholeCount).toBe(137);
  expect(patio.borderClosureCount).toBe(2);
  expect(patio.borderUnitCount).toBe(139);
  expect(patio.lastBorderUnitLengthIn).toBeCloseTo(5.015, 3);
  expect(patio.lastBorderUnitLengthIn).toBeGreaterThanOrEqual(8 / 3);
  expect(patio.borderCuts).toBe(2);
});

test("the square-ended border laid out with flatten-js: inner corners touch and nothing overlaps (@flatten-js/core as reference)", () => {
  const patio = planPatio({ patio: WIDE, ...PIT, factors: FACTORS });
  const step = (patio.borderUnitAngleDeg * Math.PI) / 180;
  const units = Array.from({ length: patio.borderWholeCount }, (_, k) => rectanglePolygon(176, 4, 8, k * step));
  for (let k = 0; k + 1 < units.length; k++) {
    expect(overlapArea(units[k], units[k + 1])).toBeLessThan(1e-9);
    expect(gapBetween(units[k], units[k + 1])).toBeLessThan(1e-9);
  }
});

test("12 × 6 in border units on a 16 ft patio would open 12 × 6 / 90 = 0.8 in V-joints, past 3/16 in, so every unit is cut one end 7.15° off square with its outer corners touching: 2·atan(12/192) (ICPI joints, from memory; derived here from the regular-polygon chord)", () => {
  const patio = plan();
  expect((12 * 6) / 90).toBeGreaterThan(0.1875);
  expect(patio.borderLayout).toBe("tapered");
  expect(patio.borderOuterJointIn).toBe(0);
  expect(patio.borderTaperDeg).toBeCloseTo((2 * Math.atan(12 / 192) * 180) / Math.PI, 12);
  // 360 / 7.1527° = 50.33: 50 tapered units and one piece of 2 × 96 × tan(0.33 × 7.1527°/2) = 3.97 in,
  // just over a third of 12 in, so it stays a single closure piece.
  expect(patio.borderWholeCount).toBe(50);
  expect(patio.borderClosureCount).toBe(1);
  expect(patio.lastBorderUnitLengthIn).toBeCloseTo(3.966, 3);
  expect(patio.borderCuts).toBe(50 + 2);
});

test("a tapered border unit's cut end meets the next unit's square end flush: flatten-js finds no gap and no overlap (@flatten-js/core as reference)", () => {
  const patio = plan();
  const theta = ((patio.borderTaperDeg ?? 0) * Math.PI) / 180;
  const [r, R, L] = [90, 96, 12];
  // Unit 0 in its own frame: square end at y = −L/2, outer corners (R, ±L/2); its cut end runs from
  // (R, L/2) along the next unit's square end, which is unit 0's square end turned by θ.
  const rot = (x: number, y: number, a: number): [number, number] => [
    x * Math.cos(a) - y * Math.sin(a),
    x * Math.sin(a) + y * Math.cos(a),
  ];
  const [p1, p2] = [rot(r, -L / 2, theta), rot(R, -L / 2, theta)];
  expect(p2[0]).toBeCloseTo(R, 9);
  expect(p2[1]).toBeCloseTo(L / 2, 9);
  const t = (r - p2[0]) / (p1[0] - p2[0]);
  const cutInner: [number, number] = [r, p2[1] + t * (p1[1] - p2[1])];
  const unit = (a: number) =>
    new Polygon(
      [rot(r, -L / 2, a), rot(R, -L / 2, a), rot(R, L / 2, a), rot(cutInner[0], cutInner[1], a)].map(([x, y]) =>
        point(x, y),
      ),
    );
  expect(overlapArea(unit(0), unit(theta))).toBeLessThan(1e-9);
  expect(gapBetween(unit(0), unit(theta))).toBeLessThan(1e-9);
  // The cut runs θ off square.
  const cutAngle = Math.atan2(L / 2 - cutInner[1], R - r);
  expect(cutAngle).toBeCloseTo(theta, 9);
});

test("field pavers come from a grid count: whole cells lie inside the field and whole + cut cells cover it, so whole × 32 ≤ field area ≤ (whole + cut) × 32 in²; 5 % breakage goes on top (geometry; floor common practice, no source)", () => {
  const patio = plan();
  const fieldIn2 = Math.PI * 90 ** 2 - Math.PI * 26.288 ** 2;
  expect(patio.fieldCutRadiusIn).toBe(90);
  expect(patio.fieldAreaFt2).toBeCloseTo(fieldIn2 / 144, 9);
  expect(patio.wholePaverCount * 32).toBeLessThanOrEqual(fieldIn2);
  expect((patio.wholePaverCount + patio.cutPaverCount) * 32).toBeGreaterThanOrEqual(fieldIn2);
  expect(patio.paverCount).toBe(Math.ceil((patio.wholePaverCount + patio.cutPaverCount) * 1.05));
  // The waste this implies is well over the flat 10 % the estimate used to assume.
  expect(patio.paverWastePct).toBeGreaterThan(15);
  expect(patio.paverWastePct).toBeCloseTo((patio.paverCount / (fieldIn2 / 32) - 1) * 100, 9);
});

test("grid counts: a 4 × 8 in paver grid over a 16 in circle has, in each quadrant, 3 whole cells and 5 cut ones, counted cell by cell here", () => {
  // Quadrant cells (i, k) span [8i, 8i+8] × [4k, 4k+4]; whole when the far corner is within 16 in.
  // far corners: (8,4)=8.9 (8,8)=11.3 (8,12)=14.4 (16,4)=16.5 … so whole: (0,0),(0,1),(0,2); cut:
  // (0,3) far (8,16)=17.9; (1,0) near 8; (1,1) near (8,4)=8.9; (1,2) near 11.3; (1,3) near 14.4.
  expect(countGridPavers({ lengthIn: 8, widthIn: 4 }, 0, 16)).toEqual({ whole: 4 * 3, cut: 4 * 5 });
});

test("edge restraint runs round the outside, 2π × 96 = 603.2 in: 7 pieces of 8 ft and a spike every 12 in, 51 spikes (ICPI construction guidance; 8 ft pieces from memory)", () => {
  const patio = plan();
  expect(patio.edgeRestraintIn).toBeCloseTo(603.186, 3);
  expect(patio.edgeRestraintPieces).toBe(7);
  expect(patio.edgeSpikes).toBe(51);
});

test("bedding sand is the paved area times 1 in deep, in cubic yards of 46,656 in³ (NIST SP 811)", () => {
  const patio = plan();
  const pavedIn2 = Math.PI * 96 ** 2 - Math.PI * 26.288 ** 2;
  expect(IN3_PER_YD3).toBe(36 ** 3);
  expect(patio.beddingSandYd3).toBeCloseTo(pavedIn2 / 46_656, 12);
  expect(patio.beddingSandTons).toBeCloseTo((pavedIn2 / 46_656) * 1.35, 12);
  expect(patio.jointSandBags).toBe(Math.ceil(pavedIn2 / 144 / 50));
});

test("a patio that does not reach past the pit and its border is refused on patio.outsideRadiusIn", () => {
  try {
    planPatio({ patio: { ...PATIO, outsideRadiusIn: 30 }, ...PIT, factors: FACTORS });
    expect.unreachable();
  } catch (error) {
    expect(error).toBeInstanceOf(PlanGeometryError);
    expect((error as PlanGeometryError).path).toBe("patio.outsideRadiusIn");
  }
});

test("each patio size is checked by name, and a patio that does not clear the pit says how far it must reach: the pit's 26.97 in corners plus a 6 in border, 32.97 in, said to the nearest 1/16 in: 33 in", () => {
  const refused = (patio: typeof PATIO) => {
    try {
      planPatio({ patio, ...PIT, factors: FACTORS });
    } catch (error) {
      if (error instanceof PlanGeometryError) return [error.path, error.message];
      throw error;
    }
    return null;
  };
  const size = "This size must be a length above 0 in.";
  expect(refused({ ...PATIO, outsideRadiusIn: Number.NaN })).toEqual(["patio.outsideRadiusIn", size]);
  expect(refused({ ...PATIO, border: { widthIn: 0, lengthIn: 12 } })).toEqual(["patio.border.widthIn", size]);
  expect(refused({ ...PATIO, border: { widthIn: 6, lengthIn: -12 } })).toEqual(["patio.border.lengthIn", size]);
  expect(refused({ ...PATIO, paver: { lengthIn: Infinity, widthIn: 4 } })).toEqual(["patio.paver.lengthIn", size]);
  expect(refused({ ...PATIO, paver: { lengthIn: 8, widthIn: 0 } })).toEqual(["patio.paver.widthIn", size]);
  expect(refused({ ...PATIO, outsideRadiusIn: 32.97 })).toEqual([
    "patio.outsideRadiusIn",
    "The patio must reach past the pit and its border: its outside radius must be more than 33 in.",
  ]);
});

test("the 16 ft patio's areas and sand: field π(90² − 26.288²) = 23,275 in² = 161.63 ft²; paved π(96² − 26.288²) = 26,782 in² = 185.98 ft²; 1 in of bedding 0.5740 yd³ × 1.35 = 0.775 t; joint sand 185.98 lb ÷ 50 → 4 bags (NIST SP 811; rates from memory)", () => {
  const patio = plan();
  expect(patio.fieldCutRadiusIn).toBe(90);
  expect(patio.borderInnerEdgeDistanceIn).toBe(90);
  expect(patio.fieldAreaFt2).toBeCloseTo(161.63, 1);
  expect(patio.pavedAreaFt2).toBeCloseTo(185.98, 1);
  expect(patio.beddingSandYd3).toBeCloseTo(0.574, 3);
  expect(patio.beddingSandTons).toBeCloseTo(0.775, 3);
  expect(patio.jointSandBags).toBe(4);
  expect(patio.edgeRestraintIn).toBeCloseTo(603.19, 2);
});

/*
 * Reference grid count, worked independently of the engine: every cell of the whole plane (not one
 * quadrant times four) with integer corners, compared in exact integer arithmetic (squared
 * distances), so a cell touching a circle at one corner is decided exactly. A cell is whole when its
 * nearest point is at or outside the inner circle and its farthest corner at or inside the outer one;
 * cut when the outer circle passes through it (nearest point inside it) and the inner circle does not
 * leave it wholly inside the pit.
 */
function referenceGrid(cellX: number, cellY: number, inner: number, outer: number) {
  let whole = 0;
  let cut = 0;
  const reach = outer + Math.max(cellX, cellY);
  const nearest = (lo: number, hi: number) => (lo > 0 ? lo : hi < 0 ? -hi : 0);
  for (let x0 = -Math.ceil(reach / cellX) * cellX; x0 < reach; x0 += cellX) {
    for (let y0 = -Math.ceil(reach / cellY) * cellY; y0 < reach; y0 += cellY) {
      const nx = nearest(x0, x0 + cellX);
      const ny = nearest(y0, y0 + cellY);
      const fx = Math.max(Math.abs(x0), Math.abs(x0 + cellX));
      const fy = Math.max(Math.abs(y0), Math.abs(y0 + cellY));
      const near2 = nx * nx + ny * ny;
      const far2 = fx * fx + fy * fy;
      if (near2 >= outer * outer || far2 <= inner * inner) continue;
      if (near2 >= inner * inner && far2 <= outer * outer) whole++;
      else cut++;
    }
  }
  return { whole, cut };
}

test("grid counts where circles touch cell corners exactly: 1 in cells and the 3-4-5 right triangle (5² = 3² + 4²), counted by hand and over the whole plane in integers", () => {
  // Radius 5, quadrant cells (i, k) whole when (i+1)² + (k+1)² ≤ 25: 4 + 4 + 4 + 3 = 15 (the 4 × 3 and
  // 3 × 4 corners land exactly on the circle and are whole). Cells with i² + k² < 25: 5 + 5 + 5 + 4 + 3
  // = 22, so 7 cut; the cells (3, 4) and (4, 3) only touch the circle at a corner and take no paver.
  expect(countGridPavers({ lengthIn: 1, widthIn: 1 }, 0, 5)).toEqual({ whole: 60, cut: 28 });
  // A 5 in circle as the pit's edge and the field's: only the cells it passes through, 7 a quadrant;
  // those whose far corner is exactly on it are inside the pit, no paver.
  expect(countGridPavers({ lengthIn: 1, widthIn: 1 }, 5, 5)).toEqual({ whole: 0, cut: 28 });
  // Half-inch cells in a 1 in circle: (0,0) reaches 0.707, whole; (1,0), (0,1), (1,1) are cut.
  expect(countGridPavers({ lengthIn: 0.5, widthIn: 0.5 }, 0, 1)).toEqual({ whole: 4, cut: 12 });
  for (const [x, y, inner, outer] of [
    [1, 1, 5, 7],
    [1, 1, 5, 10],
    [2, 1, 5, 13],
    [1, 2, 10, 13],
    [3, 4, 5, 25],
    [4, 8, 13, 30],
  ] as const) {
    expect(countGridPavers({ lengthIn: x, widthIn: y }, inner, outer)).toEqual(referenceGrid(x, y, inner, outer));
  }
});

test("a border V-joint exactly at the 3/16 in limit stays square-ended: 4 × 12 in units on r = 256 in open 12 × 4 / 256 = 0.1875 in (ICPI joints, from memory)", () => {
  const patio = planPatio({
    patio: { outsideRadiusIn: 260, border: { widthIn: 4, lengthIn: 12 }, paver: { lengthIn: 8, widthIn: 4 } },
    ...PIT,
    factors: FACTORS,
  });
  expect(patio.borderOuterJointIn).toBe(0.1875);
  expect(patio.borderLayout).toBe("square");
  expect(patio.borderTaperDeg).toBeNull();
});

test("a border that closes to within 1/8 in needs no cut piece: 6 × 12 in units tapered on a 114.5 in circle span 2·atan(6 / 114.5) = 5.99931° each, 60 of them leave 0.0414°, 0.083 in at the face (regular-polygon chord; closure rule common practice, no source)", () => {
  const patio = planPatio({
    patio: { outsideRadiusIn: 114.5, border: { widthIn: 6, lengthIn: 12 }, paver: { lengthIn: 8, widthIn: 4 } },
    ...PIT,
    factors: FACTORS,
  });
  // Square ends would open 12 × 6 / 108.5 = 0.66 in, so every unit is tapered.
  expect(patio.borderLayout).toBe("tapered");
  expect(patio.borderUnitAngleDeg).toBeCloseTo(5.99931, 5);
  expect(patio.borderWholeCount).toBe(60);
  expect(patio.borderClosureCount).toBe(0);
  expect(patio.borderUnitCount).toBe(60);
  expect(patio.lastBorderUnitLengthIn).toBe(12);
  // One taper cut on each of the 60 units, and no closure cuts.
  expect(patio.borderCuts).toBe(60);
});

test("bedding sand 1 1/2 in deep and joint sand at 1/2 lb/ft² on the 16 ft patio: 185.98 ft² × 144 × 1.5 / 46,656 = 0.8610 yd³ (× 1.35 = 1.162 t); 92.99 lb ÷ 50 lb → 2 bags (NIST SP 811; rates from memory)", () => {
  const patio = planPatio({
    patio: PATIO,
    ...PIT,
    factors: { ...FACTORS, beddingSandDepthIn: 1.5, jointSandLbPerFt2: 0.5 },
  });
  expect(patio.beddingSandYd3).toBeCloseTo(0.861, 3);
  expect(patio.beddingSandTons).toBeCloseTo(1.1624, 3);
  expect(patio.jointSandBags).toBe(2);
});
