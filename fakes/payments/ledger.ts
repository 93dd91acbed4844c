import type { FormObject, FormValue } from "./form-encoding";
import { formatFormKey } from "./form-encoding";
import { getOwn, makeId, nowSeconds } from "./ids";
import type {
  ChargeObject,
  CheckoutSessionObject,
  EventObject,
  EventType,
  LineItemRecord,
  PaymentIntentObject,
  RefundObject,
  SessionRecord,
  StateStore,
} from "./state";

/** An error answered in the service's JSON shape: `{ error: { type, code, message, param } }`. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly type: "invalid_request_error" | "api_error" | "idempotency_error",
    message: string,
    readonly code: string | null = null,
    readonly param: string | null = null,
  ) {
    super(message);
  }

  /** The same error under another status (a missing object named in a create call is a 400). */
  withStatus(status: number): ApiError {
    return new ApiError(status, this.type, this.message, this.code, this.param);
  }

  toBody() {
    return { error: { type: this.type, code: this.code, message: this.message, param: this.param } };
  }
}

export function invalidRequest(message: string, param: string | null, code: string | null = null): ApiError {
  return new ApiError(400, "invalid_request_error", message, code, param);
}

export function noSuch(kind: string, id: string, param: string): ApiError {
  return new ApiError(404, "invalid_request_error", `No such ${kind}: '${id}'`, "resource_missing", param);
}

/** Who caused an event: the API request (with its idempotency key), or nobody (page, timer). */
export interface EventCause {
  requestId: string | null;
  idempotencyKey: string | null;
}

export type EmitEvent = (
  type: EventType,
  object: CheckoutSessionObject | ChargeObject,
  cause: EventCause,
  previousAttributes?: Record<string, unknown>,
) => EventObject;

export const DECLINED_MESSAGE = "Your card was declined.";
export const TEST_CARD_MESSAGE = "Use a test card: 4242 4242 4242 4242 pays, 4000 0000 0000 0002 is declined.";
export const PAYING_CARD = "4242424242424242";
export const DECLINED_CARD = "4000000000000002";

// Top-level parameters the real endpoint accepts (stripe-node 23.1.0's SessionCreateParams).
// Those this fake acts on are read below; the rest are accepted and noted as ignored.
const SESSION_CREATE_PARAMS = new Set([
  "adaptive_pricing",
  "after_expiration",
  "allow_promotion_codes",
  "allowed_payment_method_types",
  "automatic_tax",
  "billing_address_collection",
  "branding_settings",
  "cancel_url",
  "client_reference_id",
  "consent_collection",
  "currency",
  "custom_fields",
  "custom_text",
  "customer",
  "customer_account",
  "customer_creation",
  "customer_email",
  "customer_update",
  "discounts",
  "excluded_payment_method_types",
  "expand",
  "expires_at",
  "integration_identifier",
  "invoice_creation",
  "line_items",
  "locale",
  "managed_payments",
  "metadata",
  "mode",
  "name_collection",
  "optional_items",
  "origin_context",
  "payment_intent_data",
  "payment_method_collection",
  "payment_method_configuration",
  "payment_method_data",
  "payment_method_options",
  "payment_method_types",
  "permissions",
  "phone_number_collection",
  "redirect_on_completion",
  "return_url",
  "saved_payment_method_options",
  "setup_intent_data",
  "shipping_address_collection",
  "shipping_options",
  "submit_type",
  "subscription_data",
  "success_url",
  "tax_id_collection",
  "ui_mode",
  "wallet_options",
]);
const SESSION_MODELLED_PARAMS = new Set([
  "cancel_url",
  "client_reference_id",
  "currency",
  "custom_text",
  "customer_email",
  "expand",
  "expires_at",
  "line_items",
  "locale",
  "metadata",
  "mode",
  "payment_intent_data",
  "payment_method_types",
  "submit_type",
  "success_url",
  "ui_mode",
]);
const LINE_ITEM_PARAMS = new Set([
  "adjustable_quantity",
  "dynamic_tax_rates",
  "metadata",
  "price",
  "price_data",
  "quantity",
  "tax_rates",
]);
const PRICE_DATA_PARAMS = new Set([
  "currency",
  "product",
  "product_data",
  "recurring",
  "tax_behavior",
  "unit_amount",
  "unit_amount_decimal",
]);
const PRODUCT_DATA_PARAMS = new Set(["description", "images", "metadata", "name", "tax_code", "unit_label"]);
const PAYMENT_INTENT_DATA_PARAMS = new Set([
  "application_fee_amount",
  "capture_method",
  "description",
  "metadata",
  "on_behalf_of",
  "receipt_email",
  "setup_future_usage",
  "shipping",
  "statement_descriptor",
  "statement_descriptor_suffix",
  "transfer_data",
  "transfer_group",
]);
const REFUND_CREATE_PARAMS = new Set([
  "amount",
  "charge",
  "currency",
  "customer",
  "expand",
  "instructions_email",
  "metadata",
  "origin",
  "payment_intent",
  "reason",
  "refund_application_fee",
  "reverse_transfer",
]);
const REFUND_REASONS = ["duplicate", "fraudulent", "requested_by_customer"];
// Checkout allows a session to stay open between 30 minutes and 24 hours.
const MIN_EXPIRY_SECONDS = 30 * 60;
const MAX_EXPIRY_SECONDS = 24 * 60 * 60;
// Grace for the caller's clock and request time when it asks for exactly 30 minutes.
const EXPIRY_GRACE_SECONDS = 60;
// Without expires_at a session stays open 24 hours, as the service documents ("Manage limited inventory").
const DEFAULT_EXPIRY_SECONDS = 24 * 60 * 60;
// The service's largest amount (eight digits of minor units) and its smallest charge (50 cents in USD).
const MAX_AMOUNT = 99_999_999;
const MIN_CHARGE_AMOUNT = 50;

