import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq, like } from "drizzle-orm";
import { afterAll, beforeAll, expect, test } from "vitest";
import { bookings, emailOutbox, leadEvents, leads } from "~/db/schema";
import {
  cancelBooking,
  cancelRefusalStatus,
  holdSlot,
  listCompanySlots,
  processRefunds,
  startCheckout,
} from "~/lib/consults/booking.server";
import { db } from "~/lib/platform/db.server";
import { createStripe } from "~/lib/platform/payments.server";
import { startPaymentsFake, type PaymentsFake } from "../../fakes/payments/server";
import { demoCompany } from "./support/demo";
import { createTestLead } from "./support/leads";

let fake: PaymentsFake;
beforeAll(async () => {
  fake = await startPaymentsFake({
    port: 0,
    webhookUrl: null,
    stateFile: path.join(mkdtempSync(path.join(tmpdir(), "ew-pay-")), "state.json"),
    log: () => {},
  });
});
afterAll(() => fake.close());

const control = async (pathName: string, body?: unknown) => {
  const res = await fetch(
    `${fake.url}/_fake/${pathName}`,
    body === undefined
      ? {}
      : { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json" } },
  );
  return res.json();
};

async function heldBooking() {
  const { company } = await demoCompany();
  const { id } = await createTestLead(company);
  const [lead] = await db.select().from(leads).where(eq(leads.id, id));
  const slots = await listCompanySlots(company);
  const slot = slots[Math.floor(Math.random() * slots.length)]!;
  const booking = await holdSlot({ company, lead: lead!, startsAt: slot.startsAt, customerTimeZone: null });
  return { company, lead: lead!, booking };
}

test("checkout opens with our own idempotency key: a retry returns the same session, not a second one", async () => {
  const client = createStripe(fake.url);
  const { company, lead, booking } = await heldBooking();
  const first = await startCheckout({
    booking,
    company,
    lead,
    origin: "http://localhost",
    basePath: "/c/x/consult/y",
    client,
  });
  const second = await startCheckout({
    booking,
    company,
    lead,
    origin: "http://localhost",
    basePath: "/c/x/consult/y",
    client,
  });
  expect(second).toBe(first);
  const requests = (await control("requests")) as { data: { idempotencyKey?: string; idempotency_key?: string }[] };
  expect(JSON.stringify(requests)).toContain(`checkout:${booking.id}`);
});

test("with the payment service down, checkout fails loudly, nothing is charged and the slot stays held for a retry", async () => {
  const client = createStripe(fake.url);
  const { company, lead, booking } = await heldBooking();
  await control("fail-next", { down: true });
  await expect(
    startCheckout({ booking, company, lead, origin: "http://localhost", basePath: "/c/x/consult/y", client }),
  ).rejects.toThrow();
  await control("fail-next", { down: false });
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row).toMatchObject({ status: "held", isPaid: false, checkoutSessionId: null });
  const url = await startCheckout({
    booking,
    company,
    lead,
    origin: "http://localhost",
    basePath: "/c/x/consult/y",
    client,
  });
  expect(url).toContain("/pay/");
});

test("a staff cancellation of a paid consult is refunded once, keyed refund:<booking>, however often the worker runs", async () => {
  const client = createStripe(fake.url);
  const { company, lead, booking } = await heldBooking();
  await startCheckout({ booking, company, lead, origin: "http://localhost", basePath: "/c/x/consult/y", client });
  const [withSession] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  await control(`sessions/${withSession!.checkoutSessionId}/pay`, { card: "4242424242424242" });
  const session = await client.checkout.sessions.retrieve(withSession!.checkoutSessionId!);
  await db
    .update(bookings)
    .set({ status: "confirmed", isPaid: true, paymentIntentId: String(session.payment_intent) })
    .where(eq(bookings.id, booking.id));

  await cancelBooking({ bookingId: booking.id, companyId: company.id, by: "staff", actorUserId: null });
  await Promise.all([processRefunds(client), processRefunds(client)]);
  await processRefunds(client);
  const refunds = (await control("refunds")) as { data: { payment_intent: string }[] };
  expect(refunds.data.filter((r) => r.payment_intent === String(session.payment_intent))).toHaveLength(1);
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row!.refundId).toMatch(/^re_/);
});

