import Stripe from "stripe";
import { env } from "~/lib/platform/env.server";

/** A Stripe client; STRIPE_API_BASE points it at fakes/payments, unset it talks to the real service. */
export function createStripe(
  apiBase: string | undefined = env.STRIPE_API_BASE,
  secretKey = env.STRIPE_SECRET_KEY,
): Stripe {
  if (!apiBase) return new Stripe(secretKey, { maxNetworkRetries: 2 });
  const base = new URL(apiBase);
  return new Stripe(secretKey, {
    host: base.hostname,
    port: Number(base.port || (base.protocol === "https:" ? 443 : 80)),
    protocol: base.protocol === "https:" ? "https" : "http",
    // Every POST carries our own idempotency key, so the SDK's retries cannot charge twice.
    maxNetworkRetries: 2,
  });
}

export const stripe = createStripe();

/** A checkout that cannot be opened, with the words to show the homeowner. */
export class CheckoutRefused extends Error {}

/**
 * Opens (or reopens) a hosted checkout for one amount owed, in dollars, and returns its page. An open
 * session is reused; a new one is made only when the last one expired, under a new attempt number
 * in its idempotency key, so a double press never makes two. The metadata goes on the session and its
 * payment, where the webhook handlers read which record it pays.
 */
export async function openHostedCheckout(args: {
  client: Stripe;
  /** The session stored for this record, and how many were made. */
  stored: { sessionId: string | null; attempt: number };
  /** Said when the stored session is already paid (its webhook not yet applied). */
  paidMessage: string;
  amountCents: number;
  productName: string;
  email: string;
  /** Not a bare number: the consult handler reads client_reference_id as a booking id. */
  clientReference: string;
  metadata: (attempt: number) => Record<string, string>;
  successUrl: string;
  cancelUrl: string;
  idempotencyKey: (attempt: number) => string;
  /** Stores the new session on the record. */
  save: (sessionId: string, attempt: number) => Promise<unknown>;
}): Promise<string> {
  const { client, stored } = args;
  let attempt = stored.attempt;
  if (stored.sessionId) {
    const existing = await client.checkout.sessions.retrieve(stored.sessionId);
    if (existing.status === "open" && existing.url) return existing.url;
    if (existing.status === "complete") throw new CheckoutRefused(args.paidMessage);
    attempt += 1;
  } else if (attempt === 0) {
    attempt = 1;
  }
  const metadata = args.metadata(attempt);
  const session = await client.checkout.sessions.create(
    {
      mode: "payment",
      line_items: [
        {
          price_data: { currency: "usd", unit_amount: args.amountCents, product_data: { name: args.productName } },
          quantity: 1,
        },
      ],
      customer_email: args.email,
      client_reference_id: args.clientReference,
      metadata,
      payment_intent_data: { metadata },
      success_url: args.successUrl,
      cancel_url: args.cancelUrl,
    },
    { idempotencyKey: args.idempotencyKey(attempt) },
  );
  await args.save(session.id, attempt);
  if (!session.url) throw new Error("The payment service returned no checkout page.");
  return session.url;
}

/**
 * Closes checkout pages nobody should pay on any more (a withdrawn or replaced proposal, a stopped
 * job). Best effort, after the change is saved: a payment that lands anyway is refunded when its
 * notice arrives.
 */
export async function expireCheckoutSessions(
  sessionIds: (string | null | undefined)[],
  client: Pick<Stripe, "checkout"> = stripe,
): Promise<void> {
  const open = [...new Set(sessionIds.filter((id): id is string => Boolean(id)))];
  await Promise.all(
    open.map((id) =>
      // Short and without retries: the change is saved already, and the office is waiting for the page.
      client.checkout.sessions.expire(id, {}, { timeout: 5_000, maxNetworkRetries: 0 }).catch((error: unknown) => {
        const code = (error as { code?: string }).code;
        // Paid or expired already: nothing left open.
        if (code !== "checkout_session_not_open" && !/not open|is (complete|expired)/i.test(String(error)))
          console.warn(
            `payments: could not close checkout ${id}; a payment on it is refunded when it lands: ${String(error)}`,
          );
      }),
    ),
  );
}
