import { expect, test } from "vitest";
import { calendarCells } from "~/components/consult-time-picker";

const slot = { startsAt: "2026-12-03T15:00:00.000Z" };

test("the consult day grid lays days out in whole weeks from Monday, keeping days with no free time", () => {
  // 2026-12-03 is a Thursday (Gregorian calendar, checked with Python's datetime.date.weekday):
  // three blanks (Mon–Wed) come before it.
  const cells = calendarCells([
    { day: "2026-12-03", slots: [slot] },
    { day: "2026-12-04", slots: [slot, slot] },
    { day: "2026-12-08", slots: [slot] },
  ]);
  expect(cells.slice(0, 3)).toEqual([null, null, null]);
  expect(cells.slice(3).map((c) => [c!.day, c!.slots.length])).toEqual([
    ["2026-12-03", 1],
    ["2026-12-04", 2],
    ["2026-12-05", 0],
    ["2026-12-06", 0],
    ["2026-12-07", 0],
    ["2026-12-08", 1],
  ]);
  // Monday December 7 opens the second row of seven.
  expect(cells[7]!.day).toBe("2026-12-07");
});

test("a grid starting on a Monday has no blanks, and a month's end rolls into the next", () => {
  // 2026-11-30 is a Monday (Python's datetime).
  const cells = calendarCells([
    { day: "2026-11-30", slots: [slot] },
    { day: "2026-12-01", slots: [slot] },
  ]);
  expect(cells.map((c) => c!.day)).toEqual(["2026-11-30", "2026-12-01"]);
  expect(calendarCells([])).toEqual([]);
});
