import { and, eq, exists, inArray, or, type SQL } from "drizzle-orm";
import { buildCrew, builds, leads, SIGNED_STAGES, type Lead, type Role } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { isSignedStage } from "~/lib/leads/lead-status";
import { getSessionUser, type SessionUser } from "~/lib/auth/session.server";

/** Staff who work the inbox and see prices. */
export const OFFICE_ROLES = ["owner", "estimator"] as const satisfies readonly Role[];

export function isOfficeRole(role: Role): boolean {
  return role === "owner" || role === "estimator";
}

/**
 * The JSON API's guard: 401 JSON when nobody is signed in, 403 JSON for a signed-in person without
 * the role (homeowners included). Resource routes answer JSON, never a redirect to a page.
 */
export async function requireApiUser(request: Request, roles: readonly Role[]): Promise<SessionUser> {
  const user = await getSessionUser(request);
  if (!user) {
    throw Response.json({ errors: [{ path: "", message: "Sign in to use this API." }] }, { status: 401 });
  }
  if (!roles.includes(user.role)) {
    throw Response.json({ errors: [{ path: "", message: "Your role cannot use this API." }] }, { status: 403 });
  }
  return user;
}

/** A :leadId route param as a positive integer, or null for anything else (callers answer 404). */
export function parseLeadId(raw: string | undefined): number | null {
  const id = Number(raw);
  if (!raw || !/^\d{1,12}$/.test(raw) || !Number.isSafeInteger(id) || id <= 0) return null;
  return id;
}

/**
 * The crew member's jobs, as a condition on `leads`: signed jobs given to them, or whose booked
 * build has them on its crew. Callers add the company.
 */
export function crewJobCondition(userId: number): SQL {
  const onBuild = db
    .select({ one: buildCrew.userId })
    .from(buildCrew)
    .innerJoin(builds, eq(builds.id, buildCrew.buildId))
    .where(and(eq(builds.leadId, leads.id), eq(builds.status, "booked"), eq(buildCrew.userId, userId)));
  return and(inArray(leads.status, SIGNED_STAGES), or(eq(leads.crewUserId, userId), exists(onBuild)))!;
}

/**
 * A lead the user may open, or null: callers answer 404 (never 403, so ids of other companies' leads
 * reveal nothing). Owners and estimators: any lead of their company. Crew: only signed jobs given to
 * them or whose booked build they are on.
 */
export async function findLeadFor(user: SessionUser, leadId: number | null): Promise<Lead | null> {
  if (leadId === null) return null;
  if (!isOfficeRole(user.role) && user.role !== "crew") return null;
  const [lead] = await db
    .select()
    .from(leads)
    .where(
      and(
        eq(leads.id, leadId),
        eq(leads.companyId, user.companyId),
        user.role === "crew" ? crewJobCondition(user.id) : undefined,
      ),
    )
    .limit(1);
  return lead && (isOfficeRole(user.role) || isSignedStage(lead.status)) ? lead : null;
}
