import { and, eq, inArray, isNotNull, isNull, lte } from "drizzle-orm";
import type Stripe from "stripe";
import {
  companies,
  emailOutbox,
  jobBalances,
  leadEvents,
  leads,
  paymentEvents,
  proposals,
  type Company,
  type Lead,
  type Proposal,
} from "~/db/schema";
import { DepositPaidEmail } from "~/emails/proposal-emails";
import { db, writeTransaction, type Db } from "~/lib/platform/db.server";
import { WORKER_ID } from "~/lib/jobs/jobs.server";
import {
  noticeCoversRefund,
  sendOwedRefunds,
  tableRefundQueue,
  type RefundQueue,
} from "~/lib/jobs/refund-queue.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";
import { settleStageStatements } from "~/lib/leads/job-stage.server";
import { isFinishedJob, STATUS_LABEL } from "~/lib/leads/lead-status";
import { formatMoney } from "~/lib/format/money";
import { CheckoutRefused, openHostedCheckout, stripe as defaultStripe } from "~/lib/platform/payments.server";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";
import { withdrawOpenPapers } from "~/lib/proposals/withdraw-open.server";

/*
 * The deposit on a signed proposal, paid through Checkout like the consult fee: our own idempotency
 * keys (`deposit-checkout:<proposalId>:<attempt>`, `refund:deposit:<proposalId>`), every signed
 * webhook applied once (payment_events), the session id, amount and currency checked against what
 * we stored, and states that only move forward. Checkout sessions for deposits carry
 * metadata.kind = "deposit", which is how the webhook route hands them here.
 */

export const DEPOSIT_METADATA_KIND = "deposit";

/** Whether a payment event belongs to a proposal's deposit. */
export function isDepositEvent(event: Stripe.Event): boolean {
  const object = event.data.object as { metadata?: Record<string, string> | null };
  return object.metadata?.kind === DEPOSIT_METADATA_KIND;
}

/**
 * Opens (or reopens) the hosted checkout for an accepted proposal's deposit; returns its URL. An
 * open session is reused; a new one is made only when the last one expired, under a new attempt key.
 */
export async function startDepositCheckout(args: {
  proposal: Proposal;
  lead: Lead;
  company: Company;
  origin: string;
  client?: Stripe;
  now?: Date;
}): Promise<string> {
  const { proposal, lead, company, origin } = args;
  const now = args.now ?? new Date();
  const depositCents = proposal.depositCents;
  if (proposal.status !== "accepted" || depositCents === null)
    throw new CheckoutRefused("This proposal has no deposit to pay.");
  if (now.toISOString() >= proposal.expiresAt)
    throw new CheckoutRefused("This proposal has expired: ask the contractor for a new one.");
  if (lead.status === "not-going-ahead")
    throw new CheckoutRefused(
      `${company.name} has marked this job as not going ahead: ask them before paying anything.`,
    );
  const document = parseProposalDocument(proposal.documentJson);
  return openHostedCheckout({
    client: args.client ?? defaultStripe,
    stored: { sessionId: proposal.checkoutSessionId, attempt: proposal.checkoutAttempt },
    paidMessage: "The deposit is paid; it shows here in a moment.",
    amountCents: depositCents,
    productName: `Deposit: ${document.number}, fire pit by ${company.name}`,
    email: lead.email,
    clientReference: `proposal-${proposal.id}`,
    metadata: () => ({ kind: DEPOSIT_METADATA_KIND, proposal_id: String(proposal.id), lead_id: String(lead.id) }),
    successUrl: `${origin}/p/${proposal.token}?paid=1`,
    cancelUrl: `${origin}/p/${proposal.token}?left=1`,
    idempotencyKey: (attempt) => `deposit-checkout:${proposal.id}:${attempt}`,
    save: (sessionId, attempt) =>
      db
        .update(proposals)
        .set({ checkoutSessionId: sessionId, checkoutAttempt: attempt, updatedAt: now.toISOString() })
        .where(and(eq(proposals.id, proposal.id), eq(proposals.status, "accepted"))),
  });
}

