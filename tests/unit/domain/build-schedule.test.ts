/*
 * Build days and clashes. Weekdays are checked against ICU's calendar (Intl.DateTimeFormat, an
 * implementation independent of ours) and the Gregorian leap-year rule (ISO 8601: every 4th year,
 * except centuries not divisible by 400). The day counts are worked by hand in each test.
 */
import fc from "fast-check";
import { describe, expect, test } from "vitest";
import {
  addCalendarDays,
  buildDates,
  buildDaysNeeded,
  daysBetween,
  findClashes,
  isCalendarDate,
  moveBuild,
  weekdayOf,
  type WorkCalendar,
} from "~/domain/build-schedule";

const MON_TO_FRI: WorkCalendar = { workWeekdays: [1, 2, 3, 4, 5], daysOff: new Set() };
const icuWeekday = new Intl.DateTimeFormat("en-US", { weekday: "short", timeZone: "UTC" });
const WEEKDAYS = ["Sun", "Mon", "Tue", "Wed", "Thu", "Fri", "Sat"];

describe("calendar dates", () => {
  test("weekdays agree with ICU's calendar over four centuries", () => {
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(1900, 0, 1), max: Date.UTC(2299, 11, 31) }), (ms) => {
        const date = new Date(ms).toISOString().slice(0, 10);
        expect(WEEKDAYS[weekdayOf(date)]).toBe(icuWeekday.format(new Date(`${date}T12:00:00Z`)));
      }),
      { numRuns: 300 },
    );
    // 2 December 2026 is a Wednesday; 1 January 2000 a Saturday (from the calendar, by hand).
    expect(weekdayOf("2026-12-02")).toBe(3);
    expect(weekdayOf("2000-01-01")).toBe(6);
  });

  test("adding days agrees with the platform's own calendar (ECMAScript Date) over four centuries", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: Date.UTC(1900, 0, 1), max: Date.UTC(2299, 11, 31) }),
        fc.integer({ min: -800, max: 800 }),
        (ms, n) => {
          const date = new Date(ms).toISOString().slice(0, 10);
          expect(addCalendarDays(date, n)).toBe(
            new Date(Date.UTC(Number(date.slice(0, 4)), Number(date.slice(5, 7)) - 1, Number(date.slice(8, 10)) + n))
              .toISOString()
              .slice(0, 10),
          );
          expect(daysBetween(date, addCalendarDays(date, n))).toBe(n);
        },
      ),
      { numRuns: 300 },
    );
  });

  test("the Gregorian leap-year rule: 2000 and 2028 have a 29 February, 1900 and 2027 do not", () => {
    expect(isCalendarDate("2000-02-29")).toBe(true);
    expect(isCalendarDate("2028-02-29")).toBe(true);
    expect(isCalendarDate("1900-02-29")).toBe(false);
    expect(isCalendarDate("2027-02-29")).toBe(false);
    expect(isCalendarDate("2026-13-01")).toBe(false);
    expect(isCalendarDate("2026-12-2")).toBe(false);
    expect(isCalendarDate("2026-12-02T00:00")).toBe(false);
    expect(addCalendarDays("2028-02-28", 1)).toBe("2028-02-29");
    expect(addCalendarDays("2027-02-28", 1)).toBe("2027-03-01");
    expect(addCalendarDays("2026-12-31", 1)).toBe("2027-01-01");
    expect(daysBetween("2026-12-02", "2027-12-02")).toBe(365);
    expect(daysBetween("2027-12-02", "2028-12-02")).toBe(366);
  });
});

describe("how many days a build takes", () => {
  test("labour-hours over the crew's day, rounded up, at least one", () => {
    // 30 h / (2 people × 8 h) = 1.875 → 2 days; 32 h / 16 h = exactly 2 days, not 3.
    expect(buildDaysNeeded({ labourHours: 30, crewSize: 2, dayHours: 8 })).toBe(2);
    expect(buildDaysNeeded({ labourHours: 32, crewSize: 2, dayHours: 8 })).toBe(2);
    expect(buildDaysNeeded({ labourHours: 32.01, crewSize: 2, dayHours: 8 })).toBe(3);
    // One person alone: 30 / 8 = 3.75 → 4 days. A 3-person crew on 9 h days: 30 / 27 = 1.11 → 2.
    expect(buildDaysNeeded({ labourHours: 30, crewSize: 1, dayHours: 8 })).toBe(4);
    expect(buildDaysNeeded({ labourHours: 30, crewSize: 3, dayHours: 9 })).toBe(2);
    // Even a tiny job takes the crew out for a day.
    expect(buildDaysNeeded({ labourHours: 0.5, crewSize: 2, dayHours: 8 })).toBe(1);
    expect(buildDaysNeeded({ labourHours: 0, crewSize: 2, dayHours: 8 })).toBe(1);
  });

  test("refuses a crew of nobody, a day of no hours, and hours that are not a number", () => {
    expect(() => buildDaysNeeded({ labourHours: 10, crewSize: 0, dayHours: 8 })).toThrow(RangeError);
    expect(() => buildDaysNeeded({ labourHours: 10, crewSize: 1.5, dayHours: 8 })).toThrow(RangeError);
    expect(() => buildDaysNeeded({ labourHours: 10, crewSize: 2, dayHours: 0 })).toThrow(RangeError);
    expect(() => buildDaysNeeded({ labourHours: 10, crewSize: 2, dayHours: 25 })).toThrow(RangeError);
    expect(() => buildDaysNeeded({ labourHours: Number.NaN, crewSize: 2, dayHours: 8 })).toThrow(RangeError);
    expect(() => buildDaysNeeded({ labourHours: -1, crewSize: 2, dayHours: 8 })).toThrow(RangeError);
  });
});