function rejectUnknown(value: FormObject, allowed: Set<string>, path: string[]): void {
  for (const key of Object.keys(value)) {
    if (!allowed.has(key)) {
      const name = formatFormKey([...path, key].filter((s) => s !== ""));
      throw invalidRequest(`Received unknown parameter: ${name}`, name, "parameter_unknown");
    }
  }
}

function asObject(value: FormValue | undefined, param: string): FormObject | undefined {
  if (value === undefined || value === "") return undefined;
  if (typeof value === "string" || Array.isArray(value)) {
    throw invalidRequest(
      `Invalid object for ${param}: pass it as ${param}[key]=value.`,
      param,
      "parameter_invalid_object",
    );
  }
  return value;
}

function asArray(value: FormValue | undefined, param: string): FormValue[] | undefined {
  if (value === undefined || value === "") return undefined;
  if (!Array.isArray(value)) {
    throw invalidRequest(`Invalid array for ${param}: pass it as ${param}[0]=….`, param, "parameter_invalid_array");
  }
  return value;
}

function asString(value: FormValue | undefined, param: string, maxLength = 5000): string | undefined {
  if (value === undefined) return undefined;
  if (typeof value !== "string") {
    throw invalidRequest(`Invalid string for ${param}: a single value is expected.`, param, "parameter_invalid_string");
  }
  if (value.length > maxLength) {
    throw invalidRequest(
      `Invalid ${param}: must be at most ${maxLength} characters.`,
      param,
      "parameter_invalid_string",
    );
  }
  return value;
}

function asInteger(value: FormValue | undefined, param: string, min: number, max: number): number | undefined {
  const text = asString(value, param);
  if (text === undefined || text === "") return undefined;
  if (!/^-?\d+$/.test(text)) {
    throw invalidRequest(
      `Invalid integer: ${text}. ${param} must be a whole number.`,
      param,
      "parameter_invalid_integer",
    );
  }
  const n = Number(text);
  if (!Number.isSafeInteger(n) || n < min || n > max) {
    throw invalidRequest(`Invalid ${param}: must be between ${min} and ${max}.`, param, "parameter_invalid_integer");
  }
  return n;
}

