/**
 * The fake's /v1 API: one handler per endpoint, and the steps every call goes through first, in the
 * service's order: injected failures, the secret key, the endpoint, the parameters, the idempotency
 * key (a replay answers the stored body), then the handler, whose answer is logged and remembered.
 */
import type { IncomingMessage, ServerResponse } from "node:http";
import { takeFailure } from "../shared/failures";
import {
  BodyTooLargeError,
  bearerKey,
  matchEndpoint,
  readBody,
  sendJson,
  sendJsonText,
  type Endpoint,
} from "../shared/http";
import { checkIdempotency } from "../shared/idempotency";
import { FormDecodeError, fingerprintParams, parseFormBody, type FormObject } from "./form-encoding";
import { getOwn, makeId } from "./ids";
import { ApiError, invalidRequest, noSuch, type EventCause, type PaymentsLedger } from "./ledger";
import { FAKE_API_VERSION, type StateStore } from "./state";

export const MAX_BODY_BYTES = 1024 * 1024;

// The request log is for reading what the app sent; a huge body is noted by size, not kept.
const MAX_LOGGED_PARAMS_CHARS = 8 * 1024;

interface ApiCall {
  params: FormObject;
  // The object id from the path, decoded; empty for collection routes.
  id: string;
  cause: EventCause;
}

interface ApiEndpoint extends Endpoint {
  method: "GET" | "POST";
  handle: (call: ApiCall) => { status: number; body: unknown };
}

/** The endpoints of the service that the app uses. */
export function apiEndpoints(ledger: PaymentsLedger, store: StateStore): ApiEndpoint[] {
  const ok = (body: unknown) => ({ status: 200, body });
  const session = (id: string) => {
    const record = ledger.getSession(id);
    if (!record) throw noSuch("checkout.session", id, "session");
    return record;
  };
  return [
    {
      method: "POST",
      pattern: /^\/v1\/checkout\/sessions$/,
      handle: ({ params }) => ok(ledger.presentSession(ledger.createSession(params), ledger.readSessionExpand(params))),
    },
    {
      method: "GET",
      pattern: /^\/v1\/checkout\/sessions\/([^/]+)$/,
      handle: ({ params, id }) => {
        const expand = ledger.readSessionExpand(params);
        return ok(ledger.presentSession(session(id), expand));
      },
    },
    {
      method: "GET",
      pattern: /^\/v1\/checkout\/sessions\/([^/]+)\/line_items$/,
      handle: ({ id }) => ok(ledger.presentLineItems(session(id))),
    },
    {
      method: "POST",
      pattern: /^\/v1\/checkout\/sessions\/([^/]+)\/expire$/,
      handle: ({ params, id, cause }) => {
        const expand = ledger.readSessionExpand(params);
        return ok(ledger.presentSession(ledger.expireSession(id, cause), expand));
      },
    },
    {
      method: "POST",
      pattern: /^\/v1\/refunds$/,
      handle: ({ params, cause }) =>
        ok(ledger.presentRefund(ledger.createRefund(params, cause), ledger.readRefundExpand(params))),
    },
    {
      method: "GET",
      pattern: /^\/v1\/refunds\/([^/]+)$/,
      handle: ({ params, id }) => {
        const expand = ledger.readRefundExpand(params);
        const refund = getOwn(store.state.refunds, id);
        if (!refund) throw noSuch("refund", id, "id");
        return ok(ledger.presentRefund(refund, expand));
      },
    },
    {
      method: "GET",
      pattern: /^\/v1\/payment_intents\/([^/]+)$/,
      handle: ({ id }) => {
        const intent = getOwn(store.state.paymentIntents, id);
        if (!intent) throw noSuch("payment_intent", id, "intent");
        return ok(intent);
      },
    },
    {
      method: "GET",
      pattern: /^\/v1\/charges\/([^/]+)$/,
      handle: ({ id }) => {
        const charge = getOwn(store.state.charges, id);
        if (!charge) throw noSuch("charge", id, "id");
        return ok(charge);
      },
    },
    {
      method: "GET",
      pattern: /^\/v1\/events\/([^/]+)$/,
      handle: ({ id }) => {
        const event = store.state.events.find((e) => e.id === id);
        if (!event) throw noSuch("event", id, "id");
        return ok(event);
      },
    },
  ];
}

function summariseParams(params: FormObject): unknown {
  const text = JSON.stringify(params);
  return text.length <= MAX_LOGGED_PARAMS_CHARS
    ? params
    : { omitted: `parameters of ${text.length} characters not logged` };
}

/** The failure the fake was told to give, if any; a counted one is used up. */
function injectedFailure(store: StateStore): ApiError | null {
  const { controls } = store.state;
  if (controls.down)
    return new ApiError(503, "api_error", "The payments service is unavailable (the local fake was told to go down).");
  const counted = { remaining: controls.failNext, untilMs: null };
  if (!takeFailure(counted, Date.now())) return null;
  controls.failNext = counted.remaining;
  // An injected failure never reaches the endpoint, so nothing is kept for its idempotency key:
  // a retry with the same key runs for real.
  return new ApiError(500, "api_error", "An error occurred with the payments service (injected by the local fake).");
}

