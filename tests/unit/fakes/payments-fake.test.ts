import { mkdtempSync, rmSync } from "node:fs";
import http from "node:http";
import type { AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Stripe from "stripe";
import { afterEach, beforeEach, expect, test } from "vitest";
import { parseFormBody } from "../../../fakes/payments/form-encoding";
import { startPaymentsFake } from "../../../fakes/payments/server";
import type { PaymentsFake } from "../../../fakes/payments/server";

const WEBHOOK_SECRET = "whsec_test_payments_fake";
const SECRET_KEY = "sk_test_emberwright_unit";
const SUCCESS_URL = "http://127.0.0.1:5173/consult/booked?session_id={CHECKOUT_SESSION_ID}";
const CANCEL_URL = "http://127.0.0.1:5173/consult/book";

interface Delivery {
  rawBody: string;
  signature: string;
  event: Stripe.Event;
  answeredWith: number;
}

interface Receiver {
  url: string;
  deliveries: Delivery[];
  // Statuses to answer, one per request, before falling back to `fallbackStatus`.
  scriptedStatuses: number[];
  fallbackStatus: number;
  close(): Promise<void>;
}

async function startReceiver(): Promise<Receiver> {
  const receiver: Omit<Receiver, "url" | "close"> = { deliveries: [], scriptedStatuses: [], fallbackStatus: 200 };
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      const rawBody = Buffer.concat(chunks).toString("utf8");
      const status = receiver.scriptedStatuses.shift() ?? receiver.fallbackStatus;
      receiver.deliveries.push({
        rawBody,
        signature: String(req.headers["stripe-signature"] ?? ""),
        event: JSON.parse(rawBody) as Stripe.Event,
        answeredWith: status,
      });
      res.writeHead(status, { "Content-Type": "application/json" });
      res.end(JSON.stringify({ received: status < 300 }));
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as AddressInfo;
  return Object.assign(receiver, {
    url: `http://127.0.0.1:${port}/api/webhooks/stripe`,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  });
}

function stripeFor(fake: PaymentsFake, key = SECRET_KEY): Stripe {
  const base = new URL(fake.url);
  return new Stripe(key, {
    host: base.hostname,
    port: Number(base.port),
    protocol: "http",
    // The SDK retries 5xx on its own; tests want to see the first answer.
    maxNetworkRetries: 0,
  });
}

function consultCheckout(
  bookingId: string,
  overrides: Partial<Stripe.Checkout.SessionCreateParams> = {},
): Stripe.Checkout.SessionCreateParams {
  return {
    mode: "payment",
    line_items: [
      {
        price_data: {
          currency: "usd",
          unit_amount: 15000,
          product_data: { name: "Fire pit design consult", description: "60 minutes on site, sketch and quote" },
        },
        quantity: 1,
      },
    ],
    success_url: SUCCESS_URL,
    cancel_url: CANCEL_URL,
    client_reference_id: bookingId,
    metadata: { booking_id: bookingId },
    customer_email: "rowan.pike@example.test",
    ...overrides,
  };
}

async function waitFor<T>(
  read: () => T | undefined | false | Promise<T | undefined | false>,
  timeoutMs = 5000,
): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await read();
    if (value) return value;
    if (Date.now() > deadline) throw new Error("timed out waiting for the condition");
    await new Promise((r) => setTimeout(r, 15));
  }
}

