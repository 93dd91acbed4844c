import { and, asc, desc, eq, inArray, isNotNull, isNull } from "drizzle-orm";
import type Stripe from "stripe";
import {
  companies,
  emailOutbox,
  jobBalances,
  leadEvents,
  leadPhotos,
  leads,
  paymentEvents,
  proposals,
  type Company,
  type JobBalance,
  type Lead,
} from "~/db/schema";
import { balanceDue, contractOf, type Balance } from "~/domain/job-money";
import { BalancePaidEmail, JobCompletedEmail, type BalanceLine } from "~/emails/completion-emails";
import { formatMoney } from "~/lib/format/money";
import { formatZonedDate } from "~/lib/format/zoned-time";
import { WORKER_ID } from "~/lib/jobs/jobs.server";
import {
  noticeCoversRefund,
  sendOwedRefunds,
  tableRefundQueue,
  type RefundQueue,
} from "~/lib/jobs/refund-queue.server";
import { STATUS_LABEL } from "~/lib/leads/lead-status";
import { db, writeTransaction, type Db } from "~/lib/platform/db.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";
import { env } from "~/lib/platform/env.server";
import { CheckoutRefused, openHostedCheckout, stripe as defaultStripe } from "~/lib/platform/payments.server";

/*
 * The balance of a built job, paid through Checkout exactly like the deposit: our own idempotency
 * keys (`balance-checkout:<balanceId>:<attempt>`, `refund:balance:<balanceId>`), every signed webhook
 * applied once (payment_events, same transaction as the effect), the session id, amount and currency
 * checked against what we stored, and states that only move forward. Checkout sessions for balances
 * carry metadata.kind = "balance", which is how the webhook route hands them here.
 */

export const BALANCE_METADATA_KIND = "balance";

type Tx = Parameters<Parameters<typeof writeTransaction>[0]>[0];
type Reader = Db | Tx;

/** Whether a payment event belongs to a job's balance. */
export function isBalanceEvent(event: Stripe.Event): boolean {
  const object = event.data.object as { metadata?: Record<string, string> | null };
  return object.metadata?.kind === BALANCE_METADATA_KIND;
}

/** The public origin for links in e-mails (APP_ORIGIN; development and tests may leave it unset). */
function linkOrigin(): string {
  return env.appOrigin ?? "http://localhost";
}

/**
 * The job's balance from its papers as they stand: the signed proposal (with the add-ons chosen),
 * its signed change orders and the deposit paid. Null when the job has no signed proposal (a job
 * from before proposals were kept online).
 */
export async function balanceFromPapers(
  reader: Reader,
  lead: Pick<Lead, "id" | "companyId">,
): Promise<{ proposalId: number; balance: Balance; depositPaymentIntentId: string | null } | null> {
  const [signed] = await reader
    .select()
    .from(proposals)
    .where(
      and(
        eq(proposals.leadId, lead.id),
        eq(proposals.companyId, lead.companyId),
        eq(proposals.kind, "proposal"),
        eq(proposals.status, "signed"),
      ),
    )
    .orderBy(desc(proposals.signedAt))
    .limit(1);
  if (!signed || signed.totalCents === null) return null;
  const changes = await reader
    .select({ priceCents: proposals.priceCents })
    .from(proposals)
    .where(and(eq(proposals.parentId, signed.id), eq(proposals.kind, "change-order"), eq(proposals.status, "signed")));
  // A deposit refunded (or on its way back) no longer counts as paid, and no credit goes back on its card.
  const depositKept = signed.refundOwedAt === null;
  return {
    proposalId: signed.id,
    depositPaymentIntentId: depositKept ? signed.paymentIntentId : null,
    balance: balanceDue({
      proposalPriceCents: signed.priceCents,
      proposalTotalCents: signed.totalCents,
      changeOrderDeltasCents: changes.map((c) => c.priceCents),
      // A demo or legacy deposit without a recorded payment still counts as paid once the proposal is signed.
      depositPaidCents: depositKept ? (signed.depositCents ?? 0) : 0,
    }),
  };
}

