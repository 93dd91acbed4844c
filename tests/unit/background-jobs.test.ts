/*
 * The background jobs (e-mail outbox, consult and deposit refunds, lapsed holds, upload sweep) under failure and under
 * two processes. "Two processes" are two libSQL clients on the one database file, as two servers
 * would open it; the effects are counted where they land, by the e-mail and payments fakes.
 */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { and, eq, inArray, like } from "drizzle-orm";
import { Resend } from "resend";
import type Stripe from "stripe";
import { afterAll, beforeAll, expect, onTestFinished, test, vi } from "vitest";
import { bookings, emailOutbox, jobLeases, proposals, type Company } from "~/db/schema";
import { processRefunds, releaseLapsedHolds } from "~/lib/consults/booking.server";
import { sweepStrayUploads } from "~/lib/jobs/background.server";
import { db, openDatabase, type Db } from "~/lib/platform/db.server";
import { env } from "~/lib/platform/env.server";
import { LEASE_MS } from "~/lib/jobs/jobs.server";
import { deliverDueEmails } from "~/lib/jobs/outbox-worker.server";
import { createStripe } from "~/lib/platform/payments.server";
import { processDepositRefunds } from "~/lib/proposals/proposal-payments.server";
import { action as attentionAction, loader as attentionLoader } from "~/routes/app-attention";
import { startEmailFake, type EmailFake } from "../../fakes/email/server";
import { startPaymentsFake, type PaymentsFake } from "../../fakes/payments/server";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { createTestLead } from "./support/leads";
import { loginAs } from "./support/login";
import { sentProposal } from "./support/proposals";

let payments: PaymentsFake;
let mailFake: EmailFake;
let stripe: Stripe;
let mail: Resend;
let second: { db: Db; close: () => void };
let company: Company;
let leadId: number;

beforeAll(async () => {
  payments = await startPaymentsFake({
    port: 0,
    webhookUrl: null,
    stateFile: path.join(mkdtempSync(path.join(tmpdir(), "ew-jobs-")), "state.json"),
    log: () => {},
  });
  mailFake = await startEmailFake({ port: 0 });
  stripe = createStripe(payments.url);
  mail = new Resend("re_test_key", { baseUrl: mailFake.url });
  // A second connection to the same file, as a second server process would have.
  const opened = openDatabase(env.DATABASE_URL);
  await opened.client.execute("PRAGMA busy_timeout = 5000");
  second = { db: opened.db, close: () => opened.client.close() };
  ({ company } = await demoCompany());
  leadId = (await createTestLead(company)).id;
});
afterAll(async () => {
  second.close();
  await payments.close();
  await mailFake.close();
});

let slotSeq = 0;
/** A distinct slot far ahead, so test bookings never meet the seed's or each other's. */
const nextSlot = () => {
  slotSeq += 1;
  const start = new Date(Date.UTC(2090, 0, 1) + slotSeq * 3_600_000);
  return { startsAt: start.toISOString(), endsAt: new Date(start.getTime() + 3_600_000).toISOString() };
};

/** A consult paid through the payments fake and then cancelled: a refund is owed. */
async function owedRefund(paymentIntentId?: string) {
  let intent = paymentIntentId;
  if (!intent) {
    const session = await stripe.checkout.sessions.create({
      mode: "payment",
      line_items: [
        { price_data: { currency: "usd", unit_amount: 15000, product_data: { name: "Design consult" } }, quantity: 1 },
      ],
      success_url: "http://localhost/done",
    });
    await fetch(`${payments.url}/_fake/sessions/${session.id}/pay`, {
      method: "POST",
      body: JSON.stringify({ card: "4242424242424242" }),
      headers: { "Content-Type": "application/json" },
    });
    intent = String((await stripe.checkout.sessions.retrieve(session.id)).payment_intent);
  }
  const [row] = await db
    .insert(bookings)
    .values({
      companyId: company.id,
      leadId,
      ...nextSlot(),
      status: "cancelled",
      isPaid: true,
      paymentIntentId: intent,
      holdExpiresAt: new Date().toISOString(),
      amountCents: 15000,
      cancelledBy: "staff",
      cancelReason: "staff",
    })
    .returning();
  return row!;
}

