import { and, asc, eq, inArray, isNotNull, isNull, lt, lte, or, sql, type SQL } from "drizzle-orm";
import type { SQLiteColumn, SQLiteTable } from "drizzle-orm/sqlite-core";
import type Stripe from "stripe";
import { iso, isPermanentStatus, LEASE_MS, retryDelayMs, type Backoff } from "~/lib/jobs/jobs.server";
import type { Db } from "~/lib/platform/db.server";

/*
 * One refund worker for every kind of payment that can be owed back (a cancelled consult, a refunded
 * deposit). Each kind keeps the same bookkeeping columns on its own table (refund_attempts,
 * refund_next_at, refund_last_error, refund_failed_at, refund_lease_owner, refund_lease_expires_at,
 * refund_id, refunded_at) and supplies how to claim and update its rows; the rules of
 * app/lib/jobs/jobs.server.ts (lease, attempt counted at claim, backoff, cap, owner told) live here once.
 */

/**
 * Refunds wait 30 s, 1 min, 2 min … at most an hour between tries: eight tries span about two hours before the owner is
 * told.
 */
export const REFUND_BACKOFF: Backoff = { baseMs: 30_000, maxMs: 60 * 60_000, maxAttempts: 8 };

/** A claimed row: what the worker needs to send its refund; no amount refunds the whole payment. */
export type OwedRefund = {
  id: number;
  paymentIntentId: string | null;
  refundAttempts: number;
  amountCents?: number | null;
};

/** The columns a refund try writes back. */
export type RefundOutcome =
  | { refundId: string; refundedAt: string; refundLastError: null; refundLeaseOwner: null; refundLeaseExpiresAt: null }
  | {
      refundLastError: string;
      refundNextAt: string;
      refundFailedAt: string | null;
      refundLeaseOwner: null;
      refundLeaseExpiresAt: null;
    };

export type RefundQueue = {
  /** Names the row in log lines, e.g. "booking" or "deposit of proposal". */
  label: string;
  /** The idempotency key of the row's refund: the same on every try and in every process. */
  idempotencyKey: (id: number) => string;
  /** Takes up to a batch of due rows under this process's lease (attempts counted), oldest first. */
  claim: (owner: string, now: Date) => Promise<OwedRefund[]>;
  /** Writes a try's outcome, only while this process still holds the row's lease. */
  settle: (id: number, owner: string, outcome: RefundOutcome) => Promise<unknown>;
};

/** A table that keeps the refund bookkeeping columns (`refundColumns()` in the schema) beside its id. */
type RefundTable = SQLiteTable & {
  id: SQLiteColumn;
  refundId: SQLiteColumn;
  refundAttempts: SQLiteColumn;
  refundNextAt: SQLiteColumn;
  refundFailedAt: SQLiteColumn;
  refundLeaseOwner: SQLiteColumn;
  refundLeaseExpiresAt: SQLiteColumn;
};

const REFUND_BATCH_SIZE = 10;

/**
 * Whether a refund notice (`charge.refunded`) shows the refund owed made. A whole-payment refund is
 * made once the charge is refunded in full: nothing is left to send. A refund of part of a payment (a
 * built job's credit) is made only by a refund of at least that amount: the notice's own refund, the
 * rise in `amount_refunded` over its `previous_attributes`, never the charge's running total (which
 * counts earlier refunds made by hand for other reasons). Anything less settles nothing and the
 * worker still sends what is owed.
 */
export function noticeCoversRefund(
  event: { data: { previous_attributes?: unknown } },
  charge: Pick<Stripe.Charge, "amount" | "amount_refunded">,
  owedCents: number | null | undefined,
): boolean {
  const total = Number(charge.amount_refunded);
  if (!Number.isFinite(total) || total <= 0) return false;
  if (owedCents == null) return total >= Number(charge.amount);
  const previous = (event.data.previous_attributes as { amount_refunded?: unknown } | undefined)?.amount_refunded;
  const before = Number(previous);
  if (previous === undefined || previous === null || !Number.isFinite(before)) return false;
  return total - before >= owedCents;
}

/**
 * The queue of one table's owed refunds: rows where `owed` holds, with a payment to refund, not yet
 * refunded nor given up, due, and not leased by a live process. Claimed oldest first (never tried,
 * then by when each may try again, so a failing refund waits behind the rest), up to a batch, in one
 * UPDATE … RETURNING that takes the lease and counts the attempt.
 */
