/**
 * Build days: how many working days a build takes for a crew, which calendar days those are (the
 * company's working weekdays, less its days off), and which bookings clash (one person on two builds
 * the same day, or a build on a day off). Dates are plain calendar dates, "YYYY-MM-DD", in the
 * company's own time zone: a build day is a whole day on site, not an instant.
 */

export type CalendarDate = string;

/** The company's week: which weekdays its crews work (0 Sunday … 6 Saturday), and its days off. */
export type WorkCalendar = { workWeekdays: readonly number[]; daysOff: ReadonlySet<CalendarDate> };

const DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;
/** Whether the text is a real calendar date "YYYY-MM-DD" (2027-02-29 is not). */
export function isCalendarDate(text: string): boolean {
  const match = DATE_PATTERN.exec(text);
  if (!match) return false;
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
  return month >= 1 && month <= 12 && day >= 1 && day <= daysInMonth(year, month);
}

function daysInMonth(year: number, month: number): number {
  const isLeap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
  return [31, isLeap ? 29 : 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31][month - 1]!;
}

/*
 * Days since 1970-01-01 and back, in the proleptic Gregorian calendar: H. Hinnant's
 * days_from_civil / civil_from_days ("chrono-Compatible Low-Level Date Algorithms").
 */
function toDayNumber(date: CalendarDate): number {
  if (!isCalendarDate(date)) throw new RangeError(`not a calendar date: ${date}`);
  const [y0, m, d] = date.split("-").map(Number) as [number, number, number];
  const y = m <= 2 ? y0 - 1 : y0;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

function fromDayNumber(dayNumber: number): CalendarDate {
  const z = dayNumber + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp < 10 ? mp + 3 : mp - 9;
  const y = yoe + era * 400 + (m <= 2 ? 1 : 0);
  return `${String(y).padStart(4, "0")}-${String(m).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
}

/** The weekday of a calendar date, 0 Sunday … 6 Saturday (proleptic Gregorian, as ISO 8601). */
export function weekdayOf(date: CalendarDate): number {
  // Day 0 of the Unix epoch, 1970-01-01, was a Thursday (4).
  return (((toDayNumber(date) + 4) % 7) + 7) % 7;
}

/** The date `days` calendar days after (or before, if negative) the given one. */
export function addCalendarDays(date: CalendarDate, days: number): CalendarDate {
  return fromDayNumber(toDayNumber(date) + days);
}

/** Whole calendar days from `from` to `to` (negative when `to` is earlier). */
export function daysBetween(from: CalendarDate, to: CalendarDate): number {
  return toDayNumber(to) - toDayNumber(from);
}

export function isWorkingDay(date: CalendarDate, calendar: WorkCalendar): boolean {
  return calendar.workWeekdays.includes(weekdayOf(date)) && !calendar.daysOff.has(date);
}

/**
 * Working days a build takes: the job's labour-hours over what the crew works in a day (people ×
 * hours a day), rounded up, at least one. 30 labour-hours for a crew of 2 on 8-hour days is
 * 30 / 16 = 1.875, so two days.
 */
export function buildDaysNeeded(args: { labourHours: number; crewSize: number; dayHours: number }): number {
  const { labourHours, crewSize, dayHours } = args;
  if (!(labourHours >= 0) || !Number.isFinite(labourHours))
    throw new RangeError("labour hours must be a number of hours, 0 or more");
  if (!Number.isInteger(crewSize) || crewSize < 1) throw new RangeError("a crew is one person or more");
  if (!(dayHours > 0) || dayHours > 24) throw new RangeError("a working day is more than 0 and at most 24 hours");
  // A hair of tolerance so 32.000000001 h for 2 × 8 h is two days, not three.
  return Math.max(1, Math.ceil(labourHours / (crewSize * dayHours) - 1e-9));
}

/**
 * The working days of a build of `days` days starting on `start` (or on the first working day after
 * it, when `start` is not one), skipping the company's other weekdays and days off.
 * Gives up after a year of days off in a row: a calendar with no working days cannot hold a build.
 */
export function buildDates(start: CalendarDate, days: number, calendar: WorkCalendar): CalendarDate[] {
  if (!Number.isInteger(days) || days < 1) throw new RangeError("a build takes at least one whole day");
  const dates: CalendarDate[] = [];
  let date = start;
  let idle = 0;
  while (dates.length < days) {
    if (isWorkingDay(date, calendar)) {
      dates.push(date);
      idle = 0;
    } else if (++idle > 366) {
      throw new RangeError("no working day within a year: check the working weekdays and days off");
    }
    date = addCalendarDays(date, 1);
  }
  return dates;
}

/** A build on the calendar: who is on it and on which days. */
export type ScheduledBuild = {
  id: number;
  label: string;
  crewUserIds: readonly number[];
  dates: readonly CalendarDate[];
};

export type Clash =
  | { kind: "crew"; date: CalendarDate; userId: number; otherBuildId: number; otherLabel: string }
  | { kind: "day-off"; date: CalendarDate }
  | { kind: "not-a-working-day"; date: CalendarDate };

/**
 * What stands in the way of a build's days: the same person booked elsewhere that day, days off, weekdays not worked.
 */
export function findClashes(build: ScheduledBuild, others: readonly ScheduledBuild[], calendar: WorkCalendar): Clash[] {
  const clashes: Clash[] = [];
  for (const date of build.dates) {
    if (calendar.daysOff.has(date)) clashes.push({ kind: "day-off", date });
    else if (!calendar.workWeekdays.includes(weekdayOf(date))) clashes.push({ kind: "not-a-working-day", date });
    for (const other of others) {
      if (other.id === build.id || !other.dates.includes(date)) continue;
      for (const userId of build.crewUserIds) {
        if (other.crewUserIds.includes(userId))
          clashes.push({ kind: "crew", date, userId, otherBuildId: other.id, otherLabel: other.label });
      }
    }
  }
  return clashes;
}

/**
 * Moves a build to start on `newStart`, keeping its number of working days (dragging it on the
 * calendar): the days are laid out again from the new start, skipping weekdays not worked and days off.
 */
export function moveBuild(
  dates: readonly CalendarDate[],
  newStart: CalendarDate,
  calendar: WorkCalendar,
): CalendarDate[] {
  return buildDates(newStart, Math.max(1, dates.length), calendar);
}
