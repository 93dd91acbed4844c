import fc from "fast-check";
import { expect, test } from "vitest";
import { planCaps, type CapBlank } from "~/domain/caps";
import { PlanGeometryError } from "~/domain/plan-geometry-error";
import { capPolygon, gapBetween, overlapArea } from "./flatten-shapes";

// Worked example: wall back edge distance 18 in, 8 in deep wall, 16 × 12 in blanks, 2 in inner
// overhang, 3/16 in joints (derived here from the regular-polygon formulas).
const BLANK: CapBlank = { lengthIn: 16, depthIn: 12, thicknessIn: 2.5, innerOverhangIn: 2 };
const example = () => planCaps({ edgeDistanceIn: 18, wallDepthIn: 8, cap: BLANK, jointIn: 3 / 16, spares: 1 });

function thrown(fn: () => unknown): PlanGeometryError {
  try {
    fn();
  } catch (error) {
    if (error instanceof PlanGeometryError) return error;
    throw error;
  }
  throw new Error("expected a PlanGeometryError");
}

test("16 × 12 in blanks on an 18 in edge distance wall make 12 caps, 8.380 in inside and 14.811 in outside (derived here from the formulas)", () => {
  const caps = example();
  expect(caps.count).toBe(12);
  expect(caps.innerEdgeDistanceIn).toBe(16);
  expect(caps.outerEdgeDistanceIn).toBe(28);
  expect(caps.outerOverhangIn).toBe(2);
  expect(caps.innerWidthIn).toBeCloseTo(8.38, 3);
  expect(caps.outerWidthIn).toBeCloseTo(14.811, 3);
});

test("the worked-example caps are marked 3.810 in and 0.594 in from each corner and cut 12.423 in long, 15° off square (derived here from the formulas)", () => {
  const caps = example();
  expect(caps.innerMarkIn).toBeCloseTo(3.81, 3);
  expect(caps.outerMarkIn).toBeCloseTo(0.594, 3);
  expect(caps.sideCutLengthIn).toBeCloseTo(12.423, 3);
  expect(caps.offSquareDeg).toBeCloseTo(15, 12);
  expect(caps.ripToDepthIn).toBeNull();
});

test("the worked-example blanks lose about 28 % to offcut (trapezoid against the blank, derived here)", () => {
  const caps = example();
  expect(caps.offcutShare).toBeCloseTo(1 - (((8.380259873969 + 14.811040492316) / 2) * 12) / (16 * 12), 9);
  expect(caps.offcutShare).toBeGreaterThan(0.2);
  expect(caps.offcutShare).toBeLessThan(0.3);
});

test("arced edges end on the side cuts: each arc's ends, found as line-circle intersections with the cut line through the corners, give its angle, chord c = 2r·sin(α/2), rise h = r(1 − cos(α/2)) and length l = π·r·α/180 (Machinery's Handbook, Segments of a Circle)", () => {
  const caps = example();
  // The right-hand side cut runs through the inner corner (c1/2, a1) and the outer corner (c2/2, a2),
  // pit centre at the origin; intersect it with the circle of radius r (quadratic, solved here).
  const cutMeets = (r: number): [number, number] => {
    const [x1, y1, x2, y2] = [
      caps.innerWidthIn / 2,
      caps.innerEdgeDistanceIn,
      caps.outerWidthIn / 2,
      caps.outerEdgeDistanceIn,
    ];
    const [dx, dy] = [x2 - x1, y2 - y1];
    const qa = dx * dx + dy * dy;
    const qb = 2 * (x1 * dx + y1 * dy);
    const qc = x1 * x1 + y1 * y1 - r * r;
    const s = (-qb + Math.sqrt(qb * qb - 4 * qa * qc)) / (2 * qa);
    return [x1 + s * dx, y1 + s * dy];
  };
  for (const [r, alphaDeg, rise, length] of [
    [caps.innerRadiusIn, caps.innerArcDeg, caps.innerSagittaIn, caps.innerArcLengthIn],
    [caps.outerRadiusIn, caps.outerArcDeg, caps.outerSagittaIn, caps.outerArcLengthIn],
  ] as const) {
    const [x, y] = cutMeets(r);
    const alpha = 2 * Math.atan2(x, y);
    expect((alpha * 180) / Math.PI).toBeCloseTo(alphaDeg, 9);
    expect(2 * r * Math.sin(alpha / 2)).toBeCloseTo(2 * x, 9);
    expect(r * (1 - Math.cos(alpha / 2))).toBeCloseTo(rise, 9);
    expect((Math.PI * r * ((alpha * 180) / Math.PI)) / 180).toBeCloseTo(length, 9);
  }
  expect(caps.outerRadiusIn).toBe(28);
  // The inner arc runs through the inner corners themselves: its chord is c1.
  expect(2 * caps.innerRadiusIn * Math.sin((caps.innerArcDeg * Math.PI) / 360)).toBeCloseTo(caps.innerWidthIn, 9);
});

