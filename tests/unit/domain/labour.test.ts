import { expect, test } from "vitest";
import { DEFAULT_FACTORS } from "~/domain/factors";
import { timeSawCut } from "~/domain/labour";
import { computePlan } from "~/domain/plan";
import { TYPICAL_PIT } from "./fixtures";

/*
 * Labour lines that only appear for some jobs, and the rates that scale them. Default rates (from
 * memory or common practice, no source): a 14 in blade cuts about 5 in deep in one pass, 0.5 min of
 * handling a pass and 40 in² of cut face a minute; carrying 1 h a short ton (2000 lb).
 */
const task = (plan: ReturnType<typeof computePlan>, key: string) => plan.labour.tasks.find((t) => t.task === key);

test("a cut exactly as deep as the saw reaches takes one pass: 8 in through 5 in is 0.5 + 40/40 = 1.5 min", () => {
  expect(timeSawCut(8, 5, DEFAULT_FACTORS)).toEqual({ passes: 1, minutes: 1.5 });
});

test("caps ripped to an outer overhang add one rip a cap along the blank: 16 in through 2 1/2 in, 0.5 + 40/40 = 1.5 min each", () => {
  // Ripped to T + o_i + o_o = 8 + 2 + 1 = 11 in deep; a1 = 16.288, a2 = 27.288 in. 12 caps are the
  // fewest (outer 2 × 27.288 × tan 15° − 0.1875 / cos 15° = 14.43 in; 11 would be 15.83, over
  // 16 − 2 × 1/4) and waste 1 − (8.535 + 14.43)/2 × 11 / 192 = 34.2 % of a blank; 14, the wall's
  // count, are 7.243 and 12.264 in and waste 44.1 %, within 10 points: 14 caps, 14 rips.
  const plan = computePlan({ ...TYPICAL_PIT, cap: { ...TYPICAL_PIT.cap!, outerOverhangIn: 1 } });
  expect(plan.caps?.count).toBe(14);
  expect(plan.labour.sawGroups.find((g) => g.what === "cap rips")).toEqual({
    what: "cap rips",
    count: 14,
    lengthIn: 16,
    depthIn: 2.5,
    passes: 1,
    minutesEach: 1.5,
  });
});

test("two closure units a course take four radial cuts a course: an exact 34 in bowl of 3 courses, 12 cuts of 8 in through 4 in", () => {
  // a = 17: 13 whole units leave under half a unit, so 12 whole and two closures (see the ring tests).
  const plan = computePlan({ ...TYPICAL_PIT, ring: { bowlDiameterIn: 34, fit: "exact" } });
  expect(plan.ring.closure?.countPerCourse).toBe(2);
  expect(plan.labour.sawGroups.find((g) => g.what === "closure cuts")).toEqual({
    what: "closure cuts",
    count: 12,
    lengthIn: 8,
    depthIn: 4,
    passes: 1,
    minutesEach: 1.3,
  });
});

test("carrying scales with the company's rate: 1696.1 lb (job A) at 2 h a ton is 0.848 × 2 = 1.70 h", () => {
  expect(task(computePlan(TYPICAL_PIT, { factors: { carryHoursPerTon: 2 } }), "carry")?.hours).toBe(1.7);
});

test("a one-course pit without caps or a liner has no upper courses and no saw cuts to list", () => {
  const plan = computePlan({ ...TYPICAL_PIT, courses: 1, cap: null, liner: { kind: "none" } });
  expect(plan.labour.tasks.map((t) => t.task)).toEqual(["setup", "base", "spoil", "carry", "first-course"]);
  expect(plan.labour.sawCuts).toBe(0);
  expect(plan.labour.sawGroups).toEqual([]);
});

test("a steel ring on the floor is set and backfilled; only a raised one has a gravel bed laid first (common practice, no source)", () => {
  // An 11 in ring under 11.875 in lined sits 0.875 in low, within the 1 in raise limit.
  const plan = computePlan({ ...TYPICAL_PIT, liner: { kind: "steel-ring", outsideDiameterIn: 35, heightIn: 11 } });
  expect(task(plan, "liner")).toEqual({ task: "liner", label: "Set the steel ring and backfill", hours: 0.5 });
});