export function tableRefundQueue<T extends RefundTable>(args: {
  database: Db;
  table: T;
  label: string;
  idempotencyKey: (id: number) => string;
  /** What makes a row owe its refund (besides the bookkeeping), e.g. `isNotNull(t.refundOwedAt)`. */
  owed: SQL | undefined;
  /** The payment it goes back to. */
  paymentIntent: SQLiteColumn;
  /** How much of it, in cents; absent or null refunds the whole payment. */
  amount?: SQLiteColumn;
}): RefundQueue {
  const { database, table: t } = args;
  // Drizzle types a generic table's set() and returning() loosely; the columns above are the contract.
  const update = () =>
    database.update(t as SQLiteTable) as unknown as {
      set: (values: Record<string, unknown>) => {
        where: (condition: SQL | undefined) => {
          returning: (shape: Record<string, SQLiteColumn>) => Promise<OwedRefund[]>;
        } & Promise<unknown>;
      };
    };
  return {
    label: args.label,
    idempotencyKey: args.idempotencyKey,
    claim: async (owner, now) => {
      const nowIso = now.toISOString();
      const due = database
        .select({ id: t.id })
        .from(t as SQLiteTable)
        .where(
          and(
            args.owed,
            isNull(t.refundId),
            isNotNull(args.paymentIntent),
            isNull(t.refundFailedAt),
            or(isNull(t.refundNextAt), lte(t.refundNextAt, nowIso)),
            or(isNull(t.refundLeaseExpiresAt), lt(t.refundLeaseExpiresAt, nowIso)),
          ),
        )
        .orderBy(asc(sql`coalesce(${t.refundNextAt}, '')`), asc(t.id))
        .limit(REFUND_BATCH_SIZE);
      return update()
        .set({
          refundLeaseOwner: owner,
          refundLeaseExpiresAt: iso(now.getTime() + LEASE_MS),
          refundAttempts: sql`${t.refundAttempts} + 1`,
        })
        .where(and(inArray(t.id, due), isNull(t.refundId)))
        .returning({
          id: t.id,
          paymentIntentId: args.paymentIntent,
          refundAttempts: t.refundAttempts,
          ...(args.amount ? { amountCents: args.amount } : {}),
        });
    },
    settle: (id, owner, outcome) =>
      update()
        .set(outcome)
        .where(and(eq(t.id, id), eq(t.refundLeaseOwner, owner))),
  };
}

/**
 * Sends the refunds a queue owes, each once, under a lease so two processes never send the same one.
 * A failed refund is retried with backoff and, past its cap or on an answer a retry cannot change,
 * marked failed for the owner to see. Returns how many refunds went out.
 */
export async function sendOwedRefunds(
  queue: RefundQueue,
  client: Pick<Stripe, "refunds">,
  owner: string,
  now: Date,
): Promise<number> {
  const claimed = await queue.claim(owner, now);
  let done = 0;
  for (const row of claimed) {
    const attempts = row.refundAttempts;
    let failure: { status: number | null; message: string };
    try {
      if (attempts > REFUND_BACKOFF.maxAttempts) {
        failure = { status: null, message: "no tries left after the worker stopped mid-refund" };
      } else if (!row.paymentIntentId) {
        failure = { status: 400, message: "no payment to refund" };
      } else {
        const refund = await client.refunds.create(
          {
            payment_intent: row.paymentIntentId,
            ...(row.amountCents != null ? { amount: row.amountCents } : {}),
          },
          { idempotencyKey: queue.idempotencyKey(row.id) },
        );
        await queue.settle(row.id, owner, {
          refundId: refund.id,
          refundedAt: new Date().toISOString(),
          refundLastError: null,
          refundLeaseOwner: null,
          refundLeaseExpiresAt: null,
        });
        done += 1;
        continue;
      }
    } catch (error) {
      const stripeError = error as { statusCode?: number; code?: string; type?: string; message?: string };
      if (stripeError.code === "charge_already_refunded") {
        // Refunded already (by hand, or by a try whose answer was lost): nothing is owed.
        await queue.settle(row.id, owner, {
          refundId: "already-refunded",
          refundedAt: new Date().toISOString(),
          refundLastError: null,
          refundLeaseOwner: null,
          refundLeaseExpiresAt: null,
        });
        continue;
      }
      failure = {
        status: stripeError.statusCode ?? null,
        message: `${stripeError.statusCode ?? "network"} ${stripeError.code ?? stripeError.type ?? "error"}: ${stripeError.message ?? String(error)}`,
      };
    }
    const isGivingUp = isPermanentStatus(failure.status) || attempts >= REFUND_BACKOFF.maxAttempts;
    const delay = retryDelayMs(attempts, REFUND_BACKOFF);
    await queue.settle(row.id, owner, {
      refundLastError: failure.message.slice(0, 500),
      refundNextAt: iso(now.getTime() + delay),
      refundFailedAt: isGivingUp ? now.toISOString() : null,
      refundLeaseOwner: null,
      refundLeaseExpiresAt: null,
    });
    console.error(
      isGivingUp
        ? `refunds: ${queue.label} ${row.id} failed for good after ${attempts} tries, the owner is shown it: ${failure.message}`
        : `refunds: ${queue.label} ${row.id} try ${attempts} failed, next in ${delay / 1000} s: ${failure.message}`,
    );
  }
  return done;
}