/** A deposit paid through the payments fake (or with the given intent) that the owner refunded: a refund is owed. */
async function owedDeposit(paymentIntentId?: string) {
  const intent =
    paymentIntentId ??
    (await owedRefund().then(async (b) => {
      // The consult row only lent its paid intent; it is settled so the consult refund tests never meet it.
      await db.update(bookings).set({ refundId: "by-hand" }).where(eq(bookings.id, b.id));
      return b.paymentIntentId!;
    }));
  const { proposal } = await sentProposal();
  const [row] = await db
    .update(proposals)
    .set({
      status: "signed",
      depositCents: 145_500,
      paymentIntentId: intent,
      refundOwedAt: new Date().toISOString(),
      refundReason: "Moved house.",
    })
    .where(eq(proposals.id, proposal.id))
    .returning();
  return row!;
}

async function outboxRows(n: number, tag = randomUUID().slice(0, 8)) {
  const rows = await db
    .insert(emailOutbox)
    .values(
      Array.from({ length: n }, (_, i) => ({
        companyId: company.id,
        idempotencyKey: `job-test/${tag}/${i}`,
        toAddress: `person${i}.${tag}@example.test`,
        subject: `Test message ${i}`,
        html: `<p>Message ${i}</p>`,
        text: `Message ${i}`,
        sendAfter: new Date(Date.now() - 1000).toISOString(),
      })),
    )
    .returning();
  return rows;
}

/** An e-mail client that counts each send by idempotency key and hands it to the e-mail fake. */
function countingMail() {
  const sends = new Map<string, number>();
  const client = {
    emails: {
      send: (payload: Parameters<Resend["emails"]["send"]>[0], options?: { idempotencyKey?: string }) => {
        const key = options?.idempotencyKey ?? "";
        sends.set(key, (sends.get(key) ?? 0) + 1);
        return mail.emails.send(payload, options);
      },
    },
  } as unknown as Pick<Resend, "emails">;
  return { client, sends };
}

const fakeMessages = async () =>
  (await (await fetch(`${mailFake.url}/_fake/messages`)).json()) as { to: string[]; idempotency_key: string | null }[];
const refundRequests = async () =>
  (
    (await (await fetch(`${payments.url}/_fake/requests`)).json()) as {
      data: { method: string; path: string; idempotencyKey: string | null; status: number }[];
    }
  ).data.filter((r) => r.method === "POST" && r.path === "/v1/refunds");

test("one refund the payment service keeps failing does not starve the refunds behind it", async () => {
  // Twenty refunds fail (the service answers 500 for them); the twenty-first is fine.
  const flaky = await Promise.all(
    Array.from({ length: 20 }, (_, i) => owedRefund(`pi_flaky_${i}_${randomUUID().slice(0, 6)}`)),
  );
  const good = await owedRefund();
  // Afterwards they are refunded by hand, so the tests below never meet them.
  onTestFinished(async () => {
    await db
      .update(bookings)
      .set({ refundId: "by-hand" })
      .where(
        inArray(
          bookings.id,
          [...flaky, good].map((b) => b.id),
        ),
      );
  });
  const failing = {
    refunds: {
      create: (params: Stripe.RefundCreateParams, options?: Stripe.RequestOptions) =>
        String(params.payment_intent).startsWith("pi_flaky_")
          ? Promise.reject(
              Object.assign(new Error("An error occurred with our connection to the payment service."), {
                statusCode: 500,
                type: "StripeAPIError",
              }),
            )
          : stripe.refunds.create(params, options),
    },
  } as unknown as Stripe;
  const errors = vi.spyOn(console, "error").mockImplementation(() => {});
  try {
    const now = new Date();
    for (let pass = 0; pass < 3; pass += 1) await processRefunds(failing, { now });
  } finally {
    errors.mockRestore();
  }
  const [row] = await db.select().from(bookings).where(eq(bookings.id, good.id));
  expect(row!.refundId).toMatch(/^re_/);
  const stuck = await db
    .select()
    .from(bookings)
    .where(
      inArray(
        bookings.id,
        flaky.map((b) => b.id),
      ),
    );
  // Each failing refund was tried once and waits its backoff; none is given up after one 500.
  expect(stuck.map((b) => [b.refundAttempts, b.refundFailedAt, b.refundId])).toEqual(stuck.map(() => [1, null, null]));
  expect(stuck.every((b) => b.refundNextAt! > new Date().toISOString())).toBe(true);
});

