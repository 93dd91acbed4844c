import { and, eq, gt, inArray, isNotNull, isNull, lt, sql } from "drizzle-orm";
import { createEvent } from "ics";
import type Stripe from "stripe";
import {
  bookings,
  companies,
  consultBlockedDays,
  emailOutbox,
  leadEvents,
  leads,
  paymentEvents,
  type Booking,
  type Company,
  type Lead,
} from "~/db/schema";
import {
  ConsultCancelledEmail,
  ConsultCancelledOfficeEmail,
  ConsultConfirmedEmail,
  ConsultMovedEmail,
  ConsultMovedOfficeEmail,
  ConsultReminderEmail,
} from "~/emails/consult-emails";
import { db, writeTransaction, type Db } from "~/lib/platform/db.server";
import { prepareOutboxRow } from "~/lib/platform/email.server";
import { WORKER_ID } from "~/lib/jobs/jobs.server";
import {
  noticeCoversRefund,
  sendOwedRefunds,
  tableRefundQueue,
  type RefundQueue,
} from "~/lib/jobs/refund-queue.server";
import {
  checkReschedule,
  CONSULT_HOLD_MINUTES,
  formatSlot,
  HOMEOWNER_CHANGE_CUTOFF_HOURS,
  listFreeSlots,
  parseWeeklyHours,
  type Slot,
} from "~/lib/consults/consult-slots";
import { settleStageStatements } from "~/lib/leads/job-stage.server";
import { formatMoney } from "~/lib/format/money";
import { formatPhone } from "~/lib/format/phone";
import { stripe as defaultStripe } from "~/lib/platform/payments.server";
import { readStoredDesign } from "~/lib/design/stored-plan";
import { possessive } from "~/lib/format/wording";

/*
 * Paid design consults. A booking holds its slot from the moment checkout starts (the partial
 * unique index on bookings makes a second holder impossible), the signed webhook confirms it,
 * expiry releases it, and refunds go out from a worker with idempotency keys, never from inside
 * a webhook or a transaction.
 */

// How long a slot is held for a homeowner who is paying. The Checkout Session is opened with an
// `expires_at` five minutes before the hold ends (the service's own default is 24 hours, far
// longer than any hold), so a payment can only complete while the slot is still held; its expiry
// event then releases the slot, and releaseLapsedHolds does if that event never comes.
const HOLD_MINUTES = CONSULT_HOLD_MINUTES;
const CHECKOUT_CLOSES_BEFORE_HOLD_MS = 5 * 60_000;
// The service accepts expires_at from 30 minutes to 24 hours ahead ("Manage limited inventory",
// Stripe Checkout docs); one minute more covers the difference between its clock and ours.
const MIN_CHECKOUT_OPEN_MS = 31 * 60_000;
export const HOMEOWNER_CANCEL_CUTOFF_HOURS = HOMEOWNER_CHANGE_CUTOFF_HOURS;

export class SlotUnavailableError extends Error {}

const isUniqueViolation = (error: unknown) =>
  /UNIQUE constraint failed/i.test(String((error as { message?: string })?.message ?? error)) ||
  /UNIQUE constraint failed/i.test(String((error as { cause?: { message?: string } })?.cause?.message ?? ""));

/**
 * Marks holds whose time ran out as expired, freeing their slots; returns the ids it released.
 * One conditional UPDATE: however many processes run it at once, each hold is released once.
 */
export async function releaseLapsedHolds(now = new Date(), database: Db = db): Promise<number[]> {
  const released = await database
    .update(bookings)
    .set({ status: "expired", updatedAt: now.toISOString() })
    .where(and(eq(bookings.status, "held"), lt(bookings.holdExpiresAt, now.toISOString())))
    .returning({ id: bookings.id });
  return released.map((r) => r.id);
}

/** Free consult slots of a company from now to its horizon. */
export async function listCompanySlots(company: Company, now = new Date()): Promise<Slot[]> {
  await releaseLapsedHolds(now);
  const [blocked, taken] = await Promise.all([
    db
      .select({ day: consultBlockedDays.day })
      .from(consultBlockedDays)
      .where(eq(consultBlockedDays.companyId, company.id)),
    db
      .select({ startsAt: bookings.startsAt })
      .from(bookings)
      .where(
        and(
          eq(bookings.companyId, company.id),
          inArray(bookings.status, ["held", "confirmed"]),
          gt(bookings.startsAt, now.toISOString()),
        ),
      ),
  ]);
  return listFreeSlots({
    hours: parseWeeklyHours(company.consultHoursJson),
    slotMinutes: company.consultSlotMinutes,
    horizonDays: company.consultHorizonDays,
    timeZone: company.timeZone,
    blockedDays: new Set(blocked.map((b) => b.day)),
    takenStarts: new Set(taken.map((t) => t.startsAt)),
    now,
  });
}

