import { and, count, eq, like } from "drizzle-orm";
import Stripe from "stripe";
import { expect, test, vi } from "vitest";
import { bookings, emailOutbox, leads, paymentEvents } from "~/db/schema";
import { holdSlot, listCompanySlots, SlotUnavailableError } from "~/lib/consults/booking.server";
import { db } from "~/lib/platform/db.server";
import { env } from "~/lib/platform/env.server";
import { action } from "~/routes/api/webhooks-stripe";
import { demoCompany, routeArgs } from "./support/demo";
import { createTestLead } from "./support/leads";

const stripe = new Stripe("sk_test_local");
let eventSeq = 0;

// What the payment service sends for a checkout we opened: the booking's own session, amount and currency.
function completedEvent(bookingId: number, overrides: Record<string, unknown> = {}) {
  eventSeq += 1;
  return {
    id: `evt_test_${Date.now()}_${eventSeq}`,
    object: "event",
    type: "checkout.session.completed",
    created: Math.floor(Date.now() / 1000),
    data: {
      object: {
        id: `cs_test_${bookingId}`,
        object: "checkout.session",
        payment_status: "paid",
        status: "complete",
        payment_intent: `pi_test_${bookingId}`,
        amount_total: 15000,
        currency: "usd",
        client_reference_id: String(bookingId),
        metadata: { booking_id: String(bookingId) },
        ...overrides,
      },
    },
  };
}

/** Posts a webhook the way the payment service does: the raw body, signed with the shared secret. */
async function deliver(payload: string, header?: string) {
  const signature = header ?? stripe.webhooks.generateTestHeaderString({ payload, secret: env.STRIPE_WEBHOOK_SECRET });
  const request = new Request("http://localhost/api/webhooks/stripe", {
    method: "POST",
    body: payload,
    headers: { "Stripe-Signature": signature, "Content-Type": "application/json" },
  });
  const response = (await action(routeArgs(request))) as Response;
  return { status: response.status, json: await response.json() };
}

async function heldBooking() {
  const { company } = await demoCompany();
  const lead = await createTestLead(company);
  const [leadRow] = await db.select().from(leads).where(eq(leads.id, lead.id));
  const slots = await listCompanySlots(company);
  // Each test takes its own slot, so tests never race each other for one.
  const slot = slots[Math.floor(Math.random() * slots.length)]!;
  const held = await holdSlot({
    company,
    lead: leadRow!,
    startsAt: slot.startsAt,
    customerTimeZone: "America/New_York",
  });
  // As startCheckout records it once the payment service has opened the session.
  const [booking] = await db
    .update(bookings)
    .set({ checkoutSessionId: `cs_test_${held.id}` })
    .where(eq(bookings.id, held.id))
    .returning();
  expect(booking!.amountCents).toBe(15000);
  return { company, lead: leadRow!, booking: booking! };
}

const outboxFor = async (bookingId: number) =>
  (
    await db
      .select({ n: count() })
      .from(emailOutbox)
      .where(like(emailOutbox.idempotencyKey, `consult-%/${bookingId}`))
  )[0]!.n;

test("a signed completed event confirms the booking, marks it paid and queues three e-mails (two confirmations, one reminder)", async () => {
  const { booking } = await heldBooking();
  const { status } = await deliver(JSON.stringify(completedEvent(booking.id)));
  expect(status).toBe(200);
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row).toMatchObject({ status: "confirmed", isPaid: true, paymentIntentId: `pi_test_${booking.id}` });
  expect(await outboxFor(booking.id)).toBe(3);
  const [confirmation] = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.idempotencyKey, `consult-confirmed/${booking.id}`));
  const [ics] = JSON.parse(confirmation!.attachmentsJson) as { filename: string; content: string }[];
  expect(ics!.filename).toBe("design-consult.ics");
  // RFC 5545: a calendar starts BEGIN:VCALENDAR and the event carries DTSTART in UTC.
  const text = Buffer.from(ics!.content, "base64").toString();
  expect(text).toMatch(/^BEGIN:VCALENDAR/);
  expect(text).toContain(`DTSTART:${booking.startsAt.replace(/[-:]/g, "").replace(/\.\d{3}/, "")}`);
});

