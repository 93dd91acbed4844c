import { randomUUID } from "node:crypto";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { renderInboxPage, renderMessagePage, renderNotFoundPage, type FailureSummary } from "./inbox-html";
import { MessageStore, type StoredMessage } from "./store";
import { MAX_BATCH_SIZE, parseEmailPayload, type ApiError, type ApiErrorName, type ParsedEmail } from "./validate";
import { activeFailure, takeFailure, type FailurePlan } from "../shared/failures";
import {
  BodyTooLargeError,
  bearerKey,
  closeServer,
  envInt,
  InvalidJsonError,
  isJsonObject,
  listen,
  matchEndpoint,
  parseJsonBody,
  readBody,
  sendHtml,
  sendJson,
  type Endpoint,
} from "../shared/http";
import { checkIdempotency, fingerprintBody } from "../shared/idempotency";

export interface EmailFakeOptions {
  /** 0 picks a free port; read the real one back from the result. Default 4010. */
  port?: number;
  /** Default 127.0.0.1: the fake has no auth of its own and must not be reachable from the network. */
  host?: string;
  /** JSON file that mirrors every message and idempotency key, so a restart loses nothing. */
  dataFile?: string;
  /** When set, only this API key is accepted (403 invalid_api_key otherwise); by default any key is. */
  apiKey?: string;
  /** Clock in epoch milliseconds, for idempotency expiry and timed failures. */
  now?: () => number;
}

export interface EmailFake {
  /** Base URL for `RESEND_BASE_URL` or `new Resend(key, { baseUrl })`, also the web inbox. */
  url: string;
  port: number;
  store: MessageStore;
  close(): Promise<void>;
}

// The service refuses e-mails above 40 MB including attachments; the JSON body is the closest measure here.
const MAX_BODY_BYTES = 40 * 1024 * 1024;
const MAX_IDEMPOTENCY_KEY_LENGTH = 256;
const DEFAULT_PORT = 4010;
const DEFAULT_HOST = "127.0.0.1";

/** Failures armed through /_fake/fail, answered with `status`. */
interface FailMode extends FailurePlan {
  status: number;
}

class HttpError extends Error {
  constructor(readonly error: ApiError) {
    super(error.message);
  }
}

function apiError(statusCode: number, name: ApiErrorName, message: string): HttpError {
  return new HttpError({ statusCode, name, message });
}

const HTML_HEADERS = {
  "Content-Type": "text/html; charset=utf-8",
  // No scripts at all; srcdoc frames inherit this policy, so message HTML cannot load remote images either.
  "Content-Security-Policy":
    "default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-src 'self'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'",
  "X-Content-Type-Options": "nosniff",
  "Referrer-Policy": "no-referrer",
  "Cache-Control": "no-store",
};

function sendError(res: ServerResponse, error: ApiError, headers: Record<string, string> = {}): void {
  sendJson(res, error.statusCode, { statusCode: error.statusCode, name: error.name, message: error.message }, headers);
}

function sendPage(res: ServerResponse, status: number, html: string): void {
  sendHtml(res, status, html, HTML_HEADERS);
}

async function readJson(req: IncomingMessage): Promise<unknown> {
  try {
    return parseJsonBody(await readBody(req, MAX_BODY_BYTES));
  } catch (error) {
    if (error instanceof BodyTooLargeError) {
      throw apiError(
        413,
        "validation_error",
        "The request body is larger than 40 MB; send large files by `path` instead.",
      );
    }
    if (error instanceof InvalidJsonError)
      throw apiError(400, "validation_error", "The request body is not valid JSON.");
    throw error;
  }
}

function requireApiKey(req: IncomingMessage, expectedKey: string | undefined): void {
  const key = bearerKey(req);
  // "undefined" or "null" is a caller's stringified missing environment variable, not a key.
  if (!key || key === "undefined" || key === "null") {
    throw apiError(
      401,
      "missing_api_key",
      "Missing API key in the authorization header: send `Authorization: Bearer re_...`.",
    );
  }
  if (expectedKey !== undefined && key !== expectedKey) {
    throw apiError(403, "invalid_api_key", "API key is invalid.");
  }
}

