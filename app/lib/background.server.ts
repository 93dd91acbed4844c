import { processRefunds, releaseLapsedHolds } from "~/lib/booking.server";
import { env } from "~/lib/env.server";
import { deliverDueEmails } from "~/lib/outbox-worker.server";

let timer: NodeJS.Timeout | null = null;
let isRunning = false;

/** One pass of the background work: due e-mails, owed refunds, lapsed consult holds. */
export async function runBackgroundPass(): Promise<void> {
  await deliverDueEmails();
  await processRefunds();
  await releaseLapsedHolds();
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