test("on the 14-unit ring (a2 = 28.2875 in) the outer arc between the cut lines spans 29.62° and 14.62 in, not the 30.68° and 15.15 in of an arc run to the corners' radial lines (Machinery's Handbook, Segments of a Circle: β = π/N − asin(j/2r), l = π·r·α/180)", () => {
  const a2 = 36.575 / 2 - 2 + 12; // bowl 36.575 in (ring worked example), 2 in inner overhang, 12 in blank
  const caps = planCaps({ edgeDistanceIn: 18.2875, wallDepthIn: 8, cap: BLANK, jointIn: 3 / 16, spares: 1 });
  expect(caps.count).toBe(12);
  expect(caps.outerEdgeDistanceIn).toBeCloseTo(a2, 9);
  expect(caps.outerArcDeg).toBeCloseTo(29.62, 2);
  expect(caps.outerArcLengthIn).toBeCloseTo(14.62, 2);
  // Hand working: asin(0.09375 / 28.2875) = 0.1899°, β = 15° − 0.1899° = 14.810°, α = 29.620°,
  // l = π × 28.2875 × 29.620 / 180 = 14.624 in.
});

test("the inner arc passes through both inner corners (distance from the centre, Pythagoras)", () => {
  const caps = example();
  expect(Math.hypot(caps.innerEdgeDistanceIn, caps.innerWidthIn / 2)).toBeCloseTo(caps.innerRadiusIn, 12);
  expect(caps.innerSagittaIn).toBeGreaterThan(0);
});

test("an outer overhang asked for rips the blank to T + o_i + o_o deep", () => {
  const caps = planCaps({
    edgeDistanceIn: 18,
    wallDepthIn: 8,
    cap: { ...BLANK, outerOverhangIn: 1 },
    jointIn: 3 / 16,
    spares: 1,
  });
  expect(caps.ripToDepthIn).toBe(11);
  expect(caps.capDepthIn).toBe(11);
  expect(caps.outerOverhangIn).toBe(1);
  expect(caps.outerEdgeDistanceIn).toBe(27);
  expect(caps.sideCutLengthIn).toBeCloseTo(11 / Math.cos(Math.PI / caps.count), 12);
});

test("caps that cannot be cut or cannot sit on the wall are refused with the field to blame", () => {
  const plan = (cap: CapBlank, edgeDistanceIn = 18, jointIn = 3 / 16) =>
    planCaps({ edgeDistanceIn, wallDepthIn: 8, cap, jointIn, spares: 1 });
  expect(thrown(() => plan({ ...BLANK, outerOverhangIn: 3 })).path).toBe("cap.outerOverhangIn");
  const shallow = thrown(() => plan({ ...BLANK, depthIn: 5 }));
  expect(shallow.path).toBe("cap.depthIn");
  expect(shallow.message).toMatch(/not deep enough to sit on the wall: .* at least 6 in deep .* and 10 in to cover it/);
  expect(thrown(() => plan({ ...BLANK, innerOverhangIn: 6 }, 5)).path).toBe("cap.innerOverhangIn");
  expect(thrown(() => plan({ ...BLANK, depthIn: 0 })).path).toBe("cap.depthIn");
  expect(thrown(() => plan(BLANK, 18, -1)).path).toBe("jointIn");
});

