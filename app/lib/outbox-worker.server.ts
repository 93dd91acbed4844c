import { and, asc, eq, lte } from "drizzle-orm";
import { emailOutbox } from "~/db/schema";
import { db } from "~/lib/db.server";
import { resend, type OutboxAttachment } from "~/lib/email.server";
import { env } from "~/lib/env.server";

const BATCH_SIZE = 20;
const MAX_ATTEMPTS = 12;
const BASE_DELAY_MS = 2_000;
const MAX_DELAY_MS = 5 * 60_000;

/** Delay before the next try: 2 s, 4 s, 8 s … capped at 5 min. */
export function retryDelayMs(attempts: number): number {
  return Math.min(BASE_DELAY_MS * 2 ** Math.max(0, attempts - 1), MAX_DELAY_MS);
}

/**
 * Sends every due outbox row once. Each send carries the row's idempotency key, so a crash
 * between "sent" and "marked sent" cannot produce a second e-mail. Returns how many were sent.
 */
export async function deliverDueEmails(now = new Date(), client: Pick<typeof resend, "emails"> = resend): Promise<number> {
  const due = await db
    .select()
    .from(emailOutbox)
    .where(and(eq(emailOutbox.status, "pending"), lte(emailOutbox.sendAfter, now.toISOString())))
    .orderBy(asc(emailOutbox.sendAfter))
    .limit(BATCH_SIZE);
  let sent = 0;
  for (const row of due) {
    const attachments = JSON.parse(row.attachmentsJson) as OutboxAttachment[];
    const { data, error } = await client.emails.send(
      {
        from: env.EMAIL_FROM,
        to: row.toAddress,
        subject: row.subject,
        html: row.html,
        text: row.text,
        ...(attachments.length
          ? { attachments: attachments.map((a) => ({ filename: a.filename, content: a.content, contentType: a.contentType })) }
          : {}),
      },
      { idempotencyKey: row.idempotencyKey },
    );
    const attempts = row.attempts + 1;
    if (!error) {
      sent += 1;
      await db
        .update(emailOutbox)
        .set({ status: "sent", attempts, sentAt: new Date().toISOString(), providerId: data?.id ?? null, lastError: null })
        .where(eq(emailOutbox.id, row.id));
      continue;
    }
    // A 4xx other than 429 will fail the same way again; anything else is worth retrying.
    const status = error.statusCode ?? 0;
    const isPermanent = status >= 400 && status < 500 && status !== 429;
    await db
      .update(emailOutbox)
      .set({
        status: isPermanent || attempts >= MAX_ATTEMPTS ? "failed" : "pending",
        attempts,
        lastError: `${status || "network"} ${error.name}: ${error.message}`.slice(0, 500),
        sendAfter: new Date(Date.now() + retryDelayMs(attempts)).toISOString(),
      })
      .where(eq(emailOutbox.id, row.id));
  }
  return sent;
}
