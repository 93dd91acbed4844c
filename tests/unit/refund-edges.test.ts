/*
 * The edges of money going back: which refund notice settles which refund owed, the deposit refund's
 * guards, the balance's own edges (exactly zero, papers changed meanwhile, unsigned changes), and the
 * refund worker's lease, due time and "already refunded" answer. Figures worked by hand: $4,850
 * signed with no add-ons, a 30 % deposit of $1,455 paid by card, $3,395 due once built.
 */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq, isNotNull } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, beforeAll, expect, test } from "vitest";
import { jobBalances, leadEvents, leads, paymentEvents, proposals, users } from "~/db/schema";
import { countFailedWork } from "~/lib/jobs/attention.server";
import { openBalanceInTx, prepareCompletion, processBalanceRefunds } from "~/lib/builds/job-balance.server";
import { markJobBuilt } from "~/lib/builds/mark-built.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { LEASE_MS } from "~/lib/jobs/jobs.server";
import { REFUND_BACKOFF, sendOwedRefunds, tableRefundQueue } from "~/lib/jobs/refund-queue.server";
import { db, writeTransaction } from "~/lib/platform/db.server";
import { createStripe } from "~/lib/platform/payments.server";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";
import {
  processDepositRefunds,
  requestDepositRefund,
  startDepositCheckout,
} from "~/lib/proposals/proposal-payments.server";
import { acceptProposal } from "~/lib/proposals/proposal-signing.server";
import { startPaymentsFake, type PaymentsFake } from "../../fakes/payments/server";
import { deliverSigned, fakeEvents, fakeRefundsOf, newestRefundNotice } from "./support/payments";
import { officeUser, sentProposal } from "./support/proposals";

let fake: PaymentsFake;
let client: Stripe;
beforeAll(async () => {
  fake = await startPaymentsFake({
    port: 0,
    webhookUrl: null,
    stateFile: path.join(mkdtempSync(path.join(tmpdir(), "ew-refund-edges-")), "state.json"),
    log: () => {},
  });
  client = createStripe(fake.url);
});
afterAll(() => fake.close());

let seq = 0;

const deliver = async (event: unknown) => (await deliverSigned(event)).outcome;
const fakeEventsOf = (type: string) => fakeEvents(fake.url, type);
const refundsOn = async (paymentIntent: string) => (await fakeRefundsOf(fake.url, paymentIntent)).map((r) => r.amount);
const newestNotice = (paymentIntent: string) => newestRefundNotice(fake.url, paymentIntent);
const proposalOf = async (id: number) => (await db.select().from(proposals).where(eq(proposals.id, id)))[0]!;
const balanceOf = async (leadId: number) =>
  (await db.select().from(jobBalances).where(eq(jobBalances.leadId, leadId)))[0];
const leadOf = async (id: number) => (await db.select().from(leads).where(eq(leads.id, id)))[0]!;
async function crewOf(companyId: number) {
  const [crew] = await db
    .select()
    .from(users)
    .where(and(eq(users.companyId, companyId), eq(users.role, "crew")))
    .limit(1);
  return crew!;
}

/** A job at "build booked" whose $1,455 deposit was paid by card on the payments fake. */
async function cardDepositJob() {
  const sent = await sentProposal();
  const accepted = await acceptProposal({
    proposal: sent.proposal,
    lead: sent.lead,
    document: parseProposalDocument(sent.proposal.documentJson),
    input: { name: sent.lead.customerName, ip: "203.0.113.9", userAgent: "test", chosenKeys: [] },
  });
  if (!accepted.ok) throw new Error(accepted.message);
  await startDepositCheckout({
    proposal: accepted.proposal,
    lead: sent.lead,
    company: sent.company,
    origin: "http://localhost",
    client,
  });
  const withSession = await proposalOf(sent.proposal.id);
  await fetch(`${fake.url}/_fake/sessions/${withSession.checkoutSessionId}/pay`, {
    method: "POST",
    body: JSON.stringify({ card: "4242424242424242" }),
    headers: { "Content-Type": "application/json" },
  });
  const paid = (await fakeEventsOf("checkout.session.completed")).find(
    (e) => e.data.object.id === withSession.checkoutSessionId,
  )!;
  expect(await deliver(paid)).toBe("applied");
  await db.update(leads).set({ status: "build-booked" }).where(eq(leads.id, sent.lead.id));
  const proposal = await proposalOf(sent.proposal.id);
  expect([proposal.priceCents, proposal.depositCents]).toEqual([485_000, 145_500]);
  return { lead: await leadOf(sent.lead.id), proposal, company: sent.company, intent: proposal.paymentIntentId! };
}

