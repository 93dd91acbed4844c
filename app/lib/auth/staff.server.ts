import { and, eq } from "drizzle-orm";
import { leads, type Lead, type Role } from "~/db/schema";
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

/** A :leadId route param as a positive integer; anything else is a 404. */
export function parseLeadId(raw: string | undefined): number {
  const id = Number(raw);
  if (!raw || !/^\d{1,12}$/.test(raw) || !Number.isSafeInteger(id) || id <= 0) {
    throw new Response("Not found", { status: 404 });
  }
  return id;
}

/**
 * A lead the user may open, or a 404 (never a 403, so ids of other companies' leads reveal nothing).
 * Owners and estimators: any lead of their company. Crew: only signed jobs assigned to them.
 */
export async function requireLeadFor(user: SessionUser, leadId: number): Promise<Lead> {
  const [lead] = await db
    .select()
    .from(leads)
    .where(and(eq(leads.id, leadId), eq(leads.companyId, user.companyId)))
    .limit(1);
  const isAllowed =
    lead !== undefined &&
    (isOfficeRole(user.role) || (user.role === "crew" && lead.crewUserId === user.id && isSignedStage(lead.status)));
  if (!lead || !isAllowed) throw new Response("Not found", { status: 404 });
  return lead;
}