function required<T>(value: T | undefined, param: string): T {
  if (value === undefined || value === "") {
    throw invalidRequest(`Missing required param: ${param}.`, param, "parameter_missing");
  }
  return value;
}

function asUrl(value: FormValue | undefined, param: string): string | undefined {
  const text = asString(value, param, 5000);
  if (text === undefined || text === "") return undefined;
  let parsed: URL;
  try {
    // Placeholders like {CHECKOUT_SESSION_ID} are legal in the URL template.
    parsed = new URL(text);
  } catch {
    throw invalidRequest(`Not a valid URL: ${param} must be an absolute http(s) URL.`, param, "url_invalid");
  }
  if (parsed.protocol !== "http:" && parsed.protocol !== "https:") {
    throw invalidRequest(`Not a valid URL: ${param} must use http or https.`, param, "url_invalid");
  }
  return text;
}

/** Metadata as the service allows it: at most 50 keys, keys up to 40 characters, values up to 500. */
export function readMetadata(value: FormValue | undefined, param: string): Record<string, string> {
  const obj = asObject(value, param);
  if (!obj) return {};
  const entries: Array<[string, string]> = [];
  for (const [key, raw] of Object.entries(obj)) {
    const name = `${param}[${key}]`;
    if (key.length === 0 || key.length > 40) {
      throw invalidRequest(`Invalid ${param}: keys must be 1 to 40 characters.`, name, "parameter_invalid_string");
    }
    const text = asString(raw, name, 500);
    if (text === undefined) continue;
    if (text.length > 500) throw invalidRequest(`Invalid ${name}: at most 500 characters.`, name);
    // An empty value means "unset", as in the real API.
    if (text !== "") entries.push([key, text]);
  }
  if (entries.length > 50) throw invalidRequest(`Invalid ${param}: at most 50 keys.`, param);
  return Object.fromEntries(entries);
}

function readExpand(value: FormValue | undefined, allowed: string[]): string[] {
  const list = asArray(value, "expand") ?? [];
  return list.map((item, i) => {
    const field = asString(item, `expand[${i}]`) ?? "";
    if (!allowed.includes(field)) {
      throw invalidRequest(
        `This property cannot be expanded (${field}). Expandable here: ${allowed.join(", ")}.`,
        `expand[${i}]`,
      );
    }
    return field;
  });
}

export interface CardForm {
  number: string;
  expiry: string;
  cvc: string;
  name: string;
}

export type CardFieldErrors = Partial<Record<keyof CardForm, string>>;

export type PayResult =
  | { kind: "paid"; record: SessionRecord }
  | { kind: "declined"; message: string }
  | { kind: "invalid"; errors: CardFieldErrors }
  | { kind: "not_found" }
  | { kind: "not_open"; record: SessionRecord };

interface CheckedCard {
  digits: string;
  expMonth: number;
  expYear: number;
}

/** Checks the card form the way a careful page would, naming each field that is wrong. */
export function checkCardForm(form: CardForm, now: Date): { errors: CardFieldErrors; card?: CheckedCard } {
  const errors: CardFieldErrors = {};
  const digits = form.number.replace(/[\s-]/g, "");
  if (digits === "") errors.number = "Enter the card number.";
  else if (!/^\d+$/.test(digits)) errors.number = "The card number can only contain digits and spaces.";
  else if (digits !== PAYING_CARD && digits !== DECLINED_CARD) errors.number = TEST_CARD_MESSAGE;

  let expMonth = 0;
  let expYear = 0;
  const expiry = /^\s*(\d{1,2})\s*\/\s*(\d{2}|\d{4})\s*$/.exec(form.expiry);
  if (form.expiry.trim() === "") errors.expiry = "Enter the expiry date as MM / YY.";
  else if (!expiry || Number(expiry[1]) < 1 || Number(expiry[1]) > 12) {
    errors.expiry = "Enter the expiry date as MM / YY, for example 08 / 30.";
  } else {
    expMonth = Number(expiry[1]);
    expYear = expiry[2].length === 2 ? 2000 + Number(expiry[2]) : Number(expiry[2]);
    const current = now.getUTCFullYear() * 12 + now.getUTCMonth() + 1;
    if (expYear * 12 + expMonth < current) errors.expiry = "The expiry date is in the past.";
  }

  if (!/^\d{3,4}$/.test(form.cvc.trim()))
    errors.cvc = "Enter the 3- or 4-digit security code from the back of the card.";
  const name = form.name.trim();
  if (name === "") errors.name = "Enter the name on the card.";
  else if (name.length > 200) errors.name = "The name on the card can be at most 200 characters.";

  if (Object.keys(errors).length > 0) return { errors };
  return { errors, card: { digits, expMonth, expYear } };
}

