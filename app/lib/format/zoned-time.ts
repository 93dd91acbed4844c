/*
 * Calendar days and clock times in a company's time zone, with nothing but Intl: the inbox's date
 * filter means "received on these days where the contractor works", not UTC days.
 */

/** The instant local midnight begins on `day` (YYYY-MM-DD) in the time zone, as an ISO string. */
export function startOfZonedDay(day: string, timeZone: string): string {
  const [y, m, d] = day.split("-").map(Number) as [number, number, number];
  return zonedTimeToUtc(y, m, d, 0, timeZone).toISOString();
}

/** The next calendar day after `day` (YYYY-MM-DD). */
export function nextDay(day: string): string {
  const [y, m, d] = day.split("-").map(Number) as [number, number, number];
  return new Date(Date.UTC(y, m - 1, d + 1)).toISOString().slice(0, 10);
}

/** The local calendar day (YYYY-MM-DD) of an instant in the time zone. */
export function zonedDay(instant: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(
    instant,
  );
}

/** Offset of a zone from UTC at an instant, in minutes (e.g. −300 for Chicago in summer). */
export function zoneOffsetMinutes(date: Date, timeZone: string): number {
  const parts = Object.fromEntries(
    new Intl.DateTimeFormat("en-US", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
    })
      .formatToParts(date)
      .map((p) => [p.type, Number(p.value)]),
  );
  const asUtc = Date.UTC(parts.year!, parts.month! - 1, parts.day!, parts.hour!, parts.minute!, parts.second!);
  return Math.round((asUtc - Math.floor(date.getTime() / 1000) * 1000) / 60_000);
}

/**
 * The UTC instant of a local wall-clock time (minutes after midnight) in a zone; across a fall-back hour the later
 * offset wins.
 */
export function zonedTimeToUtc(year: number, month: number, day: number, minutes: number, timeZone: string): Date {
  const guess = Date.UTC(year, month - 1, day, 0, minutes);
  let result = guess - zoneOffsetMinutes(new Date(guess), timeZone) * 60_000;
  // Once more at the result: the offset may differ across a daylight-saving change.
  result = guess - zoneOffsetMinutes(new Date(result), timeZone) * 60_000;
  return new Date(result);
}

/** "Tue, Dec 8, 9:00 AM" in the time zone. */
export function formatZonedDateTime(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat("en-US", {
    timeZone,
    weekday: "short",
    month: "short",
    day: "numeric",
    hour: "numeric",
    minute: "2-digit",
  }).format(new Date(iso));
}

/** "Dec 8, 2026" in the time zone. */
export function formatZonedDate(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat("en-US", { timeZone, month: "short", day: "numeric", year: "numeric" }).format(
    new Date(iso),
  );
}

/** How long ago, in the largest whole unit: "just now", "12 min", "5 h", "3 d", "7 wk". */
export function describeAge(iso: string, now: Date): string {
  const minutes = Math.max(0, Math.floor((now.getTime() - new Date(iso).getTime()) / 60_000));
  if (minutes < 1) return "just now";
  if (minutes < 60) return `${minutes} min`;
  const hours = Math.floor(minutes / 60);
  if (hours < 24) return `${hours} h`;
  const days = Math.floor(hours / 24);
  if (days < 14) return `${days} d`;
  return `${Math.floor(days / 7)} wk`;
}