/** The balance's parts in words, for the e-mail and the pages. */
export function balanceLines(parts: Omit<Balance, "contractCents" | "amountCents">): BalanceLine[] {
  const lines: BalanceLine[] = [{ label: "Signed price", amount: formatMoney(parts.proposalPriceCents) }];
  if (parts.addOnsCents) lines.push({ label: "Add-ons you chose", amount: formatMoney(parts.addOnsCents) });
  if (parts.changeOrdersCents)
    lines.push({
      label: "Change orders",
      amount:
        parts.changeOrdersCents > 0
          ? formatMoney(parts.changeOrdersCents)
          : `−${formatMoney(-parts.changeOrdersCents)}`,
    });
  if (parts.depositCents > 0) lines.push({ label: "Deposit paid", amount: `−${formatMoney(parts.depositCents)}` });
  return lines;
}

export type PreparedCompletion = {
  proposalId: number;
  balance: Balance;
  mail: typeof emailOutbox.$inferInsert;
};

/**
 * What of a credit (a balance below zero) goes back to the card that paid the deposit: all of it up
 * to the deposit, when the deposit was paid by card here; null when it was paid some other way (the
 * office pays the credit back by hand).
 */
export function creditRefundCents(amountCents: number, depositCents: number, depositPaymentIntentId: string | null) {
  if (amountCents >= 0 || !depositPaymentIntentId) return null;
  return Math.min(-amountCents, depositCents);
}

/**
 * Works out the balance and renders the completion e-mail ahead of the transaction that marks the
 * job built (rendering is slow; the transaction holds only writes). Null without a signed proposal.
 */
export async function prepareCompletion(lead: Lead, company: Company): Promise<PreparedCompletion | null> {
  const figures = await balanceFromPapers(db, lead);
  if (!figures) return null;
  const { balance } = figures;
  const toCard = creditRefundCents(balance.amountCents, balance.depositCents, figures.depositPaymentIntentId);
  const photos = await db
    .select({ id: leadPhotos.id, originalName: leadPhotos.originalName })
    .from(leadPhotos)
    .where(
      and(eq(leadPhotos.leadId, lead.id), eq(leadPhotos.companyId, lead.companyId), eq(leadPhotos.source, "final")),
    )
    .orderBy(asc(leadPhotos.id));
  const origin = linkOrigin();
  const page = `${origin}/my#balance-${lead.id}`;
  const mail = await prepareOutboxRow({
    idempotencyKey: `job-completed/${lead.id}`,
    companyId: company.id,
    to: lead.email,
    subject:
      balance.amountCents > 0
        ? `Your fire pit is built: balance of ${formatMoney(balance.amountCents)} due`
        : `Your fire pit is built`,
    template: JobCompletedEmail({
      companyName: company.name,
      companyPhone: company.phone || undefined,
      customerName: lead.customerName,
      photoLinks: photos.map((p, i) => ({ href: `${origin}/photos/${p.id}`, label: `Finished pit, photo ${i + 1}` })),
      photosPage: `${origin}/my`,
      balanceLines: balanceLines(balance),
      balanceDue: formatMoney(Math.max(0, balance.amountCents)),
      payLink: balance.amountCents > 0 ? page : null,
      creditNote:
        balance.amountCents >= 0
          ? null
          : toCard === -balance.amountCents
            ? `The change orders left a credit of ${formatMoney(-balance.amountCents)} in your favour: it is being refunded to the card that paid the deposit, and shows on your statement within a few days.`
            : toCard
              ? `The change orders left a credit of ${formatMoney(-balance.amountCents)} in your favour: ${formatMoney(toCard)} is being refunded to the card that paid the deposit, and ${company.name} will pay you the rest.`
              : `The change orders left a credit of ${formatMoney(-balance.amountCents)} in your favour: ${company.name} will pay it back to you.`,
    }),
  });
  return { ...figures, mail };
}

/**
 * Inside the transaction that marks the job built: records the balance (re-worked from the papers in
 * the same transaction; a change signed meanwhile makes it "changed") and queues the e-mail. A job
 * with nothing left to pay is paid in full at once.
 */