/** Sessions, payments and refunds, kept in the state store; every change is saved before returning. */
export class PaymentsLedger {
  constructor(
    private readonly store: StateStore,
    private readonly emit: EmitEvent,
    private readonly baseUrl: () => string,
  ) {}

  private get state() {
    return this.store.state;
  }

  getSession(id: string): SessionRecord | undefined {
    return getOwn(this.state.sessions, id);
  }

  /** The session as the API shows it: `url` only while open, on the current port. */
  presentSession(record: SessionRecord, expand: string[] = []): Record<string, unknown> {
    const session = record.session;
    const shown: Record<string, unknown> = {
      ...session,
      url: session.status === "open" ? `${this.baseUrl()}/pay/${encodeURIComponent(session.id)}` : null,
    };
    if (expand.includes("payment_intent") && session.payment_intent) {
      shown.payment_intent = getOwn(this.state.paymentIntents, session.payment_intent) ?? session.payment_intent;
    }
    if (expand.includes("line_items")) shown.line_items = this.presentLineItems(record);
    return structuredClone(shown);
  }

  presentLineItems(record: SessionRecord) {
    return {
      object: "list",
      data: record.lineItems.map((item) => ({
        id: item.id,
        object: "item",
        amount_discount: 0,
        amount_subtotal: item.unitAmount * item.quantity,
        amount_tax: 0,
        amount_total: item.unitAmount * item.quantity,
        currency: item.currency,
        description: item.name,
        price: {
          id: item.priceId,
          object: "price",
          active: false,
          currency: item.currency,
          livemode: false,
          product: item.productId,
          type: "one_time",
          unit_amount: item.unitAmount,
        },
        quantity: item.quantity,
      })),
      has_more: false,
      url: `/v1/checkout/sessions/${record.session.id}/line_items`,
    };
  }

  readSessionExpand(params: FormObject): string[] {
    return readExpand(params.expand, ["payment_intent", "line_items"]);
  }

