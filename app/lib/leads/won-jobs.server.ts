import { and, desc, eq, inArray } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { builds, leads, SIGNED_STAGES, users, type Lead } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import type { SessionUser } from "~/lib/auth/session.server";
import { crewJobCondition, isOfficeRole } from "~/lib/auth/staff.server";
import { parseBuildDates } from "~/lib/builds/builds.server";

const crew = alias(users, "crew");

export type WonJob = { lead: Lead; crewName: string | null; buildDays: string[] };

/**
 * The signed jobs a person may see, most recently changed first (at most 200), each with the days
 * of its booked build: the office sees every signed job of the company, crew only the ones given
 * to them or whose booked build they are on.
 */
export async function listWonJobs(user: Pick<SessionUser, "id" | "role" | "companyId">): Promise<WonJob[]> {
  const where = isOfficeRole(user.role)
    ? and(eq(leads.companyId, user.companyId), inArray(leads.status, SIGNED_STAGES))
    : and(eq(leads.companyId, user.companyId), crewJobCondition(user.id));
  const rows = await db
    .select({ lead: leads, crewName: crew.name, datesJson: builds.datesJson })
    .from(leads)
    .leftJoin(crew, eq(crew.id, leads.crewUserId))
    .leftJoin(builds, and(eq(builds.leadId, leads.id), eq(builds.status, "booked")))
    .where(where)
    .orderBy(desc(leads.updatedAt))
    .limit(200);
  return rows.map(({ lead, crewName, datesJson }) => ({
    lead,
    crewName,
    buildDays: datesJson === null ? [] : parseBuildDates({ datesJson }),
  }));
}

/**
 * The crew's order (days YYYY-MM-DD in the company's zone): jobs with a build day today or later,
 * the soonest first; then jobs not on the calendar yet; then jobs whose build days have all passed,
 * the latest first.
 */
export function orderCrewJobs<T extends { buildDays: readonly string[] }>(jobs: readonly T[], today: string): T[] {
  const nextDay = (job: T) => job.buildDays.find((d) => d >= today) ?? null;
  const group = (job: T) => (job.buildDays.length === 0 ? 1 : nextDay(job) === null ? 2 : 0);
  return [...jobs].sort((a, b) => {
    const ga = group(a);
    const gb = group(b);
    if (ga !== gb) return ga - gb;
    if (ga === 0) return nextDay(a)! < nextDay(b)! ? -1 : nextDay(a)! > nextDay(b)! ? 1 : 0;
    if (ga === 2)
      return a.buildDays.at(-1)! > b.buildDays.at(-1)! ? -1 : a.buildDays.at(-1)! < b.buildDays.at(-1)! ? 1 : 0;
    return 0;
  });
}