// The fake's JSON, read field by field in the assertions below.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
async function control(fake: PaymentsFake, path: string, body?: unknown): Promise<{ status: number; json: any }> {
  const response = await fetch(`${fake.url}/_fake/${path}`, {
    method: body === undefined ? "GET" : "POST",
    headers: { "Content-Type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: response.status, json: await response.json() };
}

let stateDir: string;
let stateFile: string;
let receiver: Receiver;
let fake: PaymentsFake;
let stripe: Stripe;
const extraFakes: PaymentsFake[] = [];

async function startFake(): Promise<PaymentsFake> {
  return startPaymentsFake({
    port: 0,
    webhookUrl: receiver.url,
    webhookSecret: WEBHOOK_SECRET,
    stateFile,
    retryBaseMs: 20,
    retryMaxMs: 200,
    log: () => {},
  });
}

beforeEach(async () => {
  stateDir = mkdtempSync(join(tmpdir(), "payments-fake-"));
  stateFile = join(stateDir, "nested", "payments-fake.json");
  receiver = await startReceiver();
  fake = await startFake();
  stripe = stripeFor(fake);
});

afterEach(async () => {
  await fake.close();
  await Promise.all(extraFakes.splice(0).map((f) => f.close()));
  await receiver.close();
  rmSync(stateDir, { recursive: true, force: true });
});

test("the SDK's bracketed form encoding decodes into nested objects and arrays", () => {
  const body =
    "mode=payment&line_items[0][price_data][currency]=usd&line_items[0][price_data][unit_amount]=15000" +
    "&line_items[0][price_data][product_data][name]=Fire%20pit%20consult&line_items[0][quantity]=1" +
    "&metadata[booking_id]=bk_1&expand[0]=line_items&success_url=http%3A%2F%2Fx.test%2F%3Fid%3D%7BCHECKOUT_SESSION_ID%7D";
  expect(parseFormBody(body)).toEqual({
    mode: "payment",
    line_items: [
      {
        price_data: { currency: "usd", unit_amount: "15000", product_data: { name: "Fire pit consult" } },
        quantity: "1",
      },
    ],
    metadata: { booking_id: "bk_1" },
    expand: ["line_items"],
    success_url: "http://x.test/?id={CHECKOUT_SESSION_ID}",
  });
});

test("a checkout session made through the SDK is open, unpaid and points at the hosted page", async () => {
  const created = await stripe.checkout.sessions.create(consultCheckout("bk_100"), {
    idempotencyKey: "checkout:bk_100",
  });
  expect(created.id).toMatch(/^cs_test_/);
  expect(created.object).toBe("checkout.session");
  expect(created.status).toBe("open");
  expect(created.payment_status).toBe("unpaid");
  expect(created.amount_total).toBe(15000);
  expect(created.currency).toBe("usd");
  expect(created.metadata).toEqual({ booking_id: "bk_100" });
  expect(created.client_reference_id).toBe("bk_100");
  expect(created.payment_intent).toBeNull();
  expect(created.url).toBe(`${fake.url}/pay/${created.id}`);
  // Without expires_at a session stays open 24 hours (Stripe docs, "Manage limited inventory").
  const now = Math.floor(Date.now() / 1000);
  expect(created.expires_at).toBeGreaterThanOrEqual(now + 24 * 3600 - 60);
  expect(created.expires_at).toBeLessThanOrEqual(now + 24 * 3600 + 1);
  expect(created.lastResponse.requestId).toMatch(/^req_/);

  const retrieved = await stripe.checkout.sessions.retrieve(created.id, { expand: ["line_items"] });
  expect(retrieved.id).toBe(created.id);
  expect(retrieved.line_items?.data[0].description).toBe("Fire pit design consult");
});

test("the hosted page is the stand-in's own: labelled as local, naming what is paid for and showing the business's note beside the button", async () => {
  const created = await stripe.checkout.sessions.create({
    ...consultCheckout("bk_110"),
    custom_text: {
      submit: { message: "You are paying Cinder & Slate Works <b>(555)</b>. Credited toward the build." },
    },
  });
  const page = await (await fetch(`${fake.url}/pay/${created.id}`)).text();
  expect(page).toContain("Local payments stand-in");
  expect(page).toContain("no real card is charged");
  // The note is escaped, never markup (custom_text[submit][message] is plain text at the service).
  expect(page).toContain(
    "You are paying Cinder &amp; Slate Works &lt;b&gt;(555)&lt;/b&gt;. Credited toward the build.",
  );
  // The payee comes from the session's own line item, not from the stand-in.
  const item = consultCheckout("bk_110").line_items![0]!.price_data!.product_data!.name;
  expect(page).toContain(`<span>${item.replace(/&/g, "&amp;")}`);
  expect(page).not.toMatch(/Pay Emberwright/);
  // A note longer than the service's 1,200 characters is refused, naming the parameter.
  const error = (await stripe.checkout.sessions
    .create({ ...consultCheckout("bk_111"), custom_text: { submit: { message: "x".repeat(1201) } } })
    .catch((e: unknown) => e)) as Stripe.errors.StripeError;
  expect(error.statusCode).toBe(400);
  expect(error.param).toBe("custom_text[submit][message]");
});

test("expires_at is honoured from 30 minutes to 24 hours ahead; outside that range it is a 400 naming expires_at, as the service answers", async () => {
  // Stripe docs, "Manage limited inventory": "The value must be between 30 minutes and 24 hours after the current
  // time."
  const now = Math.floor(Date.now() / 1000);
  const inRange = await stripe.checkout.sessions.create({ ...consultCheckout("bk_120"), expires_at: now + 35 * 60 });
  expect(inRange.expires_at).toBe(now + 35 * 60);
  for (const expiresAt of [now + 10 * 60, now + 25 * 3600]) {
    const error = (await stripe.checkout.sessions
      .create({ ...consultCheckout("bk_121"), expires_at: expiresAt })
      .catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(error).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(error.statusCode).toBe(400);
    expect(error.param).toBe("expires_at");
  }
});

test("the same idempotency key and body replays the first session instead of making a second", async () => {
  const first = await stripe.checkout.sessions.create(consultCheckout("bk_101"), { idempotencyKey: "checkout:bk_101" });
  const again = await stripe.checkout.sessions.create(consultCheckout("bk_101"), { idempotencyKey: "checkout:bk_101" });
  expect(again.id).toBe(first.id);
  expect(again.lastResponse.headers["idempotent-replayed"]).toBe("true");
  const { json } = await control(fake, "sessions");
  expect(json.data).toHaveLength(1);
});

test("the same idempotency key with a different body is an idempotency error", async () => {
  await stripe.checkout.sessions.create(consultCheckout("bk_102"), { idempotencyKey: "checkout:bk_102" });
  const changed = consultCheckout("bk_102", { customer_email: "someone.else@example.test" });
  const error = await stripe.checkout.sessions
    .create(changed, { idempotencyKey: "checkout:bk_102" })
    .catch((e: unknown) => e);
  expect(error).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
  expect((error as Stripe.errors.StripeError).statusCode).toBe(400);
});

test("invalid parameters answer 400 invalid_request_error naming the parameter", async () => {
  const cases: Array<[Stripe.Checkout.SessionCreateParams, string]> = [
    [consultCheckout("bk_103", { success_url: undefined }), "success_url"],
    [consultCheckout("bk_103", { success_url: "not a url" }), "success_url"],
    [
      consultCheckout("bk_103", {
        line_items: [
          { price_data: { currency: "usd", unit_amount: 15000, product_data: { name: "Consult" } }, quantity: 0 },
        ],
      }),
      "line_items[0][quantity]",
    ],
    [
      consultCheckout("bk_103", {
        line_items: [{ price_data: { currency: "usd", product_data: { name: "Consult" } }, quantity: 1 }],
      }),
      "line_items[0][price_data][unit_amount]",
    ],
    [consultCheckout("bk_103", { expires_at: Date.now() }), "expires_at"],
    [{ ...consultCheckout("bk_103"), colour: "red" } as Stripe.Checkout.SessionCreateParams, "colour"],
  ];
  for (const [params, param] of cases) {
    const error = (await stripe.checkout.sessions.create(params).catch((e: unknown) => e)) as Stripe.errors.StripeError;
    expect(error, param).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(error.type).toBe("StripeInvalidRequestError");
    expect(error.param).toBe(param);
    expect(error.statusCode).toBe(400);
  }
  const missing = (await stripe.checkout.sessions
    .retrieve("cs_test_nope")
    .catch((e: unknown) => e)) as Stripe.errors.StripeError;
  expect(missing.statusCode).toBe(404);
  expect(missing.code).toBe("resource_missing");
});

test("an API call without a secret key answers 401 in the error shape", async () => {
  const response = await fetch(`${fake.url}/v1/checkout/sessions`, { method: "POST", body: "mode=payment" });
  expect(response.status).toBe(401);
  const body = await response.json();
  expect(body.error).toMatchObject({ type: "invalid_request_error", param: null });
  expect(typeof body.error.message).toBe("string");
  expect(response.headers.get("request-id")).toMatch(/^req_/);

  const publishable = stripeFor(fake, "pk_test_not_secret");
  await expect(publishable.checkout.sessions.create(consultCheckout("bk_104"))).rejects.toBeInstanceOf(
    Stripe.errors.StripeAuthenticationError,
  );
});

test("paying with 4242 completes the session and sends a checkout.session.completed the SDK verifies", async () => {
  const session = await stripe.checkout.sessions.create(consultCheckout("bk_105"), {
    idempotencyKey: "checkout:bk_105",
  });
  const paid = await control(fake, `sessions/${session.id}/pay`, { card: "4242424242424242" });
  expect(paid.status).toBe(200);
  expect(paid.json.redirect).toBe(`http://127.0.0.1:5173/consult/booked?session_id=${session.id}`);

  const delivery = await waitFor(() => receiver.deliveries.find((d) => d.event.type === "checkout.session.completed"));
  const event = stripe.webhooks.constructEvent(delivery.rawBody, delivery.signature, WEBHOOK_SECRET);
  expect(event.id).toMatch(/^evt_/);
  expect(event.object).toBe("event");
  expect(event.livemode).toBe(false);
  const object = event.data.object as Stripe.Checkout.Session;
  expect(object.id).toBe(session.id);
  expect(object.status).toBe("complete");
  expect(object.payment_status).toBe("paid");
  expect(object.metadata).toEqual({ booking_id: "bk_105" });
  expect(() =>
    stripe.webhooks.constructEvent(delivery.rawBody.replace("15000", "1"), delivery.signature, WEBHOOK_SECRET),
  ).toThrow(Stripe.errors.StripeSignatureVerificationError);

  const retrieved = await stripe.checkout.sessions.retrieve(session.id);
  expect(retrieved.status).toBe("complete");
  expect(retrieved.payment_intent).toMatch(/^pi_/);
  expect(retrieved.url).toBeNull();
  const intent = await stripe.paymentIntents.retrieve(retrieved.payment_intent as string);
  expect(intent.status).toBe("succeeded");
  expect(intent.latest_charge).toMatch(/^ch_/);
});

test("the hosted page shows the amount and labelled card fields, escapes text, and pays with 4242", async () => {
  const session = await stripe.checkout.sessions.create(
    consultCheckout("bk_106", {
      line_items: [
        {
          price_data: {
            currency: "usd",
            unit_amount: 15000,
            product_data: { name: "Consult <script>alert(1)</script>" },
          },
          quantity: 1,
        },
      ],
    }),
  );
  const page = await fetch(session.url!);
  expect(page.status).toBe(200);
  const html = await page.text();
  expect(html).toContain("$150.00");
  expect(html).toContain("Consult &lt;script&gt;alert(1)&lt;/script&gt;");
  expect(html).not.toContain("<script>");
  for (const [id, label] of [
    ["card-number", "Card number"],
    ["card-expiry", "Expiry (MM / YY)"],
    ["card-cvc", "Security code (CVC)"],
    ["card-name", "Name on card"],
  ]) {
    expect(html).toContain(`<label for="${id}">${label}</label>`);
    expect(html).toContain(`id="${id}"`);
  }
  expect(html).toContain(`href="${CANCEL_URL}">Cancel and go back</a>`);

  const pay = await fetch(session.url!, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded" },
    body: "card_number=4242+4242+4242+4242&card_expiry=12+%2F+39&card_cvc=123&cardholder_name=Rowan+Pike",
  });
  expect(pay.status).toBe(303);
  expect(pay.headers.get("location")).toBe(`http://127.0.0.1:5173/consult/booked?session_id=${session.id}`);
  const after = await fetch(session.url!).then((r) => r.text());
  expect(after).toContain("already paid");
});

test("a declined card says so on the page and leaves the session open; other numbers ask for a test card", async () => {
  const session = await stripe.checkout.sessions.create(consultCheckout("bk_107"));
  const post = (cardNumber: string) =>
    fetch(session.url!, {
      method: "POST",
      redirect: "manual",
      headers: { "Content-Type": "application/x-www-form-urlencoded" },
      body: new URLSearchParams({
        card_number: cardNumber,
        card_expiry: "12 / 39",
        card_cvc: "123",
        cardholder_name: "Rowan Pike",
      }).toString(),
    });
  const declined = await post("4000 0000 0000 0002");
  expect(declined.status).toBe(402);
  expect(await declined.text()).toContain("Your card was declined.");
  const other = await post("5555 5555 5555 4444");
  expect(other.status).toBe(400);
  expect(await other.text()).toContain("Use a test card");

  const viaControl = await control(fake, `sessions/${session.id}/pay`, { card: "4000000000000002" });
  expect(viaControl.status).toBe(402);
  expect(viaControl.json.message).toBe("Your card was declined.");

  const retrieved = await stripe.checkout.sessions.retrieve(session.id);
  expect(retrieved.status).toBe("open");
  expect(retrieved.payment_status).toBe("unpaid");
  expect(retrieved.payment_intent).toBeNull();
  expect((await control(fake, "events")).json.data).toHaveLength(0);
});

test("expiring a session sends checkout.session.expired; expiring it again is a 400", async () => {
  const session = await stripe.checkout.sessions.create(consultCheckout("bk_108"));
  const expired = await stripe.checkout.sessions.expire(session.id, {}, { idempotencyKey: "expire:bk_108" });
  expect(expired.status).toBe("expired");
  expect(expired.url).toBeNull();
  const delivery = await waitFor(() => receiver.deliveries.find((d) => d.event.type === "checkout.session.expired"));
  const event = stripe.webhooks.constructEvent(delivery.rawBody, delivery.signature, WEBHOOK_SECRET);
  expect((event.data.object as Stripe.Checkout.Session).id).toBe(session.id);
  expect(event.request).toEqual({ id: expired.lastResponse.requestId, idempotency_key: "expire:bk_108" });

  const again = (await stripe.checkout.sessions
    .expire(session.id)
    .catch((e: unknown) => e)) as Stripe.errors.StripeError;
  expect(again).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
  expect(again.statusCode).toBe(400);
  expect(await fetch(session.url!).then((r) => r.text())).toContain("This checkout has expired");
  const paid = await control(fake, `sessions/${session.id}/pay`, { card: "4242424242424242" });
  expect(paid.status).toBe(409);
});

test("the expiry sweep expires an open session once its expires_at has passed", async () => {
  const session = await stripe.checkout.sessions.create(consultCheckout("bk_109"));
  const swept = await control(fake, `sessions/${session.id}/expire-now`, {});
  expect(swept.json.session.status).toBe("expired");
  const delivery = await waitFor(() => receiver.deliveries.find((d) => d.event.type === "checkout.session.expired"));
  expect(delivery.event.data.object).toMatchObject({ id: session.id, status: "expired" });
});

test("a refund under one idempotency key is made once and sends charge.refunded", async () => {
  const session = await stripe.checkout.sessions.create(consultCheckout("bk_110"));
  await control(fake, `sessions/${session.id}/pay`, { card: "4242424242424242" });
  const { payment_intent } = await stripe.checkout.sessions.retrieve(session.id);

  const refund = await stripe.refunds.create(
    { payment_intent: payment_intent as string },
    { idempotencyKey: "refund:bk_110" },
  );
  const replay = await stripe.refunds.create(
    { payment_intent: payment_intent as string },
    { idempotencyKey: "refund:bk_110" },
  );
  expect(refund.id).toMatch(/^re_/);
  expect(replay.id).toBe(refund.id);
  expect(refund).toMatchObject({
    object: "refund",
    amount: 15000,
    currency: "usd",
    status: "succeeded",
    payment_intent,
  });
  expect((await control(fake, "refunds")).json.data).toHaveLength(1);
  expect((await stripe.refunds.retrieve(refund.id)).amount).toBe(15000);

  const delivery = await waitFor(() => receiver.deliveries.find((d) => d.event.type === "charge.refunded"));
  const event = stripe.webhooks.constructEvent(delivery.rawBody, delivery.signature, WEBHOOK_SECRET);
  const charge = event.data.object as Stripe.Charge;
  expect(charge.id).toBe(refund.charge);
  expect(charge).toMatchObject({ amount_refunded: 15000, refunded: true, payment_intent });

  const second = (await stripe.refunds
    .create({ payment_intent: payment_intent as string }, { idempotencyKey: "refund:bk_110:again" })
    .catch((e: unknown) => e)) as Stripe.errors.StripeError;
  expect(second.code).toBe("charge_already_refunded");
  const noTarget = (await stripe.refunds.create({}).catch((e: unknown) => e)) as Stripe.errors.StripeError;
  expect(noTarget.param).toBe("payment_intent");
});

test("a webhook the receiver rejects twice is delivered on the third attempt", async () => {
  receiver.scriptedStatuses.push(500, 500);
  const session = await stripe.checkout.sessions.create(consultCheckout("bk_111"));
  await control(fake, `sessions/${session.id}/pay`, { card: "4242424242424242" });
  await waitFor(() => receiver.deliveries.some((d) => d.answeredWith === 200));
  expect(receiver.deliveries.map((d) => d.answeredWith)).toEqual([500, 500, 200]);
  // Every attempt carries the same event, each signed afresh.
  expect(new Set(receiver.deliveries.map((d) => d.event.id)).size).toBe(1);
  for (const d of receiver.deliveries)
    expect(() => stripe.webhooks.constructEvent(d.rawBody, d.signature, WEBHOOK_SECRET)).not.toThrow();

  const { json } = await control(fake, "deliveries");
  expect(
    json.data.map((a: { status: number; attempt: number; outcome: string }) => [a.attempt, a.status, a.outcome]),
  ).toEqual([
    [1, 500, "retry_scheduled"],
    [2, 500, "retry_scheduled"],
    [3, 200, "delivered"],
  ]);
  expect(json.pending).toHaveLength(0);
});

test("fail-next makes the SDK throw StripeAPIError and keeps nothing for the key; down answers 503 until lifted", async () => {
  await control(fake, "fail-next", { count: 1 });
  const failed = (await stripe.checkout.sessions
    .create(consultCheckout("bk_112"), { idempotencyKey: "checkout:bk_112" })
    .catch((e: unknown) => e)) as Stripe.errors.StripeError;
  expect(failed).toBeInstanceOf(Stripe.errors.StripeAPIError);
  expect(failed.statusCode).toBe(500);
  expect(failed.type).toBe("StripeAPIError");
  // The retry under the same key runs for real.
  const retried = await stripe.checkout.sessions.create(consultCheckout("bk_112"), {
    idempotencyKey: "checkout:bk_112",
  });
  expect(retried.status).toBe("open");

  await control(fake, "fail-next", { down: true });
  const down = (await stripe.checkout.sessions
    .retrieve(retried.id)
    .catch((e: unknown) => e)) as Stripe.errors.StripeError;
  expect(down).toBeInstanceOf(Stripe.errors.StripeAPIError);
  expect(down.statusCode).toBe(503);
  await control(fake, "fail-next", { down: false });
  expect((await stripe.checkout.sessions.retrieve(retried.id)).id).toBe(retried.id);
});

test("deliver-twice sends every event twice under the same event id", async () => {
  await control(fake, "deliver-twice", { on: true });
  const session = await stripe.checkout.sessions.create(consultCheckout("bk_113"));
  await control(fake, `sessions/${session.id}/pay`, { card: "4242424242424242" });
  await waitFor(() => receiver.deliveries.length === 2);
  expect(receiver.deliveries[0].event.id).toBe(receiver.deliveries[1].event.id);
  const { json } = await control(fake, "events");
  expect(json.data[0].pending_webhooks).toBe(2);
});

test("held events are delivered in reverse order when released that way", async () => {
  await control(fake, "hold-events", { on: true });
  const session = await stripe.checkout.sessions.create(consultCheckout("bk_114"));
  await control(fake, `sessions/${session.id}/pay`, { card: "4242424242424242" });
  const { payment_intent } = await stripe.checkout.sessions.retrieve(session.id);
  await stripe.refunds.create({ payment_intent: payment_intent as string }, { idempotencyKey: "refund:bk_114" });
  await new Promise((r) => setTimeout(r, 100));
  expect(receiver.deliveries).toHaveLength(0);

  const released = await control(fake, "release-events", { order: "reverse" });
  expect(released.json.released).toBe(2);
  await waitFor(() => receiver.deliveries.length === 2);
  expect(receiver.deliveries.map((d) => d.event.type)).toEqual(["charge.refunded", "checkout.session.completed"]);
});

test("a restart from the state file keeps sessions, idempotency records and the pending deliveries", async () => {
  receiver.fallbackStatus = 503;
  const session = await stripe.checkout.sessions.create(consultCheckout("bk_115"), {
    idempotencyKey: "checkout:bk_115",
  });
  await control(fake, `sessions/${session.id}/pay`, { card: "4242424242424242" });
  await waitFor(() => receiver.deliveries.length >= 1);
  await fake.close();

  receiver.fallbackStatus = 200;
  const restarted = await startFake();
  extraFakes.push(restarted);
  const client = stripeFor(restarted);
  const retrieved = await client.checkout.sessions.retrieve(session.id);
  expect(retrieved).toMatchObject({ id: session.id, status: "complete", payment_status: "paid" });
  const replay = await client.checkout.sessions.create(consultCheckout("bk_115"), {
    idempotencyKey: "checkout:bk_115",
  });
  expect(replay.id).toBe(session.id);

  const delivered = await waitFor(() => receiver.deliveries.find((d) => d.answeredWith === 200));
  expect(delivered.event.type).toBe("checkout.session.completed");
  expect((delivered.event.data.object as Stripe.Checkout.Session).id).toBe(session.id);
});

test("hostile API bodies answer 4xx in the error shape and the fake keeps serving", async () => {
  const bodies = [
    "line_items=abc&mode=payment&success_url=http://x.test/",
    "mode=payment&success_url=http://x.test/&line_items[0]=x",
    "mode=payment&success_url=http://x.test/&line_items[0][price_data]=x&line_items[0][quantity]=1",
    "mode=payment&success_url=http://x.test/&line_items[0][price_data][currency]=zzz&line_items[0][price_data][unit_amount]=100&line_items[0][price_data][product_data][name]=a&line_items[0][quantity]=1",
    "mode=payment&success_url=javascript:alert(1)",
    "metadata=x&mode=payment",
    "metadata[a]=1&metadata=2",
    "metadata[__proto__][polluted]=yes&mode=payment",
    "mode=%E0%A4%A",
    "mode[]=payment",
    "expand[0][x]=1&mode=payment",
    "mode=subscription",
    "&&&=&=",
    "x".repeat(2_000_000),
  ];
  for (const body of bodies) {
    const response = await fetch(`${fake.url}/v1/checkout/sessions`, {
      method: "POST",
      headers: { Authorization: `Bearer ${SECRET_KEY}`, "Content-Type": "application/x-www-form-urlencoded" },
      body,
    });
    expect(response.status, body.slice(0, 60)).toBeGreaterThanOrEqual(400);
    expect(response.status, body.slice(0, 60)).toBeLessThan(500);
    const json = await response.json();
    expect(json.error.type, body.slice(0, 60)).toBe("invalid_request_error");
  }
  expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  for (const path of ["__proto__", "constructor", "%E0%A4%A"]) {
    const response = await fetch(`${fake.url}/v1/checkout/sessions/${path}`, {
      headers: { Authorization: `Bearer ${SECRET_KEY}` },
    });
    expect(response.status, path).toBeGreaterThanOrEqual(400);
    expect(response.status, path).toBeLessThan(500);
    expect((await fetch(`${fake.url}/pay/${path}`)).status, path).toBe(404);
  }
  const session = await stripe.checkout.sessions.create(consultCheckout("bk_116"));
  expect(session.status).toBe("open");
});
