import { and, asc, eq, gt, gte, inArray, lt } from "drizzle-orm";
import { bookings, leads, type Booking } from "~/db/schema";
import { db } from "~/lib/platform/db.server";

export type ScheduledConsult = { booking: Booking; customerName: string; town: string; street: string; leadId: number };

/** The company's consults held or confirmed that have not ended by `now`, earliest first. */
export function listUpcomingConsults(companyId: number, now = new Date()): Promise<ScheduledConsult[]> {
  return db
    .select({
      booking: bookings,
      customerName: leads.customerName,
      town: leads.town,
      street: leads.street,
      leadId: leads.id,
    })
    .from(bookings)
    .innerJoin(leads, eq(leads.id, bookings.leadId))
    .where(
      and(
        eq(bookings.companyId, companyId),
        inArray(bookings.status, ["held", "confirmed"]),
        gt(bookings.endsAt, now.toISOString()),
      ),
    )
    .orderBy(asc(bookings.startsAt));
}

/** The company's consults held or confirmed that start from `fromIso` (inclusive) to `toIso` (exclusive). */
export function listConsultsBetween(companyId: number, fromIso: string, toIso: string): Promise<ScheduledConsult[]> {
  return db
    .select({
      booking: bookings,
      customerName: leads.customerName,
      town: leads.town,
      street: leads.street,
      leadId: leads.id,
    })
    .from(bookings)
    .innerJoin(leads, eq(leads.id, bookings.leadId))
    .where(
      and(
        eq(bookings.companyId, companyId),
        inArray(bookings.status, ["held", "confirmed"]),
        gte(bookings.startsAt, fromIso),
        lt(bookings.startsAt, toIso),
      ),
    )
    .orderBy(asc(bookings.startsAt));
}
