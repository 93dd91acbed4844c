import { render } from "@react-email/components";
import { toSingleLine } from "~/lib/format/clean-text";
import type { ReactElement } from "react";
import { Resend } from "resend";
import { z } from "zod";
import { emailOutbox } from "~/db/schema";
import { env } from "~/lib/platform/env.server";

// Points at fakes/email when RESEND_BASE_URL is set; at the real service otherwise.
export const resend = new Resend(
  env.RESEND_API_KEY,
  env.RESEND_BASE_URL ? { baseUrl: env.RESEND_BASE_URL } : undefined,
);

/** An attachment as an outbox row keeps it (content in base64); rows are parsed with this on the way out. */
export const outboxAttachmentsSchema = z.array(
  z.object({ filename: z.string(), content: z.string(), contentType: z.string() }),
);
export type OutboxAttachment = z.infer<typeof outboxAttachmentsSchema>[number];

export type OutboxMessage = {
  idempotencyKey: string;
  companyId: number | null;
  to: string;
  subject: string;
  template: ReactElement;
  attachments?: OutboxAttachment[];
  sendAfter?: Date;
};

/**
 * Renders an e-mail (HTML and plain text) into an outbox row, ready to go into the same
 * db.batch as the record that causes it. Nothing is sent here.
 */
export async function prepareOutboxRow(message: OutboxMessage): Promise<typeof emailOutbox.$inferInsert> {
  const [html, text] = await Promise.all([render(message.template), render(message.template, { plainText: true })]);
  return {
    companyId: message.companyId,
    idempotencyKey: message.idempotencyKey,
    toAddress: message.to,
    // Subjects are built from cleaned form values already; a header never gets a line break anyway.
    subject: toSingleLine(message.subject).trim(),
    html,
    text,
    attachmentsJson: JSON.stringify(message.attachments ?? []),
    ...(message.sendAfter ? { sendAfter: message.sendAfter.toISOString() } : {}),
  };
}

/**
 * The public origin for links in e-mails and payment return addresses: APP_ORIGIN, which
 * production requires. Only development and tests, which may leave it unset, fall back to the
 * request's own origin.
 */
export function appOrigin(request: Request): string {
  return env.appOrigin ?? new URL(request.url).origin;
}