/** The lead's current live booking (held or confirmed), if any. */
export async function findLiveBooking(leadId: number): Promise<Booking | null> {
  const [row] = await db
    .select()
    .from(bookings)
    .where(and(eq(bookings.leadId, leadId), inArray(bookings.status, ["held", "confirmed"])))
    .limit(1);
  return row ?? null;
}

/**
 * Holds a slot for a lead. Throws SlotUnavailableError when the slot is not offered or another
 * booking holds it (the database decides, not a check-then-write).
 */
export async function holdSlot(args: {
  company: Company;
  lead: Lead;
  startsAt: string;
  customerTimeZone: string | null;
  now?: Date;
}): Promise<Booking> {
  const now = args.now ?? new Date();
  const slot = (await listCompanySlots(args.company, now)).find((s) => s.startsAt === args.startsAt);
  if (!slot) throw new SlotUnavailableError("That time is no longer free. Pick another.");
  try {
    const [row] = await db
      .insert(bookings)
      .values({
        companyId: args.company.id,
        leadId: args.lead.id,
        homeownerId: args.lead.homeownerId,
        startsAt: slot.startsAt,
        endsAt: slot.endsAt,
        status: "held",
        holdExpiresAt: new Date(now.getTime() + HOLD_MINUTES * 60_000).toISOString(),
        amountCents: args.company.consultFeeCents,
        customerTimeZone: args.customerTimeZone,
      })
      .returning();
    return row!;
  } catch (error) {
    if (isUniqueViolation(error))
      throw new SlotUnavailableError("Someone booked that time a moment ago. Pick another.");
    throw error;
  }
}

/**
 * Opens (or, on a retry, reopens) the hosted checkout for a held booking; returns its URL. The
 * checkout closes five minutes before the hold does. When the first try failed long enough ago
 * that too little hold is left to open one, the hold is renewed first.
 */
export async function startCheckout(args: {
  booking: Booking;
  company: Company;
  lead: Lead;
  origin: string;
  basePath: string;
  client?: Stripe;
  now?: Date;
}): Promise<string> {
  const client = args.client ?? defaultStripe;
  const now = (args.now ?? new Date()).getTime();
  const { company, lead, origin, basePath } = args;
  let booking = args.booking;
  if (
    !booking.checkoutSessionId &&
    new Date(booking.holdExpiresAt).getTime() - CHECKOUT_CLOSES_BEFORE_HOLD_MS - now < MIN_CHECKOUT_OPEN_MS
  ) {
    const [renewed] = await db
      .update(bookings)
      .set({
        holdExpiresAt: new Date(now + HOLD_MINUTES * 60_000).toISOString(),
        updatedAt: new Date(now).toISOString(),
      })
      .where(and(eq(bookings.id, booking.id), eq(bookings.status, "held"), isNull(bookings.checkoutSessionId)))
      .returning();
    if (!renewed) throw new SlotUnavailableError("Your hold on that time ran out. Pick a time again.");
    booking = renewed;
  }
  const expiresAt = Math.floor((new Date(booking.holdExpiresAt).getTime() - CHECKOUT_CLOSES_BEFORE_HOLD_MS) / 1000);
  const session = await client.checkout.sessions.create(
    {
      mode: "payment",
      expires_at: expiresAt,
      line_items: [
        {
          price_data: {
            currency: booking.currency,
            unit_amount: booking.amountCents,
            // The hosted page lists the line item: it names the contractor being paid, and for what.
            product_data: {
              name: `Fire pit design consult with ${company.name}`,
              description: `Paid to ${company.name} for a visit to ${lead.street}, ${lead.town}; credited toward the build.`,
            },
          },
          quantity: 1,
        },
      ],
      // Shown beside the pay button by the hosted checkout (the local stand-in accepts it and does not draw it).
      custom_text: {
        submit: {
          message: `You are paying ${company.name}${company.phone ? ` (${formatPhone(company.phone)})` : ""}. The fee is credited toward the build.`,
        },
      },
      customer_email: lead.email,
      client_reference_id: String(booking.id),
      metadata: { booking_id: String(booking.id), lead_id: String(lead.id) },
      // Copied onto the charge, so a refund event names its booking too.
      payment_intent_data: { metadata: { booking_id: String(booking.id) } },
      success_url: `${origin}${basePath}/done?session_id={CHECKOUT_SESSION_ID}`,
      cancel_url: `${origin}${basePath}?left=${booking.id}`,
    },
    // The same hold always sends the same body and key: a retry cannot open a second payment.
    // (The expiry is part of the key because a renewed hold sends a new expires_at.)
    { idempotencyKey: `checkout:${booking.id}:${expiresAt}` },
  );
  await db
    .update(bookings)
    .set({ checkoutSessionId: session.id, updatedAt: new Date().toISOString() })
    .where(eq(bookings.id, booking.id));
  if (!session.url) throw new Error("The payment service returned no checkout page.");
  return session.url;
}