const capCase = fc.record({
  edgeDistanceIn: fc.double({ min: 12, max: 36, noNaN: true }),
  wallDepthIn: fc.double({ min: 5, max: 12, noNaN: true }),
  lengthIn: fc.double({ min: 12, max: 30, noNaN: true }),
  extraDepthIn: fc.double({ min: 0, max: 6, noNaN: true }),
  innerOverhangIn: fc.double({ min: 0, max: 3, noNaN: true }),
  jointIn: fc.double({ min: 0, max: 0.5, noNaN: true }),
});
type CapCase = {
  edgeDistanceIn: number;
  wallDepthIn: number;
  lengthIn: number;
  extraDepthIn: number;
  innerOverhangIn: number;
  jointIn: number;
};
const planCase = (c: CapCase) =>
  planCaps({
    edgeDistanceIn: c.edgeDistanceIn,
    wallDepthIn: c.wallDepthIn,
    cap: {
      lengthIn: c.lengthIn,
      depthIn: c.wallDepthIn + c.innerOverhangIn + c.extraDepthIn,
      thicknessIn: 2.5,
      innerOverhangIn: c.innerOverhangIn,
    },
    jointIn: c.jointIn,
    spares: 1,
  });

test("caps close the circle: N_c times the angle between a cap's side cuts is 360° (property, derived here)", () => {
  fc.assert(
    fc.property(capCase, (c) => {
      const caps = planCase(c);
      const sideAngle = 2 * Math.atan((caps.outerWidthIn - caps.innerWidthIn) / (2 * caps.capDepthIn));
      expect((caps.count * sideAngle * 180) / Math.PI).toBeCloseTo(360, 9);
      expect(caps.count * 2 * caps.offSquareDeg).toBeCloseTo(360, 9);
    }),
  );
});

test("caps narrow toward the fire and never exceed the blank: 0 < inner < outer ≤ length (property)", () => {
  fc.assert(
    fc.property(capCase, (c) => {
      const caps = planCase(c);
      expect(caps.innerWidthIn).toBeGreaterThan(0);
      expect(caps.innerWidthIn).toBeLessThan(caps.outerWidthIn);
      expect(caps.outerWidthIn).toBeLessThanOrEqual(caps.blankLengthIn + 1e-9);
      // One cap fewer would not fit the blank: the count is the smallest that works.
      if (caps.count > 3) {
        const half = Math.PI / (caps.count - 1);
        expect(2 * caps.outerEdgeDistanceIn * Math.tan(half) - caps.jointIn / Math.cos(half)).toBeGreaterThan(
          caps.blankLengthIn,
        );
      }
    }),
  );
});

test("a shorter blank never fits fewer caps (property)", () => {
  fc.assert(
    fc.property(capCase, fc.double({ min: 0, max: 8, noNaN: true }), (c, shorterByIn) => {
      const long = planCase(c);
      const short = planCase({ ...c, lengthIn: c.lengthIn - shorterByIn });
      expect(short.count).toBeGreaterThanOrEqual(long.count);
    }),
  );
});

