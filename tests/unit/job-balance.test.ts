/*
 * A built job's balance: opened when the job is marked built (signed proposal with its add-ons +
 * signed change orders − deposit, worked by hand below), the homeowner's completion e-mail queued in
 * the same transaction, paid through Checkout with every signed webhook applied once and only when
 * its session, amount and currency match (the payment service's guidance on fulfilling from
 * webhooks), a second payment refunded once; and the job's cost and the monthly sums for owners.
 */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import Stripe from "stripe";
import { afterAll, beforeAll, expect, test } from "vitest";
import {
  emailOutbox,
  jobBalances,
  jobExtras,
  jobHours,
  leadEvents,
  leadPhotos,
  leads,
  paymentEvents,
  proposals,
  users,
  type JobBalance,
} from "~/db/schema";
import { countFailedWork } from "~/lib/jobs/attention.server";
import {
  creditRefundCents,
  processBalanceRefunds,
  recordBalancePaidByHand,
  retryFailedBalanceRefund,
  startBalanceCheckout,
} from "~/lib/builds/job-balance.server";
import { jobCostFor, monthlyJobReport } from "~/lib/builds/job-cost.server";
import { markJobBuilt } from "~/lib/builds/mark-built.server";
import { db } from "~/lib/platform/db.server";
import { createStripe } from "~/lib/platform/payments.server";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";
import { requestDepositRefund, startDepositCheckout } from "~/lib/proposals/proposal-payments.server";
import { acceptProposal } from "~/lib/proposals/proposal-signing.server";
import { startPaymentsFake, type PaymentsFake } from "../../fakes/payments/server";
import { deliverSigned, fakeEvents, fakeRefundsOf, newestRefundNotice } from "./support/payments";
import { officeUser, sentProposal } from "./support/proposals";

let fake: PaymentsFake;
beforeAll(async () => {
  fake = await startPaymentsFake({
    port: 0,
    webhookUrl: null,
    stateFile: path.join(mkdtempSync(path.join(tmpdir(), "ew-bal-")), "state.json"),
    log: () => {},
  });
});
afterAll(() => fake.close());

let seq = 0;
const balanceOf = async (leadId: number) =>
  (await db.select().from(jobBalances).where(eq(jobBalances.leadId, leadId)))[0];
const stageOf = async (leadId: number) => (await db.select().from(leads).where(eq(leads.id, leadId)))[0]!.status;

/**
 * A signed job at "build booked": the support proposal ($4,850 fixed price, add-ons a1 $640 and
 * a2 $395), signed with a2 chosen, deposit recorded as paid.
 */
async function bookedJob(chosenKeys = ["a2"]) {
  const sent = await sentProposal();
  const accepted = await acceptProposal({
    proposal: sent.proposal,
    lead: sent.lead,
    document: parseProposalDocument(sent.proposal.documentJson),
    input: { name: sent.lead.customerName, ip: "203.0.113.9", userAgent: "test", chosenKeys },
  });
  if (!accepted.ok) throw new Error(accepted.message);
  await db
    .update(proposals)
    .set({ status: "signed", depositPaidAt: new Date().toISOString() })
    .where(eq(proposals.id, sent.proposal.id));
  await db.update(leads).set({ status: "build-booked" }).where(eq(leads.id, sent.lead.id));
  const [proposal] = await db.select().from(proposals).where(eq(proposals.id, sent.proposal.id));
  return { ...sent, proposal: proposal! };
}

function balanceEvent(balance: JobBalance, type: string, object: Record<string, unknown>) {
  seq += 1;
  return {
    id: `evt_balance_${Date.now()}_${seq}`,
    object: "event",
    type,
    created: Math.floor(Date.now() / 1000),
    data: {
      object: {
        metadata: { kind: "balance", balance_id: String(balance.id), lead_id: String(balance.leadId) },
        ...object,
      },
    },
  };
}

const completed = (balance: JobBalance, overrides: Record<string, unknown> = {}) =>
  balanceEvent(balance, "checkout.session.completed", {
    id: balance.checkoutSessionId,
    object: "checkout.session",
    payment_status: "paid",
    status: "complete",
    amount_total: balance.amountCents,
    currency: "usd",
    payment_intent: `pi_bal_${balance.id}_${seq}`,
    ...overrides,
  });