function readIdempotencyKey(req: IncomingMessage): string | null {
  const raw = req.headers["idempotency-key"];
  if (raw === undefined) return null;
  const key = Array.isArray(raw) ? raw[0] : raw;
  if (key.length < 1 || key.length > MAX_IDEMPOTENCY_KEY_LENGTH) {
    throw apiError(
      400,
      "invalid_idempotency_key",
      `The Idempotency-Key header must be 1–${MAX_IDEMPOTENCY_KEY_LENGTH} characters long.`,
    );
  }
  return key;
}

/** Attachments without their content for lists, with it (base64, as `content`) for one message. */
function toPublicMessage(message: StoredMessage, includeContent: boolean): Record<string, unknown> {
  return {
    ...message,
    attachments: message.attachments.map(({ contentBase64, ...attachment }) =>
      includeContent ? { ...attachment, content: contentBase64 } : attachment,
    ),
  };
}

/** The shape `resend.emails.get(id)` returns from the service. */
function toRetrievedEmail(message: StoredMessage): Record<string, unknown> {
  return {
    object: "email",
    id: message.id,
    to: message.to,
    from: message.from,
    created_at: message.created_at,
    subject: message.subject,
    html: message.html,
    text: message.text,
    cc: message.cc.length ? message.cc : null,
    bcc: message.bcc.length ? message.bcc : null,
    reply_to: message.reply_to.length ? message.reply_to : null,
    last_event: message.scheduled_at ? "scheduled" : "delivered",
    scheduled_at: message.scheduled_at,
    tags: message.tags,
  };
}

function parseFailMode(body: unknown, nowMs: number): FailMode {
  if (!isJsonObject(body)) {
    throw apiError(
      400,
      "validation_error",
      'Send a JSON object: { "count": N } or { "forMs": N }, optionally with "status".',
    );
  }
  const { count, forMs, status = 503 } = body;
  if ((count === undefined) === (forMs === undefined)) {
    throw apiError(
      400,
      "validation_error",
      "Give exactly one of `count` (next N sends fail) or `forMs` (sends fail for N ms).",
    );
  }
  if (
    typeof status !== "number" ||
    !Number.isInteger(status) ||
    !(status === 429 || (status >= 500 && status <= 599))
  ) {
    throw apiError(400, "validation_error", "`status` must be an integer from 500 to 599, or 429.");
  }
  if (count !== undefined) {
    if (typeof count !== "number" || !Number.isInteger(count) || count < 1 || count > 1_000_000) {
      throw apiError(400, "validation_error", "`count` must be an integer from 1 to 1000000.");
    }
    return { remaining: count, untilMs: null, status };
  }
  if (typeof forMs !== "number" || !Number.isInteger(forMs) || forMs < 1 || forMs > 86_400_000) {
    throw apiError(400, "validation_error", "`forMs` must be an integer from 1 to 86400000 (one day).");
  }
  return { remaining: null, untilMs: nowMs + forMs, status };
}

type SendEndpoint = "emails" | "emails/batch";

/** The messages one send makes and the service's answer to it. */
type SendResult = { messages: StoredMessage[]; response: unknown };

/** One send: validates the body and makes the messages it asks for (nothing is stored yet). */
type MakeMessages = (body: unknown, req: IncomingMessage, build: (email: ParsedEmail) => StoredMessage) => SendResult;

const makeOne: MakeMessages = (body, _req, build) => {
  const parsed = parseEmailPayload(body, { isBatch: false });
  if (!parsed.ok) throw new HttpError(parsed.error);
  const message = build(parsed.email);
  return { messages: [message], response: { id: message.id } };
};

const makeBatch: MakeMessages = (body, req, build) => {
  const mode = String(req.headers["x-batch-validation"] ?? "strict");
  if (mode !== "strict" && mode !== "permissive") {
    throw apiError(422, "validation_error", "Invalid `x-batch-validation` header: use `strict` or `permissive`.");
  }
  if (!Array.isArray(body)) throw apiError(422, "validation_error", "The batch body must be a JSON array of e-mails.");
  if (body.length < 1 || body.length > MAX_BATCH_SIZE) {
    throw apiError(422, "validation_error", `A batch holds 1 to ${MAX_BATCH_SIZE} e-mails; ${body.length} given.`);
  }
  const messages: StoredMessage[] = [];
  const errors: { index: number; message: string }[] = [];
  for (const [index, item] of body.entries()) {
    const parsed = parseEmailPayload(item, { isBatch: true });
    if (parsed.ok) {
      messages.push(build(parsed.email));
    } else if (mode === "strict") {
      throw apiError(parsed.error.statusCode, parsed.error.name, `E-mail at index ${index}: ${parsed.error.message}`);
    } else {
      errors.push({ index, message: parsed.error.message });
    }
  }
  const data = messages.map((message) => ({ id: message.id }));
  return { messages, response: mode === "permissive" ? { data, errors } : { data } };
};

