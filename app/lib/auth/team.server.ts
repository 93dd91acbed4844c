import { and, asc, eq, inArray } from "drizzle-orm";
import { emailOutbox, oneTimeTokens, STAFF_ROLES, users, type Company, type Role } from "~/db/schema";
import { StaffInviteAddressInUseEmail, StaffInviteEmail } from "~/emails/staff-invite";
import { db, writeTransaction } from "~/lib/platform/db.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";
import { endAllSessions, type SessionUser } from "~/lib/auth/session.server";
import { createToken, oneTimeLinkPath } from "~/lib/auth/tokens.server";

type StaffRole = (typeof STAFF_ROLES)[number];

export type TeamMember = {
  id: number;
  name: string;
  email: string;
  role: Role;
  isActive: boolean;
  hasPassword: boolean;
};

/** A company's staff (owners, estimators, crew), by name; homeowners are customers, not staff. */
export async function listTeam(companyId: number): Promise<TeamMember[]> {
  const rows = await db
    .select({
      id: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      isActive: users.isActive,
      passwordHash: users.passwordHash,
    })
    .from(users)
    .where(and(eq(users.companyId, companyId), inArray(users.role, [...STAFF_ROLES])))
    .orderBy(asc(users.name));
  return rows.map(({ passwordHash, ...rest }) => ({ ...rest, hasPassword: passwordHash !== null }));
}

/** One active staff member of the company with one of the roles, or null. */
export async function findActiveStaff(
  companyId: number,
  userId: number,
  roles: readonly Role[],
): Promise<TeamMember | null> {
  const team = await db
    .select({
      id: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      isActive: users.isActive,
      passwordHash: users.passwordHash,
    })
    .from(users)
    .where(
      and(
        eq(users.id, userId),
        eq(users.companyId, companyId),
        eq(users.isActive, true),
        inArray(users.role, [...roles]),
      ),
    )
    .limit(1);
  const row = team[0];
  return row
    ? {
        id: row.id,
        name: row.name,
        email: row.email,
        role: row.role,
        isActive: row.isActive,
        hasPassword: row.passwordHash !== null,
      }
    : null;
}

export type TeamResult = { ok: true; message: string } | { ok: false; status: number; errors: Record<string, string> };

const INVITE_DAYS = 7;

/**
 * Invites a staff member: an account without a password, a one-time invite link and the e-mail
 * carrying it, all in one transaction (the outbox worker sends the mail later).
 */
export async function inviteStaff(args: {
  owner: SessionUser;
  company: Company;
  name: string;
  email: string;
  role: StaffRole;
  origin: string;
}): Promise<TeamResult> {
  const { owner, company, name, email, role, origin } = args;
  const sent: TeamResult = { ok: true, message: `Invitation sent to ${email}.` };
  const [taken] = await db
    .select({ id: users.id, companyId: users.companyId, role: users.role })
    .from(users)
    .where(eq(users.email, email))
    .limit(1);
  if (taken && taken.companyId === company.id && taken.role !== "homeowner") {
    // Already on this owner's own team, which the team page lists anyway.
    return { ok: false, status: 400, errors: { email: "That person is already on your team." } };
  }
  if (taken) {
    // An account elsewhere (another company, or a homeowner): answer as if invited, so the team page
    // tells no one which addresses have accounts; the address's owner is told by e-mail instead.
    await db.insert(emailOutbox).values(
      await prepareOutboxRow({
        idempotencyKey: `staff-invite-in-use/${company.id}/${taken.id}/${Date.now()}`,
        companyId: company.id,
        to: email,
        subject: `${owner.name} tried to add you to ${company.name} on Emberwright`,
        template: StaffInviteAddressInUseEmail({ companyName: company.name, name, invitedBy: owner.name }),
      }),
    );
    return sent;
  }
  const { token, tokenHash } = createToken();
  const mail = await prepareOutboxRow({
    idempotencyKey: `staff-invite/${tokenHash.slice(0, 16)}`,
    companyId: company.id,
    to: email,
    subject: `${owner.name} invited you to ${company.name} on Emberwright`,
    template: StaffInviteEmail({
      companyName: company.name,
      name,
      invitedBy: owner.name,
      role,
      link: `${origin}${oneTimeLinkPath(token)}`,
      days: INVITE_DAYS,
    }),
  });
  try {
    await writeTransaction(async (tx) => {
      const [created] = await tx
        .insert(users)
        .values({ companyId: company.id, email, name, role })
        .returning({ id: users.id });
      await tx.insert(oneTimeTokens).values({
        tokenHash,
        userId: created!.id,
        purpose: "invite",
        expiresAt: new Date(Date.now() + INVITE_DAYS * 86_400_000).toISOString(),
      });
      await tx.insert(emailOutbox).values(mail);
    });
  } catch (error) {
    // Two invitations for one address at once: the unique index lets only one through.
    if (String((error as { message?: string })?.message ?? error).includes("UNIQUE")) return sent;
    throw error;
  }
  return sent;
}

async function findMember(companyId: number, userId: number) {
  const [row] = await db
    .select({ id: users.id, name: users.name, role: users.role, isActive: users.isActive })
    .from(users)
    .where(and(eq(users.id, userId), eq(users.companyId, companyId), inArray(users.role, [...STAFF_ROLES])))
    .limit(1);
  return row ?? null;
}

const NOT_FOUND: TeamResult = { ok: false, status: 404, errors: { userId: "No such person on your team." } };

/** Changes another staff member's role; owners cannot change their own (so a company always keeps one). */
export async function changeRole(owner: SessionUser, userId: number, role: StaffRole): Promise<TeamResult> {
  if (userId === owner.id)
    return { ok: false, status: 400, errors: { role: "You cannot change your own role. Ask another owner." } };
  const member = await findMember(owner.companyId, userId);
  if (!member) return NOT_FOUND;
  if (member.role === role) return { ok: false, status: 400, errors: { role: `${member.name} is already ${role}.` } };
  await db
    .update(users)
    .set({ role })
    .where(and(eq(users.id, userId), eq(users.companyId, owner.companyId)));
  return { ok: true, message: `${member.name} is now ${role === "crew" ? "on the crew" : `an ${role}`}.` };
}

/** Deactivates or reactivates a staff member; deactivation ends every session at once. */
export async function setActive(owner: SessionUser, userId: number, isActive: boolean): Promise<TeamResult> {
  if (userId === owner.id) return { ok: false, status: 400, errors: { userId: "You cannot deactivate yourself." } };
  const member = await findMember(owner.companyId, userId);
  if (!member) return NOT_FOUND;
  if (member.isActive === isActive) {
    return {
      ok: false,
      status: 400,
      errors: { userId: `${member.name} is already ${isActive ? "active" : "deactivated"}.` },
    };
  }
  await db
    .update(users)
    .set({ isActive })
    .where(and(eq(users.id, userId), eq(users.companyId, owner.companyId)));
  if (!isActive) await endAllSessions(userId);
  return {
    ok: true,
    message: isActive
      ? `${member.name} can sign in again.`
      : `${member.name} is deactivated and signed out everywhere.`,
  };
}