test.each([
  [
    "a bad signature",
    (_payload: string) => `t=${Math.floor(Date.now() / 1000)},v1=${"0".repeat(64)}`,
    (p: string) => p,
  ],
  [
    "a stale timestamp (over 300 s old)",
    (payload: string) =>
      stripe.webhooks.generateTestHeaderString({
        payload,
        secret: env.STRIPE_WEBHOOK_SECRET,
        timestamp: Math.floor(Date.now() / 1000) - 600,
      }),
    (p: string) => p,
  ],
  [
    "a re-serialised body",
    (payload: string) => stripe.webhooks.generateTestHeaderString({ payload, secret: env.STRIPE_WEBHOOK_SECRET }),
    (p: string) => JSON.stringify(JSON.parse(p), null, 2),
  ],
])("%s answers 400 and changes nothing", async (_label, sign, alter) => {
  const { booking } = await heldBooking();
  const event = completedEvent(booking.id);
  const payload = JSON.stringify(event);
  const { status } = await deliver(alter(payload), sign(payload));
  expect(status).toBe(400);
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row!.status).toBe("held");
  expect(await db.select().from(paymentEvents).where(eq(paymentEvents.id, event.id))).toHaveLength(0);
  expect(await outboxFor(booking.id)).toBe(0);
});

test("the same event twice, also at the same moment, books once and queues one set of e-mails", async () => {
  const { booking } = await heldBooking();
  const payload = JSON.stringify(completedEvent(booking.id));
  const answers = await Promise.all([deliver(payload), deliver(payload), deliver(payload)]);
  expect(answers.map((a) => a.status)).toEqual([200, 200, 200]);
  expect(answers.map((a) => a.json.outcome).sort()).toEqual(["applied", "duplicate", "duplicate"]);
  expect(await outboxFor(booking.id)).toBe(3);
  expect((await deliver(payload)).json.outcome).toBe("duplicate");
});

test("an expired event after the payment leaves the booking paid (states only move forward)", async () => {
  const { booking } = await heldBooking();
  await deliver(JSON.stringify(completedEvent(booking.id)));
  eventSeq += 1;
  const expired = {
    ...completedEvent(booking.id, { status: "expired", payment_status: "unpaid" }),
    type: "checkout.session.expired",
  };
  expect((await deliver(JSON.stringify(expired))).status).toBe(200);
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row).toMatchObject({ status: "confirmed", isPaid: true });
});

test("an expired event for an unpaid hold frees the slot", async () => {
  const { booking, company } = await heldBooking();
  const expired = {
    ...completedEvent(booking.id, { status: "expired", payment_status: "unpaid" }),
    type: "checkout.session.expired",
  };
  await deliver(JSON.stringify(expired));
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row!.status).toBe("expired");
  expect((await listCompanySlots(company)).some((s) => s.startsAt === booking.startsAt)).toBe(true);
});

test("two people racing for one slot: exactly one hold wins, the other is told the time is gone", async () => {
  const { company } = await demoCompany();
  const slot = (await listCompanySlots(company))[0]!;
  const people = await Promise.all(Array.from({ length: 6 }, () => createTestLead(company)));
  const rows = await Promise.all(
    people.map(async (p) => (await db.select().from(leads).where(eq(leads.id, p.id)))[0]!),
  );
  const results = await Promise.allSettled(
    rows.map((lead) => holdSlot({ company, lead, startsAt: slot.startsAt, customerTimeZone: null })),
  );
  expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
  for (const r of results.filter((r) => r.status === "rejected"))
    expect((r as PromiseRejectedResult).reason).toBeInstanceOf(SlotUnavailableError);
  const holders = await db
    .select()
    .from(bookings)
    .where(and(eq(bookings.companyId, company.id), eq(bookings.startsAt, slot.startsAt)));
  expect(holders.filter((b) => b.status === "held" || b.status === "confirmed")).toHaveLength(1);
});

test("a payment that lands after its hold lapsed and the slot went to someone else is refunded, not double-booked", async () => {
  const { booking, company } = await heldBooking();
  await db.update(bookings).set({ status: "expired" }).where(eq(bookings.id, booking.id));
  const rival = await createTestLead(company);
  const [rivalLead] = await db.select().from(leads).where(eq(leads.id, rival.id));
  await holdSlot({ company, lead: rivalLead!, startsAt: booking.startsAt, customerTimeZone: null });
  await deliver(JSON.stringify(completedEvent(booking.id)));
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row).toMatchObject({ status: "cancelled", isPaid: true, cancelReason: "slot-taken", refundId: null });
  // The homeowner is told: the cancellation e-mail says the fee is refunded.
  const [mail] = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.idempotencyKey, `consult-cancelled/${booking.id}`));
  expect(mail!.text).toMatch(/refunded/);
});

