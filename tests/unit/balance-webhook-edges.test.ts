/*
 * Signed webhook deliveries for a job's balance that do not match it. The payment service's
 * guidance on webhooks: verify the signature, then check the event against what you stored before
 * fulfilling or settling anything. Here: a signed body that is not an event at all, and a refund
 * of a payment other than the one the balance owes back. And a built job put on hold: picked up
 * again it is still built (its balance as opened), and a balance paid by card during the hold still
 * lets the office move it on to "paid in full". A change order on a built job: its balance was
 * fixed when it was marked built, so a change order is neither sent nor signed after that.
 */
import { and, eq } from "drizzle-orm";
import Stripe from "stripe";
import { expect, test } from "vitest";
import { jobBalances, leadEvents, leads, paymentEvents, proposals, users, type JobBalance } from "~/db/schema";
import { recordBalancePaidByHand } from "~/lib/builds/job-balance.server";
import { changeStage } from "~/lib/leads/lead-workspace.server";
import { getCompany } from "~/lib/catalog/catalog.server";
import { FINISHED_JOB_MESSAGE, sendChangeOrder } from "~/lib/proposals/change-orders.server";
import { markJobBuilt, OPEN_CHANGE_ORDER_REASON } from "~/lib/builds/mark-built.server";
import { db } from "~/lib/platform/db.server";
import { env } from "~/lib/platform/env.server";
import { parseProposalDocument } from "~/lib/proposals/proposal-document";
import { acceptProposal } from "~/lib/proposals/proposal-signing.server";
import { action as webhookAction } from "~/routes/api/webhooks-stripe";
import { routeArgs } from "./support/demo";
import { officeUser, sentProposal } from "./support/proposals";

const stripe = new Stripe("sk_test_local");
let seq = 0;

async function deliverRaw(payload: string) {
  const signature = stripe.webhooks.generateTestHeaderString({ payload, secret: env.STRIPE_WEBHOOK_SECRET });
  const response = (await webhookAction(
    routeArgs(
      new Request("http://localhost/api/webhooks/stripe", {
        method: "POST",
        body: payload,
        headers: { "Stripe-Signature": signature },
      }),
    ),
  )) as Response;
  return { status: response.status, body: (await response.json()) as { outcome?: string; error?: string } };
}

const balanceOf = async (leadId: number) =>
  (await db.select().from(jobBalances).where(eq(jobBalances.leadId, leadId)))[0]!;

/** A job marked built by its crew, its balance open with a checkout session (the homeowner pressed Pay). */
async function builtJob(beforeBuilt: (lead: typeof leads.$inferSelect) => Promise<void> = async () => {}) {
  const sent = await sentProposal();
  const accepted = await acceptProposal({
    proposal: sent.proposal,
    lead: sent.lead,
    document: parseProposalDocument(sent.proposal.documentJson),
    input: { name: sent.lead.customerName, ip: "203.0.113.9", userAgent: "test", chosenKeys: [] },
  });
  if (!accepted.ok) throw new Error(accepted.message);
  await db
    .update(proposals)
    .set({ status: "signed", depositPaidAt: new Date().toISOString() })
    .where(eq(proposals.id, sent.proposal.id));
  await db.update(leads).set({ status: "build-booked" }).where(eq(leads.id, sent.lead.id));
  const [crew] = await db
    .select()
    .from(users)
    .where(and(eq(users.companyId, sent.lead.companyId), eq(users.role, "crew")))
    .limit(1);
  await beforeBuilt((await db.select().from(leads).where(eq(leads.id, sent.lead.id)))[0]!);
  expect((await markJobBuilt({ companyId: sent.lead.companyId, leadId: sent.lead.id, actorUserId: crew!.id })).ok).toBe(
    true,
  );
  seq += 1;
  await db
    .update(jobBalances)
    .set({ checkoutSessionId: `cs_edge_${sent.lead.id}_${seq}`, checkoutAttempt: 1 })
    .where(eq(jobBalances.leadId, sent.lead.id));
  const [lead] = await db.select().from(leads).where(eq(leads.id, sent.lead.id));
  return { lead: lead!, crew: crew!, balance: await balanceOf(sent.lead.id) };
}

const noCheckout = { checkout: { sessions: { expire: async () => ({}) } } } as unknown as Stripe;

