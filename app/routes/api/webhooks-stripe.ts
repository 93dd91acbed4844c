import type Stripe from "stripe";
import type { Route } from "./+types/webhooks-stripe";
import { applyPaymentEvent, bookingIdForPaymentIntent } from "~/lib/consults/booking.server";
import { env } from "~/lib/platform/env.server";
import { stripe } from "~/lib/platform/payments.server";
import { applyDepositEvent, isDepositEvent } from "~/lib/proposals/proposal-payments.server";
import { applyBalanceEvent, isBalanceEvent } from "~/lib/builds/job-balance.server";
import { postOnly } from "~/lib/platform/post-only.server";

const MAX_BODY_BYTES = 256 * 1024;

export const loader = postOnly("Payment notices arrive here by POST.");

// The one route other machines post to: no session, no origin check. The HMAC signature over the
// raw body is the proof; anything unsigned, stale (over 300 s) or altered answers 400 and changes nothing.
export async function action({ request }: Route.ActionArgs) {
  const body = await request.text();
  if (body.length > MAX_BODY_BYTES) return Response.json({ error: "Body too large." }, { status: 413 });
  let event: Stripe.Event;
  try {
    event = stripe.webhooks.constructEvent(
      body,
      request.headers.get("stripe-signature") ?? "",
      env.STRIPE_WEBHOOK_SECRET,
    );
  } catch {
    return Response.json({ error: "Signature check failed." }, { status: 400 });
  }
  // Signed but not an event (no id, type or data.object): nothing to apply, and no handler may read it.
  if (!isEventShaped(event))
    return Response.json({ error: "The event has no id, type or data.object." }, { status: 400 });
  // Deposits on proposals carry metadata.kind = "deposit" and are applied by their own handler.
  if (isDepositEvent(event)) return Response.json({ received: true, outcome: await applyDepositEvent(event) });
  // A built job's balance: metadata.kind = "balance".
  if (isBalanceEvent(event)) return Response.json({ received: true, outcome: await applyBalanceEvent(event) });
  if (event.type === "charge.refunded") {
    const charge = event.data.object;
    const paymentIntent = typeof charge.payment_intent === "string" ? charge.payment_intent : charge.payment_intent?.id;
    if (!charge.metadata?.booking_id && paymentIntent) {
      const bookingId = await bookingIdForPaymentIntent(paymentIntent);
      if (bookingId) charge.metadata = { ...charge.metadata, booking_id: String(bookingId) };
    }
  }
  const outcome = await applyPaymentEvent(event);
  return Response.json({ received: true, outcome });
}

function isEventShaped(event: unknown): event is Stripe.Event {
  if (!event || typeof event !== "object") return false;
  const { id, type, data } = event as { id?: unknown; type?: unknown; data?: { object?: unknown } | null };
  return (
    typeof id === "string" &&
    id.length > 0 &&
    typeof type === "string" &&
    !!data &&
    typeof data === "object" &&
    !!data.object &&
    typeof data.object === "object"
  );
}