const deliver = deliverSigned;

async function crewOf(companyId: number) {
  const [crew] = await db
    .select()
    .from(users)
    .where(and(eq(users.companyId, companyId), eq(users.role, "crew")))
    .limit(1);
  return crew!;
}

/** Marks the job built and gives its balance a checkout session, as the homeowner's Pay button would. */
async function builtJobWithSession() {
  const job = await bookedJob();
  const crew = await crewOf(job.lead.companyId);
  expect(await markJobBuilt({ companyId: job.lead.companyId, leadId: job.lead.id, actorUserId: crew.id })).toEqual({
    ok: true,
    from: "build-booked",
  });
  seq += 1;
  await db
    .update(jobBalances)
    .set({ checkoutSessionId: `cs_balance_${job.lead.id}_${seq}`, checkoutAttempt: 1 })
    .where(eq(jobBalances.leadId, job.lead.id));
  return { ...job, balance: (await balanceOf(job.lead.id))! };
}

test("marking a job built opens its balance and queues the completion e-mail in the same step; a second call changes nothing", async () => {
  const job = await bookedJob();
  const crew = await crewOf(job.lead.companyId);
  await db.insert(leadPhotos).values({
    companyId: job.lead.companyId,
    leadId: job.lead.id,
    storedName: `final-${job.lead.id}.jpg`,
    originalName: "done.jpg",
    mimeType: "image/jpeg",
    sizeBytes: 1000,
    source: "final",
  });
  const result = await markJobBuilt({ companyId: job.lead.companyId, leadId: job.lead.id, actorUserId: crew.id });
  expect(result).toEqual({ ok: true, from: "build-booked" });
  expect(await stageOf(job.lead.id)).toBe("built");
  // $4,850 + $395 add-on = $5,245 signed; 30 % deposit = $1,573.50; $5,245 − $1,573.50 = $3,671.50 due.
  const balance = (await balanceOf(job.lead.id))!;
  expect(balance).toMatchObject({
    proposalPriceCents: 485_000,
    addOnsCents: 39_500,
    changeOrdersCents: 0,
    depositCents: 157_350,
    amountCents: 367_150,
    paidAt: null,
  });
  const [mail] = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.idempotencyKey, `job-completed/${job.lead.id}`));
  expect(mail!.toAddress).toBe(job.lead.email);
  expect(mail!.companyId).toBe(job.lead.companyId);
  expect(mail!.text).toContain("$3,671.50");
  expect(mail!.text).toContain("Add-ons you chose");
  expect(mail!.text).toMatch(new RegExp(`/photos/\\d+`));
  expect(mail!.text).toContain(`/my#balance-${job.lead.id}`);
  expect(mail!.text).toMatch(/metal can/);
  expect(mail!.text).toMatch(/adhesive cure/);
  expect(mail!.text).toMatch(/local fire authority/);

  const again = await markJobBuilt({ companyId: job.lead.companyId, leadId: job.lead.id, actorUserId: crew.id });
  expect(again).toMatchObject({ ok: false, status: 409 });
  expect(await db.select().from(jobBalances).where(eq(jobBalances.leadId, job.lead.id))).toHaveLength(1);
  // Another company's id is "not found".
  expect(await markJobBuilt({ companyId: 999_999, leadId: job.lead.id, actorUserId: crew.id })).toMatchObject({
    status: 404,
  });
});

test("a signed change order counts: $5,245 + $380 = $5,625 − $1,573.50 = $4,051.50", async () => {
  const job = await bookedJob();
  await db.insert(proposals).values({
    ...job.proposal,
    id: undefined,
    token: `co-${job.proposal.id}-${Date.now()}`,
    kind: "change-order",
    parentId: job.proposal.id,
    priceCents: 38_000,
    checkoutSessionId: null,
    signedAt: new Date().toISOString(),
  });
  const crew = await crewOf(job.lead.companyId);
  await markJobBuilt({ companyId: job.lead.companyId, leadId: job.lead.id, actorUserId: crew.id });
  expect((await balanceOf(job.lead.id))!).toMatchObject({ changeOrdersCents: 38_000, amountCents: 405_150 });
});

