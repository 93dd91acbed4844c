/**
 * The test controls under /_fake (fakes/payments/README.md): one handler per control. GETs read the
 * fake's records; POSTs take a JSON object (an empty body counts as {}).
 */
import type { IncomingMessage, ServerResponse } from "node:http";
import {
  InvalidJsonError,
  isJsonObject,
  matchEndpoint,
  parseJsonBody,
  readBody,
  sendJson,
  type Endpoint,
} from "../shared/http";
import { MAX_BODY_BYTES } from "./api";
import { nowSeconds } from "./ids";
import type { CardForm, PaymentsLedger } from "./ledger";
import type { StateStore } from "./state";
import type { WebhookDispatcher } from "./webhooks";

export class ControlError extends Error {
  constructor(
    readonly status: number,
    message: string,
  ) {
    super(message);
  }
}

export interface ControlContext {
  store: StateStore;
  ledger: PaymentsLedger;
  dispatcher: WebhookDispatcher;
  webhookUrl: string | null;
  baseUrl: () => string;
}

interface ControlCall {
  url: URL;
  body: Record<string, unknown>;
  /** The path's parameters, decoded. */
  params: string[];
}

interface ControlEndpoint extends Endpoint {
  method: "GET" | "POST";
  handle: (call: ControlCall) => { status: number; body: unknown };
}

function readFlag(body: Record<string, unknown>, key: string): boolean {
  const value = body[key];
  if (typeof value !== "boolean") throw new ControlError(400, `Send {"${key}": true} or {"${key}": false}.`);
  return value;
}

async function readControlBody(req: IncomingMessage): Promise<Record<string, unknown>> {
  let parsed: unknown;
  try {
    parsed = parseJsonBody(await readBody(req, MAX_BODY_BYTES));
  } catch (error) {
    if (error instanceof InvalidJsonError) throw new ControlError(400, "The body must be JSON.");
    throw error;
  }
  if (parsed === undefined) return {};
  if (!isJsonObject(parsed)) throw new ControlError(400, "The body must be a JSON object.");
  return parsed;
}

