import { and, eq, inArray, like } from "drizzle-orm";
import { expect, test } from "vitest";
import { bookings, emailOutbox, leadEvents, leads, type Company } from "~/db/schema";
import {
  cancelBooking,
  holdSlot,
  listCompanySlots,
  rescheduleBooking,
  type RescheduleResult,
} from "~/lib/consults/booking.server";
import { db } from "~/lib/platform/db.server";
import { createCompanyWithStaff } from "./support/fixtures";
import { createTestLead } from "./support/leads";

/** An iCalendar property's value, folded lines joined first (RFC 5545 3.1). */
const icsValue = (ics: string, name: string) =>
  new RegExp(`^${name}(?:;[^:]*)?:(.*)$`, "m").exec(ics.replace(/\r?\n[ \t]/g, ""))?.[1]?.trim();
/** "20261207T150000Z" (RFC 5545 3.3.5, UTC form) for an ISO instant. */
const icsUtc = (iso: string) => iso.replace(/[-:]/g, "").replace(/\.\d{3}/, "");

async function attachmentOf(key: string) {
  const [row] = await db.select().from(emailOutbox).where(eq(emailOutbox.idempotencyKey, key));
  const [file] = JSON.parse(row!.attachmentsJson) as { content: string }[];
  return { row: row!, ics: Buffer.from(file!.content, "base64").toString() };
}

/**
 * A paid, confirmed consult on a fresh company's free times (nothing else competes for its slots),
 * counted from the first more than a day away: a consult can be moved up to a day before, whatever
 * the hour the suite runs.
 */
async function paidConsult(company?: Company, slotIndex = 0) {
  company ??= (await createCompanyWithStaff("Flintrow Masonry")).company;
  const { id } = await createTestLead(company);
  const [lead] = await db.select().from(leads).where(eq(leads.id, id));
  const dayAway = new Date(Date.now() + 26 * 3_600_000).toISOString();
  const slot = (await listCompanySlots(company)).filter((s) => s.startsAt > dayAway)[slotIndex]!;
  const held = await holdSlot({ company, lead: lead!, startsAt: slot.startsAt, customerTimeZone: "America/New_York" });
  await db
    .update(bookings)
    .set({ status: "confirmed", isPaid: true, paymentIntentId: `pi_test_${held.id}` })
    .where(eq(bookings.id, held.id));
  return { company, lead: lead!, booking: { ...held, status: "confirmed" as const, isPaid: true } };
}

/** null when the move went through, else the refusal (its status and message). */
const refusal = (promise: Promise<RescheduleResult>) => promise.then((r) => (r.ok ? null : r));

test("a moved consult keeps its payment, frees the old time, takes the new one, and tells both sides", async () => {
  const { company, lead, booking } = await paidConsult();
  const target = (await listCompanySlots(company)).find((s) => s.startsAt > booking.startsAt)!;
  const result = await rescheduleBooking({
    bookingId: booking.id,
    companyId: company.id,
    startsAt: target.startsAt,
    by: "homeowner",
    actorUserId: null,
  });
  expect(result.ok).toBe(true);
  const moved = (result as { booking: { calendarSequence: number } }).booking;

  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row).toMatchObject({
    status: "confirmed",
    isPaid: true,
    paymentIntentId: `pi_test_${booking.id}`,
    startsAt: target.startsAt,
    endsAt: target.endsAt,
    calendarSequence: 1,
    checkoutSessionId: null,
  });
  expect(moved.calendarSequence).toBe(1);
  const free = (await listCompanySlots(company)).map((s) => s.startsAt);
  expect(free).toContain(booking.startsAt);
  expect(free).not.toContain(target.startsAt);

  // The homeowner's file replaces the event: same UID, SEQUENCE raised (RFC 5545 3.8.4.7, 3.8.7.4), the new start.
  const note = await attachmentOf(`consult-moved/${booking.id}/1`);
  expect(note.row.toAddress).toBe(lead.email);
  expect(icsValue(note.ics, "UID")).toBe(`consult-${booking.id}@emberwright`);
  expect(icsValue(note.ics, "SEQUENCE")).toBe("1");
  expect(icsValue(note.ics, "DTSTART")).toBe(icsUtc(target.startsAt));
  expect(note.row.text).toContain("nothing more is charged");
  const office = await attachmentOf(`consult-moved-company/${booking.id}/1`);
  expect(office.row.toAddress).toBe(company.email);
  expect(office.row.text).toContain("Wren Castellano moved their design consult online");
  const [event] = await db
    .select()
    .from(leadEvents)
    .where(and(eq(leadEvents.leadId, lead.id), eq(leadEvents.kind, "consult-moved")));
  expect(event!.detail).toMatch(/^Consult moved by the homeowner from .+ to .+; the fee paid stands\.$/);
});

test("the reminder follows the moved time: the old one is withdrawn, a new one waits for a day before the new time", async () => {
  const { company, booking } = await paidConsult();
  await db.insert(emailOutbox).values({
    companyId: company.id,
    idempotencyKey: `consult-reminder/${booking.id}`,
    toAddress: "x@example.test",
    subject: "Tomorrow",
    html: "",
    text: "",
  });
  const target = (await listCompanySlots(company)).at(-1)!;
  await rescheduleBooking({
    bookingId: booking.id,
    companyId: company.id,
    startsAt: target.startsAt,
    by: "staff",
    actorUserId: null,
  });
  const reminders = await db
    .select()
    .from(emailOutbox)
    .where(like(emailOutbox.idempotencyKey, `consult-reminder/${booking.id}%`));
  expect(reminders.find((r) => r.idempotencyKey === `consult-reminder/${booking.id}`)!.status).toBe("cancelled");
  const next = reminders.find((r) => r.idempotencyKey === `consult-reminder/${booking.id}/1`)!;
  expect(next.status).toBe("pending");
  expect(next.sendAfter).toBe(new Date(new Date(target.startsAt).getTime() - 24 * 3_600_000).toISOString());
});