test("a homeowner cannot cancel online within 24 hours of the consult", async () => {
  const { company, booking } = await heldBooking();
  await db.update(bookings).set({ status: "confirmed" }).where(eq(bookings.id, booking.id));
  const now = new Date(new Date(booking.startsAt).getTime() - 3 * 3_600_000);
  const refused = await cancelBooking({
    bookingId: booking.id,
    companyId: company.id,
    by: "homeowner",
    actorUserId: null,
    now,
  });
  expect(refused).toMatchObject({ ok: false, reason: "too-late" });
  expect((await db.select().from(bookings).where(eq(bookings.id, booking.id)))[0]!.status).toBe("confirmed");
});

test("the app down between payment and webhook: the service retries, and the retry confirms the booking once the app is back", async () => {
  const { createServer } = await import("node:http");
  const { action } = await import("~/routes/api/webhooks-stripe");
  const { routeArgs } = await import("./support/demo");
  // A stand-in for the app's webhook endpoint, on a fixed port we can take down and bring back.
  const probe = createServer();
  await new Promise<void>((resolve) => probe.listen(0, "127.0.0.1", resolve));
  const port = (probe.address() as { port: number }).port;
  await new Promise<void>((resolve) => probe.close(() => resolve()));

  const stateFile = path.join(mkdtempSync(path.join(tmpdir(), "ew-pay-")), "state.json");
  const retrying = await startPaymentsFake({
    port: 0,
    webhookUrl: `http://127.0.0.1:${port}/api/webhooks/stripe`,
    stateFile,
    retryBaseMs: 100,
    retryMaxMs: 300,
    log: () => {},
  });
  try {
    const client = createStripe(retrying.url);
    const { company, lead, booking } = await heldBooking();
    await startCheckout({ booking, company, lead, origin: "http://localhost", basePath: "/c/x/consult/y", client });
    const [withSession] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
    await fetch(`${retrying.url}/_fake/sessions/${withSession!.checkoutSessionId}/pay`, {
      method: "POST",
      body: JSON.stringify({ card: "4242424242424242" }),
      headers: { "Content-Type": "application/json" },
    });
    // Nothing listens yet: deliveries fail and are retried with backoff.
    await new Promise((r) => setTimeout(r, 400));
    expect((await db.select().from(bookings).where(eq(bookings.id, booking.id)))[0]!.status).toBe("held");

    const app = createServer(async (req, res) => {
      const chunks: Buffer[] = [];
      for await (const chunk of req) chunks.push(chunk as Buffer);
      const request = new Request(`http://127.0.0.1:${port}${req.url}`, {
        method: "POST",
        body: Buffer.concat(chunks),
        headers: req.headers as Record<string, string>,
      });
      const response = (await action(routeArgs(request))) as Response;
      res.writeHead(response.status, { "Content-Type": "application/json" }).end(await response.text());
    });
    await new Promise<void>((resolve) => app.listen(port, "127.0.0.1", resolve));
    try {
      await expect
        .poll(async () => (await db.select().from(bookings).where(eq(bookings.id, booking.id)))[0]!.status, {
          timeout: 10_000,
        })
        .toBe("confirmed");
    } finally {
      await new Promise<void>((resolve) => app.close(() => resolve()));
    }
  } finally {
    await retrying.close();
  }
});

test("a checkout opened for a held slot closes five minutes before the hold does, not after the payment service's 24-hour default", async () => {
  const client = createStripe(fake.url);
  const { company, lead, booking } = await heldBooking();
  await startCheckout({ booking, company, lead, origin: "http://localhost", basePath: "/c/x/consult/y", client });
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  const session = await client.checkout.sessions.retrieve(row!.checkoutSessionId!);
  const holdEndsSec = Math.floor(new Date(row!.holdExpiresAt).getTime() / 1000);
  expect(session.expires_at).toBe(holdEndsSec - 5 * 60);
  // The service accepts 30 minutes to 24 hours ahead (Stripe Checkout docs, "Manage limited inventory").
  const nowSec = Math.floor(Date.now() / 1000);
  expect(session.expires_at).toBeGreaterThanOrEqual(nowSec + 30 * 60);
  expect(session.expires_at).toBeLessThanOrEqual(nowSec + 40 * 60);
});

