import { createHmac } from "node:crypto";
import http from "node:http";
import https from "node:https";
import { makeId, nowSeconds } from "./ids";
import type { EventObject, QueuedDelivery, StateStore } from "./state";

/**
 * `Stripe-Signature` header for a payload: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "t.payload">`,
 * the scheme `stripe.webhooks.constructEvent` verifies.
 */
export function signWebhookPayload(payload: string, secret: string, timestampSeconds: number): string {
  const signature = createHmac("sha256", secret).update(`${timestampSeconds}.${payload}`, "utf8").digest("hex");
  return `t=${timestampSeconds},v1=${signature}`;
}

/** Delay before attempt `attempt + 1`, in ms: base, 2×base, 4×base … never above the cap. */
export function retryDelayMs(attemptsSoFar: number, baseMs: number, maxMs: number): number {
  return Math.min(baseMs * 2 ** Math.max(0, attemptsSoFar - 1), maxMs);
}

export interface WebhookOptions {
  url: string | null;
  secret: string;
  retryBaseMs: number;
  retryMaxMs: number;
  maxAttempts: number;
  timeoutMs: number;
  log: (line: string) => void;
}

export type ReleaseOrder = "created" | "reverse";

interface PostResult {
  status: number | null;
  error: string | null;
}

/**
 * Sends queued events one at a time, oldest due first, retrying with exponential backoff until the
 * endpoint answers 2xx or the attempts run out. The queue lives in the state file, so a restarted
 * fake picks up where it stopped (an attempt cut off by the restart is simply made again).
 */
export class WebhookDispatcher {
  private timer: NodeJS.Timeout | undefined;
  private sending = false;
  private stopped = false;
  private inFlight: http.ClientRequest | undefined;

  constructor(
    private readonly store: StateStore,
    readonly options: WebhookOptions,
  ) {}

  /** Queues one event (twice when deliver-twice is on); held when hold-events is on. */
  enqueue(event: EventObject): number {
    if (!this.options.url) return 0;
    const { controls, queue } = this.store.state;
    const copies = controls.deliverTwice ? 2 : 1;
    for (let i = 0; i < copies; i++) {
      queue.push({
        id: makeId("whd_"),
        eventId: event.id,
        attempts: 0,
        nextAttemptAt: Date.now(),
        held: controls.holdEvents,
        seq: this.store.takeSeq(),
      });
    }
    return copies;
  }

  /** Lets held deliveries go, in creation order or reversed. */
  release(order: ReleaseOrder): number {
    const held = this.store.state.queue.filter((d) => d.held).sort((a, b) => a.seq - b.seq);
    if (order === "reverse") held.reverse();
    const now = Date.now();
    for (const delivery of held) {
      delivery.held = false;
      delivery.nextAttemptAt = now;
      delivery.seq = this.store.takeSeq();
    }
    return held.length;
  }

  /** Looks at the queue again and arms the timer for the next due delivery. Call after any change. */
  kick(): void {
    if (this.stopped || this.sending) return;
    if (this.timer) clearTimeout(this.timer);
    this.timer = undefined;
    const next = this.nextDelivery();
    if (!next) return;
    const wait = Math.max(0, next.nextAttemptAt - Date.now());
    this.timer = setTimeout(() => {
      this.timer = undefined;
      void this.sendDue();
    }, wait);
  }

  stop(): void {
    this.stopped = true;
    if (this.timer) clearTimeout(this.timer);
    this.inFlight?.destroy(new Error("payments fake stopped"));
  }

  private nextDelivery(): QueuedDelivery | undefined {
    if (!this.options.url) return undefined;
    let best: QueuedDelivery | undefined;
    for (const d of this.store.state.queue) {
      if (d.held) continue;
      if (
        !best ||
        d.nextAttemptAt < best.nextAttemptAt ||
        (d.nextAttemptAt === best.nextAttemptAt && d.seq < best.seq)
      ) {
        best = d;
      }
    }
    return best;
  }