function proposalIdOf(event: Stripe.Event): number | null {
  const object = event.data.object as { metadata?: Record<string, string> | null };
  const id = Number(object.metadata?.proposal_id);
  return Number.isSafeInteger(id) && id > 0 ? id : null;
}

export type DepositOutcome = "applied" | "duplicate" | "ignored" | "mismatch";

/**
 * Applies one verified deposit event, once. A completed checkout signs the job only when its
 * session id, amount and currency are the ones stored for an accepted proposal; a payment that
 * arrives after the proposal expired or was withdrawn is owed back and refunded by the worker.
 */
export async function applyDepositEvent(event: Stripe.Event, now = new Date()): Promise<DepositOutcome> {
  const proposalId = proposalIdOf(event);
  const [context] = proposalId
    ? await db
        .select({ proposal: proposals, lead: leads, company: companies })
        .from(proposals)
        .innerJoin(leads, eq(leads.id, proposals.leadId))
        .innerJoin(companies, eq(companies.id, proposals.companyId))
        .where(eq(proposals.id, proposalId))
        .limit(1)
    : [];
  // E-mails are rendered before the transaction, so it holds only writes.
  const paidMails =
    context &&
    event.type === "checkout.session.completed" &&
    context.proposal.depositCents !== null &&
    context.proposal.totalCents !== null
      ? await depositPaidEmails(context.proposal, context.lead, context.company)
      : [];
  const at = now.toISOString();

  // A mismatched event is rolled back whole, so it is not recorded as applied (and a correct one with
  // the same id could still be applied).
  try {
    return await writeTransaction(async (tx): Promise<DepositOutcome> => {
      const recorded = await tx
        .insert(paymentEvents)
        .values({ id: event.id, type: event.type, bookingId: null })
        .onConflictDoNothing()
        .returning({ id: paymentEvents.id });
      if (recorded.length === 0) return "duplicate";
      if (!context) return "ignored";
      const [proposal] = await tx.select().from(proposals).where(eq(proposals.id, context.proposal.id));
      if (!proposal) return "ignored";
      const document = parseProposalDocument(proposal.documentJson);

      if (event.type === "checkout.session.completed") {
        const session = event.data.object;
        if (session.payment_status !== "paid") return "ignored";
        if (
          session.id !== proposal.checkoutSessionId ||
          session.amount_total !== proposal.depositCents ||
          session.currency !== "usd"
        ) {
          console.error(
            `deposit event ${event.id} does not match proposal ${proposal.id} (session, amount or currency); not applied`,
          );
          throw new DepositMismatch();
        }
        const paymentIntentId =
          typeof session.payment_intent === "string" ? session.payment_intent : (session.payment_intent?.id ?? null);
        const [stage] =
          proposal.status === "accepted"
            ? await tx.select({ status: leads.status }).from(leads).where(eq(leads.id, proposal.leadId))
            : [];
        if (stage?.status === "not-going-ahead") {
          // Paid on a job stopped meanwhile: the proposal is off the table and the money goes back.
          await tx
            .update(proposals)
            .set({
              status: "withdrawn",
              withdrawnAt: at,
              withdrawReason: "The job is not going ahead.",
              paymentIntentId,
              refundOwedAt: at,
              refundReason: "The deposit arrived after the job was marked not going ahead.",
              updatedAt: at,
            })
            .where(and(eq(proposals.id, proposal.id), eq(proposals.status, "accepted")));
          await tx.insert(leadEvents).values({
            companyId: proposal.companyId,
            leadId: proposal.leadId,
            kind: "deposit-refund",
            detail: `A deposit arrived on ${document.number} after the job was marked not going ahead; it is being refunded.`,
            createdAt: at,
          });
          return "applied";
        }
        if (proposal.status === "accepted") {
          await tx
            .update(proposals)
            .set({ status: "signed", paymentIntentId, depositPaidAt: at, updatedAt: at })
            .where(and(eq(proposals.id, proposal.id), eq(proposals.status, "accepted")));
          const moved = await tx
            .update(leads)
            .set({ status: "signed", stopReason: null, pausedStage: null, updatedAt: at })
            .where(
              and(
                eq(leads.id, proposal.leadId),
                inArray(leads.status, [
                  "request",
                  "called-back",
                  "consult-booked",
                  "measured",
                  "proposal-out",
                  "on-hold",
                ]),
              ),
            )
            .returning({ id: leads.id });
          await tx.insert(leadEvents).values({
            companyId: proposal.companyId,
            leadId: proposal.leadId,
            kind: "deposit-paid",
            detail: `Deposit of ${formatMoney(proposal.depositCents!)} paid on ${document.number}.${moved.length ? ` ${STATUS_LABEL["proposal-out"]} → ${STATUS_LABEL.signed}.` : ""}`,
            createdAt: at,
          });
          if (paidMails.length) await tx.insert(emailOutbox).values(paidMails).onConflictDoNothing();
          return "applied";
        }
        if (proposal.status === "expired" || proposal.status === "withdrawn") {
          // Paid for a proposal no longer open: the money goes back, and the timeline says why.
          await tx
            .update(proposals)
            .set({
              paymentIntentId,
              refundOwedAt: at,
              refundReason: `The deposit arrived after the proposal was ${proposal.status}.`,
              updatedAt: at,
            })
            .where(and(eq(proposals.id, proposal.id), isNull(proposals.refundOwedAt)));
          await tx.insert(leadEvents).values({
            companyId: proposal.companyId,
            leadId: proposal.leadId,
            kind: "deposit-refund",
            detail: `A deposit arrived after ${document.number} was ${proposal.status}; it is being refunded.`,
            createdAt: at,
          });
          return "applied";
        }
        return "ignored";
      }
      if (event.type === "checkout.session.expired") {
        // Forward only: an expired session leaves an accepted proposal accepted; the homeowner can pay again.
        return "applied";
      }
      if (event.type === "charge.refunded") {
        const charge = event.data.object;
        const refundedIntent =
          typeof charge.payment_intent === "string" ? charge.payment_intent : (charge.payment_intent?.id ?? null);
        // Only a refund of the deposit's own payment can settle anything here.
        if (!refundedIntent || refundedIntent !== proposal.paymentIntentId) {
          console.warn(`deposit event ${event.id} refunds a payment proposal ${proposal.id} did not take; not applied`);
          throw new DepositMismatch();
        }
        const noticeRefundId = charge.refunds?.data?.[0]?.id ?? "refunded";
        // A built job's credit goes back on the deposit's payment: the balance owes that refund (never
        // beside a deposit refund: a built job's deposit is not refunded on its own), and the notice
        // confirms it once the card carries at least the credit back.
        const [credit] = await tx
          .select({ id: jobBalances.id, refundId: jobBalances.refundId, amountCents: jobBalances.refundAmountCents })
          .from(jobBalances)
          .where(
            and(
              eq(jobBalances.proposalId, proposal.id),
              eq(jobBalances.refundPaymentIntentId, refundedIntent),
              isNotNull(jobBalances.refundOwedAt),
            ),
          );
        if (credit) {
          if (!credit.refundId && noticeCoversRefund(event, charge, credit.amountCents))
            await tx
              .update(jobBalances)
              .set({ refundId: noticeRefundId, refundedAt: at, updatedAt: at })
              .where(and(eq(jobBalances.id, credit.id), isNull(jobBalances.refundId)));
          return "applied";
        }
        if (!proposal.refundOwedAt) {
          console.warn(
            `deposit event ${event.id} refunds a deposit proposal ${proposal.id} does not owe back; not applied`,
          );
          throw new DepositMismatch();
        }
        if (!proposal.refundId && noticeCoversRefund(event, charge, null))
          await tx
            .update(proposals)
            .set({ refundId: noticeRefundId, refundedAt: proposal.refundedAt ?? at, updatedAt: at })
            .where(and(eq(proposals.id, proposal.id), isNull(proposals.refundId)));
        return "applied";
      }
      return "ignored";
    });
  } catch (error) {
    if (error instanceof DepositMismatch) return "mismatch";
    throw error;
  }
}