/** The lead's booking made by one checkout session, or null (the success page's lookup). */
export async function findBookingByCheckout(leadId: number, checkoutSessionId: string): Promise<Booking | null> {
  if (!checkoutSessionId) return null;
  const [row] = await db
    .select()
    .from(bookings)
    .where(and(eq(bookings.leadId, leadId), eq(bookings.checkoutSessionId, checkoutSessionId)))
    .limit(1);
  return row ?? null;
}

/** The homeowner came back without paying: close the checkout and free the slot now. */
export async function abandonCheckout(
  bookingId: number,
  leadId: number,
  client: Stripe = defaultStripe,
): Promise<void> {
  const [booking] = await db
    .select()
    .from(bookings)
    .where(and(eq(bookings.id, bookingId), eq(bookings.leadId, leadId)))
    .limit(1);
  if (!booking || booking.status !== "held") return;
  if (booking.checkoutSessionId) {
    // The expired event that follows finds the booking already released and changes nothing.
    await client.checkout.sessions.expire(booking.checkoutSessionId).catch(() => undefined);
  }
  await db
    .update(bookings)
    .set({ status: "expired", updatedAt: new Date().toISOString() })
    .where(and(eq(bookings.id, booking.id), eq(bookings.status, "held")));
}

/*
 * The consult as an iCalendar event. The cancelling file carries the same UID, a higher SEQUENCE,
 * STATUS:CANCELLED and METHOD:CANCEL, which is how RFC 5545 (3.8.4.7 UID, 3.8.7.4 SEQUENCE) and
 * RFC 5546 (3.2.5 CANCEL, which needs ORGANIZER) tell a calendar to drop the event it already holds.
 * A moved consult sends the event again under the same UID with the booking's raised SEQUENCE, which
 * replaces the earlier time rather than adding a second event.
 */
export function calendarFile(
  booking: Booking,
  company: Company,
  lead: Lead,
  kind: "booked" | "cancelled" = "booked",
): string {
  const start = new Date(booking.startsAt);
  const { value, error } = createEvent({
    uid: `consult-${booking.id}@emberwright`,
    start: start.getTime(),
    startInputType: "utc",
    startOutputType: "utc",
    duration: { minutes: Math.round((new Date(booking.endsAt).getTime() - start.getTime()) / 60_000) },
    title: `Fire pit design consult: ${company.name}`,
    description: `Design consult for the fire pit at ${lead.street}, ${lead.town}.`,
    location: `${lead.street}, ${lead.town}`,
    productId: "emberwright/consults",
    organizer: { name: company.name, email: company.email },
    // Each move raised the booking's sequence; the cancellation outranks the last of them.
    sequence: booking.calendarSequence + (kind === "cancelled" ? 1 : 0),
    ...(kind === "cancelled" ? { method: "CANCEL", status: "CANCELLED" as const } : {}),
  });
  if (error || !value) throw error ?? new Error("calendar file failed");
  return value;
}

/** "Hearthline Taper, 36 9/16 in across inside": the stone and bowl of a request, for e-mails and the consult page. */
export function designLine(lead: Lead): string {
  const bowl = readStoredDesign(lead.designJson).summary.find((l) => l.label === "Bowl")?.value;
  return [lead.stoneName, bowl].filter(Boolean).join(", ");
}

/** The outbox key of a booking's reminder for one calendar sequence (each move schedules its own). */
const reminderKey = (bookingId: number, sequence: number) =>
  sequence === 0 ? `consult-reminder/${bookingId}` : `consult-reminder/${bookingId}/${sequence}`;

/** Every reminder key a booking may have had, up to its current sequence. */
export const reminderKeys = (booking: Pick<Booking, "id" | "calendarSequence">) =>
  Array.from({ length: booking.calendarSequence + 1 }, (_, n) => reminderKey(booking.id, n));

/** The e-mail keys of a booking's moves, for the lead's timeline. */
export const moveMailKeys = (booking: Pick<Booking, "id" | "calendarSequence">) =>
  Array.from({ length: booking.calendarSequence }, (_, n) => [
    `consult-moved/${booking.id}/${n + 1}`,
    `consult-moved-company/${booking.id}/${n + 1}`,
    reminderKey(booking.id, n + 1),
  ]).flat();