test("a refund that keeps failing is tried with backoff, logs a handful of lines rather than one a second, and ends failed and shown to the owner", async () => {
  const booking = await owedRefund(`pi_stuck_${randomUUID().slice(0, 8)}`);
  let tries = 0;
  const down = {
    refunds: {
      create: (params: Stripe.RefundCreateParams) => {
        if (params.payment_intent === booking.paymentIntentId) tries += 1;
        return Promise.reject(
          Object.assign(new Error("The payment service is unavailable."), { statusCode: 503, type: "StripeAPIError" }),
        );
      },
    },
  } as unknown as Stripe;
  const lines: string[] = [];
  const errors = vi
    .spyOn(console, "error")
    .mockImplementation((...args: unknown[]) => void lines.push(args.map(String).join(" ")));
  const start = Date.now();
  try {
    // Ten minutes of passes, one a second as the worker runs them…
    for (let s = 0; s < 600; s += 1) await processRefunds(down, { now: new Date(start + s * 1000) });
    const aboutThisBooking = () => lines.filter((l) => l.includes(`booking ${booking.id} `));
    expect(aboutThisBooking().length).toBeLessThanOrEqual(6);
    // …then three hours, a pass a minute: it runs out of tries (about an hour in) and stops.
    for (let m = 10; m < 3 * 60; m += 1) await processRefunds(down, { now: new Date(start + m * 60_000) });
    expect(tries).toBe(8);
    expect(aboutThisBooking()).toHaveLength(8);
    expect(aboutThisBooking().at(-1)).toMatch(/failed for good after 8 tries/);
  } finally {
    errors.mockRestore();
  }
  const [row] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(row).toMatchObject({ refundId: null, refundAttempts: 8 });
  expect(row!.refundFailedAt).not.toBeNull();
  expect(row!.refundLastError).toMatch(/^503 /);

  // The owner sees it with its reason, and "Try again" puts it back in the queue.
  const owner = await loginAs(company.id, "owner");
  const page = (await attentionLoader(routeArgs(requestWithCookie("/app/attention", owner)))) as {
    refunds: { key: string; lastError: string | null }[];
  };
  expect(page.refunds.find((r) => r.key === `consult-${booking.id}`)?.lastError).toMatch(/unavailable/);
  const body = new URLSearchParams({ intent: "retry-refund", id: String(booking.id) });
  await attentionAction(
    routeArgs(
      requestWithCookie("/app/attention", owner, {
        method: "POST",
        body,
        headers: { "Content-Type": "application/x-www-form-urlencoded" },
      }),
    ),
  );
  const [again] = await db.select().from(bookings).where(eq(bookings.id, booking.id));
  expect(again).toMatchObject({ refundFailedAt: null, refundAttempts: 0, refundNextAt: null });
  // (Refunded by hand meanwhile, so the tests below do not meet it.)
  await db.update(bookings).set({ refundId: "by-hand" }).where(eq(bookings.id, booking.id));
});