test("the balance's signed webhook pays it once: job paid in full, timeline and receipts; a repeat changes nothing", async () => {
  const { lead, balance } = await builtJobWithSession();
  const event = completed(balance);
  expect(await deliver(event)).toEqual({ status: 200, outcome: "applied" });
  const paid = (await balanceOf(lead.id))!;
  expect(paid.paidAt).not.toBeNull();
  expect(paid.paymentIntentId).toMatch(/^pi_bal_/);
  expect(await stageOf(lead.id)).toBe("paid-in-full");
  const receipts = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.idempotencyKey, `balance-paid/${lead.id}`));
  expect(receipts).toHaveLength(1);
  expect(receipts[0]!.text).toContain("$3,671.50");

  expect(await deliver(event)).toEqual({ status: 200, outcome: "duplicate" });
  expect(
    await db
      .select()
      .from(leadEvents)
      .where(and(eq(leadEvents.leadId, lead.id), eq(leadEvents.kind, "balance-paid"))),
  ).toHaveLength(1);
});

test.each([
  ["another amount", { amount_total: 100 }],
  ["another currency", { currency: "eur" }],
  ["another checkout session", { id: "cs_someone_else" }],
])("a completed balance event with %s than stored is rejected, logged and not recorded", async (_label, overrides) => {
  const { lead, balance } = await builtJobWithSession();
  const event = completed(balance, overrides);
  const warnings: string[] = [];
  const original = console.warn;
  console.warn = (message: string) => warnings.push(message);
  try {
    expect(await deliver(event)).toEqual({ status: 200, outcome: "rejected" });
  } finally {
    console.warn = original;
  }
  expect(warnings.join("\n")).toContain(`balance ${balance.id}`);
  expect((await balanceOf(lead.id))!.paidAt).toBeNull();
  expect(await stageOf(lead.id)).toBe("built");
  expect(await db.select().from(paymentEvents).where(eq(paymentEvents.id, event.id))).toHaveLength(0);
});

test("a card payment landing after the office recorded the balance paid is refunded once (two workers at once), keyed refund:balance:<id>", async () => {
  const { lead, balance } = await builtJobWithSession();
  const expired: string[] = [];
  const client = {
    checkout: { sessions: { expire: async (id: string) => expired.push(id) } },
  } as unknown as Stripe;
  expect(await recordBalancePaidByHand({ lead, actorUserId: lead.assignedUserId!, how: "cheque", client })).toBeNull();
  expect(expired).toEqual([balance.checkoutSessionId]);
  expect(await stageOf(lead.id)).toBe("paid-in-full");
  expect(await recordBalancePaidByHand({ lead, actorUserId: lead.assignedUserId!, how: "cheque", client })).toMatch(
    /already paid/,
  );

  const late = completed(balance);
  const lateIntent = (late.data.object as Record<string, unknown>).payment_intent;
  expect(await deliver(late)).toEqual({ status: 200, outcome: "applied" });
  const owed = (await balanceOf(lead.id))!;
  expect(owed.refundOwedAt).not.toBeNull();
  expect(owed.refundPaymentIntentId).toBe(lateIntent);

  const calls: { params: unknown; key: string | undefined }[] = [];
  const refunds = {
    refunds: {
      create: async (params: unknown, options?: { idempotencyKey?: string }) => {
        calls.push({ params, key: options?.idempotencyKey });
        return { id: `re_${calls.length}` };
      },
    },
  } as unknown as Pick<Stripe, "refunds">;
  // Two workers at once (leases), then a later pass: the refund goes out once.
  await Promise.all([
    processBalanceRefunds(refunds, { owner: "worker-a" }),
    processBalanceRefunds(refunds, { owner: "worker-b" }),
  ]);
  await processBalanceRefunds(refunds, { owner: "worker-a" });
  const mine = calls.filter((c) => c.key === `refund:balance:${balance.id}`);
  expect(mine).toHaveLength(1);
  expect(mine[0]!.params).toEqual({ payment_intent: lateIntent });
  expect((await balanceOf(lead.id))!.refundId).toBe(`re_${calls.indexOf(mine[0]!) + 1}`);
});

