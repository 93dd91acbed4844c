import { createHash, randomUUID } from "node:crypto";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { renderInboxPage, renderMessagePage, renderNotFoundPage, type FailureSummary } from "./inbox-html";
import { MessageStore, type StoredMessage } from "./store";
import { MAX_BATCH_SIZE, parseEmailPayload, type ApiError, type ApiErrorName, type ParsedEmail } from "./validate";

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

interface FailMode {
  /** Sends left to fail, or null when failing by time. */
  remaining: number | null;
  /** Epoch milliseconds when a timed failure ends, or null when failing by count. */
  untilMs: number | null;
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

function sendJson(res: ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}): void {
  const payload = JSON.stringify(body);
  res.writeHead(status, {
    "Content-Type": "application/json; charset=utf-8",
    "Content-Length": Buffer.byteLength(payload),
    "Cache-Control": "no-store",
    ...headers,
  });
  res.end(payload);
}

function sendError(res: ServerResponse, error: ApiError, headers: Record<string, string> = {}): void {
  sendJson(res, error.statusCode, { statusCode: error.statusCode, name: error.name, message: error.message }, headers);
}

function sendHtml(res: ServerResponse, status: number, html: string): void {
  res.writeHead(status, { ...HTML_HEADERS, "Content-Length": Buffer.byteLength(html) });
  res.end(html);
}

async function readBody(req: IncomingMessage): Promise<string> {
  const chunks: Buffer[] = [];
  let total = 0;
  for await (const chunk of req as AsyncIterable<Buffer>) {
    total += chunk.length;
    if (total > MAX_BODY_BYTES) {
      throw apiError(413, "validation_error", "The request body is larger than 40 MB; send large files by `path` instead.");
    }
    chunks.push(chunk);
  }
  return Buffer.concat(chunks).toString("utf8");
}

async function readJson(req: IncomingMessage): Promise<unknown> {
  const raw = await readBody(req);
  if (raw.trim() === "") return undefined;
  try {
    return JSON.parse(raw);
  } catch {
    throw apiError(400, "validation_error", "The request body is not valid JSON.");
  }
}