describe("which days", () => {
  test("a three-day build from a Friday runs Friday, Monday, Tuesday on a Monday-to-Friday week", () => {
    expect(buildDates("2026-12-04", 3, MON_TO_FRI)).toEqual(["2026-12-04", "2026-12-07", "2026-12-08"]);
  });

  test("a day off is skipped, and a start on a weekend moves to the next working day", () => {
    const calendar = { ...MON_TO_FRI, daysOff: new Set(["2026-12-07"]) };
    expect(buildDates("2026-12-04", 3, calendar)).toEqual(["2026-12-04", "2026-12-08", "2026-12-09"]);
    expect(buildDates("2026-12-05", 2, calendar)).toEqual(["2026-12-08", "2026-12-09"]);
    // A crew that works Saturdays builds on them.
    expect(buildDates("2026-12-04", 2, { workWeekdays: [1, 2, 3, 4, 5, 6], daysOff: new Set() })).toEqual([
      "2026-12-04",
      "2026-12-05",
    ]);
  });

  test("across the turn of the year and through a holiday week", () => {
    const holidays = new Set(["2026-12-24", "2026-12-25", "2027-01-01"]);
    // Wed 23 Dec, (24, 25 off, 26–27 weekend) Mon 28, Tue 29.
    expect(buildDates("2026-12-23", 3, { ...MON_TO_FRI, daysOff: holidays })).toEqual([
      "2026-12-23",
      "2026-12-28",
      "2026-12-29",
    ]);
  });

  test("a calendar with no working weekdays cannot hold a build, and a build is whole days", () => {
    expect(() => buildDates("2026-12-04", 1, { workWeekdays: [], daysOff: new Set() })).toThrow(/no working day/);
    expect(() => buildDates("2026-12-04", 0, MON_TO_FRI)).toThrow(RangeError);
    expect(() => buildDates("2026-12-04", 1.5, MON_TO_FRI)).toThrow(RangeError);
    expect(() => buildDates("04/12/2026", 1, MON_TO_FRI)).toThrow(RangeError);
  });

  test("every day given is a working day, in order, and there are exactly as many as asked", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 3000 }),
        fc.integer({ min: 1, max: 8 }),
        fc.subarray([0, 1, 2, 3, 4, 5, 6], { minLength: 1 }),
        fc.array(fc.integer({ min: 0, max: 40 }), { maxLength: 10 }),
        (offset, days, workWeekdays, offDays) => {
          const start = addCalendarDays("2026-01-01", offset);
          const calendar = { workWeekdays, daysOff: new Set(offDays.map((d) => addCalendarDays(start, d))) };
          const dates = buildDates(start, days, calendar);
          expect(dates).toHaveLength(days);
          for (const date of dates) {
            expect(workWeekdays).toContain(WEEKDAYS.indexOf(icuWeekday.format(new Date(`${date}T12:00:00Z`))));
            expect(calendar.daysOff.has(date)).toBe(false);
          }
          for (let i = 1; i < dates.length; i += 1) expect(daysBetween(dates[i - 1]!, dates[i]!)).toBeGreaterThan(0);
        },
      ),
      { numRuns: 200 },
    );
  });

  test("dragging a build keeps its length: a two-day build moved to a Friday runs Friday and Monday", () => {
    expect(moveBuild(["2026-12-08", "2026-12-09"], "2026-12-11", MON_TO_FRI)).toEqual(["2026-12-11", "2026-12-14"]);
  });
});