test("a ring of caps laid out with flatten-js: no overlaps, every joint exactly j wide, all inside the annulus a1…outer corner (@flatten-js/core as reference)", () => {
  for (const [edgeDistanceIn, jointIn, lengthIn] of [
    [18, 3 / 16, 16],
    [20, 0.25, 20],
    [15, 0, 16],
    [24, 0.5, 18],
  ]) {
    const caps = planCaps({ edgeDistanceIn, wallDepthIn: 8, cap: { ...BLANK, lengthIn }, jointIn, spares: 1 });
    const step = (2 * Math.PI) / caps.count;
    const polygons = Array.from({ length: caps.count }, (_, k) =>
      capPolygon(caps.innerEdgeDistanceIn, caps.outerEdgeDistanceIn, caps.innerWidthIn, caps.outerWidthIn, k * step),
    );
    for (let k = 0; k < caps.count; k++) {
      const next = polygons[(k + 1) % caps.count];
      expect(overlapArea(polygons[k], next)).toBeLessThan(1e-9);
      expect(Math.abs(gapBetween(polygons[k], next) - jointIn)).toBeLessThan(1e-6);
      for (const v of polygons[k].vertices) {
        const r = Math.hypot(v.x, v.y);
        expect(r).toBeGreaterThanOrEqual(caps.innerEdgeDistanceIn - 1e-9);
        expect(r).toBeLessThanOrEqual(caps.outerCornerRadiusIn + 1e-9);
      }
    }
    // The caps cover the wall's top: the wall's back at a and face at a + T lie between a1 and a2.
    expect(caps.innerEdgeDistanceIn).toBeLessThanOrEqual(edgeDistanceIn);
    expect(caps.outerEdgeDistanceIn).toBeGreaterThanOrEqual(edgeDistanceIn + 8);
  }
});

test("each refusal names the field and says what is allowed", () => {
  const refused = (cap: CapBlank, edgeDistanceIn = 18, jointIn = 3 / 16) => {
    const error = thrown(() => planCaps({ edgeDistanceIn, wallDepthIn: 8, cap, jointIn, spares: 1 }));
    return [error.path, error.message];
  };
  expect(refused({ ...BLANK, lengthIn: 0 })).toEqual(["cap.lengthIn", "The cap's length must be a length above 0 in."]);
  expect(refused({ ...BLANK, depthIn: Number.NaN })).toEqual([
    "cap.depthIn",
    "The cap's depth must be a length above 0 in.",
  ]);
  expect(refused({ ...BLANK, thicknessIn: -2.5 })).toEqual([
    "cap.thicknessIn",
    "The cap's thickness must be a length above 0 in.",
  ]);
  expect(refused({ ...BLANK, innerOverhangIn: -0.5 })).toEqual([
    "cap.innerOverhangIn",
    "The inner overhang must be 0 in or more.",
  ]);
  expect(refused({ ...BLANK, innerOverhangIn: Number.NaN })).toEqual([
    "cap.innerOverhangIn",
    "The inner overhang must be 0 in or more.",
  ]);
  expect(refused(BLANK, 18, Number.NaN)).toEqual(["jointIn", "The joint must be 0 in or more."]);
  expect(refused({ ...BLANK, innerOverhangIn: 5 }, 5)).toEqual([
    "cap.innerOverhangIn",
    "The bowl is too small for this inner overhang: the caps would meet in the middle. Keep the overhang under 5 in.",
  ]);
  expect(refused({ ...BLANK, outerOverhangIn: -1 })).toEqual([
    "cap.outerOverhangIn",
    "The outer overhang must be 0 in or more.",
  ]);
  // 8 + 2 + 3 = 13 in needed from 12 in blanks; the most they give is 12 − 8 − 2 = 2 in.
  expect(refused({ ...BLANK, outerOverhangIn: 3 })).toEqual([
    "cap.outerOverhangIn",
    "A 3 in outer overhang needs blanks at least 13 in deep; these are 12 in. The most these blanks give is 2 in.",
  ]);
  // Blanks 0.01 in long with tight joints: 2 × 30 × tan(π/n) ≤ 0.01 needs n ≥ 18,850, past any real ring.
  expect(refused({ ...BLANK, lengthIn: 0.01 }, 18, 0)).toEqual([
    "cap.lengthIn",
    "The cap blanks are too short for this ring.",
  ]);
  // a1 = 6 − 5 = 1 in, a2 = 13 in, 3 in joints: 5 caps fit outside (2 × 13 × tan 36° − 3/cos 36° = 15.18 in),
  // but inside 2 × 1 × tan 36° − 3.71 = −2.26 in.
  expect(refused({ ...BLANK, innerOverhangIn: 5 }, 6, 3)).toEqual([
    "cap.innerOverhangIn",
    "The caps would come to a point at their inner edge: make the inner overhang or the joint smaller.",
  ]);
});

