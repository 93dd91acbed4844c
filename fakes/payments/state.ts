import { mkdirSync, readFileSync, renameSync, writeFileSync, existsSync } from "node:fs";
import { dirname, resolve } from "node:path";

/** API version stamped on events: the one stripe-node 23.1.0 pins (`Stripe.API_VERSION`). */
export const FAKE_API_VERSION = "2026-10-28.endive";

export type SessionStatus = "open" | "complete" | "expired";

export interface CustomerDetails {
  email: string | null;
  name: string | null;
}

/** The public shape of a Checkout Session, kept to the fields an integration reads. */
export interface CheckoutSessionObject {
  id: string;
  object: "checkout.session";
  amount_subtotal: number;
  amount_total: number;
  cancel_url: string | null;
  client_reference_id: string | null;
  created: number;
  currency: string;
  customer: null;
  customer_details: CustomerDetails | null;
  customer_email: string | null;
  expires_at: number;
  livemode: false;
  locale: string | null;
  metadata: Record<string, string>;
  mode: "payment";
  payment_intent: string | null;
  payment_method_types: string[];
  payment_status: "unpaid" | "paid";
  status: SessionStatus;
  submit_type: string | null;
  success_url: string;
  ui_mode: "hosted";
  // Filled in when the object is sent out: the page lives on whatever port the fake listens on now.
  url: string | null;
}

export interface LineItemRecord {
  id: string;
  priceId: string;
  productId: string;
  name: string;
  description: string | null;
  currency: string;
  unitAmount: number;
  quantity: number;
}

export interface PaymentAttempt {
  at: number;
  last4: string;
  outcome: "paid" | "declined";
  via: "page" | "control";
}

export interface SessionRecord {
  session: CheckoutSessionObject;
  lineItems: LineItemRecord[];
  paymentIntentData: { description: string | null; metadata: Record<string, string> };
  attempts: PaymentAttempt[];
  // Parameters the real API accepts but this fake does not act on, kept so a test can see them.
  ignoredParams: string[];
  // custom_text[submit][message]: shown beside the pay button (absent in state saved before it was kept).
  submitMessage?: string | null;
}

export interface PaymentIntentObject {
  id: string;
  object: "payment_intent";
  amount: number;
  amount_received: number;
  created: number;
  currency: string;
  description: string | null;
  latest_charge: string;
  livemode: false;
  metadata: Record<string, string>;
  payment_method: string;
  payment_method_types: string[];
  status: "succeeded";
}

export interface ChargeObject {
  id: string;
  object: "charge";
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  billing_details: { email: string | null; name: string | null };
  captured: true;
  created: number;
  currency: string;
  description: string | null;
  livemode: false;
  metadata: Record<string, string>;
  paid: true;
  payment_intent: string;
  payment_method: string;
  payment_method_details: {
    type: "card";
    card: { brand: "visa"; last4: string; exp_month: number; exp_year: number };
  };
  refunded: boolean;
  status: "succeeded";
}

export interface RefundObject {
  id: string;
  object: "refund";
  amount: number;
  charge: string;
  created: number;
  currency: string;
  metadata: Record<string, string>;
  payment_intent: string;
  reason: string | null;
  status: "succeeded";
}

export type EventType = "checkout.session.completed" | "checkout.session.expired" | "charge.refunded";