test("an e-mail the service refuses for good is marked failed at once and shown to the owner, without holding up the next", async () => {
  const [bad, good] = await outboxRows(2);
  const errors = vi.spyOn(console, "error").mockImplementation(() => {});
  const picky = {
    emails: {
      send: (payload: { to: string | string[] }, options?: { idempotencyKey?: string }) =>
        options?.idempotencyKey === bad!.idempotencyKey
          ? Promise.resolve({
              data: null,
              error: { statusCode: 422, name: "validation_error", message: "Invalid `to` field." },
            })
          : mail.emails.send(payload as never, options),
    },
  } as unknown as Pick<Resend, "emails">;
  try {
    await deliverDueEmails(new Date(), picky);
  } finally {
    errors.mockRestore();
  }
  const rows = await db
    .select()
    .from(emailOutbox)
    .where(inArray(emailOutbox.id, [bad!.id, good!.id]));
  expect(rows.find((r) => r.id === bad!.id)).toMatchObject({ status: "failed", attempts: 1, leaseOwner: null });
  expect(rows.find((r) => r.id === good!.id)).toMatchObject({ status: "sent", leaseOwner: null });
  const owner = await loginAs(company.id, "owner");
  const page = (await attentionLoader(routeArgs(requestWithCookie("/app/attention", owner)))) as {
    mail: { id: number; lastError: string | null }[];
  };
  expect(page.mail.find((m) => m.id === bad!.id)?.lastError).toMatch(/^422 validation_error/);
});

test("two workers on one database at the same time send each e-mail once, make each refund once and release each lapsed hold once", async () => {
  const tag = randomUUID().slice(0, 8);
  const emails = await outboxRows(45, tag);
  const refunds = await Promise.all(Array.from({ length: 6 }, () => owedRefund()));
  const lapsed = await db
    .insert(bookings)
    .values(
      Array.from({ length: 5 }, () => ({
        companyId: company.id,
        leadId,
        ...nextSlot(),
        status: "held" as const,
        holdExpiresAt: new Date(Date.now() - 60_000).toISOString(),
        amountCents: 15000,
      })),
    )
    .returning({ id: bookings.id });
  const { client, sends } = countingMail();
  const workers = [
    { db, owner: "worker-a" },
    { db: second.db, owner: "worker-b" },
  ];
  const released: number[] = [];
  const now = new Date();
  // Three rounds, both workers running every job at once, as two servers' timers would.
  for (let round = 0; round < 3; round += 1) {
    await Promise.all(
      workers.map(async (w) => {
        await Promise.all([
          deliverDueEmails(now, client, w),
          processRefunds(stripe, { ...w, now }),
          releaseLapsedHolds(now, w.db).then((ids) => released.push(...(ids ?? []))),
        ]);
      }),
    );
  }
  for (const row of emails) expect(sends.get(row.idempotencyKey), row.idempotencyKey).toBe(1);
  const delivered = (await fakeMessages()).filter((m) => m.idempotency_key?.startsWith(`job-test/${tag}/`));
  expect(delivered).toHaveLength(45);
  const refundKeys = (await refundRequests()).map((r) => r.idempotencyKey);
  for (const b of refunds)
    expect(
      refundKeys.filter((k) => k === `refund:${b.id}`),
      `refund:${b.id}`,
    ).toHaveLength(1);
  for (const b of lapsed)
    expect(
      released.filter((id) => id === b.id),
      `hold ${b.id}`,
    ).toHaveLength(1);
  const sent = await db
    .select()
    .from(emailOutbox)
    .where(like(emailOutbox.idempotencyKey, `job-test/${tag}/%`));
  expect(sent.every((r) => r.status === "sent" && r.attempts === 1 && r.leaseOwner === null)).toBe(true);
});

