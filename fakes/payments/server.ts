/**
 * Local stand-in for the slice of the Stripe API that a paid consult booking uses: Checkout
 * Sessions, a hosted card page, refunds, signed webhooks with retries, expiry and idempotency keys.
 * Run alone with `npx tsx fakes/payments/server.ts`, or start in-process with `startPaymentsFake`.
 */
import http from "node:http";
import { resolve } from "node:path";
import { fileURLToPath } from "node:url";
import { BodyTooLargeError, closeServer, envInt, listen, sendJson } from "../shared/http";
import { apiEndpoints, handleApi } from "./api";
import { ControlError, controlHandler } from "./controls";
import { makeId, nowSeconds } from "./ids";
import { ApiError, PaymentsLedger } from "./ledger";
import type { EmitEvent } from "./ledger";
import { handlePage } from "./page";
import { FAKE_API_VERSION, StateStore } from "./state";
import type { CheckoutSessionObject, EventObject } from "./state";
import { WebhookDispatcher } from "./webhooks";

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

  const endpoints = apiEndpoints(ledger, store);
  const handleControl = controlHandler({ store, ledger, dispatcher, webhookUrl, baseUrl: () => baseUrl });

  const server = http.createServer((req, res) => {
    const url = new URL(req.url ?? "/", "http://fake.invalid");
    const path = url.pathname;
    const work = path.startsWith("/v1/")
      ? handleApi(endpoints, store, req, res, url)
      : path.startsWith("/pay/")
        ? handlePage(ledger, req, res, url)
        : path.startsWith("/_fake/")
          ? handleControl(req, res, url)
          : handleOther(req, res, path);
    work.catch((error: unknown) => {
      if (error instanceof ControlError) return sendJson(res, error.status, { error: error.message }, {}, 2);
      if (error instanceof BodyTooLargeError)
        return sendJson(res, 413, { error: "Request body is larger than 1 MB." }, {}, 2);
      log(`payments fake: ${req.method} ${path} failed: ${error instanceof Error ? error.stack : String(error)}`);
      if (!res.headersSent)
        sendJson(
          res,
          500,
          new ApiError(500, "api_error", "The local payments fake hit an unexpected error.").toBody(),
          {},
          2,
        );
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
      return sendJson(
        res,
        200,
        { name: "Emberwright local payments fake", api: `${baseUrl}/v1`, controls: `${baseUrl}/_fake/health` },
        {},
        2,
      );
    }
    sendJson(res, 404, { error: `Nothing at ${req.method} ${path}.` }, {}, 2);
  }

  const address = await listen(server, options.port ?? DEFAULT_PORT, host);
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
      if (!closing) {
        clearInterval(sweeper);
        dispatcher.stop();
        closing = closeServer(server).catch(() => {});
      }
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