async function confirmationEmails(booking: Booking, company: Company, lead: Lead) {
  const homeownerZone = booking.customerTimeZone ?? company.timeZone;
  const common = {
    companyName: company.name,
    companyPhone: company.phone,
    design: designLine(lead),
    feeText: formatMoney(booking.amountCents),
  };
  const ics = Buffer.from(calendarFile(booking, company, lead)).toString("base64");
  const attachments = [{ filename: "design-consult.ics", content: ics, contentType: "text/calendar" }];
  return Promise.all([
    prepareOutboxRow({
      idempotencyKey: `consult-confirmed/${booking.id}`,
      companyId: company.id,
      to: lead.email,
      subject: `Design consult booked with ${company.name}: ${formatSlot(booking.startsAt, homeownerZone)}`,
      template: ConsultConfirmedEmail({
        ...common,
        recipientName: lead.customerName,
        customerName: lead.customerName,
        when: formatSlot(booking.startsAt, homeownerZone),
        forCompany: false,
      }),
      attachments,
    }),
    prepareOutboxRow({
      idempotencyKey: `consult-confirmed-company/${booking.id}`,
      companyId: company.id,
      to: company.email,
      subject: `Consult booked: ${lead.customerName}, ${formatSlot(booking.startsAt, company.timeZone)}`,
      template: ConsultConfirmedEmail({
        ...common,
        recipientName: company.name,
        customerName: lead.customerName,
        when: formatSlot(booking.startsAt, company.timeZone),
        forCompany: true,
      }),
      attachments,
    }),
    reminderEmail(booking, company, lead),
  ]);
}

function reminderEmail(booking: Booking, company: Company, lead: Lead) {
  const homeownerZone = booking.customerTimeZone ?? company.timeZone;
  return prepareOutboxRow({
    idempotencyKey: reminderKey(booking.id, booking.calendarSequence),
    companyId: company.id,
    to: lead.email,
    subject: `Tomorrow: your design consult with ${company.name}`,
    template: ConsultReminderEmail({
      companyName: company.name,
      companyPhone: company.phone,
      design: designLine(lead),
      feeText: formatMoney(booking.amountCents),
      recipientName: lead.customerName,
      when: formatSlot(booking.startsAt, homeownerZone),
    }),
    sendAfter: new Date(new Date(booking.startsAt).getTime() - 24 * 60 * 60_000),
  });
}

/** The homeowner's new calendar file and note, and the office's, for a consult moved to `moved.startsAt`. */
async function movedEmails(before: Booking, moved: Booking, company: Company, lead: Lead, by: "homeowner" | "staff") {
  const homeownerZone = moved.customerTimeZone ?? company.timeZone;
  const common = {
    companyName: company.name,
    companyPhone: company.phone,
    design: designLine(lead),
    feeText: formatMoney(moved.amountCents),
  };
  const ics = Buffer.from(calendarFile(moved, company, lead)).toString("base64");
  const attachments = [{ filename: "design-consult.ics", content: ics, contentType: "text/calendar" }];
  const seq = moved.calendarSequence;
  return Promise.all([
    prepareOutboxRow({
      idempotencyKey: `consult-moved/${moved.id}/${seq}`,
      companyId: company.id,
      to: lead.email,
      subject: `Design consult moved to ${formatSlot(moved.startsAt, homeownerZone)}`,
      template: ConsultMovedEmail({
        ...common,
        recipientName: lead.customerName,
        when: formatSlot(moved.startsAt, homeownerZone),
        was: formatSlot(before.startsAt, homeownerZone),
        byCompany: by === "staff",
      }),
      attachments,
    }),
    prepareOutboxRow({
      idempotencyKey: `consult-moved-company/${moved.id}/${seq}`,
      companyId: company.id,
      to: company.email,
      subject: `Consult moved: ${lead.customerName}, now ${formatSlot(moved.startsAt, company.timeZone)}`,
      template: ConsultMovedOfficeEmail({
        ...common,
        customerName: lead.customerName,
        when: formatSlot(moved.startsAt, company.timeZone),
        was: formatSlot(before.startsAt, company.timeZone),
        byCustomer: by === "homeowner",
      }),
      attachments,
    }),
    reminderEmail(moved, company, lead),
  ]);
}

/** Who or what ended a booking: each side's e-mail says it in its own words. */
type CancelCause = "homeowner" | "staff" | "slot-taken";

const HOMEOWNER_REASON: Record<CancelCause, (companyName: string) => string> = {
  homeowner: () => "You cancelled it.",
  staff: (companyName) => `${companyName} cancelled it and will be in touch to find another time.`,
  "slot-taken": () => "Another booking took that time while your payment was going through.",
};

const OFFICE_REASON: Record<CancelCause, (customerName: string) => string> = {
  homeowner: (customerName) => `${customerName} cancelled it online.`,
  staff: () => "It was cancelled from the workspace.",
  "slot-taken": (customerName) =>
    `${possessive(customerName)} payment arrived after another booking had taken that time, so it was not booked.`,
};