test("an outer overhang that uses the whole blank needs no rip: 8 + 2 + 2 = 12 in from 12 in blanks", () => {
  const caps = planCaps({
    edgeDistanceIn: 18,
    wallDepthIn: 8,
    cap: { ...BLANK, outerOverhangIn: 2 },
    jointIn: 3 / 16,
    spares: 1,
  });
  expect(caps.ripToDepthIn).toBeNull();
  expect(caps.capDepthIn).toBe(12);
});

test("why this count: the fewest that fit when the wall is not given; the wall's count when the fewest already divides it; a matching count only within the allowed extra waste (common practice, no source)", () => {
  const plan = (wallSides?: number, matchMaxExtraOffcutPct?: number) =>
    planCaps({
      edgeDistanceIn: 18,
      wallDepthIn: 8,
      cap: BLANK,
      jointIn: 3 / 16,
      spares: 1,
      wallSides,
      matchMaxExtraOffcutPct,
    });
  expect([plan().count, plan().countReason]).toEqual([12, "fewest"]);
  // 12 caps divide a 24-unit wall: they already sit centred over every other unit.
  expect([plan(24).count, plan(24).countReason]).toEqual([12, "matches-wall"]);
  // 14 units: 14 caps waste more than 12 do, so without an allowance the fewest stay.
  expect([plan(14).count, plan(14).countReason]).toEqual([12, "fewest"]);
  expect([plan(14, 15).count, plan(14, 15).countReason]).toEqual([14, "matches-wall"]);
  // A 13-unit wall: no count from 13 up to 13 divides it but 13 itself.
  expect(plan(13, 50).count).toBe(13);
  expect(plan(2, 50).countReason).toBe("fewest");
});

test("a wall of exactly the fewest caps' count matches them; a 22-unit wall takes 22 caps (61.6 % offcut, within 28.4 + 50 points), never 11, which would not fit the blank (derived here from the formulas)", () => {
  const plan = (wallSides: number, matchMaxExtraOffcutPct?: number) =>
    planCaps({
      edgeDistanceIn: 18,
      wallDepthIn: 8,
      cap: BLANK,
      jointIn: 3 / 16,
      spares: 1,
      wallSides,
      matchMaxExtraOffcutPct,
    });
  expect([plan(12).count, plan(12).countReason]).toEqual([12, "matches-wall"]);
  expect([plan(36).count, plan(36).countReason]).toEqual([12, "matches-wall"]);
  // 22 caps: c1 = 32·tan(π/22) − 0.1875/cos(π/22) = 4.601 − 0.189 = 4.412 in, c2 = 56·tan(π/22) − 0.189
  // = 7.862 in, (4.412 + 7.862) / 2 × 12 = 73.64 in² of a 192 in² blank: 61.6 % offcut.
  const wide = plan(22, 50);
  expect([wide.count, wide.countReason]).toEqual([22, "matches-wall"]);
  expect(wide.offcutShare).toBeCloseTo(0.6164, 3);
  // 11 caps would be 2 × 28 × tan(π/11) − 0.1875/cos(π/11) = 16.25 in outside: longer than the 16 in blank.
  expect(wide.outerWidthIn).toBeLessThanOrEqual(16);
});

test("an outer overhang of 0 in is allowed: the blank is ripped to T + o_i = 8 + 2 = 10 in, flush with the wall's face", () => {
  const caps = planCaps({
    edgeDistanceIn: 18,
    wallDepthIn: 8,
    cap: { ...BLANK, outerOverhangIn: 0 },
    jointIn: 3 / 16,
    spares: 1,
  });
  expect(caps.capDepthIn).toBe(10);
  expect(caps.ripToDepthIn).toBe(10);
  expect(caps.outerOverhangIn).toBe(0);
});