export async function openBalanceInTx(
  tx: Tx,
  args: { lead: Pick<Lead, "id" | "companyId">; prepared: PreparedCompletion; actorUserId: number; at: string },
): Promise<"opened" | "paid-in-full" | "changed"> {
  const { lead, prepared, at } = args;
  const now = await balanceFromPapers(tx, lead);
  if (!now || now.proposalId !== prepared.proposalId || now.balance.amountCents !== prepared.balance.amountCents)
    return "changed";
  const { balance } = now;
  const settled = balance.amountCents <= 0;
  const toCard = creditRefundCents(balance.amountCents, balance.depositCents, now.depositPaymentIntentId);
  await tx.insert(jobBalances).values({
    companyId: lead.companyId,
    leadId: lead.id,
    proposalId: now.proposalId,
    proposalPriceCents: balance.proposalPriceCents,
    addOnsCents: balance.addOnsCents,
    changeOrdersCents: balance.changeOrdersCents,
    depositCents: balance.depositCents,
    amountCents: balance.amountCents,
    openedAt: at,
    paidAt: settled ? at : null,
    ...(toCard
      ? {
          refundPaymentIntentId: now.depositPaymentIntentId,
          refundAmountCents: toCard,
          refundOwedAt: at,
          refundReason: `A credit of ${formatMoney(toCard)} left by the change orders goes back to the card that paid the deposit.`,
        }
      : {}),
    createdAt: at,
    updatedAt: at,
  });
  const parts = balanceLines(balance)
    .map((l) => `${l.label} ${l.amount}`)
    .join(", ");
  await tx.insert(leadEvents).values({
    companyId: lead.companyId,
    leadId: lead.id,
    actorUserId: args.actorUserId,
    kind: "balance",
    detail:
      balance.amountCents > 0
        ? `Balance of ${formatMoney(balance.amountCents)} due (${parts}); the homeowner is e-mailed the photos, the balance and care notes.`
        : `Nothing left to pay (${parts})${creditWords(balance.amountCents, toCard)}. ${STATUS_LABEL.built} → ${STATUS_LABEL["paid-in-full"]}.`,
    createdAt: at,
  });
  if (settled)
    await tx
      .update(leads)
      .set({ status: "paid-in-full", updatedAt: at })
      .where(and(eq(leads.id, lead.id), eq(leads.status, "built")));
  await tx.insert(emailOutbox).values(prepared.mail).onConflictDoNothing();
  return settled ? "paid-in-full" : "opened";
}

/** The timeline's words for a credit: what goes back to the card, and what the office pays by hand. */
function creditWords(amountCents: number, toCard: number | null): string {
  if (amountCents >= 0) return "";
  const credit = formatMoney(-amountCents);
  if (!toCard)
    return `: a credit of ${credit} is owed to the homeowner, to pay back by hand (the deposit was not paid by card here)`;
  const rest = -amountCents - toCard;
  return `: a credit of ${credit} is owed to the homeowner; ${formatMoney(toCard)} is being refunded to the deposit's card${rest > 0 ? ` and ${formatMoney(rest)} is to pay back by hand` : ""}`;
}

/** The job's balance row, scoped by company; null before the job is built. */
export async function findJobBalance(lead: Pick<Lead, "id" | "companyId">): Promise<JobBalance | null> {
  const [row] = await db
    .select()
    .from(jobBalances)
    .where(and(eq(jobBalances.leadId, lead.id), eq(jobBalances.companyId, lead.companyId)))
    .limit(1);
  return row ?? null;
}

/** Balances of a homeowner's own leads (the ids passed in must be theirs). */
export function listBalancesFor(leadIds: number[]) {
  if (!leadIds.length) return Promise.resolve([] as JobBalance[]);
  return db.select().from(jobBalances).where(inArray(jobBalances.leadId, leadIds));
}

/**
 * Opens (or reopens) the hosted checkout for a built job's balance; returns its URL. An open session
 * is reused; a new one is made only when the last one expired, under a new attempt key.
 */
export async function startBalanceCheckout(args: {
  balance: JobBalance;
  lead: Lead;
  company: Pick<Company, "id" | "name">;
  client?: Stripe;
  now?: Date;
}): Promise<string> {
  const { balance, lead, company } = args;
  const now = args.now ?? new Date();
  if (balance.paidAt) throw new CheckoutRefused("The balance is paid. Thank you.");
  if (balance.amountCents <= 0) throw new CheckoutRefused("Nothing is owed on this job.");
  const origin = linkOrigin();
  return openHostedCheckout({
    client: args.client ?? defaultStripe,
    stored: { sessionId: balance.checkoutSessionId, attempt: balance.checkoutAttempt },
    paidMessage: "The balance is paid; it shows here in a moment.",
    amountCents: balance.amountCents,
    productName: `Balance on completion: fire pit by ${company.name}`,
    email: lead.email,
    clientReference: `balance-${balance.id}`,
    metadata: (attempt) => ({
      kind: BALANCE_METADATA_KIND,
      balance_id: String(balance.id),
      lead_id: String(lead.id),
      attempt: String(attempt),
    }),
    successUrl: `${origin}/my?paid=${lead.id}#balance-${lead.id}`,
    cancelUrl: `${origin}/my#balance-${lead.id}`,
    idempotencyKey: (attempt) => `balance-checkout:${balance.id}:${attempt}`,
    save: (sessionId, attempt) =>
      db
        .update(jobBalances)
        .set({ checkoutSessionId: sessionId, checkoutAttempt: attempt, updatedAt: now.toISOString() })
        .where(and(eq(jobBalances.id, balance.id), isNull(jobBalances.paidAt))),
  });
}