  createSession(params: FormObject): SessionRecord {
    rejectUnknown(params, SESSION_CREATE_PARAMS, []);
    const mode = required(asString(params.mode, "mode"), "mode");
    if (mode !== "payment") {
      if (mode === "subscription" || mode === "setup") {
        throw invalidRequest(
          `This local fake only supports mode=payment, not ${mode}.`,
          "mode",
          "parameter_invalid_string",
        );
      }
      throw invalidRequest(
        `Invalid mode: must be one of payment, setup or subscription.`,
        "mode",
        "parameter_invalid_string",
      );
    }
    const uiMode = asString(params.ui_mode, "ui_mode");
    if (uiMode !== undefined && uiMode !== "hosted") {
      throw invalidRequest(`This local fake only serves the hosted page (ui_mode=hosted).`, "ui_mode");
    }
    const successUrl = required(asUrl(params.success_url, "success_url"), "success_url");
    const cancelUrl = asUrl(params.cancel_url, "cancel_url") ?? null;
    const clientReferenceId = asString(params.client_reference_id, "client_reference_id", 200) || null;
    const customerEmail = asString(params.customer_email, "customer_email", 800) || null;
    if (customerEmail !== null && !/^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(customerEmail)) {
      throw invalidRequest(`Invalid email address: ${customerEmail}`, "customer_email", "email_invalid");
    }
    const metadata = readMetadata(params.metadata, "metadata");
    // The note shown beside the pay button (custom_text[submit][message], at most 1,200 characters as
    // the real endpoint allows); the stand-in's page draws it like the hosted page would.
    const submitMessage =
      asString(
        asObject(asObject(params.custom_text, "custom_text")?.submit, "custom_text[submit]")?.message,
        "custom_text[submit][message]",
        1200,
      ) || null;
    const created = nowSeconds();
    const expiresAt =
      asInteger(params.expires_at, "expires_at", 0, Number.MAX_SAFE_INTEGER) ?? created + DEFAULT_EXPIRY_SECONDS;
    if (expiresAt < created + MIN_EXPIRY_SECONDS - EXPIRY_GRACE_SECONDS || expiresAt > created + MAX_EXPIRY_SECONDS) {
      throw invalidRequest(
        `expires_at must be a Unix time in seconds between 30 minutes and 24 hours from now (now is ${created}).`,
        "expires_at",
        "parameter_invalid_integer",
      );
    }

    const lineItemsParam = required(asArray(params.line_items, "line_items"), "line_items");
    if (lineItemsParam.length === 0)
      throw invalidRequest("Missing required param: line_items.", "line_items", "parameter_missing");
    if (lineItemsParam.length > 100) throw invalidRequest("Invalid line_items: at most 100 items.", "line_items");
    const lineItems = lineItemsParam.map((raw, i) => this.readLineItem(raw, i));
    const currency = lineItems[0].currency;
    const mixed = lineItems.findIndex((item) => item.currency !== currency);
    if (mixed !== -1) {
      throw invalidRequest(
        "All line items must use the same currency.",
        `line_items[${mixed}][price_data][currency]`,
        "parameter_invalid_string",
      );
    }
    const topCurrency = asString(params.currency, "currency");
    if (topCurrency && topCurrency.toLowerCase() !== currency) {
      throw invalidRequest(
        `currency (${topCurrency}) does not match the line items' currency (${currency}).`,
        "currency",
      );
    }
    const amountTotal = lineItems.reduce((sum, item) => sum + item.unitAmount * item.quantity, 0);
    if (amountTotal > MAX_AMOUNT)
      throw invalidRequest(`The total may be at most ${MAX_AMOUNT} in minor units.`, "line_items", "amount_too_large");
    if (amountTotal < MIN_CHARGE_AMOUNT) {
      throw invalidRequest(
        `The total due must be at least ${MIN_CHARGE_AMOUNT} minor units of ${currency} (0.50 USD).`,
        "line_items",
        "amount_too_small",
      );
    }

    const pid = asObject(params.payment_intent_data, "payment_intent_data") ?? {};
    rejectUnknown(pid, PAYMENT_INTENT_DATA_PARAMS, ["payment_intent_data"]);
    const paymentMethodTypes = (asArray(params.payment_method_types, "payment_method_types") ?? ["card"]).map(
      (t, i) => asString(t, `payment_method_types[${i}]`) ?? "card",
    );
    if (!paymentMethodTypes.includes("card")) {
      throw invalidRequest(
        "This local fake takes cards only: include card in payment_method_types.",
        "payment_method_types",
      );
    }
    this.readSessionExpand(params);

    const ignoredParams = Object.keys(params).filter((k) => !SESSION_MODELLED_PARAMS.has(k));
    for (const key of Object.keys(pid))
      if (key !== "description" && key !== "metadata") ignoredParams.push(`payment_intent_data[${key}]`);

    const session: CheckoutSessionObject = {
      id: makeId("cs_test_", 58),
      object: "checkout.session",
      amount_subtotal: amountTotal,
      amount_total: amountTotal,
      cancel_url: cancelUrl,
      client_reference_id: clientReferenceId,
      created,
      currency,
      customer: null,
      customer_details: null,
      customer_email: customerEmail,
      expires_at: expiresAt,
      livemode: false,
      locale: asString(params.locale, "locale") ?? null,
      metadata,
      mode: "payment",
      payment_intent: null,
      payment_method_types: paymentMethodTypes,
      payment_status: "unpaid",
      status: "open",
      submit_type: asString(params.submit_type, "submit_type") ?? null,
      success_url: successUrl,
      ui_mode: "hosted",
      url: null,
    };
    const record: SessionRecord = {
      session,
      lineItems,
      paymentIntentData: {
        description: asString(pid.description, "payment_intent_data[description]", 1000) ?? null,
        metadata: readMetadata(pid.metadata, "payment_intent_data[metadata]"),
      },
      attempts: [],
      ignoredParams,
      submitMessage,
    };
    this.state.sessions[session.id] = record;
    this.store.save();
    return record;
  }

