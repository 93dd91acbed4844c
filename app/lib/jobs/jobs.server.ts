import { randomUUID } from "node:crypto";
import { hostname } from "node:os";
import { and, eq, isNull, lt, or, sql } from "drizzle-orm";
import { jobLeases } from "~/db/schema";
import type { Db } from "~/lib/platform/db.server";

/*
 * Rules every background job follows, so any number of processes can share one database:
 *
 * - Claim with a lease: one UPDATE … WHERE <due and lease free or lapsed> … RETURNING sets
 *   `lease_owner` to this process and `lease_expires_at` to now + LEASE_MS. SQLite runs each write
 *   statement alone, so two processes never claim the same row. A process that dies mid-job leaves
 *   a lease that lapses and another process retakes the row.
 * - Count the attempt at claim time, so a row that kills its worker still runs out of attempts.
 * - After a failure the row waits retryDelayMs(attempts) (doubling, capped); past its cap, or on an
 *   error that will not change by retrying, it is marked failed and shown to the company's owner
 *   (/app/attention), who can try it again.
 * - Claim in order of due time: a failing row's next try moves it behind the others, so one bad row
 *   never holds up the rest.
 * - Log one line per failed attempt and one when giving up: with the backoff that is a handful of
 *   lines per stuck row, never one a second.
 */

/** How long a claim lasts: longer than one batch of sends or refunds takes, network retries included. */
export const LEASE_MS = 5 * 60_000;

/** This process, as named in the leases it takes. */
export const WORKER_ID = `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;

export type Backoff = { baseMs: number; maxMs: number; maxAttempts: number };

/** Delay before try `attempts + 1`: base, 2×base, 4×base … capped at maxMs. */
export function retryDelayMs(attempts: number, backoff: Pick<Backoff, "baseMs" | "maxMs">): number {
  return Math.min(backoff.baseMs * 2 ** Math.max(0, attempts - 1), backoff.maxMs);
}

/** An HTTP answer that a retry will not change (a 4xx other than timeout, conflict and rate limit). */
export function isPermanentStatus(status: number | null | undefined): boolean {
  return typeof status === "number" && status >= 400 && status < 500 && ![408, 409, 429].includes(status);
}

export const iso = (ms: number) => new Date(ms).toISOString();

export type LeaseClaim = { owner: string; now: Date };

/**
 * Takes the named singleton job's lease when it is due and free (or lapsed); returns whether this
 * process may run it now. Finish with releaseJob.
 */
export async function claimJob(db: Db, name: string, { owner, now }: LeaseClaim): Promise<{ attempts: number } | null> {
  const nowIso = now.toISOString();
  // The row exists from the first claim on; a second process inserting the same name does nothing.
  await db.insert(jobLeases).values({ name, nextRunAt: nowIso }).onConflictDoNothing();
  const [row] = await db
    .update(jobLeases)
    .set({ leaseOwner: owner, leaseExpiresAt: iso(now.getTime() + LEASE_MS), attempts: sql`${jobLeases.attempts} + 1` })
    .where(
      and(
        eq(jobLeases.name, name),
        sql`${jobLeases.nextRunAt} <= ${nowIso}`,
        or(isNull(jobLeases.leaseExpiresAt), lt(jobLeases.leaseExpiresAt, nowIso)),
      ),
    )
    .returning({ attempts: jobLeases.attempts });
  return row ?? null;
}

/**
 * Ends a singleton job run: on success it next runs after `everyMs` and its attempts reset; on
 * failure after the backoff delay (never later than `everyMs`). Only the lease holder's release counts.
 */
export async function releaseJob(
  db: Db,
  name: string,
  args: LeaseClaim & { attempts: number; everyMs: number; error?: string; backoff: Pick<Backoff, "baseMs" | "maxMs"> },
): Promise<void> {
  const at = args.now.getTime();
  await db
    .update(jobLeases)
    .set(
      args.error === undefined
        ? {
            leaseOwner: null,
            leaseExpiresAt: null,
            attempts: 0,
            lastError: null,
            lastRunAt: iso(at),
            nextRunAt: iso(at + args.everyMs),
          }
        : {
            leaseOwner: null,
            leaseExpiresAt: null,
            lastError: args.error.slice(0, 500),
            lastRunAt: iso(at),
            nextRunAt: iso(at + Math.min(retryDelayMs(args.attempts, args.backoff), args.everyMs)),
          },
    )
    .where(and(eq(jobLeases.name, name), eq(jobLeases.leaseOwner, args.owner)));
}