test("a worker that dies mid-job leaves a lease that lapses; the other worker then retakes the rows and each e-mail and refund goes out once", async () => {
  const tag = randomUUID().slice(0, 8);
  const emails = await outboxRows(5, tag);
  const refund = await owedRefund();
  // The dying worker claims its rows and then hangs for ever on its first send and refund.
  let hungCalls = 0;
  const hang = () => {
    hungCalls += 1;
    return new Promise<never>(() => {});
  };
  const now = new Date();
  void deliverDueEmails(now, { emails: { send: hang } } as unknown as Pick<Resend, "emails">, { db, owner: "dying" });
  void processRefunds({ refunds: { create: hang } } as unknown as Stripe, { db, owner: "dying", now });
  await vi.waitFor(() => expect(hungCalls).toBe(2));

  const { client, sends } = countingMail();
  const survivor = { db: second.db, owner: "survivor" };
  // While the lease holds, the survivor leaves the rows alone…
  await deliverDueEmails(new Date(now.getTime() + 1000), client, survivor);
  await processRefunds(stripe, { ...survivor, now: new Date(now.getTime() + 1000) });
  for (const row of emails) expect(sends.get(row.idempotencyKey) ?? 0).toBe(0);
  // …and once it has lapsed, takes them over.
  const later = new Date(now.getTime() + LEASE_MS + 1000);
  await deliverDueEmails(later, client, survivor);
  await processRefunds(stripe, { ...survivor, now: later });
  await deliverDueEmails(new Date(later.getTime() + 1000), client, survivor);
  await processRefunds(stripe, { ...survivor, now: new Date(later.getTime() + 1000) });

  for (const row of emails) expect(sends.get(row.idempotencyKey), row.idempotencyKey).toBe(1);
  expect((await fakeMessages()).filter((m) => m.idempotency_key?.startsWith(`job-test/${tag}/`))).toHaveLength(5);
  expect((await refundRequests()).filter((r) => r.idempotencyKey === `refund:${refund.id}`)).toHaveLength(1);
  const [row] = await db.select().from(bookings).where(eq(bookings.id, refund.id));
  expect(row).toMatchObject({ refundAttempts: 2, refundLeaseOwner: null });
  expect(row!.refundId).toMatch(/^re_/);
});

test("a deposit refund the payment service keeps refusing is tried with backoff, ends failed on the owner's list, where Try again queues it again", async () => {
  const deposit = await owedDeposit(`pi_stuck_${randomUUID().slice(0, 8)}`);
  let tries = 0;
  const down = {
    refunds: {
      create: (params: Stripe.RefundCreateParams) => {
        if (params.payment_intent === deposit.paymentIntentId) tries += 1;
        return Promise.reject(
          Object.assign(new Error("The payment service is unavailable."), { statusCode: 503, type: "StripeAPIError" }),
        );
      },
    },
  } as unknown as Stripe;
  const lines: string[] = [];
  const errors = vi
    .spyOn(console, "error")
    .mockImplementation((...args: unknown[]) => void lines.push(args.map(String).join(" ")));
  const start = Date.now();
  try {
    // A pass a second for ten minutes: the 30 s, 1 min, 2 min, 4 min waits allow five tries, not 600.
    for (let s = 0; s < 600; s += 1) await processDepositRefunds(down, { now: new Date(start + s * 1000) });
    expect(tries).toBeLessThanOrEqual(5);
    expect(tries).toBeGreaterThanOrEqual(4);
    // Then a pass a minute for three hours: eight tries in all, then it stops.
    for (let m = 10; m < 3 * 60; m += 1) await processDepositRefunds(down, { now: new Date(start + m * 60_000) });
    expect(tries).toBe(8);
    const aboutThis = lines.filter((l) => l.includes(`deposit of proposal ${deposit.id} `));
    expect(aboutThis).toHaveLength(8);
    expect(aboutThis.at(-1)).toMatch(/failed for good after 8 tries/);
  } finally {
    errors.mockRestore();
  }
  const [row] = await db.select().from(proposals).where(eq(proposals.id, deposit.id));
  expect(row).toMatchObject({ refundId: null, refundAttempts: 8, refundLeaseOwner: null });
  expect(row!.refundFailedAt).not.toBeNull();

  const owner = await loginAs(company.id, "owner");
  const page = (await attentionLoader(routeArgs(requestWithCookie("/app/attention", owner)))) as {
    refunds: { key: string; what: string; amount: string; lastError: string | null }[];
  };
  const listed = page.refunds.find((r) => r.key === `deposit-${deposit.id}`);
  expect(listed?.lastError).toMatch(/^503 .*unavailable/);
  expect(listed?.what).toMatch(/^Deposit on /);
  expect(listed?.amount).toBe("$1,455.00");
  const body = new URLSearchParams({ intent: "retry-deposit-refund", id: String(deposit.id) });
  await attentionAction(
    routeArgs(
      requestWithCookie("/app/attention", owner, {
        method: "POST",
        body,
        headers: { "Content-Type": "application/x-www-form-urlencoded" },
      }),
    ),
  );
  const [again] = await db.select().from(proposals).where(eq(proposals.id, deposit.id));
  expect(again).toMatchObject({ refundFailedAt: null, refundAttempts: 0, refundNextAt: null });
  // A company's owner cannot requeue another company's row: the same id under another company is not found.
  expect(
    await import("~/lib/proposals/proposal-payments.server").then((m) =>
      m.retryFailedDepositRefund(deposit.id, company.id + 999),
    ),
  ).toBe(false);
  await db.update(proposals).set({ refundId: "by-hand" }).where(eq(proposals.id, deposit.id));
});