test("two moves of one consult at once: one wins, the other answers 409 and changes nothing", async () => {
  const { company, booking } = await paidConsult();
  const [a, b] = (await listCompanySlots(company)).filter((s) => s.startsAt !== booking.startsAt).slice(3, 5);
  const outcomes = await Promise.all(
    [a!, b!].map((slot) =>
      refusal(
        rescheduleBooking({
          bookingId: booking.id,
          companyId: company.id,
          startsAt: slot.startsAt,
          by: "homeowner",
          actorUserId: null,
        }),
      ),
    ),
  );
  const refused = outcomes.filter((o) => o !== null);
  expect(refused).toHaveLength(1);
  expect(refused[0]!.status).toBe(409);
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row!.calendarSequence).toBe(1);
  expect([a!.startsAt, b!.startsAt]).toContain(row!.startsAt);
  // Only the winner's notes went in the outbox.
  expect(
    await db
      .select()
      .from(emailOutbox)
      .where(like(emailOutbox.idempotencyKey, `consult-moved/${booking.id}/%`)),
  ).toHaveLength(1);
});

test("two consults moved to the same free time at once: one holds it, the other gets 409 and keeps its own time", async () => {
  const first = await paidConsult();
  const second = await paidConsult(first.company, 1);
  const target = (await listCompanySlots(first.company)).at(-2)!;
  const outcomes = await Promise.all(
    [first.booking, second.booking].map((b) =>
      refusal(
        rescheduleBooking({
          bookingId: b.id,
          companyId: first.company.id,
          startsAt: target.startsAt,
          by: "homeowner",
          actorUserId: null,
        }),
      ),
    ),
  );
  expect(outcomes.filter((o) => o === null)).toHaveLength(1);
  expect(outcomes.find((o) => o !== null)!.status).toBe(409);
  const rows = await db
    .select()
    .from(bookings)
    .where(inArray(bookings.id, [first.booking.id, second.booking.id]));
  expect(rows.filter((r) => r.startsAt === target.startsAt)).toHaveLength(1);
  const loser = rows.find((r) => r.startsAt !== target.startsAt)!;
  expect(loser.startsAt).toBe(loser.id === first.booking.id ? first.booking.startsAt : second.booking.startsAt);
  expect(loser.calendarSequence).toBe(0);
});

test("a time someone else holds while paying cannot be moved onto (409), nor can a cancelled consult be moved", async () => {
  const { company, booking } = await paidConsult();
  const { id } = await createTestLead(company);
  const [other] = await db.select().from(leads).where(eq(leads.id, id));
  const taken = (await listCompanySlots(company))[2]!;
  await holdSlot({ company, lead: other!, startsAt: taken.startsAt, customerTimeZone: null });
  expect(
    (await refusal(
      rescheduleBooking({
        bookingId: booking.id,
        companyId: company.id,
        startsAt: taken.startsAt,
        by: "homeowner",
        actorUserId: null,
      }),
    ))!.status,
  ).toBe(409);

  await cancelBooking({ bookingId: booking.id, companyId: company.id, by: "staff", actorUserId: null });
  const free = (await listCompanySlots(company))[3]!;
  expect(
    (await refusal(
      rescheduleBooking({
        bookingId: booking.id,
        companyId: company.id,
        startsAt: free.startsAt,
        by: "homeowner",
        actorUserId: null,
      }),
    ))!.status,
  ).toBe(409);
});

test("cancelling after a move sends the cancellation one SEQUENCE above the move and withdraws the moved reminder", async () => {
  const { company, booking } = await paidConsult();
  // A later time, so the moved consult is still more than a day away whatever the hour the suite runs.
  const target = (await listCompanySlots(company)).find((s) => s.startsAt > booking.startsAt)!;
  await rescheduleBooking({
    bookingId: booking.id,
    companyId: company.id,
    startsAt: target.startsAt,
    by: "homeowner",
    actorUserId: null,
  });
  await cancelBooking({ bookingId: booking.id, companyId: company.id, by: "homeowner", actorUserId: null });
  const cancel = await attachmentOf(`consult-cancelled/${booking.id}`);
  expect(icsValue(cancel.ics, "UID")).toBe(`consult-${booking.id}@emberwright`);
  expect(icsValue(cancel.ics, "SEQUENCE")).toBe("2");
  expect(icsValue(cancel.ics, "METHOD")).toBe("CANCEL");
  const [reminder] = await db
    .select()
    .from(emailOutbox)
    .where(eq(emailOutbox.idempotencyKey, `consult-reminder/${booking.id}/1`));
  expect(reminder!.status).toBe("cancelled");
});

test("another company's consult is not found (404), whatever its id", async () => {
  const { booking } = await paidConsult();
  const { company: stranger } = await createCompanyWithStaff("Elsewhere Stoneworks");
  const free = (await listCompanySlots(stranger))[0]!;
  expect(
    (await refusal(
      rescheduleBooking({
        bookingId: booking.id,
        companyId: stranger.id,
        startsAt: free.startsAt,
        by: "staff",
        actorUserId: null,
      }),
    ))!.status,
  ).toBe(404);
});
