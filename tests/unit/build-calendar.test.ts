/*
 * Build calendar files, read back with ical.js (Mozilla's iCalendar parser, an independent reference)
 * against RFC 5545: UID stable for the life of the build (3.8.4.7), SEQUENCE raised on each change
 * (3.8.7.4), the occurrences exactly the build days (RRULE 3.8.5.3 with EXDATE 3.8.5.1, date-valued
 * like DTSTART), and a cancellation as METHOD:CANCEL with STATUS:CANCELLED (RFC 5546 3.2.5).
 */
import ICAL from "ical.js";
import { expect, test } from "vitest";
import { buildCalendarFeed, buildCalendarFile, buildEventUid, type BuildEvent } from "~/lib/builds/build-calendar";

const BASE: BuildEvent = {
  buildId: 41,
  sequence: 0,
  dates: ["2026-12-04", "2026-12-07", "2026-12-08"],
  title: "Fire pit build: 14 Alder Lane",
  description: "Three days on site.",
  location: "14 Alder Lane, Fernwick",
  organizer: { name: "Ridgeback Hearth & Stone", email: "office@ridgeback.example" },
};

function parse(text: string) {
  const calendar = new ICAL.Component(ICAL.parse(text));
  return { calendar, events: calendar.getAllSubcomponents("vevent").map((v) => new ICAL.Event(v)) };
}

/** The calendar days an event occurs on, expanded by ical.js's own recurrence engine. */
function occurrences(event: ICAL.Event): string[] {
  const days: string[] = [];
  const iterator = event.iterator();
  for (let next = iterator.next(); next && days.length < 60; next = iterator.next())
    days.push(next.toString().slice(0, 10));
  return days;
}

test("a build over a weekend occurs on its three days only, as all-day events, under a stable UID", () => {
  const text = buildCalendarFile(BASE, "booked");
  const { calendar, events } = parse(text);
  expect(calendar.getFirstPropertyValue("method")).toBe("REQUEST");
  expect(events).toHaveLength(1);
  const [event] = events;
  expect(event!.uid).toBe("build-41@emberwright");
  expect(event!.sequence).toBe(0);
  expect(event!.startDate.isDate).toBe(true);
  expect(occurrences(event!)).toEqual(["2026-12-04", "2026-12-07", "2026-12-08"]);
  // Dates in EXDATE carry VALUE=DATE, like DTSTART (RFC 5545 3.8.5.1).
  expect(text).toMatch(/^EXDATE;VALUE=DATE:20261205,20261206\r?$/m);
  expect(event!.component.getFirstPropertyValue("status")).toBe("CONFIRMED");
  // URI schemes are case-insensitive (RFC 3986 3.1).
  expect(event!.organizer.toLowerCase()).toBe("mailto:office@ridgeback.example");
});

test("moving a build keeps its UID and raises SEQUENCE; the new file replaces the old days", () => {
  const moved = buildCalendarFile({ ...BASE, sequence: 1, dates: ["2026-12-10", "2026-12-11"] }, "booked");
  const [event] = parse(moved).events;
  expect(event!.uid).toBe(buildEventUid(41));
  expect(event!.sequence).toBe(1);
  expect(occurrences(event!)).toEqual(["2026-12-10", "2026-12-11"]);
  // Consecutive days need no exclusions.
  expect(moved).not.toMatch(/EXDATE/);
});

test("a one-day build is a single all-day event with no repeat", () => {
  const [event] = parse(buildCalendarFile({ ...BASE, dates: ["2026-12-09"] }, "booked")).events;
  expect(event!.isRecurring()).toBe(false);
  expect(event!.startDate.toString()).toBe("2026-12-09");
  expect(event!.endDate.toString()).toBe("2026-12-10");
});

test("a cancelled build is METHOD:CANCEL with STATUS:CANCELLED under the same UID and a higher SEQUENCE", () => {
  const { calendar, events } = parse(buildCalendarFile({ ...BASE, sequence: 3 }, "cancelled"));
  expect(calendar.getFirstPropertyValue("method")).toBe("CANCEL");
  expect(events[0]!.uid).toBe(buildEventUid(41));
  expect(events[0]!.sequence).toBe(3);
  expect(events[0]!.component.getFirstPropertyValue("status")).toBe("CANCELLED");
});

test("the crew feed is a published calendar with each build once, and an empty feed is still a calendar", () => {
  const feed = buildCalendarFeed(
    [BASE, { ...BASE, buildId: 42, sequence: 2, dates: ["2026-12-14"] }],
    "Sam's builds\r\nX-EVIL:1",
  );
  const { calendar, events } = parse(feed);
  expect(calendar.getFirstPropertyValue("method")).toBe("PUBLISH");
  expect(events.map((e) => e.uid)).toEqual(["build-41@emberwright", "build-42@emberwright"]);
  expect(occurrences(events[0]!)).toEqual(BASE.dates);
  // A name with a line break cannot add a property of its own.
  expect(calendar.getFirstPropertyValue("x-evil")).toBeNull();
  const empty = parse(buildCalendarFeed([], "Sam's builds\r\nX-EVIL:1"));
  expect(empty.events).toHaveLength(0);
  expect(empty.calendar.getFirstPropertyValue("x-evil")).toBeNull();
});