test("a balance refund refused for good is counted for the owner and can be tried again", async () => {
  const { lead, balance } = await builtJobWithSession();
  const client = { checkout: { sessions: { expire: async () => undefined } } } as unknown as Stripe;
  await recordBalancePaidByHand({ lead, actorUserId: lead.assignedUserId!, how: "bank transfer", client });
  await deliver(completed(balance));
  const before = await countFailedWork(lead.companyId);
  const refusing = {
    refunds: {
      create: async () => {
        throw Object.assign(new Error("No such payment_intent"), { statusCode: 404, code: "resource_missing" });
      },
    },
  } as unknown as Pick<Stripe, "refunds">;
  const errors = console.error;
  console.error = () => undefined;
  try {
    await processBalanceRefunds(refusing);
  } finally {
    console.error = errors;
  }
  expect((await balanceOf(lead.id))!.refundFailedAt).not.toBeNull();
  expect(await countFailedWork(lead.companyId)).toBe(before + 1);
  expect(await retryFailedBalanceRefund(balance.id, 999_999)).toBe(false);
  expect(await retryFailedBalanceRefund(balance.id, lead.companyId)).toBe(true);
  expect(await countFailedWork(lead.companyId)).toBe(before);
});

/** A payments client that counts the refunds asked of it on one payment (other tests' rows share the queue). */
function countingRefunds(client: Stripe, paymentIntent: string) {
  const counter = { calls: 0, client: client as Pick<Stripe, "refunds"> };
  counter.client = {
    refunds: {
      ...client.refunds,
      create: ((...args: Parameters<Stripe["refunds"]["create"]>) => {
        if (args[0]?.payment_intent === paymentIntent) counter.calls += 1;
        return client.refunds.create(...args);
      }) as Stripe["refunds"]["create"],
    } as Stripe["refunds"],
  };
  return counter;
}

/** A signed job whose deposit was paid by card on the payments fake, applied by its own signed webhook. */
async function jobWithCardDeposit() {
  const sent = await sentProposal();
  const accepted = await acceptProposal({
    proposal: sent.proposal,
    lead: sent.lead,
    document: parseProposalDocument(sent.proposal.documentJson),
    input: { name: sent.lead.customerName, ip: "203.0.113.9", userAgent: "test", chosenKeys: [] },
  });
  if (!accepted.ok) throw new Error(accepted.message);
  const client = createStripe(fake.url);
  await startDepositCheckout({
    proposal: accepted.proposal,
    lead: sent.lead,
    company: sent.company,
    origin: "http://localhost",
    client,
  });
  const [withSession] = await db.select().from(proposals).where(eq(proposals.id, sent.proposal.id));
  const paid = await fetch(`${fake.url}/_fake/sessions/${withSession!.checkoutSessionId}/pay`, {
    method: "POST",
    body: JSON.stringify({ card: "4242424242424242" }),
    headers: { "Content-Type": "application/json" },
  });
  expect(paid.status).toBe(200);
  const completedEvent = (await fakeEvents(fake.url, "checkout.session.completed")).find(
    (e) => e.data.object.id === withSession!.checkoutSessionId,
  )!;
  expect(await deliver(completedEvent)).toEqual({ status: 200, outcome: "applied" });
  const [proposal] = await db.select().from(proposals).where(eq(proposals.id, sent.proposal.id));
  expect([proposal!.status, proposal!.paymentIntentId]).toEqual(["signed", expect.stringMatching(/^pi_/)]);
  await db.update(leads).set({ status: "build-booked" }).where(eq(leads.id, sent.lead.id));
  return { ...sent, proposal: proposal!, client };
}

/** A signed change order on the job for `deltaCents` (negative: a credit). */
async function signedChange(proposal: typeof proposals.$inferSelect, deltaCents: number) {
  await db.insert(proposals).values({
    ...proposal,
    id: undefined,
    token: `co-${proposal.id}-${Date.now()}-${deltaCents}`,
    kind: "change-order",
    parentId: proposal.id,
    priceCents: deltaCents,
    checkoutSessionId: null,
    paymentIntentId: null,
    signedAt: new Date().toISOString(),
  });
}