function balanceIdOf(event: Stripe.Event): number | null {
  const object = event.data.object as { metadata?: Record<string, string> | null };
  const id = Number(object.metadata?.balance_id);
  return Number.isSafeInteger(id) && id > 0 ? id : null;
}

export type BalanceOutcome = "applied" | "duplicate" | "ignored" | "rejected";

/**
 * Applies one verified balance event, once. A completed checkout pays the balance only when its
 * session id, amount and currency are the ones stored; the job moves to "paid in full" with a
 * timeline event and receipts. A second payment of a balance already paid (paid by hand meanwhile)
 * is owed back and refunded by the worker.
 */
export async function applyBalanceEvent(event: Stripe.Event, now = new Date()): Promise<BalanceOutcome> {
  const balanceId = balanceIdOf(event);
  const [context] = balanceId
    ? await db
        .select({ balance: jobBalances, lead: leads, company: companies })
        .from(jobBalances)
        .innerJoin(leads, eq(leads.id, jobBalances.leadId))
        .innerJoin(companies, eq(companies.id, jobBalances.companyId))
        .where(eq(jobBalances.id, balanceId))
        .limit(1)
    : [];
  const at = now.toISOString();
  // Receipts are rendered before the transaction, so it holds only writes.
  const receipts =
    context && event.type === "checkout.session.completed" && !context.balance.paidAt
      ? await receiptEmails(context.balance, context.lead, context.company, at)
      : [];

  return writeTransaction(async (tx) => {
    const recorded = await tx
      .insert(paymentEvents)
      .values({ id: event.id, type: event.type, bookingId: null })
      .onConflictDoNothing()
      .returning({ id: paymentEvents.id });
    if (recorded.length === 0) return "duplicate";
    if (!context) return "ignored";
    const [balance] = await tx.select().from(jobBalances).where(eq(jobBalances.id, context.balance.id));
    if (!balance) return "ignored";

    if (event.type === "checkout.session.completed") {
      const session = event.data.object;
      if (session.payment_status !== "paid") return "ignored";
      if (
        session.id !== balance.checkoutSessionId ||
        session.amount_total !== balance.amountCents ||
        session.currency !== "usd"
      ) {
        console.warn(
          `balance event ${event.id} does not match balance ${balance.id} (session, amount or currency); not applied`,
        );
        // Not applied, so not recorded either: a corrected delivery may still apply.
        throw new MismatchRollback();
      }
      const paymentIntentId =
        typeof session.payment_intent === "string" ? session.payment_intent : (session.payment_intent?.id ?? null);
      if (!balance.paidAt) {
        await tx
          .update(jobBalances)
          .set({ paymentIntentId, paidAt: at, updatedAt: at })
          .where(and(eq(jobBalances.id, balance.id), isNull(jobBalances.paidAt)));
        const moved = await tx
          .update(leads)
          .set({ status: "paid-in-full", updatedAt: at })
          .where(and(eq(leads.id, balance.leadId), eq(leads.status, "built")))
          .returning({ id: leads.id });
        await tx.insert(leadEvents).values({
          companyId: balance.companyId,
          leadId: balance.leadId,
          kind: "balance-paid",
          detail: `Balance of ${formatMoney(balance.amountCents)} paid by card.${moved.length ? ` ${STATUS_LABEL.built} → ${STATUS_LABEL["paid-in-full"]}.` : ""}`,
          createdAt: at,
        });
        if (receipts.length) await tx.insert(emailOutbox).values(receipts).onConflictDoNothing();
        return "applied";
      }
      if (paymentIntentId && paymentIntentId !== balance.paymentIntentId && !balance.refundOwedAt) {
        // Paid twice (the office recorded another payment meanwhile): this one goes back.
        await tx
          .update(jobBalances)
          .set({
            refundPaymentIntentId: paymentIntentId,
            refundOwedAt: at,
            refundReason: "The balance was already paid; this second payment is refunded.",
            updatedAt: at,
          })
          .where(and(eq(jobBalances.id, balance.id), isNull(jobBalances.refundOwedAt)));
        await tx.insert(leadEvents).values({
          companyId: balance.companyId,
          leadId: balance.leadId,
          kind: "balance-refund",
          detail: `A second payment of ${formatMoney(balance.amountCents)} arrived for a balance already paid; it is being refunded.`,
          createdAt: at,
        });
        return "applied";
      }
      return "ignored";
    }
    if (event.type === "checkout.session.expired") return "applied";
    if (event.type === "charge.refunded") {
      const charge = event.data.object;
      const refundedIntent =
        typeof charge.payment_intent === "string" ? charge.payment_intent : (charge.payment_intent?.id ?? null);
      // Only the refund of the second payment settles what is owed: the refund of another payment
      // (the balance's own, from the dashboard) must not mark the owed refund as sent.
      if (!balance.refundOwedAt || refundedIntent !== balance.refundPaymentIntentId) {
        console.warn(
          `balance event ${event.id} refunds a payment balance ${balance.id} does not owe back; not applied`,
        );
        throw new MismatchRollback();
      }
      // A part refunded by hand is not the refund owed: the worker still sends it.
      if (!balance.refundId && noticeCoversRefund(event, charge, balance.refundAmountCents))
        await tx
          .update(jobBalances)
          .set({
            refundId: charge.refunds?.data?.[0]?.id ?? "refunded",
            refundedAt: balance.refundedAt ?? at,
            updatedAt: at,
          })
          .where(and(eq(jobBalances.id, balance.id), isNull(jobBalances.refundId)));
      return "applied";
    }
    return "ignored";
  }).catch((error: unknown) => {
    if (error instanceof MismatchRollback) return "rejected" as const;
    throw error;
  });
}