test("a checkout retried long after the first try failed renews the hold, so the service accepts its expiry", async () => {
  const client = createStripe(fake.url);
  const { company, lead, booking } = await heldBooking();
  // Held twenty minutes ago; the service was down then, so no checkout was opened.
  const [older] = await db
    .update(bookings)
    .set({ holdExpiresAt: new Date(Date.now() + 20 * 60_000).toISOString() })
    .where(eq(bookings.id, booking.id))
    .returning();
  const url = await startCheckout({
    booking: older!,
    company,
    lead,
    origin: "http://localhost",
    basePath: "/c/x/consult/y",
    client,
  });
  expect(url).toContain("/pay/");
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(new Date(row!.holdExpiresAt).getTime()).toBeGreaterThan(Date.now() + 39 * 60_000);
  const session = await client.checkout.sessions.retrieve(row!.checkoutSessionId!);
  expect(session.expires_at).toBe(Math.floor(new Date(row!.holdExpiresAt).getTime() / 1000) - 5 * 60);
});

test("two cancels of one paid consult at the same moment: one cancels, the other is told it changed; one refund, one set of e-mails, one timeline entry", async () => {
  const client = createStripe(fake.url);
  const { company, lead, booking } = await heldBooking();
  await startCheckout({ booking, company, lead, origin: "http://localhost", basePath: "/c/x/consult/y", client });
  const [withSession] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  await control(`sessions/${withSession!.checkoutSessionId}/pay`, { card: "4242424242424242" });
  const session = await client.checkout.sessions.retrieve(withSession!.checkoutSessionId!);
  await db
    .update(bookings)
    .set({ status: "confirmed", isPaid: true, paymentIntentId: String(session.payment_intent) })
    .where(eq(bookings.id, booking.id));

  const results = await Promise.all([
    cancelBooking({ bookingId: booking.id, companyId: company.id, by: "staff", actorUserId: null }),
    cancelBooking({ bookingId: booking.id, companyId: company.id, by: "staff", actorUserId: null }),
  ]);
  expect(results.filter((r) => r.ok)).toHaveLength(1);
  const refused = results.find((r) => !r.ok);
  // Told it changed, or (had the first already finished when it read) that it is no longer booked: a conflict either
  // way.
  expect(refused && !refused.ok && cancelRefusalStatus(refused)).toBe(409);

  await processRefunds(client);
  await processRefunds(client);
  const refunds = (await control("refunds")) as { data: { payment_intent: string }[] };
  expect(refunds.data.filter((r) => r.payment_intent === String(session.payment_intent))).toHaveLength(1);
  const events = await db
    .select()
    .from(leadEvents)
    .where(and(eq(leadEvents.leadId, lead.id), eq(leadEvents.kind, "consult-cancelled")));
  expect(events).toHaveLength(1);
  expect(
    await db
      .select()
      .from(emailOutbox)
      .where(like(emailOutbox.idempotencyKey, `consult-cancelled%/${booking.id}`)),
  ).toHaveLength(2);
});

test("the hosted checkout names the contractor being paid, not the product: the line item and its note carry the company's name", async () => {
  const client = createStripe(fake.url);
  const { company, lead, booking } = await heldBooking();
  const url = await startCheckout({
    booking,
    company,
    lead,
    origin: "http://localhost",
    basePath: "/c/x/consult/y",
    client,
  });
  const page = await (await fetch(url)).text();
  // The stand-in escapes HTML as the real page would show text: "&" arrives as "&amp;".
  const shown = page.replace(/&amp;/g, "&");
  expect(shown).toContain(`Fire pit design consult with ${company.name}`);
  expect(shown).toContain(`Paid to ${company.name} for a visit to ${lead.street}, ${lead.town}`);
});