class DepositMismatch extends Error {}

async function depositPaidEmails(proposal: Proposal, lead: Lead, company: Company) {
  const document = parseProposalDocument(proposal.documentJson);
  const common = {
    companyName: company.name,
    customerName: lead.customerName,
    number: document.number,
    depositText: formatMoney(proposal.depositCents!),
    balanceText: formatMoney(proposal.totalCents! - proposal.depositCents!),
  };
  return Promise.all([
    prepareOutboxRow({
      idempotencyKey: `deposit-paid/${proposal.id}`,
      companyId: company.id,
      to: lead.email,
      subject: `Deposit received: your fire pit with ${company.name} is booked`,
      template: DepositPaidEmail({ ...common, recipientName: lead.customerName, forCompany: false }),
    }),
    prepareOutboxRow({
      idempotencyKey: `deposit-paid-company/${proposal.id}`,
      companyId: company.id,
      to: company.email,
      subject: `Signed: ${lead.customerName} paid the deposit`,
      template: DepositPaidEmail({ ...common, recipientName: company.name, forCompany: true }),
    }),
  ]);
}

/**
 * The owner refunds a paid deposit, with a reason: the refund is owed at once and sent by the worker;
 * the job stops as "not going ahead" with that reason.
 */
export async function requestDepositRefund(args: {
  actorUserId: number;
  lead: Lead;
  proposalId: number;
  reason: string;
  now?: Date;
}): Promise<string | null> {
  const { reason } = args;
  const at = (args.now ?? new Date()).toISOString();
  // One write transaction: a job marked built meanwhile (its balance counts this deposit) or a second
  // refund of the same deposit sees the other's writes and is refused.
  return writeTransaction(async (tx) => {
    const [lead] = await tx
      .select()
      .from(leads)
      .where(and(eq(leads.id, args.lead.id), eq(leads.companyId, args.lead.companyId)));
    const [proposal] = await tx
      .select()
      .from(proposals)
      .where(
        and(
          eq(proposals.id, args.proposalId),
          eq(proposals.leadId, args.lead.id),
          eq(proposals.companyId, args.lead.companyId),
        ),
      )
      .limit(1);
    if (!lead || !proposal || proposal.kind !== "proposal") return "That proposal is not one of this job's.";
    if (proposal.status !== "signed" || !proposal.paymentIntentId)
      return "Only a deposit paid through the payment service can be refunded here.";
    if (proposal.refundOwedAt) return "That deposit is already being refunded.";
    const [balance] = await tx
      .select({ id: jobBalances.id })
      .from(jobBalances)
      .where(eq(jobBalances.leadId, lead.id))
      .limit(1);
    if (balance || isFinishedJob(lead))
      return "The job is built: its balance counts this deposit, so the deposit is not refunded on its own. A credit goes back through the balance.";
    const document = parseProposalDocument(proposal.documentJson);
    await tx
      .update(proposals)
      .set({ refundOwedAt: at, refundReason: reason, updatedAt: at })
      .where(and(eq(proposals.id, proposal.id), isNull(proposals.refundOwedAt)));
    await tx
      .update(leads)
      .set({
        status: "not-going-ahead",
        stopReason: reason,
        pausedStage: lead.status === "on-hold" ? lead.pausedStage : lead.status,
        updatedAt: at,
      })
      .where(and(eq(leads.id, lead.id), eq(leads.companyId, lead.companyId)));
    await tx.insert(leadEvents).values({
      companyId: lead.companyId,
      leadId: lead.id,
      actorUserId: args.actorUserId,
      kind: "deposit-refund",
      detail: `Deposit of ${formatMoney(proposal.depositCents ?? 0)} on ${document.number} refunded: ${reason}. ${STATUS_LABEL[lead.status]} → ${STATUS_LABEL["not-going-ahead"]}.`,
      createdAt: at,
    });
    // The job stops here: a change order still out can no longer be signed.
    await withdrawOpenPapers(tx, {
      lead,
      actorUserId: args.actorUserId,
      at,
      reason: `The deposit was refunded: ${reason}`,
      because: "the deposit was refunded.",
      changeOrdersOnly: true,
    });
    return null;
  });
}