  private async sendDue(): Promise<void> {
    if (this.stopped || this.sending) return;
    const delivery = this.nextDelivery();
    if (!delivery || delivery.nextAttemptAt > Date.now()) {
      this.kick();
      return;
    }
    this.sending = true;
    try {
      await this.attempt(delivery);
    } finally {
      this.sending = false;
    }
    this.kick();
  }

  private async attempt(delivery: QueuedDelivery): Promise<void> {
    const state = this.store.state;
    const event = state.events.find((e) => e.id === delivery.eventId);
    if (!event) {
      state.queue = state.queue.filter((d) => d.id !== delivery.id);
      this.store.save();
      return;
    }
    // Stripe sends pretty-printed JSON and signs each attempt afresh, so a late retry still
    // falls inside the receiver's timestamp tolerance.
    const payload = JSON.stringify(event, null, 2);
    const header = signWebhookPayload(payload, this.options.secret, nowSeconds());
    const started = Date.now();
    const result = await this.post(payload, header);
    if (this.stopped) return;
    // A reset while the request was out removes the delivery: then there is nothing to record.
    const current = this.store.state.queue.find((d) => d.id === delivery.id);
    if (!current) return;
    current.attempts += 1;
    const ok = result.status !== null && result.status >= 200 && result.status < 300;
    const gaveUp = !ok && current.attempts >= this.options.maxAttempts;
    const nextAttemptAt =
      ok || gaveUp
        ? null
        : Date.now() + retryDelayMs(current.attempts, this.options.retryBaseMs, this.options.retryMaxMs);
    this.store.state.deliveries.push({
      deliveryId: current.id,
      eventId: event.id,
      eventType: event.type,
      attempt: current.attempts,
      at: started,
      status: result.status,
      error: result.error,
      durationMs: Date.now() - started,
      outcome: ok ? "delivered" : gaveUp ? "gave_up" : "retry_scheduled",
      nextAttemptAt,
    });
    if (!ok) {
      const answer = result.status !== null ? `answered ${result.status}` : `failed (${result.error})`;
      const next = gaveUp ? "giving up" : `retry in ${nextAttemptAt! - Date.now()} ms`;
      this.options.log(
        `payments fake: webhook ${event.type} ${event.id} attempt ${current.attempts} ${answer}; ${next}`,
      );
    }
    if (nextAttemptAt === null) {
      this.store.state.queue = this.store.state.queue.filter((d) => d.id !== current.id);
    } else {
      current.nextAttemptAt = nextAttemptAt;
    }
    this.store.save();
  }

  private post(payload: string, signature: string): Promise<PostResult> {
    const target = new URL(this.options.url!);
    const client = target.protocol === "https:" ? https : http;
    return new Promise((resolveResult) => {
      let settled = false;
      const finish = (result: PostResult) => {
        if (settled) return;
        settled = true;
        this.inFlight = undefined;
        resolveResult(result);
      };
      const request = client.request(
        target,
        {
          method: "POST",
          // No keep-alive: each attempt stands alone, as a fresh delivery would.
          agent: false,
          timeout: this.options.timeoutMs,
          headers: {
            "Content-Type": "application/json; charset=utf-8",
            "Content-Length": Buffer.byteLength(payload),
            "Stripe-Signature": signature,
            "User-Agent": "emberwright-payments-fake/1",
          },
        },
        (response) => {
          // The body is not used, but reading it lets the socket finish cleanly.
          response.resume();
          response.on("end", () => finish({ status: response.statusCode ?? null, error: null }));
          response.on("error", (error) => finish({ status: response.statusCode ?? null, error: error.message }));
        },
      );
      this.inFlight = request;
      request.on("timeout", () => request.destroy(new Error(`no answer within ${this.options.timeoutMs} ms`)));
      request.on("error", (error: NodeJS.ErrnoException) =>
        finish({ status: null, error: error.code ?? error.message }),
      );
      request.end(payload);
    });
  }
}
