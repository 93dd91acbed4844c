import { and, eq, inArray, sql, type SQL } from "drizzle-orm";
import { bookings, leads, siteVisits, type LeadStatus } from "~/db/schema";
import { db } from "~/lib/platform/db.server";

/*
 * A job's stage follows what is true of it. When the thing that put a job at a stage is undone (its
 * consult is cancelled, its proposal withdrawn or expired), the stage falls back to the furthest
 * step the job's own records still support: a recorded site visit, a confirmed consult, a call back,
 * or just the request. Written as SQL so it goes into the same batch as the change that causes it.
 */

// Stages a fallback may replace: the ones the undone events put a job at.
const UNDOABLE: LeadStatus[] = ["consult-booked", "measured", "proposal-out"];

function fallbackStage(leadId: number, ignoreBookingId: number | null): SQL {
  const otherConsult = ignoreBookingId === null ? sql`` : sql` AND ${bookings.id} <> ${ignoreBookingId}`;
  return sql`(CASE
    WHEN EXISTS (SELECT 1 FROM ${siteVisits} WHERE ${siteVisits.leadId} = ${leadId}) THEN 'measured'
    WHEN EXISTS (SELECT 1 FROM ${bookings} WHERE ${bookings.leadId} = ${leadId} AND ${bookings.status} = 'confirmed'${otherConsult}) THEN 'consult-booked'
    WHEN ${leads.calledBackAt} IS NOT NULL THEN 'called-back'
    ELSE 'request' END)`;
}

/**
 * Statements that set a job back after a consult is cancelled or a proposal is withdrawn or expires:
 * its stage (when it stands at a step the undone event gave it), or the step an on-hold job stopped at.
 * `from` lists the stages the undone event could have put the job at.
 */
export function settleStageStatements(args: {
  leadId: number;
  from: LeadStatus[];
  cancelledBookingId?: number | null;
  at: string;
  tx?: Pick<typeof db, "update">;
}) {
  const from = args.from.filter((s) => UNDOABLE.includes(s));
  const fallback = fallbackStage(args.leadId, args.cancelledBookingId ?? null);
  const runner = args.tx ?? db;
  return [
    runner
      .update(leads)
      .set({ status: sql`${fallback}`, updatedAt: args.at })
      .where(and(eq(leads.id, args.leadId), inArray(leads.status, from))),
    runner
      .update(leads)
      .set({ pausedStage: sql`${fallback}`, updatedAt: args.at })
      .where(
        and(
          eq(leads.id, args.leadId),
          inArray(leads.status, ["on-hold", "not-going-ahead"]),
          inArray(leads.pausedStage, from),
        ),
      ),
  ] as const;
}