/** Deposits the owner refunded (or paid too late), refunded through the shared refund worker. */
function depositRefundQueue(database: Db): RefundQueue {
  return tableRefundQueue({
    database,
    table: proposals,
    label: "deposit of proposal",
    idempotencyKey: (id) => `refund:deposit:${id}`,
    owed: isNotNull(proposals.refundOwedAt),
    paymentIntent: proposals.paymentIntentId,
  });
}

/**
 * Sends the deposit refunds owed, each once, keyed `refund:deposit:<proposalId>`, under a lease so two
 * processes never send the same one; retried with backoff, failed rows shown to the owner.
 */
export async function processDepositRefunds(
  client: Pick<Stripe, "refunds"> = defaultStripe,
  options: { now?: Date; db?: Db; owner?: string } = {},
): Promise<number> {
  return sendOwedRefunds(
    depositRefundQueue(options.db ?? db),
    client,
    options.owner ?? WORKER_ID,
    options.now ?? new Date(),
  );
}

/** Puts a failed deposit refund back in the queue (the owner pressed "Try again"). */
export async function retryFailedDepositRefund(proposalId: number, companyId: number): Promise<boolean> {
  const rows = await db
    .update(proposals)
    .set({ refundFailedAt: null, refundAttempts: 0, refundNextAt: null, refundLastError: null })
    .where(
      and(
        eq(proposals.id, proposalId),
        eq(proposals.companyId, companyId),
        isNotNull(proposals.refundFailedAt),
        isNull(proposals.refundId),
      ),
    )
    .returning({ id: proposals.id });
  return rows.length > 0;
}