test("a credit left by the change orders goes back to the deposit's card once, for that amount; the webhook confirms it", async () => {
  // $4,850 signed, no add-ons, 30 % deposit $1,455 paid by card; a change order credits $3,500:
  // $4,850 − $3,500 − $1,455 = −$105, a credit of $105 (worked by hand).
  const job = await jobWithCardDeposit();
  await signedChange(job.proposal, -350_000);
  const crew = await crewOf(job.lead.companyId);
  await markJobBuilt({ companyId: job.lead.companyId, leadId: job.lead.id, actorUserId: crew.id });
  const balance = (await balanceOf(job.lead.id))!;
  expect(balance).toMatchObject({
    amountCents: -10_500,
    refundAmountCents: 10_500,
    refundPaymentIntentId: job.proposal.paymentIntentId,
    refundId: null,
  });
  expect(balance.paidAt).not.toBeNull();
  expect(balance.refundOwedAt).not.toBeNull();
  expect(await stageOf(job.lead.id)).toBe("paid-in-full");
  const [timeline] = await db
    .select()
    .from(leadEvents)
    .where(and(eq(leadEvents.leadId, job.lead.id), eq(leadEvents.kind, "balance")));
  expect(timeline!.detail).toContain("a credit of $105.00 is owed to the homeowner; $105.00 is being refunded");
  const [mail] = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.idempotencyKey, `job-completed/${job.lead.id}`));
  expect(mail!.text).toContain("it is being refunded to the card that paid the deposit");

  // Two workers at once, then a later pass: one refund of $105 on the deposit's payment, asked for
  // once (the lease, not the service's idempotency key, keeps the second worker off it).
  const counting = countingRefunds(job.client, job.proposal.paymentIntentId!);
  await Promise.all([
    processBalanceRefunds(counting.client, { owner: "worker-a" }),
    processBalanceRefunds(counting.client, { owner: "worker-b" }),
  ]);
  await processBalanceRefunds(counting.client, { owner: "worker-a" });
  expect(counting.calls).toBe(1);
  const refunds = await fakeRefundsOf(fake.url, job.proposal.paymentIntentId!);
  expect(refunds.map((r) => r.amount)).toEqual([10_500]);
  expect((await balanceOf(job.lead.id))!.refundId).toBe(refunds[0]!.id);

  // The payment service's notice of it reaches the deposit's handler: applied to the balance, not a mismatch.
  const refundedNotice = (await fakeEvents(fake.url, "charge.refunded")).find(
    (e) => e.data.object.payment_intent === job.proposal.paymentIntentId,
  )!;
  expect(await deliver(refundedNotice)).toEqual({ status: 200, outcome: "applied" });
  const [deposit] = await db.select().from(proposals).where(eq(proposals.id, job.proposal.id));
  expect([deposit!.refundOwedAt, deposit!.refundId]).toEqual([null, null]);
  expect((await balanceOf(job.lead.id))!.refundId).toBe(refunds[0]!.id);

  // The job is built and its balance counts the deposit: the owner cannot refund the deposit on top.
  const owner = await officeUser(job.lead.companyId, "owner");
  const [lead] = await db.select().from(leads).where(eq(leads.id, job.lead.id));
  expect(
    await requestDepositRefund({
      actorUserId: owner.id,
      lead: lead!,
      proposalId: job.proposal.id,
      reason: "changed mind",
    }),
  ).toMatch(/^The job is built/);
  const [still] = await db.select().from(proposals).where(eq(proposals.id, job.proposal.id));
  expect(still!.refundOwedAt).toBeNull();
  expect(await stageOf(job.lead.id)).toBe("paid-in-full");
});