export interface EventObject {
  id: string;
  object: "event";
  api_version: string;
  created: number;
  data: { object: CheckoutSessionObject | ChargeObject; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: EventType;
}

export interface IdempotencyRecord {
  method: string;
  path: string;
  fingerprint: string;
  status: number;
  body: string;
  createdAt: number;
}

export interface QueuedDelivery {
  id: string;
  eventId: string;
  // Attempts made so far for this delivery.
  attempts: number;
  nextAttemptAt: number;
  held: boolean;
  // Orders deliveries that are due at the same moment.
  seq: number;
}

export interface DeliveryAttempt {
  deliveryId: string;
  eventId: string;
  eventType: EventType;
  attempt: number;
  at: number;
  status: number | null;
  error: string | null;
  durationMs: number;
  outcome: "delivered" | "retry_scheduled" | "gave_up";
  nextAttemptAt: number | null;
}

export interface RequestLogEntry {
  at: number;
  requestId: string;
  method: string;
  path: string;
  idempotencyKey: string | null;
  params: unknown;
  status: number;
  replayed: boolean;
}

export interface Controls {
  failNext: number;
  down: boolean;
  deliverTwice: boolean;
  holdEvents: boolean;
}

export interface FakeState {
  version: 1;
  sessions: Record<string, SessionRecord>;
  paymentIntents: Record<string, PaymentIntentObject>;
  charges: Record<string, ChargeObject>;
  refunds: Record<string, RefundObject>;
  events: EventObject[];
  idempotency: Record<string, IdempotencyRecord>;
  queue: QueuedDelivery[];
  deliveries: DeliveryAttempt[];
  requests: RequestLogEntry[];
  controls: Controls;
  nextSeq: number;
}

// Logs are for looking at, not for correctness: keep the state file small.
const MAX_DELIVERY_LOG = 2000;
const MAX_REQUEST_LOG = 1000;
const MAX_IDEMPOTENCY_RECORDS = 10_000;
// Stripe keeps idempotency results for at least 24 hours.
const IDEMPOTENCY_TTL_MS = 24 * 60 * 60 * 1000;

export function emptyState(): FakeState {
  return {
    version: 1,
    sessions: {},
    paymentIntents: {},
    charges: {},
    refunds: {},
    events: [],
    idempotency: {},
    queue: [],
    deliveries: [],
    requests: [],
    controls: { failNext: 0, down: false, deliverTwice: false, holdEvents: false },
    nextSeq: 1,
  };
}

/** Holds the fake's whole state in memory and writes it to one JSON file after every change. */
export class StateStore {
  readonly file: string;
  state: FakeState;

  constructor(file: string) {
    this.file = resolve(file);
    mkdirSync(dirname(this.file), { recursive: true });
    this.state = this.load();
  }

  private load(): FakeState {
    if (!existsSync(this.file)) return emptyState();
    const text = readFileSync(this.file, "utf8");
    let parsed: unknown;
    try {
      parsed = JSON.parse(text);
    } catch {
      throw new Error(`Payments fake: state file ${this.file} is not valid JSON; fix it or delete it to start empty.`);
    }
    if (!parsed || typeof parsed !== "object" || (parsed as { version?: unknown }).version !== 1) {
      throw new Error(`Payments fake: state file ${this.file} has an unknown layout; delete it to start empty.`);
    }
    // Fill in any collection an older file lacks rather than failing on it.
    return { ...emptyState(), ...(parsed as FakeState) };
  }

  /** Writes the state atomically: a crash mid-write leaves the previous file intact. */
  save(): void {
    this.prune();
    const temp = `${this.file}.${process.pid}.tmp`;
    writeFileSync(temp, JSON.stringify(this.state));
    renameSync(temp, this.file);
  }

  reset(): void {
    this.state = emptyState();
    this.save();
  }

  takeSeq(): number {
    return this.state.nextSeq++;
  }

  private prune(): void {
    const s = this.state;
    if (s.deliveries.length > MAX_DELIVERY_LOG) s.deliveries.splice(0, s.deliveries.length - MAX_DELIVERY_LOG);
    if (s.requests.length > MAX_REQUEST_LOG) s.requests.splice(0, s.requests.length - MAX_REQUEST_LOG);
    const keys = Object.keys(s.idempotency);
    const cutoff = Date.now() - IDEMPOTENCY_TTL_MS;
    for (const key of keys) if (s.idempotency[key].createdAt < cutoff) delete s.idempotency[key];
    const left = Object.keys(s.idempotency);
    if (left.length > MAX_IDEMPOTENCY_RECORDS) {
      left
        .sort((a, b) => s.idempotency[a].createdAt - s.idempotency[b].createdAt)
        .slice(0, left.length - MAX_IDEMPOTENCY_RECORDS)
        .forEach((key) => delete s.idempotency[key]);
    }
  }
}
