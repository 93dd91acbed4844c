import { and, asc, eq, inArray, isNull, lt, lte, or, sql } from "drizzle-orm";
import { companies, emailOutbox } from "~/db/schema";
import { senderHeaders } from "~/lib/platform/email-headers";
import { db as defaultDb, type Db } from "~/lib/platform/db.server";
import { outboxAttachmentsSchema, resend } from "~/lib/platform/email.server";
import { env } from "~/lib/platform/env.server";
import { iso, isPermanentStatus, LEASE_MS, retryDelayMs, WORKER_ID, type Backoff } from "~/lib/jobs/jobs.server";

const BATCH_SIZE = 20;
// 2 s, 4 s, 8 s … 5 min: twelve tries span about half an hour of outage before the owner is told.
export const OUTBOX_BACKOFF: Backoff = { baseMs: 2_000, maxMs: 5 * 60_000, maxAttempts: 12 };

type WorkerOptions = { db?: Db; owner?: string };

/** Claims up to BATCH_SIZE due rows for this process in one statement (see app/lib/jobs/jobs.server.ts). */
async function claimDueEmails(db: Db, owner: string, now: Date) {
  const nowIso = now.toISOString();
  const due = db
    .select({ id: emailOutbox.id })
    .from(emailOutbox)
    .where(
      and(
        eq(emailOutbox.status, "pending"),
        lte(emailOutbox.sendAfter, nowIso),
        or(isNull(emailOutbox.leaseExpiresAt), lt(emailOutbox.leaseExpiresAt, nowIso)),
      ),
    )
    .orderBy(asc(emailOutbox.sendAfter), asc(emailOutbox.id))
    .limit(BATCH_SIZE);
  return db
    .update(emailOutbox)
    .set({
      leaseOwner: owner,
      leaseExpiresAt: iso(now.getTime() + LEASE_MS),
      attempts: sql`${emailOutbox.attempts} + 1`,
    })
    .where(and(inArray(emailOutbox.id, due), eq(emailOutbox.status, "pending")))
    .returning();
}

/**
 * Sends every due outbox row once. Each send carries the row's idempotency key, so a crash
 * between "sent" and "marked sent" cannot produce a second e-mail; the lease keeps a second
 * process from sending the same row meanwhile. Returns how many were sent.
 */
export async function deliverDueEmails(
  now = new Date(),
  client: Pick<typeof resend, "emails"> = resend,
  options: WorkerOptions = {},
): Promise<number> {
  const db = options.db ?? defaultDb;
  const owner = options.owner ?? WORKER_ID;
  const claimed = await claimDueEmails(db, owner, now);
  // The sender's name and Reply-To come from the company as it is at sending time.
  const companyIds = [...new Set(claimed.map((row) => row.companyId).filter((id): id is number => id !== null))];
  const senders = companyIds.length
    ? await db
        .select({ id: companies.id, name: companies.name, email: companies.email })
        .from(companies)
        .where(inArray(companies.id, companyIds))
    : [];
  const mine = (id: number) => and(eq(emailOutbox.id, id), eq(emailOutbox.leaseOwner, owner));
  let sent = 0;
  for (const row of claimed) {
    const attempts = row.attempts;
    let failure: { status: number | null; message: string };
    try {
      if (attempts > OUTBOX_BACKOFF.maxAttempts) {
        // Its last worker stopped mid-send (the lease lapsed) and it has no tries left.
        failure = { status: null, message: "no tries left after the worker stopped mid-send" };
      } else {
        // A row that does not parse fails like any other send (a ZodError, caught below), never as a half-read
        // attachment.
        const attachments = outboxAttachmentsSchema.parse(JSON.parse(row.attachmentsJson));
        const sender = senderHeaders({
          sendingFrom: env.EMAIL_FROM,
          company: senders.find((c) => c.id === row.companyId) ?? null,
          to: row.toAddress,
        });
        const { data, error } = await client.emails.send(
          {
            from: sender.from,
            ...(sender.replyTo ? { replyTo: sender.replyTo } : {}),
            to: row.toAddress,
            subject: row.subject,
            html: row.html,
            text: row.text,
            ...(attachments.length
              ? {
                  attachments: attachments.map((a) => ({
                    filename: a.filename,
                    content: a.content,
                    contentType: a.contentType,
                  })),
                }
              : {}),
          },
          { idempotencyKey: row.idempotencyKey },
        );
        if (!error) {
          sent += 1;
          await db
            .update(emailOutbox)
            .set({
              status: "sent",
              sentAt: new Date().toISOString(),
              providerId: data?.id ?? null,
              lastError: null,
              leaseOwner: null,
              leaseExpiresAt: null,
            })
            .where(mine(row.id));
          continue;
        }
        failure = {
          status: error.statusCode ?? null,
          message: `${error.statusCode || "network"} ${error.name}: ${error.message}`,
        };
      }
    } catch (error) {
      // A row that cannot even be read or handed over (bad JSON, a thrown network error) is a failed try too.
      failure = { status: null, message: `error ${(error as Error).message}` };
    }
    // A 4xx other than 408/409/429 will fail the same way again; anything else is retried with backoff.
    const isGivingUp = isPermanentStatus(failure.status) || attempts >= OUTBOX_BACKOFF.maxAttempts;
    await db
      .update(emailOutbox)
      .set({
        status: isGivingUp ? "failed" : "pending",
        lastError: failure.message.slice(0, 500),
        sendAfter: iso(now.getTime() + retryDelayMs(attempts, OUTBOX_BACKOFF)),
        leaseOwner: null,
        leaseExpiresAt: null,
      })
      .where(mine(row.id));
    console.error(
      isGivingUp
        ? `outbox: e-mail ${row.id} (${row.idempotencyKey}) failed for good after ${attempts} tries: ${failure.message}`
        : `outbox: e-mail ${row.id} (${row.idempotencyKey}) try ${attempts} failed, next in ${retryDelayMs(attempts, OUTBOX_BACKOFF) / 1000} s: ${failure.message}`,
    );
  }
  return sent;
}