/** A change order on the job in the given state. */
async function change(
  proposal: typeof proposals.$inferSelect,
  deltaCents: number,
  status: "signed" | "sent" | "withdrawn",
) {
  seq += 1;
  await db.insert(proposals).values({
    ...proposal,
    id: undefined,
    token: `edge-co-${proposal.id}-${seq}`,
    kind: "change-order",
    parentId: proposal.id,
    priceCents: deltaCents,
    status,
    checkoutSessionId: null,
    paymentIntentId: null,
    signedAt: status === "signed" ? new Date().toISOString() : null,
  });
}

async function built(job: Awaited<ReturnType<typeof cardDepositJob>>) {
  const crew = await crewOf(job.lead.companyId);
  return markJobBuilt({ companyId: job.lead.companyId, leadId: job.lead.id, actorUserId: crew.id });
}

test("a balance of exactly nothing ($4,850 − $3,395 − $1,455 = $0) is paid in full at once, with nothing to refund", async () => {
  const job = await cardDepositJob();
  await change(job.proposal, -339_500, "signed");
  expect(await built(job)).toMatchObject({ ok: true });
  const balance = (await balanceOf(job.lead.id))!;
  expect(balance).toMatchObject({ amountCents: 0, refundOwedAt: null, refundAmountCents: null });
  expect(balance.paidAt).not.toBeNull();
  expect((await leadOf(job.lead.id)).status).toBe("paid-in-full");
});

test("only signed change orders count: one still out (+$380) and one withdrawn (−$500) leave the $3,395 as it was", async () => {
  const job = await cardDepositJob();
  await change(job.proposal, 38_000, "sent");
  await change(job.proposal, -50_000, "withdrawn");
  expect(await built(job)).toMatchObject({ ok: true });
  expect(await balanceOf(job.lead.id)).toMatchObject({ amountCents: 339_500, changeOrdersCents: 0 });
});

test("papers signed between working out the balance and opening it: the balance is not opened on the old figure", async () => {
  const job = await cardDepositJob();
  const prepared = (await prepareCompletion(job.lead, await getCompany(job.lead.companyId)))!;
  expect(prepared.balance.amountCents).toBe(339_500);
  await change(job.proposal, 38_000, "signed");
  const crew = await crewOf(job.lead.companyId);
  const outcome = await writeTransaction((tx) =>
    openBalanceInTx(tx, { lead: job.lead, prepared, actorUserId: crew.id, at: new Date().toISOString() }),
  );
  expect(outcome).toBe("changed");
  expect(await balanceOf(job.lead.id)).toBeUndefined();
});

test("the balance's own payment notified twice (two event ids, one payment) is not taken for a second payment: nothing is refunded", async () => {
  const job = await cardDepositJob();
  expect(await built(job)).toMatchObject({ ok: true });
  await db
    .update(jobBalances)
    .set({ checkoutSessionId: `cs_edge_${job.lead.id}`, checkoutAttempt: 1 })
    .where(eq(jobBalances.leadId, job.lead.id));
  const balance = (await balanceOf(job.lead.id))!;
  const completed = () => {
    seq += 1;
    return {
      id: `evt_edge_${Date.now()}_${seq}`,
      object: "event",
      type: "checkout.session.completed",
      created: Math.floor(Date.now() / 1000),
      data: {
        object: {
          id: balance.checkoutSessionId,
          object: "checkout.session",
          payment_status: "paid",
          status: "complete",
          amount_total: balance.amountCents,
          currency: "usd",
          payment_intent: `pi_edge_once_${balance.id}`,
          metadata: { kind: "balance", balance_id: String(balance.id), lead_id: String(balance.leadId) },
        },
      },
    };
  };
  expect(await deliver(completed())).toBe("applied");
  await deliver(completed());
  expect(await balanceOf(job.lead.id)).toMatchObject({ refundOwedAt: null, refundPaymentIntentId: null });
  expect((await balanceOf(job.lead.id))!.paidAt).not.toBeNull();
});

test("a deposit refunded in full from the dashboard, with no refund asked for, settles nothing: not the deposit, not a balance refund owed on another payment", async () => {
  const job = await cardDepositJob();
  expect(await built(job)).toMatchObject({ ok: true });
  // The balance owes a refund of a late second payment (pi_late), not of the deposit.
  await db
    .update(jobBalances)
    .set({ refundPaymentIntentId: `pi_late_${job.lead.id}`, refundOwedAt: new Date().toISOString() })
    .where(eq(jobBalances.leadId, job.lead.id));
  await client.refunds.create({ payment_intent: job.intent });
  const notice = await newestNotice(job.intent);
  expect(await deliver(notice)).toBe("mismatch");
  expect((await proposalOf(job.proposal.id)).refundId).toBeNull();
  expect((await balanceOf(job.lead.id))!.refundId).toBeNull();
  expect(await db.select().from(paymentEvents).where(eq(paymentEvents.id, notice.id))).toEqual([]);
});