/**
 * Expires proposals and change orders past their date that were not signed (an accepted one whose
 * deposit never came included); the job's stage falls back to what is still true. An open deposit
 * checkout is closed afterwards, outside the transaction.
 */
export async function expireProposals(now = new Date(), client: Stripe = defaultStripe): Promise<number> {
  const at = now.toISOString();
  const due = await db
    .select()
    .from(proposals)
    .where(and(inArray(proposals.status, ["sent", "accepted"]), lte(proposals.expiresAt, at)))
    .limit(50);
  let count = 0;
  for (const proposal of due) {
    const document = parseProposalDocument(proposal.documentJson);
    // The event and the stage follow only the process whose update moved the proposal.
    const changed = await writeTransaction(async (tx) => {
      const moved = await tx
        .update(proposals)
        .set({ status: "expired", updatedAt: at })
        .where(and(eq(proposals.id, proposal.id), inArray(proposals.status, ["sent", "accepted"])))
        .returning({ id: proposals.id });
      if (moved.length === 0) return false;
      await tx.insert(leadEvents).values({
        companyId: proposal.companyId,
        leadId: proposal.leadId,
        kind: "proposal-expired",
        detail: `${document.number} expired unsigned${proposal.status === "accepted" ? " (signed, but the deposit never came)" : ""}.`,
        createdAt: at,
      });
      if (proposal.kind === "proposal")
        for (const statement of settleStageStatements({ leadId: proposal.leadId, from: ["proposal-out"], at, tx }))
          await statement;
      return true;
    });
    if (!changed) continue;
    count += 1;
    if (proposal.checkoutSessionId)
      await client.checkout.sessions.expire(proposal.checkoutSessionId).catch(() => undefined);
  }
  return count;
}