/** A refusal when the call carries no secret key in the service's format. */
function checkSecretKey(req: IncomingMessage): ApiError | null {
  const key = bearerKey(req);
  if (key === null) {
    return new ApiError(
      401,
      "invalid_request_error",
      "No API key provided. Send your secret key as 'Authorization: Bearer sk_…'.",
      null,
      null,
    );
  }
  if (/^(sk|rk)_\S+$/.test(key)) return null;
  const shown = key.length > 8 ? `${key.slice(0, 4)}…${key.slice(-4)}` : "****";
  return new ApiError(
    401,
    "invalid_request_error",
    `Invalid API key provided: ${shown}. Keys start with sk_.`,
    "api_key_invalid",
    null,
  );
}

/** The call's parameters: the query of a GET, the form-encoded body of a POST. */
async function readParams(req: IncomingMessage, method: string, url: URL): Promise<FormObject> {
  if (method === "GET") return parseFormBody(url.search.slice(1));
  const body = await readBody(req, MAX_BODY_BYTES);
  const type = (req.headers["content-type"] ?? "").split(";")[0].trim().toLowerCase();
  if (body !== "" && type !== "application/x-www-form-urlencoded") {
    throw invalidRequest("Send parameters form-encoded (Content-Type: application/x-www-form-urlencoded).", null);
  }
  return parseFormBody(body);
}

/** Answers one /v1 call. */
export async function handleApi(
  endpoints: ApiEndpoint[],
  store: StateStore,
  req: IncomingMessage,
  res: ServerResponse,
  url: URL,
): Promise<void> {
  const requestId = makeId("req_", 14);
  const method = req.method ?? "GET";
  const versionHeader = req.headers["stripe-version"];
  const idempotencyHeader = req.headers["idempotency-key"];
  const idempotencyKey = typeof idempotencyHeader === "string" && idempotencyHeader !== "" ? idempotencyHeader : null;
  const headers: Record<string, string> = {
    "Request-Id": requestId,
    "Stripe-Version": typeof versionHeader === "string" ? versionHeader : FAKE_API_VERSION,
  };
  if (idempotencyKey && method === "POST") headers["Idempotency-Key"] = idempotencyKey;
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
    sendJson(res, error.status, error.toBody(), headers, 2);
  };

  const refusal = injectedFailure(store) ?? checkSecretKey(req);
  if (refusal) return fail(refusal);

  const match = matchEndpoint(endpoints, method, url.pathname);
  if (match.kind !== "found") {
    return fail(
      new ApiError(404, "invalid_request_error", `Unrecognized request URL (${method}: ${url.pathname}).`, null, null),
    );
  }

  try {
    params = await readParams(req, method, url);
  } catch (error) {
    if (error instanceof BodyTooLargeError) {
      headers.Connection = "close";
      return fail(new ApiError(413, "invalid_request_error", "Request body is larger than 1 MB.", null, null));
    }
    if (error instanceof FormDecodeError) return fail(invalidRequest(error.message, error.param));
    if (error instanceof ApiError) return fail(error);
    throw error;
  }

  const endpoint = `${method} ${url.pathname}`;
  const fingerprint = fingerprintParams(params);
  let idempotencySlot: string | null = null;
  if (method === "POST" && idempotencyKey) {
    if (idempotencyKey.length > 255)
      return fail(invalidRequest("Idempotency-Key may be at most 255 characters.", "idempotency_key"));
    // Prefixed so a key such as "__proto__" is just data.
    idempotencySlot = `key:${idempotencyKey}`;
    const previous = getOwn(store.state.idempotency, idempotencySlot);
    const check = checkIdempotency(
      previous && { endpoint: `${previous.method} ${previous.path}`, fingerprint: previous.fingerprint },
      { endpoint, fingerprint },
    );
    if (previous && check === "conflict") {
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
    if (previous && check === "replay") {
      record(previous.status, true);
      return sendJsonText(res, previous.status, previous.body, { "Idempotent-Replayed": "true", ...headers });
    }
  }

  let id = "";
  try {
    id = match.params[0] === undefined ? "" : decodeURIComponent(match.params[0]);
  } catch {
    return fail(invalidRequest("Malformed id in the URL.", "id"));
  }
  try {
    const result = match.endpoint.handle({ params, id, cause: { requestId, idempotencyKey } });
    const text = JSON.stringify(result.body, null, 2);
    // Only a request that ran is remembered; validation errors are not, as with the real service.
    if (idempotencySlot && result.status < 300) {
      store.state.idempotency[idempotencySlot] = {
        method,
        path: url.pathname,
        fingerprint,
        status: result.status,
        body: text,
        createdAt: Date.now(),
      };
    }
    record(result.status, false);
    sendJsonText(res, result.status, text, headers);
  } catch (error) {
    if (error instanceof ApiError) return fail(error);
    throw error;
  }
}
