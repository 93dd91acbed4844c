import { processRefunds, releaseLapsedHolds } from "~/lib/consults/booking.server";
import { db as defaultDb, type Db } from "~/lib/platform/db.server";
import { env } from "~/lib/platform/env.server";
import { claimJob, releaseJob, WORKER_ID } from "~/lib/jobs/jobs.server";
import { deliverDueEmails } from "~/lib/jobs/outbox-worker.server";
import { sweepUnrecordedPhotos } from "~/lib/leads/leads.server";
import { expireProposals, processDepositRefunds } from "~/lib/proposals/proposal-payments.server";
import { processBalanceRefunds } from "~/lib/builds/job-balance.server";

let timer: NodeJS.Timeout | null = null;
let isRunning = false;
const SWEEP_EVERY_MS = 10 * 60_000;
// A failing sweep tries again after 1 min, 2 min … never later than its usual 10 minutes.
const SWEEP_BACKOFF = { baseMs: 60_000, maxMs: SWEEP_EVERY_MS };

/** Sweeps photos left by a crash mid-submit: one process at a time, every 10 minutes (a lease row). */
export async function sweepStrayUploads(
  options: { now?: Date; db?: Db; owner?: string; sweep?: () => Promise<unknown> } = {},
): Promise<boolean> {
  const database = options.db ?? defaultDb;
  const claim = { owner: options.owner ?? WORKER_ID, now: options.now ?? new Date() };
  const taken = await claimJob(database, "upload-sweep", claim);
  if (!taken) return false;
  try {
    await (options.sweep ?? (() => sweepUnrecordedPhotos()))();
    await releaseJob(database, "upload-sweep", {
      ...claim,
      attempts: taken.attempts,
      everyMs: SWEEP_EVERY_MS,
      backoff: SWEEP_BACKOFF,
    });
  } catch (error) {
    const message = (error as Error).message ?? String(error);
    // One line per failed run; runs are minutes apart.
    console.error(`background: upload sweep try ${taken.attempts} failed: ${message}`);
    await releaseJob(database, "upload-sweep", {
      ...claim,
      attempts: taken.attempts,
      everyMs: SWEEP_EVERY_MS,
      backoff: SWEEP_BACKOFF,
      error: message,
    });
  }
  return true;
}

/**
 * One pass of the background work: due e-mails, owed refunds, lapsed consult holds, proposals past their date, deposit
 * and balance refunds, and now and then photos left by a crash.
 */
export async function runBackgroundPass(): Promise<void> {
  await deliverDueEmails();
  await processRefunds();
  await releaseLapsedHolds();
  // Each proposal expires once (a conditional update per row), and each deposit refund carries its
  // own idempotency key, so several processes running these at once cannot double either.
  await expireProposals();
  await processDepositRefunds();
  await processBalanceRefunds();
  await sweepStrayUploads();
}

// A pass that fails as a whole (the database unreachable) is logged when it starts failing, when
// the message changes, and then once a minute, not once a second.
let lastPassError: { message: string; loggedAt: number; repeats: number } | null = null;
const PASS_ERROR_LOG_EVERY_MS = 60_000;

/** Polls in this process, one pass at a time; leases share the work with any other process. */
export function startBackgroundWork(intervalMs = 1_000): void {
  if (timer) return;
  timer = setInterval(async () => {
    if (isRunning) return;
    isRunning = true;
    try {
      await runBackgroundPass();
      if (lastPassError) console.error(`background: passes work again (after ${lastPassError.repeats + 1} failed)`);
      lastPassError = null;
    } catch (err) {
      const message = (err as Error).message ?? String(err);
      const now = Date.now();
      if (
        !lastPassError ||
        lastPassError.message !== message ||
        now - lastPassError.loggedAt >= PASS_ERROR_LOG_EVERY_MS
      ) {
        console.error(
          `background: pass failed${lastPassError ? ` (${lastPassError.repeats + 1} times so far)` : ""}`,
          err,
        );
        lastPassError = { message, loggedAt: now, repeats: (lastPassError?.repeats ?? 0) + 1 };
      } else {
        lastPassError.repeats += 1;
      }
    } finally {
      isRunning = false;
    }
  }, intervalMs);
  timer.unref();
}

if (env.OUTBOX_WORKER === "on" && !process.env.VITEST) startBackgroundWork();