async function cancellationEmails(booking: Booking, company: Company, lead: Lead, cause: CancelCause) {
  const common = {
    companyName: company.name,
    companyPhone: company.phone,
    design: designLine(lead),
    feeText: formatMoney(booking.amountCents),
    isRefunded: booking.isPaid,
  };
  const ics = Buffer.from(calendarFile(booking, company, lead, "cancelled")).toString("base64");
  const attachments = [
    { filename: "design-consult-cancelled.ics", content: ics, contentType: "text/calendar; method=CANCEL" },
  ];
  return Promise.all([
    prepareOutboxRow({
      idempotencyKey: `consult-cancelled/${booking.id}`,
      companyId: company.id,
      to: lead.email,
      subject: `Design consult cancelled${booking.isPaid ? " and refunded" : ""}`,
      template: ConsultCancelledEmail({
        ...common,
        recipientName: lead.customerName,
        reason: HOMEOWNER_REASON[cause](company.name),
        when: formatSlot(booking.startsAt, booking.customerTimeZone ?? company.timeZone),
      }),
      // A confirmed consult put an event in the homeowner's calendar; this takes it out again.
      ...(cause === "slot-taken" ? {} : { attachments }),
    }),
    prepareOutboxRow({
      idempotencyKey: `consult-cancelled-company/${booking.id}`,
      companyId: company.id,
      to: company.email,
      subject: `Consult cancelled: ${lead.customerName}, ${formatSlot(booking.startsAt, company.timeZone)}`,
      template: ConsultCancelledOfficeEmail({
        ...common,
        customerName: lead.customerName,
        reason: OFFICE_REASON[cause](lead.customerName),
        when: formatSlot(booking.startsAt, company.timeZone),
      }),
      ...(cause === "slot-taken" ? {} : { attachments }),
    }),
  ]);
}

async function loadBookingContext(bookingId: number) {
  const [row] = await db
    .select({ booking: bookings, lead: leads, company: companies })
    .from(bookings)
    .innerJoin(leads, eq(leads.id, bookings.leadId))
    .innerJoin(companies, eq(companies.id, bookings.companyId))
    .where(eq(bookings.id, bookingId))
    .limit(1);
  return row ?? null;
}

/**
 * A booking on one of this homeowner's own requests, with its company and request; null for anyone
 * else's (the caller answers 404).
 */
export async function loadHomeownerConsult(homeownerId: number, bookingId: number) {
  const [row] = await db
    .select({ booking: bookings, lead: leads, company: companies })
    .from(bookings)
    .innerJoin(leads, eq(leads.id, bookings.leadId))
    .innerJoin(companies, eq(companies.id, bookings.companyId))
    .where(and(eq(bookings.id, bookingId), eq(leads.homeownerId, homeownerId)))
    .limit(1);
  return row ?? null;
}

export type WebhookOutcome = "applied" | "duplicate" | "ignored" | "rejected";

/**
 * What in a signed event does not match the booking it names: its checkout session, amount and
 * currency for checkout events, its payment for a refund. A valid signature proves only that the
 * sender has the webhook secret; these prove the event is about the payment we asked for.
 */
function eventMismatch(event: Stripe.Event, booking: Booking): string | null {
  const problems: string[] = [];
  // Values from the event are quoted with JSON.stringify so they cannot forge log lines.
  if (event.type === "checkout.session.completed" || event.type === "checkout.session.expired") {
    const session = event.data.object;
    if (!booking.checkoutSessionId || session.id !== booking.checkoutSessionId) {
      problems.push(
        `checkout session ${JSON.stringify(session.id)} is not the booking's (${booking.checkoutSessionId ?? "none opened"})`,
      );
    }
    if (event.type === "checkout.session.completed") {
      if (session.amount_total !== booking.amountCents)
        problems.push(`amount ${JSON.stringify(session.amount_total)} is not ${booking.amountCents}`);
      if (typeof session.currency !== "string" || session.currency.toLowerCase() !== booking.currency) {
        problems.push(`currency ${JSON.stringify(session.currency)} is not ${booking.currency}`);
      }
    }
  } else if (event.type === "charge.refunded") {
    const charge = event.data.object;
    const paymentIntent =
      typeof charge.payment_intent === "string" ? charge.payment_intent : (charge.payment_intent?.id ?? null);
    if (!booking.paymentIntentId || paymentIntent !== booking.paymentIntentId) {
      problems.push(
        `payment ${JSON.stringify(paymentIntent)} is not the booking's (${booking.paymentIntentId ?? "none"})`,
      );
    }
  }
  return problems.length ? problems.join("; ") : null;
}

/**
 * Applies one verified payment event. The event id is recorded under its primary key in the same
 * transaction as the effect, so a repeat (or a concurrent twin) changes nothing. States only move
 * forward: an expiry after a payment leaves the booking paid.
 */
