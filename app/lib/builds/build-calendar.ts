import { createEvent, createEvents, type EventAttributes } from "ics";
import { addCalendarDays, daysBetween, type CalendarDate } from "~/domain/build-schedule";

/*
 * A build as iCalendar (RFC 5545). One event per build, whatever its days: it starts on the first
 * build day as an all-day event and repeats daily until the last (RRULE), the days between that are
 * not build days excluded (EXDATE), so a Friday–Monday build does not fill the weekend.
 *
 * The UID stays the same for the life of the build; every change (moved, days edited, cancelled)
 * raises SEQUENCE, so a calendar replaces the copy it holds (RFC 5545 3.8.4.7 UID, 3.8.7.4 SEQUENCE).
 * A cancellation is METHOD:CANCEL with STATUS:CANCELLED and the organizer (RFC 5546 3.2.5).
 */

export type BuildEvent = {
  buildId: number;
  /** Raised on every change to the build; 0 when first booked. */
  sequence: number;
  dates: readonly CalendarDate[];
  title: string;
  description: string;
  location: string;
  organizer: { name: string; email: string };
};

const PRODUCT_ID = "emberwright/builds";

/** The UID of a build's event: the same in every file sent about it, and in the crew's feed. */
export function buildEventUid(buildId: number): string {
  return `build-${buildId}@emberwright`;
}

function dateParts(date: CalendarDate): [number, number, number] {
  const [year, month, day] = date.split("-").map(Number) as [number, number, number];
  return [year, month, day];
}

function eventAttributes(event: BuildEvent, status: "CONFIRMED" | "CANCELLED"): EventAttributes {
  const dates = [...event.dates].sort();
  const first = dates[0];
  const last = dates.at(-1);
  if (!first || !last) throw new RangeError("a build has at least one day");
  const span = daysBetween(first, last);
  const onSite = new Set(dates);
  const skipped: CalendarDate[] = [];
  for (let d = 1; d < span; d += 1) {
    const date = addCalendarDays(first, d);
    if (!onSite.has(date)) skipped.push(date);
  }
  return {
    uid: buildEventUid(event.buildId),
    sequence: event.sequence,
    start: dateParts(first),
    end: dateParts(addCalendarDays(first, 1)),
    ...(span > 0 ? { recurrenceRule: `FREQ=DAILY;UNTIL=${last.replaceAll("-", "")}` } : {}),
    ...(skipped.length ? { exclusionDates: skipped.map(dateParts) } : {}),
    title: event.title,
    description: event.description,
    location: event.location,
    organizer: event.organizer,
    status,
    busyStatus: status === "CANCELLED" ? "FREE" : "BUSY",
    productId: PRODUCT_ID,
  };
}

// The ics package writes EXDATE with date values but without VALUE=DATE, which RFC 5545 (3.8.5.1)
// needs when the value is a date; the start is a date, so the exclusions must be dates too.
function withDateExclusions(text: string): string {
  return text.replace(/^EXDATE:(\d{8}(?:,\d{8})*)\r?$/gm, (line, values: string) =>
    line.replace(`EXDATE:${values}`, `EXDATE;VALUE=DATE:${values}`),
  );
}

/** The file sent with a booking or a move (METHOD:REQUEST), or with a cancellation (METHOD:CANCEL). */
export function buildCalendarFile(event: BuildEvent, kind: "booked" | "cancelled"): string {
  const { value, error } = createEvent({
    ...eventAttributes(event, kind === "cancelled" ? "CANCELLED" : "CONFIRMED"),
    method: kind === "cancelled" ? "CANCEL" : "REQUEST",
  });
  if (error || !value) throw error ?? new Error("the calendar file could not be written");
  return withDateExclusions(value);
}

/** A crew member's feed: every build they are on, as a published calendar (METHOD:PUBLISH). */
export function buildCalendarFeed(events: readonly BuildEvent[], name: string): string {
  // A line break in the name would start a property of its own.
  const calendarName = name.replace(/[\r\n]+/g, " ");
  if (events.length === 0) {
    // The ics package refuses an empty list; an empty calendar is still a valid feed.
    return [
      "BEGIN:VCALENDAR",
      "VERSION:2.0",
      `PRODID:${PRODUCT_ID}`,
      "METHOD:PUBLISH",
      `X-WR-CALNAME:${calendarName}`,
      "END:VCALENDAR",
      "",
    ].join("\r\n");
  }
  const { value, error } = createEvents(
    events.map((event) => eventAttributes(event, "CONFIRMED")),
    { productId: PRODUCT_ID, method: "PUBLISH", calName: calendarName },
  );
  if (error || !value) throw error ?? new Error("the calendar feed could not be written");
  return withDateExclusions(value);
}