describe("clashes", () => {
  const calendar = { ...MON_TO_FRI, daysOff: new Set(["2026-12-10"]) };
  test("the same person on two builds the same day, a day off and a weekend are each named", () => {
    const build = {
      id: 1,
      label: "Alder Lane",
      crewUserIds: [7, 8],
      dates: ["2026-12-09", "2026-12-10", "2026-12-12"],
    };
    const others = [
      { id: 2, label: "Birch Court", crewUserIds: [8], dates: ["2026-12-08", "2026-12-09"] },
      { id: 3, label: "Cedar Row", crewUserIds: [9], dates: ["2026-12-09"] },
    ];
    expect(findClashes(build, others, calendar)).toEqual([
      { kind: "crew", date: "2026-12-09", userId: 8, otherBuildId: 2, otherLabel: "Birch Court" },
      { kind: "day-off", date: "2026-12-10" },
      { kind: "not-a-working-day", date: "2026-12-12" },
    ]);
  });

  test("a build never clashes with itself, and different people on the same day do not clash", () => {
    const build = { id: 1, label: "Alder Lane", crewUserIds: [7], dates: ["2026-12-09"] };
    expect(
      findClashes(build, [build, { id: 3, label: "Cedar Row", crewUserIds: [9], dates: ["2026-12-09"] }], calendar),
    ).toEqual([]);
  });
});

describe("edges of the calendar and the refusals in words", () => {
  test("day 00, a date with anything before or after it, and a date that is not one are refused by name", () => {
    // ISO 8601 calendar dates: days run from 01; a date is exactly YYYY-MM-DD.
    expect(isCalendarDate("2026-12-00")).toBe(false);
    expect(isCalendarDate("2026-12-01")).toBe(true);
    expect(isCalendarDate("12026-12-02")).toBe(false);
    expect(isCalendarDate("x2026-12-02")).toBe(false);
    // 29 February 2027 does not exist (2027 is not a leap year), so it has no weekday.
    expect(() => weekdayOf("2027-02-29")).toThrow(new RangeError("not a calendar date: 2027-02-29"));
    expect(() => addCalendarDays("2026-02-30", 1)).toThrow(new RangeError("not a calendar date: 2026-02-30"));
  });

  test("the last day of a 400-year Gregorian cycle and years before 1000 (checked against ECMAScript Date)", () => {
    // 29 February 2000 closes the 400-year cycle that started 1 March 1600 (day 146,096 of it).
    const viaDate = (y: number, m: number, d: number) => {
      const date = new Date(Date.UTC(2000, m - 1, d));
      date.setUTCFullYear(y, m - 1, d);
      return date.toISOString().slice(0, 10);
    };
    expect(addCalendarDays("2000-02-28", 1)).toBe(viaDate(2000, 2, 29));
    expect(addCalendarDays("2400-03-01", -1)).toBe(viaDate(2400, 2, 29));
    expect(addCalendarDays("2000-03-01", -1)).toBe("2000-02-29");
    // A four-digit year keeps its leading zero.
    expect(addCalendarDays("0999-12-30", 1)).toBe(viaDate(999, 12, 31));
    expect(addCalendarDays("0999-12-30", 1)).toBe("0999-12-31");
  });

  test("each refusal says what is allowed; a 24-hour day is the longest allowed", () => {
    expect(() => buildDaysNeeded({ labourHours: -1, crewSize: 2, dayHours: 8 })).toThrow(
      new RangeError("labour hours must be a number of hours, 0 or more"),
    );
    expect(() => buildDaysNeeded({ labourHours: 10, crewSize: 0, dayHours: 8 })).toThrow(
      new RangeError("a crew is one person or more"),
    );
    expect(() => buildDaysNeeded({ labourHours: 10, crewSize: 2, dayHours: 24.5 })).toThrow(
      new RangeError("a working day is more than 0 and at most 24 hours"),
    );
    // 48 labour-hours for one person on 24-hour days: 48 / 24 = 2 days.
    expect(buildDaysNeeded({ labourHours: 48, crewSize: 1, dayHours: 24 })).toBe(2);
    expect(() => buildDates("2026-12-04", 0, MON_TO_FRI)).toThrow(
      new RangeError("a build takes at least one whole day"),
    );
  });

  test("a build after exactly a year of days off (366 in a row) still finds its day; one more and it gives up", () => {
    const everyDay = [0, 1, 2, 3, 4, 5, 6];
    const offFrom = (start: string, count: number) =>
      new Set(Array.from({ length: count }, (_, i) => addCalendarDays(start, i)));
    // 2027-01-01 plus 366 days is 2028-01-02 (2027 has 365 days).
    expect(buildDates("2027-01-01", 1, { workWeekdays: everyDay, daysOff: offFrom("2027-01-01", 366) })).toEqual([
      "2028-01-02",
    ]);
    expect(() => buildDates("2027-01-01", 1, { workWeekdays: everyDay, daysOff: offFrom("2027-01-01", 367) })).toThrow(
      new RangeError("no working day within a year: check the working weekdays and days off"),
    );
  });
});