export async function applyPaymentEvent(event: Stripe.Event): Promise<WebhookOutcome> {
  const bookingId = bookingIdOf(event);
  const context = bookingId ? await loadBookingContext(bookingId) : null;
  const mismatch = context ? eventMismatch(event, context.booking) : null;
  if (context && mismatch) {
    // Not recorded either: the event id stays free, and the booking is exactly as it was.
    console.warn(
      `payments: refused event ${JSON.stringify(event.id)} (${JSON.stringify(event.type)}) for booking ${context.booking.id}: ${mismatch}`,
    );
    return "rejected";
  }
  // E-mails are rendered up front (local work), so the transaction holds only writes.
  const confirmRows =
    context && event.type === "checkout.session.completed"
      ? await confirmationEmails(context.booking, context.company, context.lead)
      : [];
  const slotTakenRows =
    context && event.type === "checkout.session.completed"
      ? await cancellationEmails({ ...context.booking, isPaid: true }, context.company, context.lead, "slot-taken")
      : [];

  return writeTransaction(async (tx) => {
    const recorded = await tx
      .insert(paymentEvents)
      .values({ id: event.id, type: event.type, bookingId: context?.booking.id ?? null })
      .onConflictDoNothing()
      .returning({ id: paymentEvents.id });
    if (recorded.length === 0) return "duplicate";
    if (!context) return "ignored";
    const now = new Date().toISOString();
    const [booking] = await tx.select().from(bookings).where(eq(bookings.id, context.booking.id));
    if (!booking) return "ignored";

    if (event.type === "checkout.session.completed") {
      const session = event.data.object;
      if (session.payment_status !== "paid" || booking.isPaid) return "ignored";
      const paymentIntentId =
        typeof session.payment_intent === "string" ? session.payment_intent : (session.payment_intent?.id ?? null);
      if (booking.status === "held" || booking.status === "expired") {
        // An expired hold may have lost its slot meanwhile; the unique index decides.
        const taken = await tx
          .select({ id: bookings.id })
          .from(bookings)
          .where(
            and(
              eq(bookings.companyId, booking.companyId),
              eq(bookings.startsAt, booking.startsAt),
              inArray(bookings.status, ["held", "confirmed"]),
              sql`${bookings.id} <> ${booking.id}`,
            ),
          );
        if (taken.length === 0) {
          await tx
            .update(bookings)
            .set({ status: "confirmed", isPaid: true, paymentIntentId, updatedAt: now })
            .where(eq(bookings.id, booking.id));
          await tx.insert(emailOutbox).values(confirmRows).onConflictDoNothing();
          await tx.insert(leadEvents).values({
            companyId: booking.companyId,
            leadId: booking.leadId,
            kind: "consult-booked",
            detail: `Design consult paid and booked for ${formatSlot(booking.startsAt, context.company.timeZone)}.`,
          });
          await tx
            .update(leads)
            .set({ status: "consult-booked", updatedAt: now })
            .where(and(eq(leads.id, booking.leadId), inArray(leads.status, ["request", "called-back"])));
          return "applied";
        }
      }
      // Paid for a slot it no longer holds (or a cancelled booking): refund, and say so.
      await tx
        .update(bookings)
        .set({
          status: "cancelled",
          isPaid: true,
          paymentIntentId,
          cancelledBy: "system",
          cancelReason: "slot-taken",
          updatedAt: now,
        })
        .where(eq(bookings.id, booking.id));
      await tx.insert(emailOutbox).values(slotTakenRows).onConflictDoNothing();
      return "applied";
    }
    if (event.type === "checkout.session.expired") {
      await tx
        .update(bookings)
        .set({ status: "expired", updatedAt: now })
        .where(and(eq(bookings.id, booking.id), eq(bookings.status, "held")));
      return "applied";
    }
    if (event.type === "charge.refunded") {
      const charge = event.data.object;
      // The consult is refunded whole: a part refunded by hand leaves a refund owed for the worker.
      if (!booking.refundId && noticeCoversRefund(event, charge, null))
        await tx
          .update(bookings)
          .set({
            refundId: charge.refunds?.data?.[0]?.id ?? "refunded",
            refundedAt: booking.refundedAt ?? now,
            updatedAt: now,
          })
          .where(and(eq(bookings.id, booking.id), isNull(bookings.refundId)));
      return "applied";
    }
    return "ignored";
  });
}

function bookingIdOf(event: Stripe.Event): number | null {
  const object = event.data.object as { metadata?: Record<string, string> | null; client_reference_id?: string | null };
  const raw = object.metadata?.booking_id ?? object.client_reference_id ?? null;
  const id = Number(raw);
  return Number.isSafeInteger(id) && id > 0 ? id : null;
}

