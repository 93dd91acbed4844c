import { randomBytes } from "node:crypto";
import { and, eq, gt, lt } from "drizzle-orm";
import { createCookie, redirect } from "react-router";
import { sessions, users, type Role, type User } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { env } from "~/lib/platform/env.server";

const SESSION_DAYS = 14;

// Signed with rotating secrets: the first signs, the rest still verify.
export const sessionCookie = createCookie("ew_session", {
  httpOnly: true,
  secure: env.NODE_ENV === "production",
  sameSite: "lax",
  path: "/",
  maxAge: SESSION_DAYS * 24 * 60 * 60,
  secrets: env.sessionSecrets,
});

export type SessionUser = Pick<User, "id" | "companyId" | "email" | "name" | "role"> & {
  sessionId: string;
};

/** Starts a server-side session for a user; returns the Set-Cookie header value. */
export async function startSession(userId: number): Promise<string> {
  const id = randomBytes(32).toString("base64url");
  const expiresAt = new Date(Date.now() + SESSION_DAYS * 86_400_000).toISOString();
  await db.insert(sessions).values({ id, userId, expiresAt });
  return sessionCookie.serialize(id);
}

async function readSessionId(request: Request): Promise<string | null> {
  const value = await sessionCookie.parse(request.headers.get("Cookie"));
  return typeof value === "string" && value.length > 0 ? value : null;
}

/** The signed-in, active user of a request, or null. One indexed lookup. */
export async function getSessionUser(request: Request): Promise<SessionUser | null> {
  const sessionId = await readSessionId(request);
  if (!sessionId) return null;
  const [row] = await db
    .select({
      id: users.id,
      companyId: users.companyId,
      email: users.email,
      name: users.name,
      role: users.role,
    })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .where(and(eq(sessions.id, sessionId), gt(sessions.expiresAt, new Date().toISOString()), eq(users.isActive, true)))
    .limit(1);
  return row ? { ...row, sessionId } : null;
}

/** Ends the request's session on the server and returns a cookie that clears the browser's copy. */
export async function endSession(request: Request): Promise<string> {
  const sessionId = await readSessionId(request);
  if (sessionId) await db.delete(sessions).where(eq(sessions.id, sessionId));
  return sessionCookie.serialize("", { maxAge: 0 });
}

/** Ends every session of a user (deactivation, role change, password reset). */
export async function endAllSessions(userId: number): Promise<void> {
  await db.delete(sessions).where(eq(sessions.userId, userId));
}

/** Deletes expired session rows; cheap, called from sign-in. */
export async function sweepExpiredSessions(): Promise<void> {
  await db.delete(sessions).where(lt(sessions.expiresAt, new Date().toISOString()));
}

type RequireOptions = { roles?: readonly Role[] };

/**
 * The guard every protected loader and action calls itself. Anonymous visitors and
 * homeowners asking for a staff page go to sign-in; staff without the role get 403.
 */
export async function requireUser(request: Request, options: RequireOptions = {}): Promise<SessionUser> {
  const user = await getSessionUser(request);
  const roles = options.roles;
  const wantsStaff = roles?.some((r) => r !== "homeowner") ?? false;
  if (!user || (wantsStaff && user.role === "homeowner" && !roles?.includes("homeowner"))) {
    throw redirectToSignIn(request);
  }
  if (roles && !roles.includes(user.role)) {
    throw new Response("You do not have access to this page.", { status: 403 });
  }
  return user;
}

export function redirectToSignIn(request: Request) {
  const url = new URL(request.url);
  const back = url.pathname + url.search;
  return redirect(`/login?redirectTo=${encodeURIComponent(back)}`);
}

// C0 controls, DEL and C1 controls: browsers drop tabs and newlines from URLs ("/\t/evil.example"
// becomes "//evil.example"), and a newline in a Location header fails the whole response.
const CONTROL_CHARACTERS = /[\u0000-\u001f\u007f-\u009f]/;

/**
 * The only redirect targets after sign-in: paths on the app's own origin. The target is parsed as
 * the browser will parse it (WHATWG URL, against the app origin) and must keep that origin; the
 * answer is the normalised path, query and fragment, which are always safe in a header. Anything
 * else (another host, a scheme, "//", "/\\", control characters) gives the fallback.
 */
export function safeRedirectPath(target: string | null | undefined, fallback: string): string {
  if (!target || !target.startsWith("/") || CONTROL_CHARACTERS.test(target)) return fallback;
  const base = env.appOrigin ?? "http://localhost";
  let url: URL;
  try {
    url = new URL(target, base);
  } catch {
    return fallback;
  }
  if (url.origin !== new URL(base).origin) return fallback;
  return `${url.pathname}${url.search}${url.hash}`;
}
