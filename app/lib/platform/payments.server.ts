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
