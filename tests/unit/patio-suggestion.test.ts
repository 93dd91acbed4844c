import { expect, test } from "vitest";
import { PATIO_CHAIR_ROOM_FT, PATIO_RADIUS_FT, suggestPatioRadiusFt } from "~/lib/design/design";

// Common practice, no source: chairs sit about 2 ft back from the wall, take about 3 ft, and a path
// behind them wants about 1 ft more, so the patio reaches about 6 ft past the pit's outside edge.

test("a pit 48 in across outside gets an 8 ft patio radius: 2 ft of pit and 6 ft of chairs and path", () => {
  expect(PATIO_CHAIR_ROOM_FT).toBe(6);
  expect(suggestPatioRadiusFt(48)).toBe(8);
});

test("the suggestion rounds up to the next half foot, so the chairs always fit", () => {
  // 62 in across → 31 in = 2.58 ft radius; + 6 = 8.58 ft → 9 ft.
  expect(suggestPatioRadiusFt(62)).toBe(9);
  // 54 in across → 2.25 ft; + 6 = 8.25 → 8.5 ft.
  expect(suggestPatioRadiusFt(54)).toBe(8.5);
});

test("the suggestion stays within the patio sizes offered, and has a value before the first plan arrives", () => {
  expect(suggestPatioRadiusFt(400)).toBe(PATIO_RADIUS_FT.max);
  expect(suggestPatioRadiusFt(null)).toBe(8);
  expect(suggestPatioRadiusFt(0)).toBe(8);
});