/** Thrown inside the transaction to undo the event's record when the event does not match. */
class MismatchRollback extends Error {}

async function receiptEmails(balance: JobBalance, lead: Lead, company: Company, at: string) {
  const common = {
    companyName: company.name,
    customerName: lead.customerName,
    amount: formatMoney(balance.amountCents),
    paidOn: formatZonedDate(at, company.timeZone),
    contract: formatMoney(contractOf(balance)),
    pageLink: `${linkOrigin()}/my`,
  };
  return Promise.all([
    prepareOutboxRow({
      idempotencyKey: `balance-paid/${lead.id}`,
      companyId: company.id,
      to: lead.email,
      subject: `Receipt: your fire pit with ${company.name} is paid in full`,
      template: BalancePaidEmail({
        ...common,
        companyPhone: company.phone || undefined,
        recipientName: lead.customerName,
        forCompany: false,
      }),
    }),
    prepareOutboxRow({
      idempotencyKey: `balance-paid-company/${lead.id}`,
      companyId: company.id,
      to: company.email,
      subject: `Paid in full: ${lead.customerName} paid the balance`,
      template: BalancePaidEmail({ ...common, recipientName: company.name, forCompany: true }),
    }),
  ]);
}

/**
 * The owner records a balance paid another way (cheque, bank transfer): the job is paid in full. An
 * open checkout is closed afterwards; if the homeowner pays it anyway, the webhook refunds it.
 */
