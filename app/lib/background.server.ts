import { processRefunds, releaseLapsedHolds } from "~/lib/booking.server";
import { env } from "~/lib/env.server";
import { deliverDueEmails } from "~/lib/outbox-worker.server";
import { sweepUnrecordedPhotos } from "~/lib/leads.server";

let timer: NodeJS.Timeout | null = null;
let isRunning = false;
let lastSweepAt = 0;
const SWEEP_EVERY_MS = 10 * 60_000;

/** One pass of the background work: due e-mails, owed refunds, lapsed consult holds, and now and then photos left by a crash. */
export async function runBackgroundPass(): Promise<void> {
  await deliverDueEmails();
  await processRefunds();
  await releaseLapsedHolds();
  if (Date.now() - lastSweepAt > SWEEP_EVERY_MS) {
    lastSweepAt = Date.now();
    await sweepUnrecordedPhotos();
  }
}

/** Polls in this process, one pass at a time (a second process would take a lease first). */
export function startBackgroundWork(intervalMs = 1_000): void {
  if (timer) return;
  timer = setInterval(async () => {
    if (isRunning) return;
    isRunning = true;
    try {
      await runBackgroundPass();
    } catch (err) {
      console.error("background: pass failed", err);
    } finally {
      isRunning = false;
    }
  }, intervalMs);
  timer.unref();
}

if (env.OUTBOX_WORKER === "on" && !process.env.VITEST) startBackgroundWork();