test("out of order: an expiry that arrives before the payment it raced still ends with a paid, confirmed booking when the slot is free", async () => {
  const { booking } = await heldBooking();
  const expired = {
    ...completedEvent(booking.id, { status: "expired", payment_status: "unpaid" }),
    type: "checkout.session.expired",
  };
  const completed = completedEvent(booking.id);
  await deliver(JSON.stringify(expired));
  await deliver(JSON.stringify(completed));
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row).toMatchObject({ status: "confirmed", isPaid: true });
});

test.each([
  ["another checkout session", { id: "cs_test_forged" }],
  ["a smaller amount", { amount_total: 100 }],
  ["another currency", { currency: "jpy" }],
])("a signed paid-checkout event naming %s changes nothing and is logged", async (_label, overrides) => {
  const { booking } = await heldBooking();
  const event = completedEvent(booking.id, overrides);
  const warn = vi.spyOn(console, "warn").mockImplementation(() => {});
  try {
    const { status, json } = await deliver(JSON.stringify(event));
    expect(status).toBe(200);
    expect(json.outcome).toBe("rejected");
    expect(warn).toHaveBeenCalledTimes(1);
    expect(String(warn.mock.calls[0]![0])).toContain(`booking ${booking.id}`);
  } finally {
    warn.mockRestore();
  }
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row).toMatchObject({ status: "held", isPaid: false, paymentIntentId: null });
  expect(await db.select().from(paymentEvents).where(eq(paymentEvents.id, event.id))).toHaveLength(0);
  expect(await outboxFor(booking.id)).toBe(0);
  // The genuine event still books it afterwards.
  expect((await deliver(JSON.stringify(completedEvent(booking.id)))).json.outcome).toBe("applied");
});

test("a part of a paid consult refunded by hand does not mark it refunded; the whole payment refunded does", async () => {
  const { booking } = await heldBooking();
  await deliver(JSON.stringify(completedEvent(booking.id)));
  const [paid] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  const refundNotice = (amountRefunded: number, refundId: string) => {
    eventSeq += 1;
    return {
      id: `evt_test_${Date.now()}_${eventSeq}`,
      object: "event",
      type: "charge.refunded",
      created: Math.floor(Date.now() / 1000),
      data: {
        object: {
          id: `ch_part_${booking.id}`,
          object: "charge",
          amount: paid!.amountCents,
          amount_refunded: amountRefunded,
          payment_intent: paid!.paymentIntentId,
          metadata: { booking_id: String(booking.id) },
          refunds: { data: [{ id: refundId }] },
        },
      },
    };
  };
  expect((await deliver(JSON.stringify(refundNotice(1_000, "re_part")))).json.outcome).toBe("applied");
  expect((await db.select().from(bookings).where(eq(bookings.id, booking.id)))[0]).toMatchObject({
    refundId: null,
    refundedAt: null,
  });
  expect((await deliver(JSON.stringify(refundNotice(paid!.amountCents, "re_whole")))).json.outcome).toBe("applied");
  expect((await db.select().from(bookings).where(eq(bookings.id, booking.id)))[0]!.refundId).toBe("re_whole");
});

test("a signed refund event naming another payment does not mark a paid consult refunded", async () => {
  const { booking } = await heldBooking();
  await deliver(JSON.stringify(completedEvent(booking.id)));
  eventSeq += 1;
  const forged = {
    id: `evt_test_${Date.now()}_${eventSeq}`,
    object: "event",
    type: "charge.refunded",
    created: Math.floor(Date.now() / 1000),
    data: {
      object: {
        id: "ch_forged",
        object: "charge",
        payment_intent: "pi_someone_else",
        refunded: true,
        metadata: { booking_id: String(booking.id) },
        refunds: { data: [{ id: "re_forged" }] },
      },
    },
  };
  const warn = vi.spyOn(console, "warn").mockImplementation(() => {});
  try {
    expect((await deliver(JSON.stringify(forged))).json.outcome).toBe("rejected");
    expect(warn).toHaveBeenCalledTimes(1);
  } finally {
    warn.mockRestore();
  }
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row).toMatchObject({ status: "confirmed", isPaid: true, refundId: null, refundedAt: null });
});