export async function recordBalancePaidByHand(args: {
  lead: Lead;
  actorUserId: number;
  how: string;
  client?: Stripe;
  now?: Date;
}): Promise<string | null> {
  const at = (args.now ?? new Date()).toISOString();
  const result = await writeTransaction(async (tx) => {
    const [balance] = await tx
      .select()
      .from(jobBalances)
      .where(and(eq(jobBalances.leadId, args.lead.id), eq(jobBalances.companyId, args.lead.companyId)));
    if (!balance) return { error: "This job has no balance yet: it is opened when the job is marked built." };
    const paid = await tx
      .update(jobBalances)
      .set({ paidAt: at, updatedAt: at })
      .where(and(eq(jobBalances.id, balance.id), isNull(jobBalances.paidAt)))
      .returning({ id: jobBalances.id });
    if (!paid.length) {
      // Paid by card while the job was on hold: the job still moves on to "paid in full", once.
      const settled = await tx
        .update(leads)
        .set({ status: "paid-in-full", updatedAt: at })
        .where(and(eq(leads.id, args.lead.id), eq(leads.companyId, args.lead.companyId), eq(leads.status, "built")))
        .returning({ id: leads.id });
      if (!settled.length) return { error: "The balance is already paid." };
      await tx.insert(leadEvents).values({
        companyId: balance.companyId,
        leadId: balance.leadId,
        actorUserId: args.actorUserId,
        kind: "status",
        detail: `The balance of ${formatMoney(balance.amountCents)} was paid already${balance.paymentIntentId ? " by card" : ""}. ${STATUS_LABEL.built} → ${STATUS_LABEL["paid-in-full"]}.`,
        createdAt: at,
      });
      return { sessionId: null };
    }
    const moved = await tx
      .update(leads)
      .set({ status: "paid-in-full", updatedAt: at })
      .where(and(eq(leads.id, args.lead.id), eq(leads.status, "built")))
      .returning({ id: leads.id });
    await tx.insert(leadEvents).values({
      companyId: balance.companyId,
      leadId: balance.leadId,
      actorUserId: args.actorUserId,
      kind: "balance-paid",
      detail: `Balance of ${formatMoney(balance.amountCents)} recorded as paid: ${args.how}.${moved.length ? ` ${STATUS_LABEL.built} → ${STATUS_LABEL["paid-in-full"]}.` : ""}`,
      createdAt: at,
    });
    return { sessionId: balance.checkoutSessionId };
  });
  if ("error" in result) return result.error ?? null;
  if (result.sessionId)
    await (args.client ?? defaultStripe).checkout.sessions.expire(result.sessionId).catch(() => undefined);
  return null;
}

/**
 * Money a built job owes back, refunded through the shared refund worker: a second payment of a paid
 * balance (the whole of it), or the credit the change orders left (that amount of the deposit).
 */
function balanceRefundQueue(database: Db): RefundQueue {
  return tableRefundQueue({
    database,
    table: jobBalances,
    label: "balance",
    idempotencyKey: (id) => `refund:balance:${id}`,
    owed: isNotNull(jobBalances.refundOwedAt),
    paymentIntent: jobBalances.refundPaymentIntentId,
    amount: jobBalances.refundAmountCents,
  });
}

/** Sends the balance refunds owed, each once, keyed `refund:balance:<balanceId>`, under a lease. */
export async function processBalanceRefunds(
  client: Pick<Stripe, "refunds"> = defaultStripe,
  options: { now?: Date; db?: Db; owner?: string } = {},
): Promise<number> {
  return sendOwedRefunds(
    balanceRefundQueue(options.db ?? db),
    client,
    options.owner ?? WORKER_ID,
    options.now ?? new Date(),
  );
}

/** Puts a failed balance refund back in the queue (the owner pressed "Try again"). */
export async function retryFailedBalanceRefund(balanceId: number, companyId: number): Promise<boolean> {
  const rows = await db
    .update(jobBalances)
    .set({ refundFailedAt: null, refundAttempts: 0, refundNextAt: null, refundLastError: null })
    .where(
      and(
        eq(jobBalances.id, balanceId),
        eq(jobBalances.companyId, companyId),
        isNotNull(jobBalances.refundFailedAt),
        isNull(jobBalances.refundId),
      ),
    )
    .returning({ id: jobBalances.id });
  return rows.length > 0;
}

/** The balance as the office reads it on the lead page. */
export function describeBalance(balance: JobBalance, timeZone: string) {
  return {
    lines: balanceLines(balance),
    amount: balance.amountCents >= 0 ? formatMoney(balance.amountCents) : `${formatMoney(-balance.amountCents)} credit`,
    dueSince: formatZonedDate(balance.openedAt, timeZone),
    paidOn: balance.paidAt ? formatZonedDate(balance.paidAt, timeZone) : null,
    how: balance.paidAt ? (balance.paymentIntentId ? "by card" : "recorded by the office") : null,
    refund: balance.refundOwedAt
      ? `${balance.refundReason ?? "A payment is being refunded."}${balance.refundedAt ? " Refunded." : " Refund on its way."}`
      : null,
  };
}
