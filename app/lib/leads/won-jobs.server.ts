import { and, desc, eq, inArray } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { leads, SIGNED_STAGES, users, type Lead } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import type { SessionUser } from "~/lib/auth/session.server";
import { isOfficeRole } from "~/lib/auth/staff.server";

const crew = alias(users, "crew");

/**
 * The signed jobs a person may see, most recently changed first (at most 200): the office sees every
 * signed job of the company, crew only the ones given to them.
 */
export function listWonJobs(
  user: Pick<SessionUser, "id" | "role" | "companyId">,
): Promise<{ lead: Lead; crewName: string | null }[]> {
  const where = isOfficeRole(user.role)
    ? and(eq(leads.companyId, user.companyId), inArray(leads.status, SIGNED_STAGES))
    : and(eq(leads.companyId, user.companyId), inArray(leads.status, SIGNED_STAGES), eq(leads.crewUserId, user.id));
  return db
    .select({ lead: leads, crewName: crew.name })
    .from(leads)
    .leftJoin(crew, eq(crew.id, leads.crewUserId))
    .where(where)
    .orderBy(desc(leads.updatedAt))
    .limit(200);
}
