/*
 * Consult availability: weekly hours in the company's time zone turned into bookable UTC slots.
 * Pure (the clock is passed in); time zones through the platform's Intl data, so daylight-saving
 * changes fall where the IANA database says.
 */
import { z } from "zod";
import { zonedDay, zonedTimeToUtc } from "~/lib/format/zoned-time";

/** ISO weekday (1 = Monday … 7 = Sunday) → list of [start, end) minutes after local midnight. */
export type WeeklyHours = Partial<Record<"1" | "2" | "3" | "4" | "5" | "6" | "7", [number, number][]>>;

export type Slot = { startsAt: string; endsAt: string };

/** How long choosing a time holds it while the homeowner pays (minutes). */
export const CONSULT_HOLD_MINUTES = 40;

/** ISO weekday (1 = Monday … 7 = Sunday) of a calendar date given in UTC fields. */
const isoWeekday = (date: Date) => ((date.getUTCDay() + 6) % 7) + 1;

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
  const [ty, tm, td] = zonedDay(now, timeZone).split("-").map(Number) as [number, number, number];
  const slots: Slot[] = [];
  for (let offset = 0; offset <= horizonDays; offset++) {
    // Walk calendar days in the zone: noon UTC of the local date avoids edge-of-day surprises.
    const noon = new Date(Date.UTC(ty, tm - 1, td + offset, 12));
    const y = noon.getUTCFullYear();
    const m = noon.getUTCMonth() + 1;
    const d = noon.getUTCDate();
    const day = `${y}-${String(m).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
    if (blockedDays.has(day)) continue;
    const weekday = isoWeekday(noon);
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
    const stored = z.record(z.string(), z.unknown()).safeParse(JSON.parse(json));
    if (!stored.success) return {};
    const raw = stored.data;
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
