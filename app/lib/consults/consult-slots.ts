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
        (r): r is [number, number] =>
          Array.isArray(r) &&
          r.length === 2 &&
          Number.isInteger(r[0]) &&
          Number.isInteger(r[1]) &&
          r[0] >= 0 &&
          r[1] <= 1440 &&
          r[0] < r[1],
      );
    }
    return hours;
  } catch {
    return {};
  }
}

/** How close to the visit a homeowner may still cancel or move it online (hours); after that, they call. */
export const HOMEOWNER_CHANGE_CUTOFF_HOURS = 24;

export type RescheduleCheck = { ok: true; slot: Slot } | { ok: false; status: 400 | 409; message: string };

/**
 * Whether a booked consult may move to `targetStartsAt`: only a confirmed (paid) booking moves, the
 * homeowner only while the visit is more than the cutoff away, and only to another time that is
 * free now. The database still has the last word (the slot's unique index and the state re-check).
 */
export function checkReschedule(args: {
  status: string;
  currentStartsAt: string;
  targetStartsAt: string;
  freeSlots: Slot[];
  by: "homeowner" | "staff";
  companyName: string;
  now: Date;
}): RescheduleCheck {
  if (args.status !== "confirmed")
    return {
      ok: false,
      status: 409,
      message: "This consult is not booked (it was cancelled or is not paid yet), so there is no time to move.",
    };
  if (
    args.by === "homeowner" &&
    new Date(args.currentStartsAt).getTime() - args.now.getTime() < HOMEOWNER_CHANGE_CUTOFF_HOURS * 3_600_000
  ) {
    return {
      ok: false,
      status: 409,
      message: `Consults can be moved online up to ${HOMEOWNER_CHANGE_CUTOFF_HOURS} hours ahead. Please call ${args.companyName}.`,
    };
  }
  const target = new Date(args.targetStartsAt);
  if (Number.isNaN(target.getTime())) return { ok: false, status: 400, message: "Choose a new time from the list." };
  if (target.toISOString() === new Date(args.currentStartsAt).toISOString())
    return { ok: false, status: 400, message: "That is the time already booked. Choose another one." };
  const slot = args.freeSlots.find((s) => s.startsAt === target.toISOString());
  if (!slot) return { ok: false, status: 409, message: "That time is no longer free. Choose another." };
  return { ok: true, slot };
}

/** Groups slots by their local calendar day in a zone, days and times in order. */
export function groupSlotsByDay(slots: Slot[], timeZone: string): { day: string; slots: Slot[] }[] {
  const days = new Map<string, Slot[]>();
  for (const slot of [...slots].sort((a, b) => (a.startsAt < b.startsAt ? -1 : 1))) {
    const day = zonedDay(new Date(slot.startsAt), timeZone);
    days.set(day, [...(days.get(day) ?? []), slot]);
  }
  return [...days.entries()].map(([day, list]) => ({ day, slots: list }));
}