test("a part of the deposit refunded by hand does not settle the credit; the whole credit refunded by hand does, and the worker sends nothing more", async () => {
  // Same job: a $105 credit on a $1,455 card deposit (worked by hand above).
  const partJob = await jobWithCardDeposit();
  await signedChange(partJob.proposal, -350_000);
  const crew = await crewOf(partJob.lead.companyId);
  await markJobBuilt({ companyId: partJob.lead.companyId, leadId: partJob.lead.id, actorUserId: crew.id });
  const intent = partJob.proposal.paymentIntentId!;
  // $50 back by hand from the payment service's dashboard, its notice delivered before any worker pass.
  await partJob.client.refunds.create({ payment_intent: intent, amount: 5_000 });
  expect(await deliver(await newestRefundNotice(fake.url, intent))).toEqual({ status: 200, outcome: "applied" });
  expect((await balanceOf(partJob.lead.id))!.refundId).toBeNull();
  await processBalanceRefunds(partJob.client, { owner: "worker-a" });
  expect((await fakeRefundsOf(fake.url, intent)).map((r) => r.amount).sort((a, b) => a - b)).toEqual([5_000, 10_500]);

  const handJob = await jobWithCardDeposit();
  await signedChange(handJob.proposal, -350_000);
  await markJobBuilt({ companyId: handJob.lead.companyId, leadId: handJob.lead.id, actorUserId: crew.id });
  const handIntent = handJob.proposal.paymentIntentId!;
  await handJob.client.refunds.create({ payment_intent: handIntent, amount: 10_500 });
  expect(await deliver(await newestRefundNotice(fake.url, handIntent))).toEqual({ status: 200, outcome: "applied" });
  expect((await balanceOf(handJob.lead.id))!.refundId).not.toBeNull();
  const counting = countingRefunds(handJob.client, handIntent);
  await processBalanceRefunds(counting.client, { owner: "worker-a" });
  expect(counting.calls).toBe(0);
  expect((await fakeRefundsOf(fake.url, handIntent)).map((r) => r.amount)).toEqual([10_500]);
});

test("a deposit refunded before the job goes ahead again no longer counts: the balance is the whole contract, with no credit on its card", async () => {
  // $4,850 signed, no add-ons; the owner refunds the $1,455 deposit, then the job resumes and is built.
  const job = await jobWithCardDeposit();
  const owner = await officeUser(job.lead.companyId, "owner");
  const [lead] = await db.select().from(leads).where(eq(leads.id, job.lead.id));
  expect(
    await requestDepositRefund({
      actorUserId: owner.id,
      lead: lead!,
      proposalId: job.proposal.id,
      reason: "on hold a year",
    }),
  ).toBeNull();
  expect(await stageOf(job.lead.id)).toBe("not-going-ahead");
  await db.update(leads).set({ status: "build-booked" }).where(eq(leads.id, job.lead.id));
  const crew = await crewOf(job.lead.companyId);
  await markJobBuilt({ companyId: job.lead.companyId, leadId: job.lead.id, actorUserId: crew.id });
  expect(await balanceOf(job.lead.id)).toMatchObject({
    depositCents: 0,
    amountCents: 485_000,
    refundOwedAt: null,
    refundPaymentIntentId: null,
  });
  const [mail] = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.idempotencyKey, `job-completed/${job.lead.id}`));
  expect(mail!.text).not.toContain("Deposit paid");
});

test("a credit on a deposit not paid by card here is left to the office, and says so; a credit beyond the deposit refunds the deposit only", async () => {
  const job = await bookedJob([]);
  await signedChange(job.proposal, -350_000);
  const crew = await crewOf(job.lead.companyId);
  await markJobBuilt({ companyId: job.lead.companyId, leadId: job.lead.id, actorUserId: crew.id });
  const balance = (await balanceOf(job.lead.id))!;
  expect(balance).toMatchObject({ amountCents: -10_500, refundOwedAt: null, refundAmountCents: null });
  const [timeline] = await db
    .select()
    .from(leadEvents)
    .where(and(eq(leadEvents.leadId, job.lead.id), eq(leadEvents.kind, "balance")));
  expect(timeline!.detail).toContain("to pay back by hand");
  // Worked by hand: a $2,000 credit on a $1,455 deposit paid by card sends $1,455 back to the card.
  expect(creditRefundCents(-200_000, 145_500, "pi_x")).toBe(145_500);
  expect(creditRefundCents(-10_500, 145_500, "pi_x")).toBe(10_500);
  expect(creditRefundCents(-10_500, 145_500, null)).toBeNull();
  expect(creditRefundCents(0, 145_500, "pi_x")).toBeNull();
});