function controlEndpoints({ store, ledger, dispatcher, webhookUrl, baseUrl }: ControlContext): ControlEndpoint[] {
  const ok = (body: unknown, status = 200) => ({ status, body });
  const state = () => store.state;
  const presentRecord = (id: string) => {
    const record = ledger.getSession(id)!;
    return {
      session: ledger.presentSession(record),
      lineItems: record.lineItems,
      paymentIntentData: record.paymentIntentData,
      attempts: record.attempts,
      ignoredParams: record.ignoredParams,
    };
  };
  const openSession = (id: string) => {
    const record = ledger.getSession(id);
    if (!record) throw new ControlError(404, `No session ${id}.`);
    return record;
  };
  const setFlag = (key: "deliverTwice" | "holdEvents") => (call: ControlCall) => {
    state().controls[key] = readFlag(call.body, "on");
    store.save();
    return ok(state().controls);
  };

  return [
    {
      method: "GET",
      pattern: /^\/health$/,
      handle: () => ok({ ok: true, url: baseUrl(), webhookUrl, stateFile: store.file }),
    },
    {
      method: "GET",
      pattern: /^\/events$/,
      handle: ({ url }) => {
        const type = url.searchParams.get("type");
        return ok({ data: type ? state().events.filter((e) => e.type === type) : state().events });
      },
    },
    {
      method: "GET",
      pattern: /^\/sessions$/,
      handle: () => ok({ data: Object.keys(state().sessions).map(presentRecord) }),
    },
    { method: "GET", pattern: /^\/refunds$/, handle: () => ok({ data: Object.values(state().refunds) }) },
    {
      method: "GET",
      pattern: /^\/deliveries$/,
      handle: () => ok({ data: state().deliveries, pending: state().queue }),
    },
    { method: "GET", pattern: /^\/requests$/, handle: () => ok({ data: state().requests }) },
    { method: "GET", pattern: /^\/controls$/, handle: () => ok(state().controls) },
    {
      method: "POST",
      pattern: /^\/sessions\/([^/]+)\/expire-now$/,
      handle: ({ params: [id] }) => {
        const record = openSession(id!);
        if (record.session.status !== "open")
          throw new ControlError(409, `Session ${id} is ${record.session.status}, not open.`);
        // Moves the deadline and lets the regular sweep do the expiring, as the timer would.
        record.session.expires_at = nowSeconds();
        ledger.sweepExpired();
        return ok(presentRecord(id!));
      },
    },
    {
      method: "POST",
      pattern: /^\/sessions\/([^/]+)\/pay$/,
      handle: ({ body, params: [id] }) => {
        openSession(id!);
        if (typeof body.card !== "string") throw new ControlError(400, 'Send {"card": "4242424242424242"}.');
        const farYear = (new Date().getUTCFullYear() + 5) % 100;
        const form: CardForm = {
          number: body.card,
          expiry: typeof body.expiry === "string" ? body.expiry : `12 / ${String(farYear).padStart(2, "0")}`,
          cvc: typeof body.cvc === "string" ? body.cvc : "123",
          name: typeof body.name === "string" ? body.name : "Test Cardholder",
        };
        const result = ledger.paySession(id!, form, "control");
        switch (result.kind) {
          case "paid":
            return ok({ outcome: "paid", redirect: ledger.successRedirect(result.record), ...presentRecord(id!) });
          case "declined":
            return ok({ outcome: "declined", message: result.message, ...presentRecord(id!) }, 402);
          case "invalid":
            return ok({ outcome: "invalid", errors: result.errors }, 400);
          case "not_open":
            return ok({ outcome: "not_open", status: result.record.session.status }, 409);
          case "not_found":
            throw new ControlError(404, `No session ${id}.`);
        }
      },
    },
    {
      method: "POST",
      pattern: /^\/events\/([^/]+)\/resend$/,
      handle: ({ params: [id] }) => {
        const event = state().events.find((e) => e.id === id);
        if (!event) throw new ControlError(404, `No event ${id}.`);
        const copies = dispatcher.enqueue(event);
        store.save();
        dispatcher.kick();
        return ok({ queued: copies });
      },
    },
    {
      method: "POST",
      pattern: /^\/fail-next$/,
      handle: ({ body }) => {
        const { controls } = state();
        if (body.down !== undefined) controls.down = readFlag(body, "down");
        if (body.count !== undefined) {
          if (typeof body.count !== "number" || !Number.isInteger(body.count) || body.count < 0 || body.count > 1000) {
            throw new ControlError(400, "count must be a whole number from 0 to 1000.");
          }
          controls.failNext = body.count;
        }
        if (body.down === undefined && body.count === undefined)
          throw new ControlError(400, 'Send {"count": N} or {"down": true|false}.');
        store.save();
        return ok(controls);
      },
    },
    { method: "POST", pattern: /^\/deliver-twice$/, handle: setFlag("deliverTwice") },
    { method: "POST", pattern: /^\/hold-events$/, handle: setFlag("holdEvents") },
    {
      method: "POST",
      pattern: /^\/release-events$/,
      handle: ({ body }) => {
        const order = body.order ?? "created";
        if (order !== "created" && order !== "reverse")
          throw new ControlError(400, 'order must be "created" or "reverse".');
        const released = dispatcher.release(order);
        store.save();
        dispatcher.kick();
        return ok({ released });
      },
    },
    {
      method: "POST",
      pattern: /^\/reset$/,
      handle: () => {
        store.reset();
        return ok({ ok: true });
      },
    },
  ];
}

/** Makes the handler for /_fake/… requests; errors are thrown as ControlError for the server to answer. */
export function controlHandler(context: ControlContext) {
  const endpoints = controlEndpoints(context);
  return async (req: IncomingMessage, res: ServerResponse, url: URL): Promise<void> => {
    const path = url.pathname.slice("/_fake".length);
    const method = req.method ?? "GET";
    if (method !== "GET" && method !== "POST") throw new ControlError(405, "Controls take GET or POST.");
    // A POST's body is read (and must be a JSON object) before the control is looked up.
    const body = method === "POST" ? await readControlBody(req) : {};
    const match = matchEndpoint(endpoints, method, path);
    if (match.kind !== "found") throw new ControlError(404, `No control at ${method} ${path}.`);
    const result = match.endpoint.handle({ url, body, params: match.params.map(decodeURIComponent) });
    sendJson(res, result.status, result.body, {}, 2);
  };
}