test("marks kept so far from the corners that nothing is left of the blank are refused, not searched for ever: 16 in blanks with 9 in each end leave −2 in", () => {
  const error = thrown(() =>
    planCaps({ edgeDistanceIn: 18, wallDepthIn: 8, cap: BLANK, jointIn: 3 / 16, spares: 1, minMarkIn: 9 }),
  );
  expect([error.path, error.message]).toEqual(["cap.lengthIn", "The cap blanks are too short for this ring."]);
});

test("the outer corner trim runs along the side cut from the outer corner to where the arc at a2 = 28 in meets it: 0.963 in on the worked example; half-widths are 4.190 and 7.406 in (line-circle intersection solved here)", () => {
  const caps = example();
  const [x1, y1, x2, y2] = [
    caps.innerWidthIn / 2,
    caps.innerEdgeDistanceIn,
    caps.outerWidthIn / 2,
    caps.outerEdgeDistanceIn,
  ];
  const [dx, dy] = [x2 - x1, y2 - y1];
  const qa = dx * dx + dy * dy;
  const qb = 2 * (x1 * dx + y1 * dy);
  const qc = x1 * x1 + y1 * y1 - 28 * 28;
  const s = (-qb + Math.sqrt(qb * qb - 4 * qa * qc)) / (2 * qa);
  const meets = [x1 + s * dx, y1 + s * dy];
  expect(caps.outerCornerTrimIn).toBeCloseTo(Math.hypot(x2 - meets[0]!, y2 - meets[1]!), 9);
  expect(caps.outerCornerTrimIn).toBeCloseTo(0.963, 3);
  expect(caps.innerHalfWidthIn).toBeCloseTo(8.38 / 2, 3);
  expect(caps.outerHalfWidthIn).toBeCloseTo(14.811 / 2, 3);
});

test("arced caps over a whole ring: the overhangs measured point by point round the wall's face and back (14 units of 12/8/8, a = 18.288 in) against arcs at a2 and the inner radius", () => {
  const a = 6 / Math.tan(Math.PI / 14) - 8; // face corners touching: 12 / (2·tan(π/14)) − 8
  const outsideCorner = Math.hypot(a + 8, 6);
  const backCorner = Math.hypot(a, 4);
  const caps = planCaps({
    edgeDistanceIn: a,
    wallDepthIn: 8,
    cap: BLANK,
    jointIn: 3 / 16,
    spares: 1,
    wallOutsideCornerRadiusIn: outsideCorner,
    wallBackCornerRadiusIn: backCorner,
  });
  // Walk one unit's face (x = a + 8, y from −6 to 6) and back (x = a, y from −4 to 4): every unit is the same.
  const face: number[] = [];
  const back: number[] = [];
  for (let i = 0; i <= 1000; i++) {
    face.push(Math.hypot(a + 8, -6 + (12 * i) / 1000));
    back.push(Math.hypot(a, -4 + (8 * i) / 1000));
  }
  const r2 = caps.outerEdgeDistanceIn;
  const ri = caps.innerRadiusIn;
  const range = caps.arcedOverhangRange;
  expect(range.outerMinIn).toBeCloseTo(r2 - Math.max(...face), 9);
  expect(range.outerMaxIn).toBeCloseTo(r2 - Math.min(...face), 9);
  expect(range.innerMinIn).toBeCloseTo(Math.min(...back) - ri, 9);
  expect(range.innerMaxIn).toBeCloseTo(Math.max(...back) - ri, 9);
  // An arced outer edge overhangs the middle of each face by the outer overhang, 12 − 8 − 2 = 2 in.
  expect(range.outerMaxIn).toBeCloseTo(2, 9);
});