test("the Pay button opens Checkout on the payment service for the exact balance, and reuses the open session", async () => {
  const job = await bookedJob([]);
  const crew = await crewOf(job.lead.companyId);
  await markJobBuilt({ companyId: job.lead.companyId, leadId: job.lead.id, actorUserId: crew.id });
  const balance = (await balanceOf(job.lead.id))!;
  const client = createStripe(fake.url);
  const url = await startBalanceCheckout({ balance, lead: job.lead, company: job.company, client });
  const stored = (await balanceOf(job.lead.id))!;
  expect(stored.checkoutAttempt).toBe(1);
  const session = await client.checkout.sessions.retrieve(stored.checkoutSessionId!);
  // $4,850 signed, no add-ons; 30 % deposit $1,455; $4,850 − $1,455 = $3,395.
  expect(session.amount_total).toBe(339_500);
  expect(session.metadata).toMatchObject({ kind: "balance", balance_id: String(balance.id) });
  expect(await startBalanceCheckout({ balance: stored, lead: job.lead, company: job.company, client })).toBe(url);
});

test("job cost: the plan's hours and material against hours logged, material and extras; the monthly report sums built jobs", async () => {
  const { lead, balance } = await builtJobWithSession();
  const crew = await crewOf(lead.companyId);
  const before = await jobCostFor(lead);
  expect(before!.actual.labourHours).toBe(0);
  await db.insert(jobHours).values([
    {
      companyId: lead.companyId,
      leadId: lead.id,
      workerUserId: crew.id,
      day: "2026-11-03",
      hours: 6.5,
      clientId: `h1-${lead.id}`,
    },
    {
      companyId: lead.companyId,
      leadId: lead.id,
      workerUserId: crew.id,
      day: "2026-11-04",
      hours: 5,
      clientId: `h2-${lead.id}`,
    },
  ]);
  await db.insert(jobExtras).values({
    companyId: lead.companyId,
    leadId: lead.id,
    description: "Spare cap",
    quantity: 1,
    costCents: 2_850,
    clientId: `x-${lead.id}`,
  });
  const cost = (await jobCostFor(lead))!;
  // 6.5 + 5 = 11.5 h at the plan's cost rate; extras $28.50; material as planned (no supplier order).
  expect(cost.actual.labourHours).toBe(11.5);
  expect(cost.actual.labourCents).toBe(Math.round(11.5 * cost.labourCostRateCents));
  expect(cost.actual.extrasCents).toBe(2_850);
  expect(cost.materialSource).toBe("the plan");
  expect(cost.actual.materialCents).toBe(cost.estimated.materialCents);
  // Revenue is the job's total: $5,245.
  expect(cost.revenueCents).toBe(524_500);
  expect(cost.grossProfitCents).toBe(524_500 - cost.actual.totalCents);
  expect(cost.differenceCents).toBe(cost.actual.totalCents - cost.estimated.totalCents);

  // Move this job into a month of its own, far back, and read the report's row for it.
  await db.update(jobBalances).set({ openedAt: "2001-03-10T18:00:00.000Z" }).where(eq(jobBalances.id, balance.id));
  const report = await monthlyJobReport(lead.companyId);
  const march = report.rows.find((r) => r.month === "2001-03")!;
  expect(march).toMatchObject({
    jobsBuilt: 1,
    revenueCents: 524_500,
    actualCents: cost.actual.totalCents,
    estimatedCents: cost.estimated.totalCents,
    grossProfitCents: cost.grossProfitCents,
  });
  expect(march.accuracy).toBeCloseTo(cost.actual.totalCents / cost.estimated.totalCents, 10);
  // Every built job of the company is counted once across the months.
  const balances = await db.select().from(jobBalances).where(eq(jobBalances.companyId, lead.companyId));
  expect(report.rows.reduce((n, r) => n + r.jobsBuilt, 0)).toBe(balances.length);
});
