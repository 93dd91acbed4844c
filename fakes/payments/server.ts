/**
 * Local stand-in for the slice of the Stripe API that a paid consult booking uses: Checkout
 * Sessions, a hosted card page, refunds, signed webhooks with retries, expiry and idempotency keys.
 * Run alone with `npx tsx fakes/payments/server.ts`, or start in-process with `startPaymentsFake`.
 */
import http from "node:http";
import type { AddressInfo } from "node:net";
import { resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { CARD_FIELD_NAMES, renderCheckoutPage, renderClosedPage, renderNotFoundPage } from "./checkout-page";
import { FormDecodeError, fingerprintParams, parseFormBody } from "./form-encoding";
import type { FormObject } from "./form-encoding";
import { getOwn, makeId, nowSeconds } from "./ids";
import { ApiError, PaymentsLedger, TEST_CARD_MESSAGE, invalidRequest, noSuch } from "./ledger";
import type { CardForm, EmitEvent, EventCause } from "./ledger";
import { FAKE_API_VERSION, StateStore } from "./state";
import type { CheckoutSessionObject, EventObject } from "./state";
import { WebhookDispatcher } from "./webhooks";
import type { ReleaseOrder } from "./webhooks";

export interface PaymentsFakeOptions {
  port?: number;
  host?: string;
  // Where events are POSTed; null or empty keeps events on record without sending them.
  webhookUrl?: string | null;
  webhookSecret?: string;
  stateFile?: string;
  // First retry delay; later ones double up to retryMaxMs.
  retryBaseMs?: number;
  retryMaxMs?: number;
  // Attempts per delivery, the first included, before the fake gives up on it.
  maxAttempts?: number;
  deliveryTimeoutMs?: number;
  // How often open sessions are checked for a passed expires_at.
  sweepIntervalMs?: number;
  log?: (line: string) => void;
}

export interface PaymentsFake {
  url: string;
  close(): Promise<void>;
}

export const DEFAULT_PORT = 4020;
export const DEFAULT_HOST = "127.0.0.1";
export const DEFAULT_WEBHOOK_SECRET = "whsec_emberwright_local";
export const DEFAULT_STATE_FILE = "./data/payments-fake.json";

const MAX_BODY_BYTES = 1024 * 1024;

class BodyTooLargeError extends Error {}

function readBody(req: http.IncomingMessage): Promise<string> {
  return new Promise((resolveBody, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    const onData = (chunk: Buffer) => {
      size += chunk.length;
      if (size > MAX_BODY_BYTES) {
        // Keep reading and dropping the rest, so the client gets a 413 rather than a reset socket.
        req.off("data", onData);
        req.resume();
        reject(new BodyTooLargeError());
        return;
      }
      chunks.push(chunk);
    };
    req.on("data", onData);
    req.on("end", () => resolveBody(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

function sendJson(res: http.ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}): void {
  const text = JSON.stringify(body, null, 2);
  res.writeHead(status, {
    "Content-Type": "application/json; charset=utf-8",
    "Content-Length": Buffer.byteLength(text),
    "Cache-Control": "no-store",
    ...headers,
  });
  res.end(text);
}

const PAGE_HEADERS = {
  "Content-Type": "text/html; charset=utf-8",
  "Cache-Control": "no-store",
  // No scripts at all; styles are inline; the page may not be framed.
  "Content-Security-Policy": "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; frame-ancestors 'none'",
  "X-Content-Type-Options": "nosniff",
  "Referrer-Policy": "no-referrer",
};

function sendHtml(res: http.ServerResponse, status: number, html: string): void {
  res.writeHead(status, { ...PAGE_HEADERS, "Content-Length": Buffer.byteLength(html) });
  res.end(html);
}

interface ApiContext {
  params: FormObject;
  // The object id from the path, decoded; empty for collection routes.
  id: string;
  cause: EventCause;
}

interface ApiRoute {
  method: "GET" | "POST";
  pattern: RegExp;
  handle: (ctx: ApiContext) => { status: number; body: unknown };
}

class ControlError extends Error {
  constructor(
    readonly status: number,
    message: string,
  ) {
    super(message);
  }
}

function readFlag(body: Record<string, unknown>, key: string): boolean {
  if (typeof body[key] !== "boolean") throw new ControlError(400, `Send {"${key}": true} or {"${key}": false}.`);
  return body[key] as boolean;
}

// The request log is for reading what the app sent; a huge body is noted by size, not kept.
const MAX_LOGGED_PARAMS_CHARS = 8 * 1024;

function summariseParams(params: FormObject): unknown {
  const text = JSON.stringify(params);
  return text.length <= MAX_LOGGED_PARAMS_CHARS ? params : { omitted: `parameters of ${text.length} characters not logged` };
}

function envInt(name: string, fallback: number, min: number, max: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < min || n > max) {
    throw new Error(`${name} must be a whole number from ${min} to ${max}; got "${raw}".`);
  }
  return n;
}

/** Starts the fake; resolves once it listens. Port 0 picks a free port (see the returned url). */
export async function startPaymentsFake(options: PaymentsFakeOptions = {}): Promise<PaymentsFake> {
  const host = options.host ?? DEFAULT_HOST;
  const log = options.log ?? ((line: string) => console.log(line));
  const webhookUrl = options.webhookUrl ? new URL(options.webhookUrl).toString() : null;
  const store = new StateStore(options.stateFile ?? DEFAULT_STATE_FILE);
  let baseUrl = "";

  const dispatcher = new WebhookDispatcher(store, {
    url: webhookUrl,
    secret: options.webhookSecret ?? DEFAULT_WEBHOOK_SECRET,
    retryBaseMs: options.retryBaseMs ?? 500,
    retryMaxMs: options.retryMaxMs ?? 30_000,
    maxAttempts: options.maxAttempts ?? 12,
    timeoutMs: options.deliveryTimeoutMs ?? 10_000,
    log,
  });

  const presentForEvent = (object: CheckoutSessionObject | EventObject["data"]["object"]) =>
    object.object === "checkout.session"
      ? { ...object, url: object.status === "open" ? `${baseUrl}/pay/${encodeURIComponent(object.id)}` : null }
      : object;

  const emit: EmitEvent = (type, object, cause, previousAttributes) => {
    const event: EventObject = {
      id: makeId("evt_"),
      object: "event",
      api_version: FAKE_API_VERSION,
      created: nowSeconds(),
      data: {
        object: structuredClone(presentForEvent(object)),
        ...(previousAttributes ? { previous_attributes: previousAttributes } : {}),
      },
      livemode: false,
      pending_webhooks: 0,
      request: { id: cause.requestId, idempotency_key: cause.idempotencyKey },
      type,
    };
    store.state.events.push(event);
    event.pending_webhooks = dispatcher.enqueue(event);
    // The caller saves the state before returning; the send itself starts on a later tick.
    dispatcher.kick();
    return event;
  };

  const ledger = new PaymentsLedger(store, emit, () => baseUrl);

  const apiRoutes: ApiRoute[] = [
    {
      method: "POST",
      pattern: /^\/v1\/checkout\/sessions$/,
      handle: ({ params }) => {
        const record = ledger.createSession(params);
        return { status: 200, body: ledger.presentSession(record, ledger.readSessionExpand(params)) };
      },
    },
    {
      method: "GET",
      pattern: /^\/v1\/checkout\/sessions\/([^/]+)$/,
      handle: ({ params, id }) => {
        const expand = ledger.readSessionExpand(params);
        const record = ledger.getSession(id);
        if (!record) throw noSuch("checkout.session", id, "session");
        return { status: 200, body: ledger.presentSession(record, expand) };
      },
    },
    {
      method: "GET",
      pattern: /^\/v1\/checkout\/sessions\/([^/]+)\/line_items$/,
      handle: ({ id }) => {
        const record = ledger.getSession(id);
        if (!record) throw noSuch("checkout.session", id, "session");
        return { status: 200, body: ledger.presentLineItems(record) };
      },
    },
    {
      method: "POST",
      pattern: /^\/v1\/checkout\/sessions\/([^/]+)\/expire$/,
      handle: ({ params, id, cause }) => {
        const expand = ledger.readSessionExpand(params);
        const record = ledger.expireSession(id, cause);
        return { status: 200, body: ledger.presentSession(record, expand) };
      },
    },
    {
      method: "POST",
      pattern: /^\/v1\/refunds$/,
      handle: ({ params, cause }) => {
        const refund = ledger.createRefund(params, cause);
        return { status: 200, body: ledger.presentRefund(refund, ledger.readRefundExpand(params)) };
      },
    },
    {
      method: "GET",
      pattern: /^\/v1\/refunds\/([^/]+)$/,
      handle: ({ params, id }) => {
        const expand = ledger.readRefundExpand(params);
        const refund = getOwn(store.state.refunds, id);
        if (!refund) throw noSuch("refund", id, "id");
        return { status: 200, body: ledger.presentRefund(refund, expand) };
      },
    },
    {
      method: "GET",
      pattern: /^\/v1\/payment_intents\/([^/]+)$/,
      handle: ({ id }) => {
        const intent = getOwn(store.state.paymentIntents, id);
        if (!intent) throw noSuch("payment_intent", id, "intent");
        return { status: 200, body: intent };
      },
    },
    {
      method: "GET",
      pattern: /^\/v1\/charges\/([^/]+)$/,
      handle: ({ id }) => {
        const charge = getOwn(store.state.charges, id);
        if (!charge) throw noSuch("charge", id, "id");
        return { status: 200, body: charge };
      },
    },
    {
      method: "GET",
      pattern: /^\/v1\/events\/([^/]+)$/,
      handle: ({ id }) => {
        const event = store.state.events.find((e) => e.id === id);
        if (!event) throw noSuch("event", id, "id");
        return { status: 200, body: event };
      },
    },
  ];

  async function handleApi(req: http.IncomingMessage, res: http.ServerResponse, url: URL): Promise<void> {
    const requestId = makeId("req_", 14);
    const versionHeader = req.headers["stripe-version"];
    const idempotencyHeader = req.headers["idempotency-key"];
    const idempotencyKey = typeof idempotencyHeader === "string" && idempotencyHeader !== "" ? idempotencyHeader : null;
    const headers: Record<string, string> = {
      "Request-Id": requestId,
      "Stripe-Version": typeof versionHeader === "string" ? versionHeader : FAKE_API_VERSION,
    };
    if (idempotencyKey && req.method === "POST") headers["Idempotency-Key"] = idempotencyKey;
    const method = req.method ?? "GET";
    let params: FormObject = {};

    const record = (status: number, replayed: boolean) => {
      store.state.requests.push({
        at: Date.now(),
        requestId,
        method,
        path: url.pathname,
        idempotencyKey,
        params: summariseParams(params),
        status,
        replayed,
      });
      store.save();
    };
    const fail = (error: ApiError) => {
      record(error.status, false);
      sendJson(res, error.status, error.toBody(), headers);
    };

    const { controls } = store.state;
    if (controls.down) {
      return fail(new ApiError(503, "api_error", "The payments service is unavailable (the local fake was told to go down)."));
    }
    if (controls.failNext > 0) {
      controls.failNext -= 1;
      // An injected failure never reaches the endpoint, so nothing is kept for its idempotency key:
      // a retry with the same key runs for real.
      return fail(new ApiError(500, "api_error", "An error occurred with the payments service (injected by the local fake)."));
    }

    const auth = req.headers.authorization ?? "";
    const bearer = /^Bearer\s+(\S+)$/i.exec(auth);
    if (!bearer) {
      return fail(
        new ApiError(401, "invalid_request_error", "No API key provided. Send your secret key as 'Authorization: Bearer sk_…'.", null, null),
      );
    }
    if (!/^(sk|rk)_\S+$/.test(bearer[1])) {
      const shown = bearer[1].length > 8 ? `${bearer[1].slice(0, 4)}…${bearer[1].slice(-4)}` : "****";
      return fail(new ApiError(401, "invalid_request_error", `Invalid API key provided: ${shown}. Keys start with sk_.`, "api_key_invalid", null));
    }

    const matching = apiRoutes.filter((r) => r.pattern.test(url.pathname));
    const route = matching.find((r) => r.method === method);
    if (!route) {
      return fail(
        new ApiError(404, "invalid_request_error", `Unrecognized request URL (${method}: ${url.pathname}).`, null, null),
      );
    }

    try {
      if (method === "GET") {
        params = parseFormBody(url.search.slice(1));
      } else {
        const body = await readBody(req);
        const type = (req.headers["content-type"] ?? "").split(";")[0].trim().toLowerCase();
        if (body !== "" && type !== "application/x-www-form-urlencoded") {
          throw invalidRequest("Send parameters form-encoded (Content-Type: application/x-www-form-urlencoded).", null);
        }
        params = parseFormBody(body);
      }
    } catch (error) {
      if (error instanceof BodyTooLargeError) {
        headers.Connection = "close";
        return fail(new ApiError(413, "invalid_request_error", "Request body is larger than 1 MB.", null, null));
      }
      if (error instanceof FormDecodeError) return fail(invalidRequest(error.message, error.param));
      if (error instanceof ApiError) return fail(error);
      throw error;
    }

    let idempotencySlot: string | null = null;
    if (method === "POST" && idempotencyKey) {
      if (idempotencyKey.length > 255) {
        return fail(invalidRequest("Idempotency-Key may be at most 255 characters.", "idempotency_key"));
      }
      // Prefixed so a key such as "__proto__" is just data.
      idempotencySlot = `key:${idempotencyKey}`;
      const previous = getOwn(store.state.idempotency, idempotencySlot);
      const fingerprint = fingerprintParams(params);
      if (previous) {
        if (previous.method !== method || previous.path !== url.pathname || previous.fingerprint !== fingerprint) {
          return fail(
            new ApiError(
              400,
              "idempotency_error",
              `Idempotency key '${idempotencyKey}' was first used for ${previous.method} ${previous.path} with other parameters. ` +
                "Use a new key for a different request.",
              "idempotency_key_in_use",
              null,
            ),
          );
        }
        record(previous.status, true);
        res.writeHead(previous.status, {
          "Content-Type": "application/json; charset=utf-8",
          "Content-Length": Buffer.byteLength(previous.body),
          "Cache-Control": "no-store",
          "Idempotent-Replayed": "true",
          ...headers,
        });
        res.end(previous.body);
        return;
      }
    }

    const match = route.pattern.exec(url.pathname)!;
    let id = "";
    try {
      id = match[1] === undefined ? "" : decodeURIComponent(match[1]);
    } catch {
      return fail(invalidRequest("Malformed id in the URL.", "id"));
    }
    try {
      const result = route.handle({ params, id, cause: { requestId, idempotencyKey } });
      const text = JSON.stringify(result.body, null, 2);
      // Only a request that ran is remembered; validation errors are not, as with the real service.
      if (idempotencySlot && result.status < 300) {
        store.state.idempotency[idempotencySlot] = {
          method,
          path: url.pathname,
          fingerprint: fingerprintParams(params),
          status: result.status,
          body: text,
          createdAt: Date.now(),
        };
      }
      record(result.status, false);
      res.writeHead(result.status, {
        "Content-Type": "application/json; charset=utf-8",
        "Content-Length": Buffer.byteLength(text),
        "Cache-Control": "no-store",
        ...headers,
      });
      res.end(text);
    } catch (error) {
      if (error instanceof ApiError) return fail(error);
      throw error;
    }
  }

  function readCardForm(fields: FormObject): CardForm {
    const text = (key: string) => {
      const value = fields[key];
      return typeof value === "string" ? value : "";
    };
    return {
      number: text(CARD_FIELD_NAMES.number),
      expiry: text(CARD_FIELD_NAMES.expiry),
      cvc: text(CARD_FIELD_NAMES.cvc),
      name: text(CARD_FIELD_NAMES.name),
    };
  }

  async function handlePage(req: http.IncomingMessage, res: http.ServerResponse, url: URL): Promise<void> {
    const match = /^\/pay\/([^/]+)$/.exec(url.pathname);
    let id = "";
    try {
      id = match ? decodeURIComponent(match[1]) : "";
    } catch {
      id = "";
    }
    const record = id ? ledger.getSession(id) : undefined;
    if (!record) return sendHtml(res, 404, renderNotFoundPage());

    if (req.method === "GET" || req.method === "HEAD") {
      ledger.expireIfDue(record);
      if (record.session.status !== "open") return sendHtml(res, 200, renderClosedPage(record, ledger.successRedirect(record)));
      return sendHtml(res, 200, renderCheckoutPage({ record }));
    }
    if (req.method !== "POST") {
      res.writeHead(405, { Allow: "GET, POST" });
      res.end();
      return;
    }

    let form: CardForm;
    try {
      form = readCardForm(parseFormBody(await readBody(req)));
    } catch {
      return sendHtml(res, 400, renderCheckoutPage({ record, alert: "The form could not be read. Try again." }));
    }
    const result = ledger.paySession(id, form, "page");
    switch (result.kind) {
      case "paid":
        res.writeHead(303, { Location: ledger.successRedirect(result.record), "Cache-Control": "no-store" });
        res.end();
        return;
      case "declined":
        return sendHtml(res, 402, renderCheckoutPage({ record, form, alert: `${result.message} Try another card.` }));
      case "invalid": {
        const alert = result.errors.number === TEST_CARD_MESSAGE && Object.keys(result.errors).length === 1 ? TEST_CARD_MESSAGE : undefined;
        return sendHtml(res, 400, renderCheckoutPage({ record, form, errors: result.errors, alert }));
      }
      case "not_open":
        return sendHtml(res, 409, renderClosedPage(result.record, ledger.successRedirect(result.record)));
      case "not_found":
        return sendHtml(res, 404, renderNotFoundPage());
    }
  }

  async function readControlBody(req: http.IncomingMessage): Promise<Record<string, unknown>> {
    const text = await readBody(req);
    if (text.trim() === "") return {};
    let parsed: unknown;
    try {
      parsed = JSON.parse(text);
    } catch {
      throw new ControlError(400, "The body must be JSON.");
    }
    if (!parsed || typeof parsed !== "object" || Array.isArray(parsed)) throw new ControlError(400, "The body must be a JSON object.");
    return parsed as Record<string, unknown>;
  }

  function presentRecord(id: string) {
    const record = ledger.getSession(id)!;
    return {
      session: ledger.presentSession(record),
      lineItems: record.lineItems,
      paymentIntentData: record.paymentIntentData,
      attempts: record.attempts,
      ignoredParams: record.ignoredParams,
    };
  }

  async function handleControl(req: http.IncomingMessage, res: http.ServerResponse, url: URL): Promise<void> {
    const path = url.pathname.slice("/_fake".length);
    const method = req.method ?? "GET";
    const state = store.state;
    const route = `${method} ${path}`;

    if (method === "GET") {
      switch (path) {
        case "/health":
          return sendJson(res, 200, { ok: true, url: baseUrl, webhookUrl, stateFile: store.file });
        case "/events": {
          const type = url.searchParams.get("type");
          return sendJson(res, 200, { data: type ? state.events.filter((e) => e.type === type) : state.events });
        }
        case "/sessions":
          return sendJson(res, 200, { data: Object.keys(state.sessions).map(presentRecord) });
        case "/refunds":
          return sendJson(res, 200, { data: Object.values(state.refunds) });
        case "/deliveries":
          return sendJson(res, 200, { data: state.deliveries, pending: state.queue });
        case "/requests":
          return sendJson(res, 200, { data: state.requests });
        case "/controls":
          return sendJson(res, 200, state.controls);
      }
      throw new ControlError(404, `No control at ${route}.`);
    }
    if (method !== "POST") throw new ControlError(405, "Controls take GET or POST.");

    const body = await readControlBody(req);
    const sessionAction = /^\/sessions\/([^/]+)\/(pay|expire-now)$/.exec(path);
    if (sessionAction) {
      const id = decodeURIComponent(sessionAction[1]);
      const record = ledger.getSession(id);
      if (!record) throw new ControlError(404, `No session ${id}.`);
      if (sessionAction[2] === "expire-now") {
        if (record.session.status !== "open") throw new ControlError(409, `Session ${id} is ${record.session.status}, not open.`);
        // Moves the deadline and lets the regular sweep do the expiring, as the timer would.
        record.session.expires_at = nowSeconds();
        ledger.sweepExpired();
        return sendJson(res, 200, presentRecord(id));
      }
      if (typeof body.card !== "string") throw new ControlError(400, 'Send {"card": "4242424242424242"}.');
      const farYear = (new Date().getUTCFullYear() + 5) % 100;
      const form: CardForm = {
        number: body.card,
        expiry: typeof body.expiry === "string" ? body.expiry : `12 / ${String(farYear).padStart(2, "0")}`,
        cvc: typeof body.cvc === "string" ? body.cvc : "123",
        name: typeof body.name === "string" ? body.name : "Test Cardholder",
      };
      const result = ledger.paySession(id, form, "control");
      switch (result.kind) {
        case "paid":
          return sendJson(res, 200, { outcome: "paid", redirect: ledger.successRedirect(result.record), ...presentRecord(id) });
        case "declined":
          return sendJson(res, 402, { outcome: "declined", message: result.message, ...presentRecord(id) });
        case "invalid":
          return sendJson(res, 400, { outcome: "invalid", errors: result.errors });
        case "not_open":
          return sendJson(res, 409, { outcome: "not_open", status: result.record.session.status });
        case "not_found":
          throw new ControlError(404, `No session ${id}.`);
      }
    }
    const resend = /^\/events\/([^/]+)\/resend$/.exec(path);
    if (resend) {
      const event = state.events.find((e) => e.id === decodeURIComponent(resend[1]));
      if (!event) throw new ControlError(404, `No event ${resend[1]}.`);
      const copies = dispatcher.enqueue(event);
      store.save();
      dispatcher.kick();
      return sendJson(res, 200, { queued: copies });
    }

    switch (path) {
      case "/fail-next": {
        if (body.down !== undefined) state.controls.down = readFlag(body, "down");
        if (body.count !== undefined) {
          if (typeof body.count !== "number" || !Number.isInteger(body.count) || body.count < 0 || body.count > 1000) {
            throw new ControlError(400, "count must be a whole number from 0 to 1000.");
          }
          state.controls.failNext = body.count;
        }
        if (body.down === undefined && body.count === undefined) throw new ControlError(400, 'Send {"count": N} or {"down": true|false}.');
        store.save();
        return sendJson(res, 200, state.controls);
      }
      case "/deliver-twice":
        state.controls.deliverTwice = readFlag(body, "on");
        store.save();
        return sendJson(res, 200, state.controls);
      case "/hold-events":
        state.controls.holdEvents = readFlag(body, "on");
        store.save();
        return sendJson(res, 200, state.controls);
      case "/release-events": {
        const order = body.order ?? "created";
        if (order !== "created" && order !== "reverse") throw new ControlError(400, 'order must be "created" or "reverse".');
        const released = dispatcher.release(order as ReleaseOrder);
        store.save();
        dispatcher.kick();
        return sendJson(res, 200, { released });
      }
      case "/reset":
        store.reset();
        return sendJson(res, 200, { ok: true });
    }
    throw new ControlError(404, `No control at ${route}.`);
  }

  const server = http.createServer((req, res) => {
    const url = new URL(req.url ?? "/", "http://fake.invalid");
    const path = url.pathname;
    const work = path.startsWith("/v1/")
      ? handleApi(req, res, url)
      : path.startsWith("/pay/")
        ? handlePage(req, res, url)
        : path.startsWith("/_fake/")
          ? handleControl(req, res, url)
          : handleOther(req, res, path);
    work.catch((error: unknown) => {
      if (error instanceof ControlError) return sendJson(res, error.status, { error: error.message });
      if (error instanceof BodyTooLargeError) return sendJson(res, 413, { error: "Request body is larger than 1 MB." });
      log(`payments fake: ${req.method} ${path} failed: ${error instanceof Error ? error.stack : String(error)}`);
      if (!res.headersSent) sendJson(res, 500, new ApiError(500, "api_error", "The local payments fake hit an unexpected error.").toBody());
      else res.destroy();
    });
  });

  async function handleOther(req: http.IncomingMessage, res: http.ServerResponse, path: string): Promise<void> {
    if (path === "/favicon.ico") {
      res.writeHead(204);
      res.end();
      return;
    }
    if (path === "/") {
      return sendJson(res, 200, {
        name: "Emberwright local payments fake",
        api: `${baseUrl}/v1`,
        controls: `${baseUrl}/_fake/health`,
      });
    }
    sendJson(res, 404, { error: `Nothing at ${req.method} ${path}.` });
  }

  await new Promise<void>((resolveListen, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? DEFAULT_PORT, host, () => {
      server.off("error", reject);
      resolveListen();
    });
  });
  const address = server.address() as AddressInfo;
  const shownHost = address.family === "IPv6" ? `[${address.address}]` : address.address;
  baseUrl = `http://${shownHost}:${address.port}`;

  // Sessions that ran out while the fake was stopped expire now; deliveries left in the queue resume.
  ledger.sweepExpired();
  dispatcher.kick();
  const sweeper = setInterval(() => {
    try {
      ledger.sweepExpired();
    } catch (error) {
      log(`payments fake: expiry sweep failed: ${error instanceof Error ? error.message : String(error)}`);
    }
  }, options.sweepIntervalMs ?? 1000);
  sweeper.unref();

  log(
    `Payments fake listening on ${baseUrl} (webhooks to ${webhookUrl ?? "nowhere: no webhook URL set"}; state in ${store.file})`,
  );

  let closing: Promise<void> | undefined;
  return {
    url: baseUrl,
    close() {
      closing ??= new Promise<void>((resolveClose) => {
        clearInterval(sweeper);
        dispatcher.stop();
        server.close(() => resolveClose());
        // The SDK keeps connections alive; without this close() would wait for them to time out.
        server.closeAllConnections();
      });
      return closing;
    },
  };
}

async function main(): Promise<void> {
  const fake = await startPaymentsFake({
    port: envInt("PAYMENTS_FAKE_PORT", DEFAULT_PORT, 0, 65535),
    host: DEFAULT_HOST,
    webhookUrl: process.env.PAYMENTS_FAKE_WEBHOOK_URL || null,
    webhookSecret: process.env.STRIPE_WEBHOOK_SECRET || DEFAULT_WEBHOOK_SECRET,
    stateFile: process.env.PAYMENTS_FAKE_STATE || DEFAULT_STATE_FILE,
    retryBaseMs: envInt("PAYMENTS_FAKE_RETRY_BASE_MS", 500, 1, 3_600_000),
    maxAttempts: envInt("PAYMENTS_FAKE_MAX_ATTEMPTS", 12, 1, 1000),
  });
  const stop = () => {
    void fake.close().then(() => process.exit(0));
  };
  process.once("SIGINT", stop);
  process.once("SIGTERM", stop);
}

const invokedPath = process.argv[1] ? resolve(process.argv[1]) : "";
if (invokedPath === fileURLToPath(import.meta.url)) {
  main().catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error);
    process.exit(1);
  });
}
