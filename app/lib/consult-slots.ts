/*
 * Consult availability: weekly hours in the company's time zone turned into bookable UTC slots.
 * Pure (the clock is passed in); time zones through the platform's Intl data, so daylight-saving
 * changes fall where the IANA database says.
 */

/** ISO weekday (1 = Monday … 7 = Sunday) → list of [start, end) minutes after local midnight. */
export type WeeklyHours = Partial<Record<"1" | "2" | "3" | "4" | "5" | "6" | "7", [number, number][]>>;

export type Slot = { startsAt: string; endsAt: string };

const partsFormatters = new Map<string, Intl.DateTimeFormat>();

function zonedParts(date: Date, timeZone: string) {
  let fmt = partsFormatters.get(timeZone);
  if (!fmt) {
    fmt = new Intl.DateTimeFormat("en-US", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
      weekday: "short",
    });
    partsFormatters.set(timeZone, fmt);
  }
  const parts = Object.fromEntries(fmt.formatToParts(date).map((p) => [p.type, p.value]));
  return {
    year: Number(parts.year),
    month: Number(parts.month),
    day: Number(parts.day),
    hour: Number(parts.hour),
    minute: Number(parts.minute),
    second: Number(parts.second),
    weekday: ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"].indexOf(parts.weekday!) + 1,
  };
}

/** Offset of a zone from UTC at an instant, in minutes (e.g. −300 for Chicago in summer). */
export function zoneOffsetMinutes(date: Date, timeZone: string): number {
  const p = zonedParts(date, timeZone);
  const asUtc = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
  return Math.round((asUtc - Math.floor(date.getTime() / 1000) * 1000) / 60_000);
}

/** The UTC instant of a local wall-clock time in a zone (the later offset wins in a fall-back hour). */
export function zonedTimeToUtc(year: number, month: number, day: number, minutes: number, timeZone: string): Date {
  const guess = Date.UTC(year, month - 1, day, 0, minutes);
  let result = guess - zoneOffsetMinutes(new Date(guess), timeZone) * 60_000;
  // Once more at the result: the offset may differ across a daylight-saving change.
  result = guess - zoneOffsetMinutes(new Date(result), timeZone) * 60_000;
  return new Date(result);
}

/** The local calendar day (YYYY-MM-DD) of an instant in a zone. */
export function localDay(date: Date, timeZone: string): string {
  const p = zonedParts(date, timeZone);
  return `${p.year}-${String(p.month).padStart(2, "0")}-${String(p.day).padStart(2, "0")}`;
}

/**
 * Bookable slots from `now` (exclusive of the next `leadMinutes`) up to `horizonDays` local days
 * ahead: weekly hours cut into `slotMinutes` pieces, minus blocked days and taken starts.
 */
export function listFreeSlots(args: {
  hours: WeeklyHours;
  slotMinutes: number;
  horizonDays: number;
  timeZone: string;
  blockedDays: Set<string>;
  takenStarts: Set<string>;
  now: Date;
  leadMinutes?: number;
}): Slot[] {
  const { hours, slotMinutes, horizonDays, timeZone, blockedDays, takenStarts, now } = args;
  const earliest = now.getTime() + (args.leadMinutes ?? 12 * 60) * 60_000;
  const today = zonedParts(now, timeZone);
  const slots: Slot[] = [];
  for (let offset = 0; offset <= horizonDays; offset++) {
    // Walk calendar days in the zone: noon UTC of the local date avoids edge-of-day surprises.
    const noon = new Date(Date.UTC(today.year, today.month - 1, today.day + offset, 12));
    const y = noon.getUTCFullYear();
    const m = noon.getUTCMonth() + 1;
    const d = noon.getUTCDate();
    const day = `${y}-${String(m).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
    if (blockedDays.has(day)) continue;
    const weekday = ((noon.getUTCDay() + 6) % 7) + 1;
    for (const [from, to] of hours[String(weekday) as keyof WeeklyHours] ?? []) {
      for (let start = from; start + slotMinutes <= to; start += slotMinutes) {
        const startsAt = zonedTimeToUtc(y, m, d, start, timeZone);
        if (startsAt.getTime() < earliest) continue;
        const iso = startsAt.toISOString();
        if (takenStarts.has(iso)) continue;
        slots.push({ startsAt: iso, endsAt: new Date(startsAt.getTime() + slotMinutes * 60_000).toISOString() });
      }
    }
  }
  return slots;
}

/** "Tue, Dec 8, 2:00 PM CST" in a zone. */
export function formatSlot(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat("en-US", {
    timeZone,
    weekday: "short",
    month: "short",
    day: "numeric",
    hour: "numeric",
    minute: "2-digit",
    timeZoneName: "short",
  }).format(new Date(iso));
}

/** Parses stored weekly hours, dropping anything malformed. */
export function parseWeeklyHours(json: string): WeeklyHours {
  try {
    const raw = JSON.parse(json) as Record<string, unknown>;
    const hours: WeeklyHours = {};
    for (const key of ["1", "2", "3", "4", "5", "6", "7"] as const) {
      const ranges = raw[key];
      if (!Array.isArray(ranges)) continue;
      hours[key] = ranges.filter(
        (r): r is [number, number] => Array.isArray(r) && r.length === 2 && Number.isInteger(r[0]) && Number.isInteger(r[1]) && r[0] >= 0 && r[1] <= 1440 && r[0] < r[1],
      );
    }
    return hours;
  } catch {
    return {};
  }
}