test("a deposit refund owed: a part refunded by hand does not settle it, a notice naming another payment does not either, and the worker sends the rest", async () => {
  const job = await cardDepositJob();
  const owner = await officeUser(job.lead.companyId, "owner");
  expect(
    await requestDepositRefund({
      actorUserId: owner.id,
      lead: job.lead,
      proposalId: job.proposal.id,
      reason: "moving",
    }),
  ).toBeNull();
  // A second request: refused, one timeline line, the step it stopped at kept.
  expect(
    await requestDepositRefund({
      actorUserId: owner.id,
      lead: await leadOf(job.lead.id),
      proposalId: job.proposal.id,
      reason: "again",
    }),
  ).toBe("That deposit is already being refunded.");
  const lines = await db
    .select()
    .from(leadEvents)
    .where(and(eq(leadEvents.leadId, job.lead.id), eq(leadEvents.kind, "deposit-refund")));
  expect(lines).toHaveLength(1);
  expect((await leadOf(job.lead.id)).pausedStage).toBe("build-booked");

  // $500 of the $1,455 back by hand, its notice before any worker pass.
  await client.refunds.create({ payment_intent: job.intent, amount: 50_000 });
  expect(await deliver(await newestNotice(job.intent))).toBe("applied");
  expect((await proposalOf(job.proposal.id)).refundId).toBeNull();
  // A notice for this deposit naming someone else's payment, refunded in full: not applied.
  const forged = await newestNotice(job.intent);
  seq += 1;
  const other = {
    ...forged,
    id: `evt_edge_other_${seq}`,
    data: { object: { ...forged.data.object, payment_intent: "pi_someone_else", amount_refunded: 145_500 } },
  };
  expect(await deliver(other)).toBe("mismatch");
  expect((await proposalOf(job.proposal.id)).refundId).toBeNull();
  // The worker sends what is left: $955.
  await processDepositRefunds(client);
  expect((await refundsOn(job.intent)).sort((a, b) => a - b)).toEqual([50_000, 95_500]);
});

test("a job built and then stopped keeps its deposit: its balance counts it", async () => {
  const job = await cardDepositJob();
  expect(await built(job)).toMatchObject({ ok: true });
  await db
    .update(leads)
    .set({ status: "not-going-ahead", pausedStage: "built", stopReason: "dispute" })
    .where(eq(leads.id, job.lead.id));
  const owner = await officeUser(job.lead.companyId, "owner");
  expect(
    await requestDepositRefund({
      actorUserId: owner.id,
      lead: await leadOf(job.lead.id),
      proposalId: job.proposal.id,
      reason: "dispute",
    }),
  ).toMatch(/^The job is built/);
  expect((await proposalOf(job.proposal.id)).refundOwedAt).toBeNull();
});

/** The deposit refund queue as the worker builds it, for driving the worker's steps by hand. */
const depositQueue = () =>
  tableRefundQueue({
    database: db,
    table: proposals,
    label: "deposit of proposal",
    idempotencyKey: (id) => `refund:deposit:edge:${id}`,
    owed: isNotNull(proposals.refundOwedAt),
    paymentIntent: proposals.paymentIntentId,
  });

/** A proposal owing its deposit back, with the worker's bookkeeping clear. */
async function owedDeposit() {
  const job = await cardDepositJob();
  await db
    .update(proposals)
    .set({ refundOwedAt: new Date().toISOString(), refundReason: "edge" })
    .where(eq(proposals.id, job.proposal.id));
  return job;
}

test("a worker whose lease lapsed cannot write over the one that took the refund over", async () => {
  const job = await owedDeposit();
  const queue = depositQueue();
  const t = new Date(Date.now() + 3_600_000);
  const first = await queue.claim("worker-a", t);
  expect(first.map((r) => r.id)).toContain(job.proposal.id);
  const later = new Date(t.getTime() + LEASE_MS + 1_000);
  expect((await queue.claim("worker-b", later)).map((r) => r.id)).toContain(job.proposal.id);
  const done = {
    refundedAt: later.toISOString(),
    refundLastError: null,
    refundLeaseOwner: null,
    refundLeaseExpiresAt: null,
  } as const;
  await queue.settle(job.proposal.id, "worker-a", { ...done, refundId: "re_lapsed" });
  expect((await proposalOf(job.proposal.id)).refundId).toBeNull();
  await queue.settle(job.proposal.id, "worker-b", { ...done, refundId: "re_current" });
  expect((await proposalOf(job.proposal.id)).refundId).toBe("re_current");
});

