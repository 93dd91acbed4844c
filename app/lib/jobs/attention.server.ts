import { and, count, desc, eq, isNotNull, isNull } from "drizzle-orm";
import { bookings, emailOutbox, jobBalances, leads, proposals } from "~/db/schema";
import { retryFailedBalanceRefund } from "~/lib/builds/job-balance.server";
import { retryFailedRefund } from "~/lib/consults/booking.server";
import { db } from "~/lib/platform/db.server";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";
import { retryFailedDepositRefund } from "~/lib/proposals/proposal-payments.server";

/*
 * Background work that gave up (past its tries, or refused for good by the service) waits here for
 * the company's owner: each row says what failed and why, and "Try again" puts it back in the queue.
 */

/** How many e-mails and refunds of a company have failed for good (for the workspace banner). */
export async function countFailedWork(companyId: number): Promise<number> {
  const [[mail], [refunds], [deposits], [balances]] = await Promise.all([
    db
      .select({ n: count() })
      .from(emailOutbox)
      .where(and(eq(emailOutbox.companyId, companyId), eq(emailOutbox.status, "failed"))),
    db
      .select({ n: count() })
      .from(bookings)
      .where(and(eq(bookings.companyId, companyId), isNotNull(bookings.refundFailedAt), isNull(bookings.refundId))),
    db
      .select({ n: count() })
      .from(proposals)
      .where(and(eq(proposals.companyId, companyId), isNotNull(proposals.refundFailedAt), isNull(proposals.refundId))),
    db
      .select({ n: count() })
      .from(jobBalances)
      .where(
        and(eq(jobBalances.companyId, companyId), isNotNull(jobBalances.refundFailedAt), isNull(jobBalances.refundId)),
      ),
  ]);
  return (mail?.n ?? 0) + (refunds?.n ?? 0) + (deposits?.n ?? 0) + (balances?.n ?? 0);
}

export async function listFailedWork(companyId: number) {
  const [mail, refunds, deposits, balances] = await Promise.all([
    db
      .select({
        id: emailOutbox.id,
        to: emailOutbox.toAddress,
        subject: emailOutbox.subject,
        attempts: emailOutbox.attempts,
        lastError: emailOutbox.lastError,
        createdAt: emailOutbox.createdAt,
      })
      .from(emailOutbox)
      .where(and(eq(emailOutbox.companyId, companyId), eq(emailOutbox.status, "failed")))
      .orderBy(desc(emailOutbox.createdAt))
      .limit(100),
    db
      .select({
        id: bookings.id,
        leadId: bookings.leadId,
        customerName: leads.customerName,
        startsAt: bookings.startsAt,
        amountCents: bookings.amountCents,
        attempts: bookings.refundAttempts,
        lastError: bookings.refundLastError,
        failedAt: bookings.refundFailedAt,
      })
      .from(bookings)
      .innerJoin(leads, eq(leads.id, bookings.leadId))
      .where(and(eq(bookings.companyId, companyId), isNotNull(bookings.refundFailedAt), isNull(bookings.refundId)))
      .orderBy(desc(bookings.refundFailedAt))
      .limit(100),
    db
      .select({
        id: proposals.id,
        leadId: proposals.leadId,
        customerName: leads.customerName,
        documentJson: proposals.documentJson,
        amountCents: proposals.depositCents,
        attempts: proposals.refundAttempts,
        lastError: proposals.refundLastError,
        failedAt: proposals.refundFailedAt,
      })
      .from(proposals)
      .innerJoin(leads, eq(leads.id, proposals.leadId))
      .where(and(eq(proposals.companyId, companyId), isNotNull(proposals.refundFailedAt), isNull(proposals.refundId)))
      .orderBy(desc(proposals.refundFailedAt))
      .limit(100),
    db
      .select({
        id: jobBalances.id,
        leadId: jobBalances.leadId,
        customerName: leads.customerName,
        amountCents: jobBalances.amountCents,
        attempts: jobBalances.refundAttempts,
        lastError: jobBalances.refundLastError,
        failedAt: jobBalances.refundFailedAt,
      })
      .from(jobBalances)
      .innerJoin(leads, eq(leads.id, jobBalances.leadId))
      .where(
        and(eq(jobBalances.companyId, companyId), isNotNull(jobBalances.refundFailedAt), isNull(jobBalances.refundId)),
      )
      .orderBy(desc(jobBalances.refundFailedAt))
      .limit(100),
  ]);
  return {
    mail,
    refunds,
    balances,
    deposits: deposits.map(({ documentJson, amountCents, ...row }) => ({
      ...row,
      amountCents: amountCents ?? 0,
      number: parseProposalDocument(documentJson).number,
    })),
  };
}

/** Puts a failed e-mail of the company back in the queue, due now, with its tries reset. */
export async function retryFailedEmail(id: number, companyId: number, now = new Date()): Promise<boolean> {
  const rows = await db
    .update(emailOutbox)
    .set({
      status: "pending",
      attempts: 0,
      sendAfter: now.toISOString(),
      lastError: null,
      leaseOwner: null,
      leaseExpiresAt: null,
    })
    .where(and(eq(emailOutbox.id, id), eq(emailOutbox.companyId, companyId), eq(emailOutbox.status, "failed")))
    .returning({ id: emailOutbox.id });
  return rows.length > 0;
}

export { retryFailedBalanceRefund, retryFailedDepositRefund, retryFailedRefund };
