import { expect, test } from "vitest";
import { IN3_PER_YD3, planPatio, type PatioFactors } from "~/domain/patio";
import { PlanGeometryError } from "~/domain/plan-geometry-error";
import { gapBetween, overlapArea, rectanglePolygon } from "./flatten-shapes";

const FACTORS: PatioFactors = { paverWastePct: 10, beddingSandDepthIn: 1, sandTonsPerYd3: 1.35, jointSandLbPerFt2: 1, jointSandBagLb: 50 };
// A 16 ft patio: 96 in outside radius, 6 × 12 in border units, 4 × 8 in pavers, around a pit with
// its faces 26.288 in from the centre (14 units of 12/8/8, derived here).
const PATIO = { outsideRadiusIn: 96, border: { widthIn: 6, lengthIn: 12 }, paver: { lengthIn: 8, widthIn: 4 } };
const PIT = { pitOutsideEdgeDistanceIn: 26.288, pitOutsideCornerRadiusIn: 26.97 };
const plan = () => planPatio({ patio: PATIO, ...PIT, factors: FACTORS });

test("a 16 ft patio takes 48 border units of 12 in laid on a 90 in circle: ceil(π / atan(L/2r)) (derived here from the regular-polygon formulas)", () => {
  const patio = plan();
  expect(patio.borderInnerEdgeDistanceIn).toBe(90);
  expect(patio.borderUnitCount).toBe(Math.ceil(Math.PI / Math.atan(12 / 180)));
  expect(patio.borderUnitCount).toBe(48);
  expect(patio.borderOuterJointIn).toBeCloseTo((12 * 6) / 90, 12);
});

test("the border laid out with flatten-js: inner corners touch, nothing overlaps, 47 whole units leave less than one unit to cut (@flatten-js/core as reference)", () => {
  const patio = plan();
  const step = (patio.borderUnitAngleDeg * Math.PI) / 180;
  const units = Array.from({ length: patio.borderUnitCount - 1 }, (_, k) => rectanglePolygon(90, 6, 12, k * step));
  for (let k = 0; k + 1 < units.length; k++) {
    expect(overlapArea(units[k], units[k + 1])).toBeLessThan(1e-9);
    expect(gapBetween(units[k], units[k + 1])).toBeLessThan(1e-9);
  }
  const wrapGap = gapBetween(units[units.length - 1], units[0]);
  expect(wrapGap).toBeGreaterThan(0);
  expect(wrapGap).toBeLessThan(12);
  // The cut unit's inner face (a chord at r) matches the corner-to-corner gap within 1/32 in.
  expect(Math.abs(patio.lastBorderUnitLengthIn - wrapGap)).toBeLessThan(1 / 32);
  // A 48th whole unit would overlap the first: hence one is cut.
  const whole48 = rectanglePolygon(90, 6, 12, (patio.borderUnitCount - 1) * step);
  expect(overlapArea(whole48, units[0])).toBeGreaterThan(0);
});

test("the field is the 90 in circle less the pit's footprint; pavers include 10 % waste (1 ft² = 144 in², NIST SP 811)", () => {
  const patio = plan();
  const fieldIn2 = Math.PI * 90 ** 2 - Math.PI * 26.288 ** 2;
  expect(patio.fieldCutRadiusIn).toBe(90);
  expect(patio.fieldAreaFt2).toBeCloseTo(fieldIn2 / 144, 9);
  expect(patio.paverCount).toBe(Math.ceil((fieldIn2 / 32) * 1.1));
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
