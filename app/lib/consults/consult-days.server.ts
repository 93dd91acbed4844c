import { and, asc, eq, gte, inArray, lt } from "drizzle-orm";
import { bookings, consultBlockedDays, leads } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { nextDay, startOfZonedDay, zonedDay } from "~/lib/format/zoned-time";

/** "Tuesday, June 9, 2026" for a calendar day (YYYY-MM-DD); the day itself has no zone. */
export function formatCalendarDay(day: string): string {
  return new Intl.DateTimeFormat("en-US", {
    weekday: "long",
    month: "long",
    day: "numeric",
    year: "numeric",
    timeZone: "UTC",
  }).format(new Date(`${day}T12:00:00Z`));
}

export type BlockedDay = {
  id: number;
  day: string;
  label: string;
  /** Consults still booked (paid or being paid) on that day: blocking a day frees no booked time by itself. */
  bookings: { id: number; customerName: string; time: string; isPaid: boolean; status: "held" | "confirmed" }[];
};

/** The company's days off from today on, each with the consults still booked on it, in date order. */
export async function listBlockedDays(companyId: number, timeZone: string, now = new Date()): Promise<BlockedDay[]> {
  const today = zonedDay(now, timeZone);
  const days = await db
    .select({ id: consultBlockedDays.id, day: consultBlockedDays.day })
    .from(consultBlockedDays)
    .where(and(eq(consultBlockedDays.companyId, companyId), gte(consultBlockedDays.day, today)))
    .orderBy(asc(consultBlockedDays.day));
  const time = (iso: string) =>
    new Intl.DateTimeFormat("en-US", { timeZone, hour: "numeric", minute: "2-digit" }).format(new Date(iso));
  return Promise.all(
    days.map(async ({ id, day }) => {
      const rows = await db
        .select({
          id: bookings.id,
          startsAt: bookings.startsAt,
          isPaid: bookings.isPaid,
          status: bookings.status,
          customerName: leads.customerName,
        })
        .from(bookings)
        .innerJoin(leads, eq(leads.id, bookings.leadId))
        .where(
          and(
            eq(bookings.companyId, companyId),
            inArray(bookings.status, ["held", "confirmed"]),
            gte(bookings.startsAt, startOfZonedDay(day, timeZone)),
            lt(bookings.startsAt, startOfZonedDay(nextDay(day), timeZone)),
          ),
        )
        .orderBy(asc(bookings.startsAt));
      return {
        id,
        day,
        label: formatCalendarDay(day),
        bookings: rows.map((r) => ({
          id: r.id,
          customerName: r.customerName,
          time: time(r.startsAt),
          isPaid: r.isPaid,
          status: r.status as "held" | "confirmed",
        })),
      };
    }),
  );
}

export type BlockDayResult = { ok: true } | { ok: false; error: string };

/** Blocks a calendar day for consults; today and later only, in the company's time zone. */
export async function blockDay(
  companyId: number,
  timeZone: string,
  day: string,
  now = new Date(),
): Promise<BlockDayResult> {
  if (
    !/^\d{4}-\d{2}-\d{2}$/.test(day) ||
    Number.isNaN(Date.parse(`${day}T00:00:00Z`)) ||
    new Date(`${day}T00:00:00Z`).toISOString().slice(0, 10) !== day
  ) {
    return { ok: false, error: "Choose a date to block." };
  }
  const today = zonedDay(now, timeZone);
  if (day < today)
    return {
      ok: false,
      error: `Choose today (${formatCalendarDay(today)}) or a later date: ${formatCalendarDay(day)} has passed.`,
    };
  await db.insert(consultBlockedDays).values({ companyId, day }).onConflictDoNothing();
  return { ok: true };
}

/** Opens a blocked day again; another company's id changes nothing. */
export async function unblockDay(companyId: number, id: number): Promise<void> {
  await db
    .delete(consultBlockedDays)
    .where(and(eq(consultBlockedDays.companyId, companyId), eq(consultBlockedDays.id, id)));
}