  private readLineItem(raw: FormValue, index: number): LineItemRecord {
    const base = `line_items[${index}]`;
    const item = required(asObject(raw, base), base);
    rejectUnknown(item, LINE_ITEM_PARAMS, ["line_items", String(index)]);
    if (item.price !== undefined) {
      const priceId = asString(item.price, `${base}[price]`) ?? "";
      throw noSuch("price", priceId, `${base}[price]`).withStatus(400);
    }
    const priceData = required(asObject(item.price_data, `${base}[price_data]`), `${base}[price_data]`);
    rejectUnknown(priceData, PRICE_DATA_PARAMS, ["line_items", String(index), "price_data"]);
    if (priceData.recurring !== undefined) {
      throw invalidRequest(
        "Recurring prices need mode=subscription, which this local fake does not offer.",
        `${base}[price_data][recurring]`,
      );
    }
    const currency = required(
      asString(priceData.currency, `${base}[price_data][currency]`),
      `${base}[price_data][currency]`,
    ).toLowerCase();
    if (!/^[a-z]{3}$/.test(currency) || !isKnownCurrency(currency)) {
      throw invalidRequest(
        `Invalid currency: ${currency}. Use a three-letter ISO code such as usd.`,
        `${base}[price_data][currency]`,
        "parameter_invalid_string",
      );
    }
    let unitAmount = asInteger(priceData.unit_amount, `${base}[price_data][unit_amount]`, 0, MAX_AMOUNT);
    if (unitAmount === undefined && priceData.unit_amount_decimal !== undefined) {
      const decimal = asString(priceData.unit_amount_decimal, `${base}[price_data][unit_amount_decimal]`) ?? "";
      if (!/^\d+$/.test(decimal)) {
        throw invalidRequest(
          "This local fake takes whole minor units only: use unit_amount.",
          `${base}[price_data][unit_amount_decimal]`,
        );
      }
      unitAmount = Number(decimal);
    }
    unitAmount = required(unitAmount, `${base}[price_data][unit_amount]`);
    if (priceData.product !== undefined) {
      const productId = asString(priceData.product, `${base}[price_data][product]`) ?? "";
      throw noSuch("product", productId, `${base}[price_data][product]`).withStatus(400);
    }
    const productData = required(
      asObject(priceData.product_data, `${base}[price_data][product_data]`),
      `${base}[price_data][product_data]`,
    );
    rejectUnknown(productData, PRODUCT_DATA_PARAMS, ["line_items", String(index), "price_data", "product_data"]);
    const name = required(
      asString(productData.name, `${base}[price_data][product_data][name]`, 250)?.trim(),
      `${base}[price_data][product_data][name]`,
    );
    const description =
      asString(productData.description, `${base}[price_data][product_data][description]`, 5000) || null;
    const quantity = required(asInteger(item.quantity, `${base}[quantity]`, 1, 999_999), `${base}[quantity]`);
    return {
      id: makeId("li_"),
      priceId: makeId("price_"),
      productId: makeId("prod_"),
      name,
      description,
      currency,
      unitAmount,
      quantity,
    };
  }