/** Finds the booking of a refunded charge by its payment intent (charges carry no booking id). */
export async function bookingIdForPaymentIntent(paymentIntentId: string): Promise<number | null> {
  const [row] = await db
    .select({ id: bookings.id })
    .from(bookings)
    .where(eq(bookings.paymentIntentId, paymentIntentId))
    .limit(1);
  return row?.id ?? null;
}

/** Why a consult could not be cancelled: `not-found` (no such booking in the company), or a conflict with its state. */
export type CancelRefusal = { ok: false; reason: "not-found" | "not-booked" | "too-late" | "changed"; message: string };
export type CancelResult = { ok: true; booking: Booking } | CancelRefusal;

class BookingChanged extends Error {}

/**
 * Cancels a live booking (staff any time, the homeowner up to 24 h ahead). A paid booking is
 * refunded by the refund worker; both sides get an e-mail; the reminder is withdrawn. A refusal says
 * why, in words for the person who asked; nothing is written then.
 */
export async function cancelBooking(args: {
  bookingId: number;
  companyId: number;
  by: "homeowner" | "staff";
  actorUserId: number | null;
  now?: Date;
}): Promise<CancelResult> {
  const now = args.now ?? new Date();
  const context = await loadBookingContext(args.bookingId);
  if (!context || context.booking.companyId !== args.companyId)
    return { ok: false, reason: "not-found", message: "That consult was not found." };
  const { booking, company, lead } = context;
  if (booking.status !== "confirmed" && booking.status !== "held") {
    return { ok: false, reason: "not-booked", message: "This consult is not booked." };
  }
  if (
    args.by === "homeowner" &&
    new Date(booking.startsAt).getTime() - now.getTime() < HOMEOWNER_CANCEL_CUTOFF_HOURS * 3_600_000
  ) {
    return {
      ok: false,
      reason: "too-late",
      message: `Consults can be cancelled online up to ${HOMEOWNER_CANCEL_CUTOFF_HOURS} hours ahead. Please call ${company.name}.`,
    };
  }
  const rows = booking.status === "confirmed" ? await cancellationEmails(booking, company, lead, args.by) : [];
  try {
    await cancelInTransaction();
  } catch (error) {
    if (error instanceof BookingChanged)
      return {
        ok: false,
        reason: "changed",
        message: "This consult changed a moment ago (cancelled or paid). Reload to see it.",
      };
    throw error;
  }
  return { ok: true, booking: { ...booking, status: "cancelled" } };

  function cancelInTransaction() {
    return writeTransaction(async (tx) => {
      // The state is checked again by the write itself: of two cancels at once (or a cancel racing the
      // payment), only the one that still finds the booking as it read it changes anything.
      const changed = await tx
        .update(bookings)
        .set({
          status: "cancelled",
          cancelledBy: args.by,
          cancelReason: args.by === "homeowner" ? "homeowner" : "staff",
          updatedAt: now.toISOString(),
        })
        .where(
          and(eq(bookings.id, booking.id), eq(bookings.status, booking.status), eq(bookings.isPaid, booking.isPaid)),
        )
        .returning({ id: bookings.id });
      if (changed.length === 0) throw new BookingChanged();
      await tx
        .update(emailOutbox)
        .set({ status: "cancelled" })
        .where(and(inArray(emailOutbox.idempotencyKey, reminderKeys(booking)), eq(emailOutbox.status, "pending")));
      await tx.insert(leadEvents).values({
        companyId: company.id,
        leadId: lead.id,
        actorUserId: args.actorUserId,
        kind: "consult-cancelled",
        detail: `Consult for ${formatSlot(booking.startsAt, company.timeZone)} cancelled by the ${args.by}${booking.isPaid ? "; fee refunded" : ""}.`,
      });
      if (rows.length) await tx.insert(emailOutbox).values(rows).onConflictDoNothing();
      // The request's stage follows the booking: no confirmed consult left, no "consult booked".
      for (const statement of settleStageStatements({
        leadId: lead.id,
        from: ["consult-booked"],
        cancelledBookingId: booking.id,
        at: now.toISOString(),
        tx,
      }))
        await statement;
    });
  }
}

export type RescheduleResult = { ok: true; booking: Booking } | { ok: false; status: 400 | 404 | 409; message: string };

class SlotTaken extends Error {}

/**
 * Moves a confirmed consult to another free time, keeping its payment: no second checkout. The same
 * guarantees as booking: the slot's partial unique index lets only one booking hold a time, and the
 * booking's state (confirmed, at the time read, at the sequence read) is re-checked by the write
 * itself in the transaction, so of two moves at once one wins and the other is refused (409). The
 * homeowner gets the event again under the same UID with SEQUENCE raised, the office a note, and
 * the reminder follows the new time. A refusal says why; nothing is written then.
 */