/** JSON with object keys sorted, so two bodies that differ only in key order hash the same. */
function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  if (value && typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, item]) => item !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([key, item]) => `${JSON.stringify(key)}:${canonicalJson(item)}`).join(",")}}`;
  }
  return JSON.stringify(value) ?? "null";
}

function requireApiKey(req: IncomingMessage, expectedKey: string | undefined): void {
  const header = req.headers.authorization?.trim() ?? "";
  const match = /^Bearer\s+(\S+)$/i.exec(header);
  const key = match?.[1];
  // "undefined" or "null" is a caller's stringified missing environment variable, not a key.
  if (!key || key === "undefined" || key === "null") {
    throw apiError(401, "missing_api_key", "Missing API key in the authorization header: send `Authorization: Bearer re_...`.");
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
    throw apiError(400, "invalid_idempotency_key", `The Idempotency-Key header must be 1–${MAX_IDEMPOTENCY_KEY_LENGTH} characters long.`);
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
  if (!body || typeof body !== "object" || Array.isArray(body)) {
    throw apiError(400, "validation_error", 'Send a JSON object: { "count": N } or { "forMs": N }, optionally with "status".');
  }
  const { count, forMs, status = 503 } = body as Record<string, unknown>;
  if ((count === undefined) === (forMs === undefined)) {
    throw apiError(400, "validation_error", "Give exactly one of `count` (next N sends fail) or `forMs` (sends fail for N ms).");
  }
  if (typeof status !== "number" || !Number.isInteger(status) || !(status === 429 || (status >= 500 && status <= 599))) {
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

  function activeFailMode(nowMs: number): FailMode | null {
    if (!failMode) return null;
    if (failMode.remaining !== null && failMode.remaining <= 0) failMode = null;
    else if (failMode.untilMs !== null && nowMs >= failMode.untilMs) failMode = null;
    return failMode;
  }

  function describeFailMode(): Record<string, unknown> {
    const mode = activeFailMode(now());
    if (!mode) return { failing: false };
    return {
      failing: true,
      status: mode.status,
      ...(mode.remaining !== null ? { remaining: mode.remaining } : { until: new Date(mode.untilMs!).toISOString() }),
    };
  }

  function summariseFailMode(): FailureSummary {
    const mode = activeFailMode(now());
    if (!mode) return { isActive: false, description: "" };
    const scope =
      mode.remaining !== null
        ? `the next ${mode.remaining} ${mode.remaining === 1 ? "send" : "sends"}`
        : `every send until ${new Date(mode.untilMs!).toISOString().slice(11, 19)} UTC`;
    return { isActive: true, description: `${scope} answer ${mode.status}` };
  }

  /** Throws the simulated outage error when a failure is armed, using up one counted failure. */
  function maybeFailSend(): void {
    const mode = activeFailMode(now());
    if (!mode) return;
    if (mode.remaining !== null) mode.remaining -= 1;
    if (mode.status === 429) {
      throw apiError(429, "rate_limit_exceeded", "Too many requests (simulated by the local e-mail fake); retry later.");
    }
    throw apiError(mode.status, "application_error", "The e-mail service is unavailable (simulated by the local e-mail fake); retry later.");
  }

  function buildMessage(email: ParsedEmail, idempotencyKey: string | null, endpoint: string, createdAt: string): StoredMessage {
    return { id: randomUUID(), created_at: createdAt, ...email, idempotency_key: idempotencyKey, endpoint };
  }

  async function handleSend(req: IncomingMessage, res: ServerResponse, endpoint: "emails" | "emails/batch"): Promise<void> {
    const body = await readJson(req);
    maybeFailSend();
    requireApiKey(req, options.apiKey);
    const idempotencyKey = readIdempotencyKey(req);
    const nowMs = now();
    const bodyHash = createHash("sha256").update(canonicalJson(body)).digest("hex");

    if (idempotencyKey) {
      const previous = store.findIdempotency(idempotencyKey, nowMs);
      if (previous) {
        if (previous.endpoint !== endpoint || previous.bodyHash !== bodyHash) {
          throw apiError(409, "invalid_idempotent_request", "Same idempotency key used with a different request payload.");
        }
        sendJson(res, 200, previous.response);
        return;
      }
    }

    const createdAt = new Date(nowMs).toISOString();
    let messages: StoredMessage[];
    let response: unknown;
    if (endpoint === "emails") {
      const parsed = parseEmailPayload(body, { isBatch: false });
      if (!parsed.ok) throw new HttpError(parsed.error);
      messages = [buildMessage(parsed.email, idempotencyKey, endpoint, createdAt)];
      response = { id: messages[0].id };
    } else {
      const mode = String(req.headers["x-batch-validation"] ?? "strict");
      if (mode !== "strict" && mode !== "permissive") {
        throw apiError(422, "validation_error", "Invalid `x-batch-validation` header: use `strict` or `permissive`.");
      }
      if (!Array.isArray(body)) throw apiError(422, "validation_error", "The batch body must be a JSON array of e-mails.");
      if (body.length < 1 || body.length > MAX_BATCH_SIZE) {
        throw apiError(422, "validation_error", `A batch holds 1 to ${MAX_BATCH_SIZE} e-mails; ${body.length} given.`);
      }
      messages = [];
      const errors: { index: number; message: string }[] = [];
      for (const [index, item] of body.entries()) {
        const parsed = parseEmailPayload(item, { isBatch: true });
        if (parsed.ok) {
          messages.push(buildMessage(parsed.email, idempotencyKey, endpoint, createdAt));
        } else if (mode === "strict") {
          throw apiError(parsed.error.statusCode, parsed.error.name, `E-mail at index ${index}: ${parsed.error.message}`);
        } else {
          errors.push({ index, message: parsed.error.message });
        }
      }
      const data = messages.map((message) => ({ id: message.id }));
      response = mode === "permissive" ? { data, errors } : { data };
    }

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
    const contentType = /^[\w.+-]+\/[\w.+-]+$/.test(attachment.contentType) ? attachment.contentType : "application/octet-stream";
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

  async function route(req: IncomingMessage, res: ServerResponse): Promise<void> {
    const url = new URL(req.url ?? "/", "http://fake.invalid");
    const path = url.pathname.replace(/\/+$/, "") || "/";
    const method = req.method ?? "GET";
    const segments = path.split("/").filter(Boolean).map(decodeURIComponent);

    if (path === "/emails" || path === "/emails/batch") {
      if (method !== "POST") throw apiError(405, "method_not_allowed", "Method is not allowed for the requested path.");
      await handleSend(req, res, path === "/emails" ? "emails" : "emails/batch");
      return;
    }
    if (segments[0] === "emails" && segments.length === 2) {
      if (method !== "GET") throw apiError(405, "method_not_allowed", "Method is not allowed for the requested path.");
      requireApiKey(req, options.apiKey);
      const message = store.get(segments[1]);
      if (!message) throw apiError(404, "not_found", "Email not found.");
      sendJson(res, 200, toRetrievedEmail(message));
      return;
    }

    if (segments[0] === "_fake") {
      const resource = segments.slice(1).join("/");
      if (resource === "messages" && method === "GET") {
        const to = url.searchParams.get("to") ?? undefined;
        sendJson(res, 200, store.list({ to }).map((message) => toPublicMessage(message, false)));
        return;
      }
      if (resource === "messages" && method === "DELETE") {
        sendJson(res, 200, { deleted: store.clear() });
        return;
      }
      if (segments[1] === "messages" && segments.length === 3 && method === "GET") {
        const message = store.get(segments[2]);
        if (!message) throw apiError(404, "not_found", "No message with that id.");
        sendJson(res, 200, toPublicMessage(message, true));
        return;
      }
      if (segments[1] === "messages" && segments[3] === "attachments" && segments.length === 5 && method === "GET") {
        if (!sendAttachment(res, store.get(segments[2]), segments[4])) throw apiError(404, "not_found", "No such attachment.");
        return;
      }
      if (resource === "fail" && method === "POST") {
        failMode = parseFailMode(await readJson(req), now());
        sendJson(res, 200, describeFailMode());
        return;
      }
      if (resource === "fail" && method === "GET") {
        sendJson(res, 200, describeFailMode());
        return;
      }
      if (resource === "recover" && method === "POST") {
        failMode = null;
        sendJson(res, 200, describeFailMode());
        return;
      }
      throw apiError(404, "not_found", "Unknown control endpoint; see fakes/email/README.md.");
    }

    if (method === "GET" && path === "/") {
      sendHtml(res, 200, renderInboxPage(store.list(), baseUrl, summariseFailMode()));
      return;
    }
    if (method === "GET" && segments[0] === "m" && segments.length === 2) {
      const message = store.get(segments[1]);
      if (message) sendHtml(res, 200, renderMessagePage(message, baseUrl));
      else sendHtml(res, 404, renderNotFoundPage(baseUrl));
      return;
    }
    if (method === "GET" && segments[0] === "m" && segments[2] === "attachments" && segments.length === 4) {
      if (!sendAttachment(res, store.get(segments[1]), segments[3])) sendHtml(res, 404, renderNotFoundPage(baseUrl));
      return;
    }

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
      sendError(res, { statusCode: 500, name: "application_error", message: "Unexpected error in the local e-mail fake." });
    });
  });

  await new Promise<void>((resolveListen, rejectListen) => {
    server.once("error", rejectListen);
    server.listen(options.port ?? DEFAULT_PORT, host, () => {
      server.off("error", rejectListen);
      resolveListen();
    });
  });

  const port = (server.address() as AddressInfo).port;
  baseUrl = `http://${host.includes(":") ? `[${host}]` : host}:${port}`;

  return {
    url: baseUrl,
    port,
    store,
    close: () =>
      new Promise<void>((resolveClose, rejectClose) => {
        server.close((error) => (error ? rejectClose(error) : resolveClose()));
        // The SDK's fetch keeps connections alive; without this close() would wait for them to time out.
        server.closeAllConnections();
      }),
  };
}

function readPortFromEnv(): number {
  const raw = process.env.EMAIL_FAKE_PORT;
  if (raw === undefined || raw === "") return DEFAULT_PORT;
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    throw new Error(`EMAIL_FAKE_PORT must be an integer from 0 to 65535, got ${JSON.stringify(raw)}`);
  }
  return port;
}

async function main(): Promise<void> {
  const fake = await startEmailFake({
    port: readPortFromEnv(),
    host: process.env.EMAIL_FAKE_HOST || DEFAULT_HOST,
    dataFile: process.env.EMAIL_FAKE_DATA_FILE || undefined,
    apiKey: process.env.EMAIL_FAKE_API_KEY || undefined,
  });
  const persistence = process.env.EMAIL_FAKE_DATA_FILE ? `, saving to ${process.env.EMAIL_FAKE_DATA_FILE}` : ", in memory only";
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
