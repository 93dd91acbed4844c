import { expect, test } from "vitest";
import { ADHESIVE_CURE_DAYS, listBuildSteps } from "~/domain/build-steps";
import { DEFAULT_FACTORS } from "~/domain/factors";
import { computePlan, type Plan } from "~/domain/plan";
import { PATIO, TYPICAL_PIT } from "./fixtures";

/*
 * The checklist of the three jobs worked by hand in worked-jobs.test.ts (job A, B and C there; the
 * figures below are that working's, not the engine's). The order of the work (base, courses from the
 * bottom, liner, caps, cure, patio, clean-up) is common practice, no source.
 */

const steps = (plan: Plan) =>
  listBuildSteps({
    ...plan,
    baseDepthIn: DEFAULT_FACTORS.baseDepthIn,
    patioBaseDepthIn: DEFAULT_FACTORS.patioBaseDepthIn,
  });

test("job A: base, three courses of 14, the steel ring on its bed, 12 glued caps, cure and clean-up", () => {
  const list = steps(computePlan(TYPICAL_PIT));
  expect(list.map((s) => s.key)).toEqual([
    "dig-base",
    "course-1",
    "course-2",
    "course-3",
    "liner",
    "caps",
    "cure",
    "clean-up",
  ]);
  // Base disc r = 32.9638 in (worked-jobs job A) → 32 15/16 in, 65 15/16 in across; 6 in deep (the default factor).
  expect(list[0]!.detail).toBe(
    "Dig a circle 65 15/16 in across (32 15/16 in from the centre pin) and lay 6 in of base, compacted in lifts.",
  );
  // a = 18.2877 in → 18 5/16 in on the tape.
  expect(list[1]!.detail).toContain("14 units, backs on the 18 5/16 in layout radius");
  // Half a unit: 360° / 14 / 2 = 12.857° → 12.9°; only the top course and the caps are glued (560 in of bead).
  expect(list[2]!.detail).toBe("14 units, turned 12.9° from the course below, dry-stacked.");
  expect(list[3]!.detail).toBe("14 units, glued to the course below.");
  // 1.875 in gravel bed under a 35 in ring.
  expect(list[4]!.detail).toContain("1 7/8 in gravel bed");
  expect(list[4]!.detail).toContain("35 in ring");
  expect(list[5]).toMatchObject({ title: "Glue the caps", detail: expect.stringMatching(/^12 caps/) });
  // "Let the adhesive cure (commonly about 7 days)" — the caution shown with every plan (advice.ts).
  expect(ADHESIVE_CURE_DAYS).toBe(7);
  expect(list[6]!.detail).toMatch(/^About 7 days/);
});

test("job B: four courses of 15 pieces with one closure, firebrick of 4 rows of 12 with the top row ripped to 2 1/8 in", () => {
  const list = steps(
    computePlan({
      ...TYPICAL_PIT,
      ring: { bowlDiameterIn: 40, fit: "exact" },
      courses: 4,
      cap: { ...TYPICAL_PIT.cap!, innerOverhangIn: 1 },
      liner: { kind: "firebrick", lengthIn: 9, widthIn: 4.5, heightIn: 2.5 },
    }),
  );
  expect(list.map((s) => s.key)).toEqual([
    "dig-base",
    "course-1",
    "course-2",
    "course-3",
    "course-4",
    "liner",
    "caps",
    "cure",
    "clean-up",
  ]);
  expect(list[1]!.detail).toContain("15 units, 1 of them cut as closure units");
  // Rows of 4.5625 in: 3 whole and a rip of 2.125 in (worked-jobs job B), 12 a row.
  expect(list[5]!.detail).toBe(
    "4 rows of 12 bricks on edge in refractory mortar, the top row ripped to 2 1/8 in; fill behind with sand.",
  );
  expect(list[6]!.detail).toMatch(/^13 caps/);
  // Odd courses keep the first course's layout; only even ones turn.
  expect(list[3]!.detail).not.toContain("turned");
  expect(list[4]!.detail).toContain("turned");
});

test("job C: no liner, a patio on a 4 in base out to 102 in with 51 border units at 96 in", () => {
  const list = steps(
    computePlan({
      ...TYPICAL_PIT,
      ring: { unitCount: 15 },
      wallUnit: { faceIn: 12, backIn: 8.75, depthIn: 9, heightIn: 6 },
      cap: { lengthIn: 18, depthIn: 12, thicknessIn: 2.5, innerOverhangIn: 1 },
      liner: { kind: "none" },
      patio: { ...PATIO, paver: { lengthIn: 9, widthIn: 6 } },
    }),
  );
  expect(list.map((s) => s.key)).toEqual([
    "dig-base",
    "course-1",
    "course-2",
    "course-3",
    "caps",
    "cure",
    "patio",
    "clean-up",
  ]);
  // Patio base radius 96 + max(4, 6) = 102 in; border of 50 whole units and one closure = 51 (worked-jobs job C).
  expect(list[6]!.detail).toBe(
    "4 in of compacted base out to 102 in from the centre, then the 51 border units at 96 in and the pavers inside them.",
  );
});

test("a pit without caps has no caps step, and the keys of the courses it keeps do not change", () => {
  const withCaps = steps(computePlan(TYPICAL_PIT)).map((s) => s.key);
  const without = steps(computePlan({ ...TYPICAL_PIT, cap: null, courses: 4 })).map((s) => s.key);
  expect(without).not.toContain("caps");
  expect(without).toContain("course-4");
  for (const key of ["dig-base", "course-1", "course-2", "course-3", "liner", "clean-up"]) {
    expect(withCaps).toContain(key);
    expect(without).toContain(key);
  }
  // Every key appears once.
  expect(new Set(without).size).toBe(without.length);
});

test("each step's title, in the order of the work; a plan saved without its glued layers reads as the engine glues them (the top course and the caps)", () => {
  const plan = computePlan(TYPICAL_PIT);
  const list = steps(plan);
  expect(list.map((s) => s.title)).toEqual([
    "Dig and lay the base",
    "Set the first course level",
    "Course 2 of 3",
    "Course 3 of 3",
    "Set the steel ring",
    "Glue the caps",
    "Leave the adhesive to cure before the first fire",
    "Clean up",
  ]);
  expect(list.at(-1)!.detail).toBe(
    "Clear offcuts, spoil and packaging; sweep the site and rinse saw slurry away from drains.",
  );
  const older = listBuildSteps({
    ...plan,
    adhesive: {},
    baseDepthIn: DEFAULT_FACTORS.baseDepthIn,
    patioBaseDepthIn: DEFAULT_FACTORS.patioBaseDepthIn,
  });
  expect(older).toEqual(list);
  // One course: nothing below it to glue to, so only the caps are glued.
  const one = computePlan({ ...TYPICAL_PIT, courses: 1, liner: { kind: "none" } });
  const oneOlder = listBuildSteps({
    ...one,
    adhesive: {},
    baseDepthIn: DEFAULT_FACTORS.baseDepthIn,
    patioBaseDepthIn: DEFAULT_FACTORS.patioBaseDepthIn,
  });
  expect(oneOlder).toEqual(steps(one));
});