test("two workers at once make each deposit refund once, and a worker that dies mid-refund leaves it to the other after its lease lapses", async () => {
  const deposits = await Promise.all(Array.from({ length: 4 }, () => owedDeposit()));
  const now = new Date();
  for (let round = 0; round < 3; round += 1) {
    await Promise.all([
      processDepositRefunds(stripe, { db, owner: "worker-a", now }),
      processDepositRefunds(stripe, { db: second.db, owner: "worker-b", now }),
    ]);
  }
  const keys = (await refundRequests()).map((r) => r.idempotencyKey);
  for (const d of deposits)
    expect(
      keys.filter((k) => k === `refund:deposit:${d.id}`),
      `refund:deposit:${d.id}`,
    ).toHaveLength(1);

  const stuck = await owedDeposit();
  let hung = 0;
  void processDepositRefunds(
    { refunds: { create: () => ((hung += 1), new Promise<never>(() => {})) } } as unknown as Stripe,
    { db, owner: "dying", now },
  );
  await vi.waitFor(() => expect(hung).toBe(1));
  await processDepositRefunds(stripe, { db: second.db, owner: "survivor", now: new Date(now.getTime() + 1000) });
  expect((await refundRequests()).filter((r) => r.idempotencyKey === `refund:deposit:${stuck.id}`)).toHaveLength(0);
  await processDepositRefunds(stripe, {
    db: second.db,
    owner: "survivor",
    now: new Date(now.getTime() + LEASE_MS + 1000),
  });
  expect((await refundRequests()).filter((r) => r.idempotencyKey === `refund:deposit:${stuck.id}`)).toHaveLength(1);
  const [row] = await db.select().from(proposals).where(eq(proposals.id, stuck.id));
  expect(row).toMatchObject({ refundAttempts: 2, refundLeaseOwner: null });
  expect(row!.refundId).toMatch(/^re_/);
});

test("the upload sweep runs in one process at a time, every ten minutes, and a failing sweep retries with backoff", async () => {
  let runs = 0;
  const sweep = async () => {
    runs += 1;
  };
  const now = new Date(Date.now() + 24 * 3_600_000);
  const took = await Promise.all([
    sweepStrayUploads({ db, owner: "a", now, sweep }),
    sweepStrayUploads({ db: second.db, owner: "b", now, sweep }),
  ]);
  expect(took.filter(Boolean)).toHaveLength(1);
  expect(runs).toBe(1);
  expect(await sweepStrayUploads({ db, owner: "a", now: new Date(now.getTime() + 9 * 60_000), sweep })).toBe(false);
  expect(await sweepStrayUploads({ db, owner: "b", now: new Date(now.getTime() + 10 * 60_000 + 1), sweep })).toBe(true);

  const errors = vi.spyOn(console, "error").mockImplementation(() => {});
  try {
    const failAt = new Date(now.getTime() + 30 * 60_000);
    await sweepStrayUploads({ db, owner: "a", now: failAt, sweep: () => Promise.reject(new Error("disk gone")) });
    const [lease] = await db.select().from(jobLeases).where(eq(jobLeases.name, "upload-sweep"));
    expect(lease).toMatchObject({
      attempts: 1,
      lastError: "disk gone",
      leaseOwner: null,
      nextRunAt: new Date(failAt.getTime() + 60_000).toISOString(),
    });
    expect(errors).toHaveBeenCalledTimes(1);
  } finally {
    errors.mockRestore();
  }
  await db
    .update(jobLeases)
    .set({ nextRunAt: new Date(0).toISOString(), attempts: 0 })
    .where(and(eq(jobLeases.name, "upload-sweep")));
});
