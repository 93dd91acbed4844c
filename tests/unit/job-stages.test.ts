/*
 * A job's stage follows what is true of it. The stage names and the moves allowed by hand are the
 * product's own (common practice, no source): a hardscaper calls back, books the consult, measures
 * the yard, sends the proposal, and the job is signed when the deposit is in.
 */
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import { expect, test } from "vitest";
import { bookings, leads } from "~/db/schema";
import { applyPaymentEvent, cancelBooking, holdSlot, listCompanySlots } from "~/lib/consults/booking.server";
import { db } from "~/lib/platform/db.server";
import { allowedMoves, describeNextStep, stepOf } from "~/lib/leads/lead-status";
import { demoCompany } from "./support/demo";
import { createTestLead } from "./support/leads";

let seq = 0;

async function paidConsult(stage: "request" | "called-back" = "request") {
  const { company } = await demoCompany();
  const created = await createTestLead(company);
  if (stage === "called-back")
    await db
      .update(leads)
      .set({ status: "called-back", calledBackAt: new Date().toISOString() })
      .where(eq(leads.id, created.id));
  const [lead] = await db.select().from(leads).where(eq(leads.id, created.id));
  const slots = await listCompanySlots(company);
  const slot = slots[Math.floor(Math.random() * slots.length)]!;
  const held = await holdSlot({ company, lead: lead!, startsAt: slot.startsAt, customerTimeZone: null });
  // As startCheckout records it once the payment service has opened the session.
  const [booking] = (await db
    .update(bookings)
    .set({ checkoutSessionId: `cs_stage_${held.id}` })
    .where(eq(bookings.id, held.id))
    .returning()) as [typeof held];
  seq += 1;
  const event = {
    id: `evt_stage_${Date.now()}_${seq}`,
    object: "event",
    type: "checkout.session.completed",
    created: Math.floor(Date.now() / 1000),
    data: {
      object: {
        id: `cs_stage_${booking.id}`,
        object: "checkout.session",
        payment_status: "paid",
        status: "complete",
        amount_total: booking.amountCents,
        currency: "usd",
        payment_intent: `pi_stage_${booking.id}`,
        metadata: { booking_id: String(booking.id) },
      },
    },
  } as unknown as Stripe.Event;
  expect(await applyPaymentEvent(event)).toBe("applied");
  return { company, booking, leadId: lead!.id };
}

const stageOf = async (leadId: number) => (await db.select().from(leads).where(eq(leads.id, leadId)))[0]!;

test("a paid consult puts the request at “consult booked”; the homeowner cancelling it puts the request back to “request in”", async () => {
  const { company, booking, leadId } = await paidConsult();
  expect((await stageOf(leadId)).status).toBe("consult-booked");
  const farAhead = new Date(new Date(booking.startsAt).getTime() - 3 * 86_400_000);
  await cancelBooking({
    bookingId: booking.id,
    companyId: company.id,
    by: "homeowner",
    actorUserId: null,
    now: farAhead,
  });
  expect((await db.select().from(bookings).where(eq(bookings.id, booking.id)))[0]!.status).toBe("cancelled");
  expect((await stageOf(leadId)).status).toBe("request");
});

test("the office cancelling the consult of a request it had called back puts it back to “called back”", async () => {
  const { company, booking, leadId } = await paidConsult("called-back");
  expect((await stageOf(leadId)).status).toBe("consult-booked");
  await cancelBooking({ bookingId: booking.id, companyId: company.id, by: "staff", actorUserId: null });
  expect((await stageOf(leadId)).status).toBe("called-back");
});

test("a job put on hold at “consult booked” whose consult is then cancelled picks up again at the step still true", async () => {
  const { company, booking, leadId } = await paidConsult("called-back");
  await db
    .update(leads)
    .set({ status: "on-hold", pausedStage: "consult-booked", stopReason: "Away for a month." })
    .where(eq(leads.id, leadId));
  await cancelBooking({ bookingId: booking.id, companyId: company.id, by: "staff", actorUserId: null });
  expect(await stageOf(leadId)).toMatchObject({ status: "on-hold", pausedStage: "called-back" });
});

test("a cancelled consult leaves later stages alone: a job already past the consult keeps its stage", async () => {
  const { company, booking, leadId } = await paidConsult();
  await db.update(leads).set({ status: "signed" }).where(eq(leads.id, leadId));
  await cancelBooking({ bookingId: booking.id, companyId: company.id, by: "staff", actorUserId: null });
  expect((await stageOf(leadId)).status).toBe("signed");
});

test("the moves by hand: a request can be called back, held or dropped; a stopped job picks up where it stopped", () => {
  expect(allowedMoves("request", null).map((m) => m.to)).toEqual(["called-back", "on-hold", "not-going-ahead"]);
  expect(allowedMoves("proposal-out", null).map((m) => m.to)).toEqual(["on-hold", "not-going-ahead"]);
  expect(allowedMoves("signed", null).map((m) => m.to)).toEqual(["stone-ordered", "on-hold"]);
  expect(allowedMoves("paid-in-full", null)).toEqual([]);
  expect(allowedMoves("on-hold", "measured").map((m) => m.to)).toEqual(["measured", "not-going-ahead"]);
  expect(allowedMoves("on-hold", "build-booked").map((m) => m.to)).toEqual(["build-booked"]);
  expect(stepOf("not-going-ahead", "proposal-out")).toBe("proposal-out");
});

test("the lead page leads with the next step for the person looking: the office is told what to do, the crew to build", () => {
  const facts = { firstName: "Wren", consultLabel: null, proposal: null, openChangeOrder: false, stopReason: null };
  expect(describeNextStep("measured", null, true, facts).title).toBe("Send the proposal");
  expect(
    describeNextStep("proposal-out", null, true, { ...facts, proposal: { state: "sent", opened: false } }),
  ).toEqual({
    title: "Waiting for the signature",
    detail: "Wren has not opened the proposal yet.",
  });
  expect(
    describeNextStep("proposal-out", null, true, { ...facts, proposal: { state: "accepted", opened: true } }).title,
  ).toBe("Waiting for the deposit");
  expect(describeNextStep("signed", null, false, facts).title).toBe("Build it");
});