/** A card payment of the balance, as the payment service reports it. */
const cardPayment = (balance: JobBalance, paymentIntent: string) =>
  event("checkout.session.completed", balance, {
    id: balance.checkoutSessionId,
    object: "checkout.session",
    payment_status: "paid",
    status: "complete",
    amount_total: balance.amountCents,
    currency: "usd",
    payment_intent: paymentIntent,
  });

/** A built job whose balance the office recorded as paid, then a card payment landed: a refund is owed. */
async function balanceOwingARefund(): Promise<{ balance: JobBalance; cardIntent: string }> {
  const { lead, crew } = await builtJob();
  expect(await recordBalancePaidByHand({ lead, actorUserId: crew.id, how: "cheque", client: noCheckout })).toBeNull();
  const balance = await balanceOf(lead.id);
  const cardIntent = `pi_edge_card_${balance.id}`;
  const late = await deliverRaw(JSON.stringify(cardPayment(balance, cardIntent)));
  expect(late).toEqual({ status: 200, body: { received: true, outcome: "applied" } });
  return { balance: await balanceOf(lead.id), cardIntent };
}

function event(type: string, balance: JobBalance, object: Record<string, unknown>) {
  seq += 1;
  return {
    id: `evt_edge_${Date.now()}_${seq}`,
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

test.each([
  ["{}", "no id, type or data"],
  ['{"id":"evt_edge_nodata","object":"event","type":"checkout.session.completed","data":{}}', "no data.object"],
  ['{"id":"evt_edge_null","object":"event","type":"charge.refunded","data":{"object":null}}', "a null data.object"],
  ["[]", "an array"],
  ["7", "a number"],
])("a signed body %s (%s) is a 400 that records nothing, never a 500", async (payload) => {
  const before = (await db.select().from(paymentEvents)).length;
  const answer = await deliverRaw(payload);
  expect(answer).toEqual({ status: 400, body: { error: "The event has no id, type or data.object." } });
  expect(await db.select().from(paymentEvents)).toHaveLength(before);
});

test("a refund of another payment, or of a part of the second, does not settle the refund owed; the whole second payment refunded does", async () => {
  const { balance, cardIntent } = await balanceOwingARefund();
  expect(balance.refundOwedAt).not.toBeNull();
  expect(balance.refundPaymentIntentId).toBe(cardIntent);

  const stray = event("charge.refunded", balance, {
    id: `ch_edge_other_${balance.id}`,
    object: "charge",
    payment_intent: `pi_edge_someone_else_${balance.id}`,
    refunds: { data: [{ id: `re_edge_other_${balance.id}` }] },
  });
  expect(await deliverRaw(JSON.stringify(stray))).toEqual({
    status: 200,
    body: { received: true, outcome: "rejected" },
  });
  const after = await balanceOf(balance.leadId);
  expect(after.refundId).toBeNull();
  expect(after.refundedAt).toBeNull();
  // Not applied, so not recorded: a corrected delivery may still apply.
  expect(await db.select().from(paymentEvents).where(eq(paymentEvents.id, stray.id))).toEqual([]);

  // A part of the second payment refunded by hand is not the refund owed: it stays owed for the worker.
  const part = event("charge.refunded", balance, {
    id: `ch_edge_own_${balance.id}`,
    object: "charge",
    amount: balance.amountCents,
    amount_refunded: 5_000,
    payment_intent: cardIntent,
    refunds: { data: [{ id: `re_edge_part_${balance.id}` }] },
  });
  expect((await deliverRaw(JSON.stringify(part))).body.outcome).toBe("applied");
  expect((await balanceOf(balance.leadId)).refundId).toBeNull();

  const own = event("charge.refunded", balance, {
    id: `ch_edge_own_${balance.id}`,
    object: "charge",
    amount: balance.amountCents,
    amount_refunded: balance.amountCents,
    payment_intent: cardIntent,
    refunds: { data: [{ id: `re_edge_own_${balance.id}` }] },
  });
  expect((await deliverRaw(JSON.stringify(own))).body.outcome).toBe("applied");
  expect((await balanceOf(balance.leadId)).refundId).toBe(`re_edge_own_${balance.id}`);
});

test("a built job put on hold is picked up again as built; a balance paid by card meanwhile lets it move to paid in full", async () => {
  const { lead, balance } = await builtJob();
  const owner = await officeUser(lead.companyId, "owner");
  const stage = async () => (await db.select().from(leads).where(eq(leads.id, lead.id)))[0]!;
  expect(await changeStage(owner, lead, "on-hold", "homeowner away until spring")).toEqual({ ok: true });
  // The homeowner pays from /my while the job is on hold: the balance is paid, the stage stays on hold.
  expect((await deliverRaw(JSON.stringify(cardPayment(balance, `pi_edge_hold_${balance.id}`)))).body.outcome).toBe(
    "applied",
  );
  expect((await balanceOf(lead.id)).paidAt).not.toBeNull();
  expect((await stage()).status).toBe("on-hold");

  expect(await changeStage(owner, await stage(), "built", "")).toEqual({ ok: true });
  expect((await stage()).status).toBe("built");
  // Still the one balance, as it was opened.
  expect(await db.select().from(jobBalances).where(eq(jobBalances.leadId, lead.id))).toHaveLength(1);

  expect(await changeStage(owner, await stage(), "paid-in-full", "")).toEqual({ ok: true });
  expect((await stage()).status).toBe("paid-in-full");
  const events = await db.select().from(leadEvents).where(eq(leadEvents.leadId, lead.id));
  expect(events.at(-1)!.detail).toMatch(/^The balance of \$[\d,.]+ was paid already by card\. Built → Paid in full\.$/);
  // Once there, a second "paid in full" is refused as before.
  expect(
    await recordBalancePaidByHand({ lead: await stage(), actorUserId: owner.id, how: "cheque", client: noCheckout }),
  ).toBe("The balance is already paid.");
});

test("a built job takes no change order: none is sent, and one sent before it was built is withdrawn and can no longer be signed", async () => {
  let pending: typeof proposals.$inferSelect | null = null;
  const { lead, balance } = await builtJob(async (signedLead) => {
    const owner = await officeUser(signedLead.companyId, "owner");
    const sent = await sendChangeOrder({
      user: owner,
      lead: signedLead,
      company: await getCompany(signedLead.companyId),
      deltaCents: 50_000,
      validUntil: "2099-06-30",
      origin: "http://localhost",
    });
    if (typeof sent === "string") throw new Error(sent);
    pending = sent;
  });
  const owner = await officeUser(lead.companyId, "owner");
  const company = await getCompany(lead.companyId);
  const again = await sendChangeOrder({
    user: owner,
    lead,
    company,
    deltaCents: 20_000,
    validUntil: "2099-06-30",
    origin: "http://localhost",
  });
  expect(again).toBe(FINISHED_JOB_MESSAGE);

  const change = pending!;
  const signing = await acceptProposal({
    proposal: change,
    lead,
    document: parseProposalDocument(change.documentJson),
    input: { name: lead.customerName, ip: "203.0.113.9", userAgent: "test", chosenKeys: [] },
  });
  expect(signing).toMatchObject({ ok: false, status: 409 });
  // Marking it built withdrew it, with the reason on the homeowner's page and a line on the timeline.
  const [stored] = await db.select().from(proposals).where(eq(proposals.id, change.id));
  expect([stored!.status, stored!.withdrawReason]).toEqual(["withdrawn", OPEN_CHANGE_ORDER_REASON]);
  const withdrawnEvents = await db
    .select()
    .from(leadEvents)
    .where(and(eq(leadEvents.leadId, lead.id), eq(leadEvents.kind, "change-order-withdrawn")));
  expect(withdrawnEvents.map((e) => e.detail)).toEqual([
    `${parseProposalDocument(change.documentJson).number} withdrawn unsigned: ${OPEN_CHANGE_ORDER_REASON}`,
  ]);
  const signingStored = await acceptProposal({
    proposal: stored!,
    lead,
    document: parseProposalDocument(stored!.documentJson),
    input: { name: lead.customerName, ip: "203.0.113.9", userAgent: "test", chosenKeys: [] },
  });
  expect(signingStored).toMatchObject({ ok: false, status: 409, message: /can no longer be signed/ });
  // The balance stays what it was when the job was marked built.
  expect((await balanceOf(lead.id)).amountCents).toBe(balance.amountCents);
});