test("a refund the service says is already made is settled, not failed: the owner is not asked to act", async () => {
  const job = await owedDeposit();
  const before = await countFailedWork(job.lead.companyId);
  const refusing = {
    refunds: {
      create: () =>
        Promise.reject(
          Object.assign(new Error("Charge has already been refunded."), {
            statusCode: 400,
            code: "charge_already_refunded",
          }),
        ),
    },
  } as unknown as Pick<Stripe, "refunds">;
  await sendOwedRefunds(depositQueue(), refusing, "worker-a", new Date(Date.now() + 7_200_000));
  expect(await proposalOf(job.proposal.id)).toMatchObject({
    refundId: "already-refunded",
    refundFailedAt: null,
    refundLastError: null,
  });
  expect(await countFailedWork(job.lead.companyId)).toBe(before);
});

test("a failed refund is tried again exactly when its wait is over, not a millisecond before", async () => {
  const job = await owedDeposit();
  // Only this proposal's calls are counted (other tests' rows share the table).
  let tries = 0;
  const failing = {
    refunds: {
      create: (params: { payment_intent?: string }) => {
        if (params.payment_intent === job.intent) tries += 1;
        return Promise.reject(Object.assign(new Error("busy"), { statusCode: 503, code: "busy" }));
      },
    },
  } as unknown as Pick<Stripe, "refunds">;
  const t = new Date(Date.now() + 10_800_000);
  await sendOwedRefunds(depositQueue(), failing, "worker-a", t);
  expect(tries).toBe(1);
  const wait = REFUND_BACKOFF.baseMs;
  expect((await proposalOf(job.proposal.id)).refundNextAt).toBe(new Date(t.getTime() + wait).toISOString());
  await sendOwedRefunds(depositQueue(), failing, "worker-a", new Date(t.getTime() + wait - 1));
  expect(tries).toBe(1);
  await sendOwedRefunds(depositQueue(), failing, "worker-a", new Date(t.getTime() + wait));
  expect(tries).toBe(2);
  expect((await proposalOf(job.proposal.id)).refundAttempts).toBe(2);
});

test("a balance refund owed is not sent by the deposit worker, and the balance worker sends it once", async () => {
  // Guard for the two queues sharing one payment service: each refunds only its own rows.
  const job = await cardDepositJob();
  await change(job.proposal, -350_000, "signed");
  expect(await built(job)).toMatchObject({ ok: true });
  await processDepositRefunds(client);
  expect(await refundsOn(job.intent)).toEqual([]);
  await processBalanceRefunds(client);
  await processBalanceRefunds(client);
  // $4,850 − $3,500 − $1,455 = −$105: $105 back on the deposit's card.
  expect(await refundsOn(job.intent)).toEqual([10_500]);
});

test("a credit owed is settled by a notice of a refund of that much, not by refunds made by hand before it, nor by a smaller one after", async () => {
  // $4,850 − $3,500 − $1,455 = −$105 owed back on the deposit's card.
  const job = await cardDepositJob();
  // $200 back by hand before the build (its notice does not match anything owed then).
  await client.refunds.create({ payment_intent: job.intent, amount: 20_000 });
  expect(await deliver(await newestNotice(job.intent))).toBe("mismatch");
  await change(job.proposal, -350_000, "signed");
  expect(await built(job)).toMatchObject({ ok: true });
  expect(await balanceOf(job.lead.id)).toMatchObject({ refundAmountCents: 10_500, refundId: null });
  // $50 more by hand: the charge now shows $250 back, more than the $105 owed, but this refund is $50.
  await client.refunds.create({ payment_intent: job.intent, amount: 5_000 });
  expect(await deliver(await newestNotice(job.intent))).toBe("applied");
  expect((await balanceOf(job.lead.id))!.refundId).toBeNull();
  // The worker sends the $105, and its own notice confirms it.
  await processBalanceRefunds(client);
  expect((await refundsOn(job.intent)).sort((a, b) => a - b)).toEqual([5_000, 10_500, 20_000]);
  const own = await newestNotice(job.intent);
  expect(own.data.previous_attributes).toMatchObject({ amount_refunded: 25_000 });
  expect(await deliver(own)).toBe("applied");
  expect((await balanceOf(job.lead.id))!.refundId).toMatch(/^re_/);
});