  /** Marks an open session expired and sends checkout.session.expired. */
  expireSession(id: string, cause: EventCause): SessionRecord {
    const record = this.getSession(id);
    if (!record) throw noSuch("checkout.session", id, "session");
    if (record.session.status !== "open") {
      throw invalidRequest(
        `Only open Checkout Sessions can be expired; ${id} is ${record.session.status}.`,
        "session",
        "checkout_session_not_open",
      );
    }
    record.session.status = "expired";
    this.emit("checkout.session.expired", record.session, cause);
    this.store.save();
    return record;
  }

  /** Expires every open session whose expires_at has passed; returns how many. */
  sweepExpired(nowSec = nowSeconds()): number {
    let count = 0;
    for (const record of Object.values(this.state.sessions)) {
      if (record.session.status === "open" && record.session.expires_at <= nowSec) {
        this.expireSession(record.session.id, { requestId: null, idempotencyKey: null });
        count++;
      }
    }
    return count;
  }

  /** Expires this one session now if its time is up, so the page never takes a card the sweep would refuse. */
  expireIfDue(record: SessionRecord): void {
    if (record.session.status === "open" && record.session.expires_at <= nowSeconds()) {
      this.expireSession(record.session.id, { requestId: null, idempotencyKey: null });
    }
  }

  /** Takes a card for a session, as the hosted page does; only the two test cards lead anywhere. */
  paySession(id: string, form: CardForm, via: "page" | "control"): PayResult {
    const record = this.getSession(id);
    if (!record) return { kind: "not_found" };
    this.expireIfDue(record);
    if (record.session.status !== "open") return { kind: "not_open", record };
    const { errors, card } = checkCardForm(form, new Date());
    if (!card) return { kind: "invalid", errors };
    const last4 = card.digits.slice(-4);
    if (card.digits === DECLINED_CARD) {
      record.attempts.push({ at: nowSeconds(), last4, outcome: "declined", via });
      this.store.save();
      return { kind: "declined", message: DECLINED_MESSAGE };
    }

    const created = nowSeconds();
    const session = record.session;
    const paymentMethod = makeId("pm_");
    const description = record.paymentIntentData.description ?? record.lineItems.map((i) => i.name).join(", ");
    const intent: PaymentIntentObject = {
      id: makeId("pi_"),
      object: "payment_intent",
      amount: session.amount_total,
      amount_received: session.amount_total,
      created,
      currency: session.currency,
      description,
      latest_charge: "",
      livemode: false,
      metadata: { ...record.paymentIntentData.metadata },
      payment_method: paymentMethod,
      payment_method_types: ["card"],
      status: "succeeded",
    };
    const charge: ChargeObject = {
      id: makeId("ch_"),
      object: "charge",
      amount: session.amount_total,
      amount_captured: session.amount_total,
      amount_refunded: 0,
      billing_details: { email: session.customer_email, name: form.name.trim() },
      captured: true,
      created,
      currency: session.currency,
      description,
      livemode: false,
      metadata: { ...record.paymentIntentData.metadata },
      paid: true,
      payment_intent: intent.id,
      payment_method: paymentMethod,
      payment_method_details: {
        type: "card",
        card: { brand: "visa", last4, exp_month: card.expMonth, exp_year: card.expYear },
      },
      refunded: false,
      status: "succeeded",
    };
    intent.latest_charge = charge.id;
    this.state.paymentIntents[intent.id] = intent;
    this.state.charges[charge.id] = charge;
    session.status = "complete";
    session.payment_status = "paid";
    session.payment_intent = intent.id;
    session.customer_details = { email: session.customer_email, name: form.name.trim() };
    record.attempts.push({ at: created, last4, outcome: "paid", via });
    this.emit("checkout.session.completed", session, { requestId: null, idempotencyKey: null });
    this.store.save();
    return { kind: "paid", record };
  }

  /** Where the customer goes after paying: success_url with {CHECKOUT_SESSION_ID} filled in. */
  successRedirect(record: SessionRecord): string {
    return record.session.success_url.split("{CHECKOUT_SESSION_ID}").join(record.session.id);
  }

