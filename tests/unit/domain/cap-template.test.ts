import fc from "fast-check";
import { expect, test } from "vitest";
import { layoutCapTemplate, type TemplatePoint } from "~/domain/cap-template";
import { planCaps, type CapBlank } from "~/domain/caps";

// Worked example, derived by hand from the regular-polygon chord c = 2a·tan(π/N) (Machinery's
// Handbook, "Segments of a Circle"): wall back edge distance 18 in, 8 in deep wall, 16 × 12 in
// blanks, 2 in inner overhang, 3/16 in joints → 12 caps, c1 = 8.380 in, c2 = 14.811 in, marks
// 3.810 in and 0.594 in from each corner, side cuts 12.423 in long and 15° off square.
const BLANK: CapBlank = { lengthIn: 16, depthIn: 12, thicknessIn: 2.5, innerOverhangIn: 2 };
const example = () => planCaps({ edgeDistanceIn: 18, wallDepthIn: 8, cap: BLANK, jointIn: 3 / 16, spares: 1 });

const dist = (p: TemplatePoint, q: TemplatePoint) => Math.hypot(p[0] - q[0], p[1] - q[1]);

/** Distance from a point to the infinite line through a and b. */
function distanceToLine(p: TemplatePoint, a: TemplatePoint, b: TemplatePoint): number {
  const cross = (b[0] - a[0]) * (p[1] - a[1]) - (b[1] - a[1]) * (p[0] - a[0]);
  return Math.abs(cross) / dist(a, b);
}

test("the template's wedge measures 8.380 in inside, 14.811 in outside and 12 in deep on a 16 × 12 in blank (worked example, derived by hand from c = 2a·tan(π/N))", () => {
  const t = layoutCapTemplate(example());
  const [il, ir, or, ol] = t.corners;
  expect(dist(il, ir)).toBeCloseTo(8.38, 3);
  expect(dist(ol, or)).toBeCloseTo(14.811, 3);
  expect(il[1]).toBe(0);
  expect(ol[1]).toBe(12);
  expect(t.blankLengthIn).toBe(16);
  expect(t.blankDepthIn).toBe(12);
});

test("the template's corners sit 3.810 in and 0.594 in in from the blank's corners, the marks the crew measures (worked example, derived by hand)", () => {
  const [il, ir, or, ol] = layoutCapTemplate(example()).corners;
  expect(il[0]).toBeCloseTo(3.81, 3);
  expect(16 - ir[0]).toBeCloseTo(3.81, 3);
  expect(ol[0]).toBeCloseTo(0.594, 3);
  expect(16 - or[0]).toBeCloseTo(0.594, 3);
});

test("each side of the template is 12.423 in long and runs 15° off square (worked example; W / cos(π/N) and 180/N)", () => {
  const [il, ir, or, ol] = layoutCapTemplate(example()).corners;
  expect(dist(il, ol)).toBeCloseTo(12.423, 3);
  expect(dist(ir, or)).toBeCloseTo(12.423, 3);
  const offSquareDeg = (Math.atan2(il[0] - ol[0], ol[1] - il[1]) * 180) / Math.PI;
  expect(offSquareDeg).toBeCloseTo(15, 9);
});

test("each side cut lies half a joint off the radial line through the pit centre, so neighbouring caps leave a 3/16 in joint (derived: the joint is centred on the radius)", () => {
  const t = layoutCapTemplate(example());
  const [il, ir, or, ol] = t.corners;
  expect(distanceToLine(t.centre, il, ol)).toBeCloseTo(3 / 32, 9);
  expect(distanceToLine(t.centre, ir, or)).toBeCloseTo(3 / 32, 9);
  expect(t.centre).toEqual([8, -16]);
});

test("the optional inner arc runs through both inner corners and bows into the cap by its sagitta (Machinery's Handbook, Segments of a Circle)", () => {
  const caps = example();
  const t = layoutCapTemplate(caps);
  const [il, ir] = t.corners;
  expect(dist(t.innerArc[0]!, il)).toBeCloseTo(0, 9);
  expect(dist(t.innerArc.at(-1)!, ir)).toBeCloseTo(0, 9);
  const middle = t.innerArc[Math.floor(t.innerArc.length / 2)]!;
  expect(middle[0]).toBeCloseTo(8, 9);
  expect(middle[1]).toBeCloseTo(caps.innerSagittaIn, 9);
  // h = r − √(r² − (c/2)²) for the 8.380 in chord on a 16.547 in radius.
  expect(caps.innerSagittaIn).toBeCloseTo(
    caps.innerRadiusIn - Math.sqrt(caps.innerRadiusIn ** 2 - (8.380259873969 / 2) ** 2),
    6,
  );
  for (const p of t.innerArc) expect(dist(p, t.centre)).toBeCloseTo(caps.innerRadiusIn, 9);
});

test("the optional outer arc is struck at a2 = 28 in through the middle of the outer edge (worked example)", () => {
  const t = layoutCapTemplate(example());
  const middle = t.outerArc[Math.floor(t.outerArc.length / 2)]!;
  expect(middle[0]).toBeCloseTo(8, 9);
  expect(middle[1]).toBeCloseTo(12, 9);
  for (const p of t.outerArc) expect(dist(p, t.centre)).toBeCloseTo(28, 9);
});

test("a ripped cap's outer corners sit on the rip line, not the blank's edge", () => {
  const caps = planCaps({
    edgeDistanceIn: 18,
    wallDepthIn: 8,
    cap: { ...BLANK, outerOverhangIn: 1 },
    jointIn: 3 / 16,
    spares: 1,
  });
  const t = layoutCapTemplate(caps);
  expect(caps.ripToDepthIn).toBe(11);
  expect(t.ripLineIn).toBe(11);
  expect(t.corners[2][1]).toBe(11);
  expect(t.corners[3][1]).toBe(11);
});

test("for any buildable ring and blank, the template's edges equal the plan's c1 and c2, its marks the plan's marks, and it is symmetric (property, derived from the chord formula)", () => {
  fc.assert(
    fc.property(
      fc.double({ min: 12, max: 40, noNaN: true }),
      fc.double({ min: 6, max: 9, noNaN: true }),
      fc.double({ min: 14, max: 24, noNaN: true }),
      fc.double({ min: 10, max: 14, noNaN: true }),
      fc.double({ min: 0, max: 2, noNaN: true }),
      fc.constantFrom(0, 1 / 8, 3 / 16, 1 / 4),
      (a, t, l, w, oi, j) => {
        const caps = planCaps({
          edgeDistanceIn: a,
          wallDepthIn: t,
          cap: { lengthIn: l, depthIn: w, thicknessIn: 2.5, innerOverhangIn: oi },
          jointIn: j,
          spares: 1,
        });
        const tpl = layoutCapTemplate(caps);
        const [il, ir, or, ol] = tpl.corners;
        expect(dist(il, ir)).toBeCloseTo(caps.innerWidthIn, 9);
        expect(dist(ol, or)).toBeCloseTo(caps.outerWidthIn, 9);
        expect(il[0]).toBeCloseTo(caps.innerMarkIn, 9);
        expect(ol[0]).toBeCloseTo(caps.outerMarkIn, 9);
        expect(dist(il, ol)).toBeCloseTo(caps.sideCutLengthIn, 9);
        expect(il[0] + ir[0]).toBeCloseTo(l, 9);
        expect(ol[0] + or[0]).toBeCloseTo(l, 9);
        expect(ol[0]).toBeGreaterThanOrEqual(-1e-9);
      },
    ),
    { numRuns: 300 },
  );
});
