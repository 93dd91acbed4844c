import { createHash, randomBytes } from "node:crypto";
import { and, eq, gt, inArray, isNotNull, isNull } from "drizzle-orm";
import { leads, oneTimeTokens, users } from "~/db/schema";
import { db, writeTransaction } from "~/lib/platform/db.server";

/** A URL-safe random token (256 bits) and the SHA-256 hex that is stored in its place. */
export function createToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, tokenHash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/** A short unguessable reference for public links (128 bits). */
export function createRef(): string {
  return randomBytes(16).toString("base64url");
}

/*
 * One-time links (set a password, accept an invitation). The token travels in the link's fragment
 * (`/welcome#<token>`), which browsers never send to a server, and then in a POST body: it never
 * appears in a request line, so never in an access log or a Referer. A newer link revokes the
 * older ones of the same account; using a link and setting the password are one transaction.
 */

type Tx = Parameters<Parameters<typeof writeTransaction>[0]>[0];
type Purpose = (typeof oneTimeTokens.$inferInsert)["purpose"];

/** The path of a one-time link; the token is a fragment, so it stays in the browser. */
export function oneTimeLinkPath(token: string): string {
  return `/welcome#${token}`;
}

/**
 * Issues a link for an account inside the caller's transaction. A link that sets a password (or
 * accepts an invitation) revokes every older one of the account: an older link that also confirmed
 * a request keeps only that power (it becomes a "confirm-request" link), the rest stop working.
 * Links that only confirm a request grant no sign-in and live side by side, one per request.
 */
export async function issueOneTimeToken(
  tx: Tx,
  args: { userId: number; purpose: Purpose; days: number; leadId?: number | null },
): Promise<string> {
  const { userId, purpose, days, leadId = null } = args;
  const now = new Date();
  if (purpose !== "confirm-request") {
    const live = and(
      eq(oneTimeTokens.userId, userId),
      isNull(oneTimeTokens.usedAt),
      inArray(oneTimeTokens.purpose, ["set-password", "invite"]),
    );
    await tx
      .update(oneTimeTokens)
      .set({ purpose: "confirm-request" })
      .where(and(live, isNotNull(oneTimeTokens.leadId)));
    await tx
      .update(oneTimeTokens)
      .set({ usedAt: now.toISOString() })
      .where(and(live, isNull(oneTimeTokens.leadId)));
  }
  const { token, tokenHash } = createToken();
  await tx.insert(oneTimeTokens).values({
    tokenHash,
    userId,
    purpose,
    leadId,
    expiresAt: new Date(now.getTime() + days * 86_400_000).toISOString(),
  });
  return token;
}

/** The person a live (unused, unexpired, active account) token belongs to, or null. */
export async function findLiveToken(token: string) {
  if (!token || token.length > 200) return null;
  const [row] = await db
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      purpose: oneTimeTokens.purpose,
      leadId: oneTimeTokens.leadId,
      passwordHash: users.passwordHash,
    })
    .from(oneTimeTokens)
    .innerJoin(users, eq(users.id, oneTimeTokens.userId))
    .where(
      and(
        eq(oneTimeTokens.tokenHash, hashToken(token)),
        isNull(oneTimeTokens.usedAt),
        gt(oneTimeTokens.expiresAt, new Date().toISOString()),
        eq(users.isActive, true),
      ),
    )
    .limit(1);
  if (!row) return null;
  const { passwordHash, ...rest } = row;
  return { ...rest, hasPassword: passwordHash !== null };
}

class LinkNotLive extends Error {}

/**
 * Spends a token of one of `purposes` if it is still unused and unexpired at `now`: one conditional
 * UPDATE, so of two uses at the same moment only one gets the row back. Null for a dead link.
 */
async function consumeToken(
  tx: Tx,
  token: string,
  purposes: Purpose[],
  now: string,
): Promise<{ userId: number; leadId: number | null } | null> {
  const [used] = await tx
    .update(oneTimeTokens)
    .set({ usedAt: now })
    .where(
      and(
        eq(oneTimeTokens.tokenHash, hashToken(token)),
        isNull(oneTimeTokens.usedAt),
        gt(oneTimeTokens.expiresAt, now),
        inArray(oneTimeTokens.purpose, purposes),
      ),
    )
    .returning({ userId: oneTimeTokens.userId, leadId: oneTimeTokens.leadId });
  return used ?? null;
}

/**
 * Uses a token and sets the account's password in one transaction: the token is marked used only
 * if it was still unused, unexpired and its account active, and only then is the password written.
 * A second use at the same moment finds it used and changes nothing. Returns null for a dead link.
 */
export async function setPasswordWithToken(
  token: string,
  passwordHash: string,
): Promise<{ id: number; role: (typeof users.$inferSelect)["role"] } | null> {
  try {
    return await writeTransaction(async (tx) => {
      const now = new Date().toISOString();
      const used = await consumeToken(tx, token, ["set-password", "invite"], now);
      if (!used) throw new LinkNotLive();
      const [user] = await tx
        .update(users)
        .set({ passwordHash })
        .where(and(eq(users.id, used.userId), eq(users.isActive, true)))
        .returning({ id: users.id, role: users.role });
      if (!user) throw new LinkNotLive();
      if (used.leadId !== null) await attachLead(tx, used.leadId, user.id);
      // Any other password link still out there for this account is spent too (request links stay).
      await tx
        .update(oneTimeTokens)
        .set({ usedAt: now })
        .where(
          and(
            eq(oneTimeTokens.userId, user.id),
            isNull(oneTimeTokens.usedAt),
            inArray(oneTimeTokens.purpose, ["set-password", "invite"]),
          ),
        );
      return user;
    });
  } catch (error) {
    if (error instanceof LinkNotLive) return null;
    throw error;
  }
}

/** Puts a request in the account's own list; only a request that no account holds yet. */
async function attachLead(tx: Tx, leadId: number, userId: number): Promise<void> {
  await tx
    .update(leads)
    .set({ homeownerId: userId })
    .where(and(eq(leads.id, leadId), isNull(leads.homeownerId)));
}

/**
 * Uses a "this request was mine" link: the request joins the account the e-mail went to, in the
 * same transaction that spends the link. Returns the account, or null for a dead link.
 */
export async function confirmRequestWithToken(token: string): Promise<{ userId: number; hasPassword: boolean } | null> {
  return writeTransaction(async (tx) => {
    const used = await consumeToken(tx, token, ["confirm-request"], new Date().toISOString());
    if (!used || used.leadId === null) return null;
    await attachLead(tx, used.leadId, used.userId);
    const [user] = await tx.select({ passwordHash: users.passwordHash }).from(users).where(eq(users.id, used.userId));
    return { userId: used.userId, hasPassword: Boolean(user?.passwordHash) };
  });
}