export async function rescheduleBooking(args: {
  bookingId: number;
  companyId: number;
  startsAt: string;
  by: "homeowner" | "staff";
  actorUserId: number | null;
  now?: Date;
}): Promise<RescheduleResult> {
  const now = args.now ?? new Date();
  const context = await loadBookingContext(args.bookingId);
  if (!context || context.booking.companyId !== args.companyId)
    return { ok: false, status: 404, message: "That consult was not found." };
  const { booking, company, lead } = context;
  const freeSlots = booking.status === "confirmed" ? await listCompanySlots(company, now) : [];
  const check = checkReschedule({
    status: booking.status,
    currentStartsAt: booking.startsAt,
    targetStartsAt: args.startsAt,
    freeSlots,
    by: args.by,
    companyName: company.name,
    now,
  });
  if (!check.ok) return { ok: false, status: check.status, message: check.message };
  const moved: Booking = {
    ...booking,
    startsAt: check.slot.startsAt,
    endsAt: check.slot.endsAt,
    calendarSequence: booking.calendarSequence + 1,
    updatedAt: now.toISOString(),
  };
  // Rendered before the transaction, so it holds only writes.
  const rows = await movedEmails(booking, moved, company, lead, args.by);
  try {
    await writeTransaction(async (tx) => {
      const changed = await tx
        .update(bookings)
        .set({
          startsAt: moved.startsAt,
          endsAt: moved.endsAt,
          calendarSequence: moved.calendarSequence,
          updatedAt: moved.updatedAt,
        })
        .where(
          and(
            eq(bookings.id, booking.id),
            eq(bookings.status, "confirmed"),
            eq(bookings.startsAt, booking.startsAt),
            eq(bookings.calendarSequence, booking.calendarSequence),
          ),
        )
        .returning({ id: bookings.id });
      if (changed.length === 0) throw new BookingChanged();
      await tx
        .update(emailOutbox)
        .set({ status: "cancelled" })
        .where(and(inArray(emailOutbox.idempotencyKey, reminderKeys(booking)), eq(emailOutbox.status, "pending")));
      await tx.insert(emailOutbox).values(rows).onConflictDoNothing();
      await tx.insert(leadEvents).values({
        companyId: company.id,
        leadId: lead.id,
        actorUserId: args.actorUserId,
        kind: "consult-moved",
        detail: `Consult moved by the ${args.by} from ${formatSlot(booking.startsAt, company.timeZone)} to ${formatSlot(moved.startsAt, company.timeZone)}; the fee paid stands.`,
      });
    }).catch((error: unknown) => {
      throw isUniqueViolation(error) ? new SlotTaken() : error;
    });
  } catch (error) {
    if (error instanceof BookingChanged)
      return {
        ok: false,
        status: 409,
        message: "This consult changed a moment ago (moved or cancelled). Reload to see it.",
      };
    if (error instanceof SlotTaken)
      return { ok: false, status: 409, message: "Someone booked that time a moment ago. Choose another." };
    throw error;
  }
  return { ok: true, booking: moved };
}

/** The HTTP status a cancel refusal answers with. */
export const cancelRefusalStatus = (refusal: CancelRefusal): 404 | 409 => (refusal.reason === "not-found" ? 404 : 409);

/**
 * Cancelled consults that were paid, refunded through the shared refund worker (app/lib/jobs/refund-queue.server.ts).
 */
function consultRefundQueue(database: Db): RefundQueue {
  return tableRefundQueue({
    database,
    table: bookings,
    label: "booking",
    idempotencyKey: (id) => `refund:${id}`,
    owed: and(eq(bookings.status, "cancelled"), eq(bookings.isPaid, true)),
    paymentIntent: bookings.paymentIntentId,
  });
}

/**
 * Sends the refunds owed (cancelled after payment), each once, keyed `refund:<bookingId>`, under a
 * lease so two processes never send the same one; retried with backoff, failed rows shown to the owner.
 */
export async function processRefunds(
  client: Pick<Stripe, "refunds"> = defaultStripe,
  options: { now?: Date; db?: Db; owner?: string } = {},
): Promise<number> {
  return sendOwedRefunds(
    consultRefundQueue(options.db ?? db),
    client,
    options.owner ?? WORKER_ID,
    options.now ?? new Date(),
  );
}

/** Puts a failed refund back in the queue (the owner pressed "Try again"). */
export async function retryFailedRefund(bookingId: number, companyId: number): Promise<boolean> {
  const rows = await db
    .update(bookings)
    .set({ refundFailedAt: null, refundAttempts: 0, refundNextAt: null, refundLastError: null })
    .where(
      and(
        eq(bookings.id, bookingId),
        eq(bookings.companyId, companyId),
        isNotNull(bookings.refundFailedAt),
        isNull(bookings.refundId),
      ),
    )
    .returning({ id: bookings.id });
  return rows.length > 0;
}
