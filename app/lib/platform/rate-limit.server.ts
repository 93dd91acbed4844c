import { eq, lt, sql } from "drizzle-orm";
import { createContext, type RouterContextProvider } from "react-router";
import { rateLimits } from "~/db/schema";
import { addressBucket, resolveClientAddress } from "~/lib/platform/client-address";
import { db } from "~/lib/platform/db.server";
import { env } from "~/lib/platform/env.server";

/**
 * Limits stored in the database, so every app process sees the same counts. Each limiter has a
 * name, a number of points and a fixed window; a key (an address, a company and an address, an
 * account and an address) gets its own row. Spending is one atomic statement: the window restarts
 * when it has ended, otherwise the count goes up, and the new count comes back in the same step.
 */
export type LimitVerdict = { ok: true } | { ok: false; retryAfterSeconds: number };
export type Limiter = { name: string; points: number; durationSeconds: number };

export function createLimiter(name: string, points: number, durationSeconds: number): Limiter {
  return { name, points, durationSeconds };
}

const rowKey = (limiter: Limiter, key: string) => `${limiter.name}|${key}`;
const retryAfter = (windowEndsAt: number, now: number) => Math.max(1, Math.ceil((windowEndsAt - now) / 1000));

// A write can meet another process's (or this one's) open transaction and get SQLITE_BUSY at once
// from libSQL; a short retry rides that out instead of failing the visitor's request.
async function withBusyRetry<T>(work: () => Promise<T>): Promise<T> {
  for (let attempt = 0; ; attempt++) {
    try {
      return await work();
    } catch (error) {
      const text =
        String((error as { code?: string; message?: string })?.code ?? "") + String((error as Error)?.message ?? "");
      if (attempt >= 8 || !/SQLITE_BUSY|database is locked/i.test(text)) throw error;
      await new Promise((r) => setTimeout(r, 5 * 2 ** attempt));
    }
  }
}

/** Points spent on a key in its current window (0 when its window has ended). */
export async function countSpent(limiter: Limiter, key: string): Promise<{ spent: number; windowEndsAt: number }> {
  const now = Date.now();
  const [row] = await db
    .select()
    .from(rateLimits)
    .where(eq(rateLimits.key, rowKey(limiter, key)))
    .limit(1);
  if (!row || row.windowEndsAt <= now) return { spent: 0, windowEndsAt: now };
  return { spent: row.points, windowEndsAt: row.windowEndsAt };
}

/** Checks a key without spending a point. */
export async function peekLimit(limiter: Limiter, key: string): Promise<LimitVerdict> {
  const { spent, windowEndsAt } = await countSpent(limiter, key);
  return spent >= limiter.points
    ? { ok: false, retryAfterSeconds: retryAfter(windowEndsAt, Date.now()) }
    : { ok: true };
}

let spendsSinceSweep = 0;

/** Spends one point; refuses once the window's points are used up. */
export async function spendLimit(limiter: Limiter, key: string): Promise<LimitVerdict> {
  const now = Date.now();
  const fresh = now + limiter.durationSeconds * 1000;
  const [row] = await withBusyRetry(() =>
    db
      .insert(rateLimits)
      .values({ key: rowKey(limiter, key), points: 1, windowEndsAt: fresh })
      .onConflictDoUpdate({
        target: rateLimits.key,
        set: {
          points: sql`case when ${rateLimits.windowEndsAt} <= ${now} then 1 else ${rateLimits.points} + 1 end`,
          windowEndsAt: sql`case when ${rateLimits.windowEndsAt} <= ${now} then ${fresh} else ${rateLimits.windowEndsAt} end`,
        },
      })
      .returning({ points: rateLimits.points, windowEndsAt: rateLimits.windowEndsAt }),
  );
  // Ended windows are dead weight; one cheap indexed delete now and then keeps the table small.
  if (++spendsSinceSweep >= 500) {
    spendsSinceSweep = 0;
    await withBusyRetry(() => db.delete(rateLimits).where(lt(rateLimits.windowEndsAt, now))).catch(() => undefined);
  }
  return row!.points > limiter.points
    ? { ok: false, retryAfterSeconds: retryAfter(row!.windowEndsAt, now) }
    : { ok: true };
}

/**
 * The socket's peer address, put into the request context by the server (server.mjs). Without it
 * (the Vite dev server, a bare react-router-serve) every visitor shares one "unknown" bucket, so
 * the limits still cap the total.
 */
export const socketAddressContext = createContext<string | null>(null);

/** The address bucket for per-address limits: the socket's peer, or what a trusted proxy says. */
export function clientAddress(request: Request, context: Readonly<RouterContextProvider> | undefined): string {
  const socket = typeof context?.get === "function" ? context.get(socketAddressContext) : null;
  return addressBucket(resolveClientAddress(socket, request.headers.get("x-forwarded-for"), env.trustProxy));
}

export function tooManyRequests(retryAfterSeconds: number, message: string): Response {
  return Response.json(
    { errors: [{ path: "", message }] },
    { status: 429, headers: { "Retry-After": String(retryAfterSeconds) } },
  );
}