  createRefund(params: FormObject, cause: EventCause): RefundObject {
    rejectUnknown(params, REFUND_CREATE_PARAMS, []);
    const intentId = asString(params.payment_intent, "payment_intent") || undefined;
    const chargeId = asString(params.charge, "charge") || undefined;
    if (!intentId && !chargeId) {
      throw invalidRequest(
        "One of payment_intent or charge is required to create a refund.",
        "payment_intent",
        "parameter_missing",
      );
    }
    if (intentId && chargeId) {
      throw invalidRequest("Give only one of payment_intent or charge.", "charge");
    }
    let charge: ChargeObject | undefined;
    let param = "charge";
    if (intentId) {
      param = "payment_intent";
      const intent = getOwn(this.state.paymentIntents, intentId);
      if (!intent) throw noSuch("payment_intent", intentId, "payment_intent").withStatus(400);
      charge = getOwn(this.state.charges, intent.latest_charge);
    } else {
      charge = getOwn(this.state.charges, chargeId!);
      if (!charge) throw noSuch("charge", chargeId!, "charge").withStatus(400);
    }
    if (!charge) throw invalidRequest(`PaymentIntent ${intentId} has no successful charge to refund.`, param);
    const remaining = charge.amount - charge.amount_refunded;
    if (remaining <= 0) {
      throw invalidRequest(`Charge ${charge.id} has already been refunded.`, param, "charge_already_refunded");
    }
    const amount = asInteger(params.amount, "amount", 1, MAX_AMOUNT) ?? remaining;
    if (amount > remaining) {
      throw invalidRequest(
        `Refund amount (${amount}) is greater than the unrefunded amount on charge ${charge.id} (${remaining}).`,
        "amount",
        "amount_too_large",
      );
    }
    const currency = asString(params.currency, "currency");
    if (currency && currency.toLowerCase() !== charge.currency) {
      throw invalidRequest(
        `currency (${currency}) does not match the charge's currency (${charge.currency}).`,
        "currency",
      );
    }
    const reason = asString(params.reason, "reason") || null;
    if (reason !== null && !REFUND_REASONS.includes(reason)) {
      throw invalidRequest(
        `Invalid reason: must be one of ${REFUND_REASONS.join(", ")}.`,
        "reason",
        "parameter_invalid_string",
      );
    }
    const metadata = readMetadata(params.metadata, "metadata");
    readExpand(params.expand, ["charge", "payment_intent"]);

    const refund: RefundObject = {
      id: makeId("re_"),
      object: "refund",
      amount,
      charge: charge.id,
      created: nowSeconds(),
      currency: charge.currency,
      metadata,
      payment_intent: charge.payment_intent,
      reason,
      status: "succeeded",
    };
    const previous = { amount_refunded: charge.amount_refunded, refunded: charge.refunded };
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded === charge.amount;
    this.state.refunds[refund.id] = refund;
    this.emit("charge.refunded", charge, cause, previous);
    this.store.save();
    return refund;
  }

  readRefundExpand(params: FormObject): string[] {
    return readExpand(params.expand, ["charge", "payment_intent"]);
  }

  presentRefund(refund: RefundObject, expand: string[]): Record<string, unknown> {
    const shown: Record<string, unknown> = { ...refund };
    if (expand.includes("charge")) shown.charge = getOwn(this.state.charges, refund.charge) ?? refund.charge;
    if (expand.includes("payment_intent"))
      shown.payment_intent = getOwn(this.state.paymentIntents, refund.payment_intent) ?? refund.payment_intent;
    return structuredClone(shown);
  }
}

function isKnownCurrency(code: string): boolean {
  return Intl.supportedValuesOf("currency").includes(code.toUpperCase());
}

/** Amount in minor units as the customer reads it: `$150.00`, `¥1,500`. */
export function formatAmount(minorUnits: number, currency: string): string {
  const format = new Intl.NumberFormat("en-US", { style: "currency", currency: currency.toUpperCase() });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(minorUnits / 10 ** digits);
}
