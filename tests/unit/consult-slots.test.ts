import { expect, test } from "vitest";
import { formatSlot, listFreeSlots } from "~/lib/consults/consult-slots";
import { zonedDay, zonedTimeToUtc, zoneOffsetMinutes } from "~/lib/format/zoned-time";

test("Chicago is UTC−6 in winter and UTC−5 in summer (IANA tz database, US daylight saving rules)", () => {
  expect(zoneOffsetMinutes(new Date("2026-01-15T12:00:00Z"), "America/Chicago")).toBe(-360);
  expect(zoneOffsetMinutes(new Date("2026-07-15T12:00:00Z"), "America/Chicago")).toBe(-300);
});

test("9:00 local on the day clocks spring forward (2026-03-08) is 14:00 UTC; the day before it is 15:00 UTC", () => {
  expect(zonedTimeToUtc(2026, 3, 8, 9 * 60, "America/Chicago").toISOString()).toBe("2026-03-08T14:00:00.000Z");
  expect(zonedTimeToUtc(2026, 3, 7, 9 * 60, "America/Chicago").toISOString()).toBe("2026-03-07T15:00:00.000Z");
});

test("weekly hours become hour slots on open days only, minus blocked days and taken slots", () => {
  // Monday 2026-12-07 and Tuesday 2026-12-08 open 9–12 local; Tuesday blocked; one Monday slot taken.
  const slots = listFreeSlots({
    hours: { "1": [[540, 720]], "2": [[540, 720]] },
    slotMinutes: 60,
    horizonDays: 9,
    timeZone: "America/Chicago",
    blockedDays: new Set(["2026-12-08"]),
    takenStarts: new Set(["2026-12-07T16:00:00.000Z"]),
    now: new Date("2026-12-02T12:00:00Z"),
  });
  expect(slots.map((s) => s.startsAt)).toEqual(["2026-12-07T15:00:00.000Z", "2026-12-07T17:00:00.000Z"]);
  expect(slots[0]!.endsAt).toBe("2026-12-07T16:00:00.000Z");
  expect(formatSlot(slots[0]!.startsAt, "America/Chicago")).toBe("Mon, Dec 7, 9:00 AM CST");
  expect(formatSlot(slots[0]!.startsAt, "America/New_York")).toBe("Mon, Dec 7, 10:00 AM EST");
});

test("slots sooner than the lead time are not offered", () => {
  const slots = listFreeSlots({
    hours: { "3": [[540, 1020]] },
    slotMinutes: 60,
    horizonDays: 0,
    timeZone: "UTC",
    blockedDays: new Set(),
    takenStarts: new Set(),
    now: new Date("2026-12-02T08:00:00Z"),
    leadMinutes: 120,
  });
  expect(slots[0]!.startsAt).toBe("2026-12-02T10:00:00.000Z");
  expect(zonedDay(new Date("2026-12-02T05:00:00Z"), "America/Chicago")).toBe("2026-12-01");
});