interface RequestContext {
  req: IncomingMessage;
  res: ServerResponse;
  url: URL;
  /** The path's parameters, decoded. */
  params: string[];
}

interface EmailEndpoint extends Endpoint {
  handle: (ctx: RequestContext) => void | Promise<void>;
}

/**
 * Starts the local stand-in for the Resend API plus its web inbox. Resolves once listening;
 * `close()` stops it and drops open keep-alive connections.
 */
export async function startEmailFake(options: EmailFakeOptions = {}): Promise<EmailFake> {
  const host = options.host ?? DEFAULT_HOST;
  const now = options.now ?? Date.now;
  const store = new MessageStore(options.dataFile);
  let failMode: FailMode | null = null;
  let baseUrl = "";

  function currentFailMode(nowMs: number): FailMode | null {
    failMode = activeFailure(failMode, nowMs);
    return failMode;
  }

  function describeFailMode(): Record<string, unknown> {
    const mode = currentFailMode(now());
    if (!mode) return { failing: false };
    return {
      failing: true,
      status: mode.status,
      ...(mode.remaining !== null ? { remaining: mode.remaining } : { until: new Date(mode.untilMs!).toISOString() }),
    };
  }

  function summariseFailMode(): FailureSummary {
    const mode = currentFailMode(now());
    if (!mode) return { isActive: false, description: "" };
    const scope =
      mode.remaining !== null
        ? `the next ${mode.remaining} ${mode.remaining === 1 ? "send" : "sends"}`
        : `every send until ${new Date(mode.untilMs!).toISOString().slice(11, 19)} UTC`;
    return { isActive: true, description: `${scope} answer ${mode.status}` };
  }

  /** Throws the simulated outage error when a failure is armed, using up one counted failure. */
  function maybeFailSend(): void {
    const nowMs = now();
    const mode = currentFailMode(nowMs);
    if (!mode || !takeFailure(mode, nowMs)) return;
    if (mode.status === 429) {
      throw apiError(
        429,
        "rate_limit_exceeded",
        "Too many requests (simulated by the local e-mail fake); retry later.",
      );
    }
    throw apiError(
      mode.status,
      "application_error",
      "The e-mail service is unavailable (simulated by the local e-mail fake); retry later.",
    );
  }

  /** A send: body, injected failure, key, idempotency replay, then the messages `make` builds, stored together. */
  async function handleSend(
    req: IncomingMessage,
    res: ServerResponse,
    endpoint: SendEndpoint,
    make: MakeMessages,
  ): Promise<void> {
    const body = await readJson(req);
    maybeFailSend();
    requireApiKey(req, options.apiKey);
    const idempotencyKey = readIdempotencyKey(req);
    const nowMs = now();
    const bodyHash = fingerprintBody(body);

    if (idempotencyKey) {
      const previous = store.findIdempotency(idempotencyKey, nowMs);
      const check = checkIdempotency(previous && { endpoint: previous.endpoint, fingerprint: previous.bodyHash }, {
        endpoint,
        fingerprint: bodyHash,
      });
      if (check === "conflict") {
        throw apiError(
          409,
          "invalid_idempotent_request",
          "Same idempotency key used with a different request payload.",
        );
      }
      if (previous && check === "replay") return sendJson(res, 200, previous.response);
    }

    const createdAt = new Date(nowMs).toISOString();
    const build = (email: ParsedEmail): StoredMessage => ({
      id: randomUUID(),
      created_at: createdAt,
      ...email,
      idempotency_key: idempotencyKey,
      endpoint,
    });
    const { messages, response } = make(body, req, build);
    store.add(
      messages,
      idempotencyKey ? { key: idempotencyKey, endpoint, bodyHash, createdAtMs: nowMs, response } : undefined,
    );
    sendJson(res, 200, response);
  }

  function sendAttachment(res: ServerResponse, message: StoredMessage | undefined, indexText: string): boolean {
    const attachment = message?.attachments[Number(indexText)];
    if (!message || !/^\d+$/.test(indexText) || !attachment) return false;
    const bytes = Buffer.from(attachment.contentBase64, "base64");
    const asciiName = attachment.filename.replace(/[^\x20-\x7e]|["\\]/g, "_");
    const contentType = /^[\w.+-]+\/[\w.+-]+$/.test(attachment.contentType)
      ? attachment.contentType
      : "application/octet-stream";
    res.writeHead(200, {
      "Content-Type": contentType,
      "Content-Length": bytes.length,
      "Content-Disposition": `attachment; filename="${asciiName}"; filename*=UTF-8''${encodeURIComponent(attachment.filename)}`,
      "X-Content-Type-Options": "nosniff",
      "Content-Security-Policy": "sandbox; default-src 'none'",
      "Cache-Control": "no-store",
    });
    res.end(bytes);
    return true;
  }

  // The service's API: a known path with another method is a 405.
  const api: EmailEndpoint[] = [
    { method: "POST", pattern: /^\/emails$/, handle: ({ req, res }) => handleSend(req, res, "emails", makeOne) },
    {
      method: "POST",
      pattern: /^\/emails\/batch$/,
      handle: ({ req, res }) => handleSend(req, res, "emails/batch", makeBatch),
    },
    {
      method: "GET",
      pattern: /^\/emails\/(?!batch$)([^/]+)$/,
      handle: ({ req, res, params: [id] }) => {
        requireApiKey(req, options.apiKey);
        const message = store.get(id!);
        if (!message) throw apiError(404, "not_found", "Email not found.");
        sendJson(res, 200, toRetrievedEmail(message));
      },
    },
  ];

  // Test controls (fakes/email/README.md).
  const controls: EmailEndpoint[] = [
    {
      method: "GET",
      pattern: /^\/_fake\/messages$/,
      handle: ({ res, url }) =>
        sendJson(
          res,
          200,
          store.list({ to: url.searchParams.get("to") ?? undefined }).map((m) => toPublicMessage(m, false)),
        ),
    },
    {
      method: "DELETE",
      pattern: /^\/_fake\/messages$/,
      handle: ({ res }) => sendJson(res, 200, { deleted: store.clear() }),
    },
    {
      method: "GET",
      pattern: /^\/_fake\/messages\/([^/]+)$/,
      handle: ({ res, params: [id] }) => {
        const message = store.get(id!);
        if (!message) throw apiError(404, "not_found", "No message with that id.");
        sendJson(res, 200, toPublicMessage(message, true));
      },
    },
    {
      method: "GET",
      pattern: /^\/_fake\/messages\/([^/]+)\/attachments\/([^/]+)$/,
      handle: ({ res, params: [id, index] }) => {
        if (!sendAttachment(res, store.get(id!), index!)) throw apiError(404, "not_found", "No such attachment.");
      },
    },
    {
      method: "POST",
      pattern: /^\/_fake\/fail$/,
      handle: async ({ req, res }) => {
        failMode = parseFailMode(await readJson(req), now());
        sendJson(res, 200, describeFailMode());
      },
    },
    { method: "GET", pattern: /^\/_fake\/fail$/, handle: ({ res }) => sendJson(res, 200, describeFailMode()) },
    {
      method: "POST",
      pattern: /^\/_fake\/recover$/,
      handle: ({ res }) => {
        failMode = null;
        sendJson(res, 200, describeFailMode());
      },
    },
  ];

  // The web inbox.
  const pages: EmailEndpoint[] = [
    {
      method: "GET",
      pattern: /^\/$/,
      handle: ({ res }) => sendPage(res, 200, renderInboxPage(store.list(), baseUrl, summariseFailMode())),
    },
    {
      method: "GET",
      pattern: /^\/m\/([^/]+)$/,
      handle: ({ res, params: [id] }) => {
        const message = store.get(id!);
        if (message) sendPage(res, 200, renderMessagePage(message, baseUrl));
        else sendPage(res, 404, renderNotFoundPage(baseUrl));
      },
    },
    {
      method: "GET",
      pattern: /^\/m\/([^/]+)\/attachments\/([^/]+)$/,
      handle: ({ res, params: [id, index] }) => {
        if (!sendAttachment(res, store.get(id!), index!)) sendPage(res, 404, renderNotFoundPage(baseUrl));
      },
    },
  ];

  async function route(req: IncomingMessage, res: ServerResponse): Promise<void> {
    const url = new URL(req.url ?? "/", "http://fake.invalid");
    const path = url.pathname.replace(/\/+$/, "") || "/";
    const method = req.method ?? "GET";
    const run = (found: { endpoint: EmailEndpoint; params: string[] }) =>
      found.endpoint.handle({ req, res, url, params: found.params.map(decodeURIComponent) });

    // A path that does not decode is refused whatever it names (URIError, answered 400 below).
    path.split("/").forEach((segment) => decodeURIComponent(segment));

    const inApi = matchEndpoint(api, method, path);
    if (inApi.kind === "found") return run(inApi);
    if (inApi.kind === "wrong-method")
      throw apiError(405, "method_not_allowed", "Method is not allowed for the requested path.");
    if (path === "/_fake" || path.startsWith("/_fake/")) {
      const control = matchEndpoint(controls, method, path);
      if (control.kind === "found") return run(control);
      throw apiError(404, "not_found", "Unknown control endpoint; see fakes/email/README.md.");
    }
    const page = matchEndpoint(pages, method, path);
    if (page.kind === "found") return run(page);
    throw apiError(404, "not_found", "The requested endpoint does not exist.");
  }

  const server = createServer((req, res) => {
    route(req, res).catch((error: unknown) => {
      if (res.headersSent) {
        res.destroy();
        return;
      }
      if (error instanceof HttpError) {
        const headers: Record<string, string> = error.error.statusCode === 429 ? { "Retry-After": "1" } : {};
        // After an oversized body the rest of the upload is not worth reading.
        if (error.error.statusCode === 413) headers.Connection = "close";
        sendError(res, error.error, headers);
        return;
      }
      if (error instanceof URIError) {
        sendError(res, { statusCode: 400, name: "validation_error", message: "The request path is not valid." });
        return;
      }
      console.error("email fake: unexpected error", error);
      sendError(res, {
        statusCode: 500,
        name: "application_error",
        message: "Unexpected error in the local e-mail fake.",
      });
    });
  });

  const { port } = await listen(server, options.port ?? DEFAULT_PORT, host);
  baseUrl = `http://${host.includes(":") ? `[${host}]` : host}:${port}`;

  return { url: baseUrl, port, store, close: () => closeServer(server) };
}

async function main(): Promise<void> {
  const fake = await startEmailFake({
    port: envInt("EMAIL_FAKE_PORT", DEFAULT_PORT, 0, 65535),
    host: process.env.EMAIL_FAKE_HOST || DEFAULT_HOST,
    dataFile: process.env.EMAIL_FAKE_DATA_FILE || undefined,
    apiKey: process.env.EMAIL_FAKE_API_KEY || undefined,
  });
  const persistence = process.env.EMAIL_FAKE_DATA_FILE
    ? `, saving to ${process.env.EMAIL_FAKE_DATA_FILE}`
    : ", in memory only";
  console.log(`email fake listening on ${fake.url} (inbox at ${fake.url}/, RESEND_BASE_URL=${fake.url}${persistence})`);

  let isClosing = false;
  const shutdown = (signal: NodeJS.Signals) => {
    if (isClosing) {
      // A second Ctrl-C means "now".
      process.exit(1);
    }
    isClosing = true;
    console.log(`email fake: ${signal} received, closing`);
    fake.close().then(
      () => process.exit(0),
      (error: unknown) => {
        console.error("email fake: error while closing", error);
        process.exit(1);
      },
    );
  };
  process.on("SIGTERM", shutdown);
  process.on("SIGINT", shutdown);
}

const isEntryPoint = process.argv[1] !== undefined && import.meta.url === pathToFileURL(resolve(process.argv[1])).href;
if (isEntryPoint) {
  main().catch((error: unknown) => {
    const hint =
      (error as NodeJS.ErrnoException).code === "EADDRINUSE"
        ? " (another process holds the port: stop it, or choose another with EMAIL_FAKE_PORT)"
        : "";
    console.error(`email fake: failed to start: ${error instanceof Error ? error.message : String(error)}${hint}`);
    process.exit(1);
  });
}
