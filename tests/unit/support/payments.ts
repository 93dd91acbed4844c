/*
 * Payment notices in unit tests: signed as the payment service signs them and posted to the app's
 * webhook action; and what the local payments fake recorded (its own webhooks are off in these files).
 */
import Stripe from "stripe";
import { expect } from "vitest";
import { env } from "~/lib/platform/env.server";
import { action as webhookAction } from "~/routes/api/webhooks-stripe";
import { routeArgs } from "./demo";

const signer = new Stripe("sk_test_local");

/** Posts an event to the webhook, signed with the app's secret: its status and the outcome it names. */
export async function deliverSigned(event: unknown): Promise<{ status: number; outcome: string }> {
  const payload = JSON.stringify(event);
  const signature = signer.webhooks.generateTestHeaderString({ payload, secret: env.STRIPE_WEBHOOK_SECRET });
  const response = (await webhookAction(
    routeArgs(
      new Request("http://localhost/api/webhooks/stripe", {
        method: "POST",
        body: payload,
        headers: { "Stripe-Signature": signature },
      }),
    ),
  )) as Response;
  return { status: response.status, outcome: ((await response.json()) as { outcome: string }).outcome };
}

export type FakeEvent = {
  id: string;
  type: string;
  data: { object: Record<string, unknown>; previous_attributes?: Record<string, unknown> };
};

/** The events the payments fake at `fakeUrl` recorded of one type, newest last. */
export async function fakeEvents(fakeUrl: string, type: string): Promise<FakeEvent[]> {
  return ((await (await fetch(`${fakeUrl}/_fake/events?type=${type}`)).json()) as { data: FakeEvent[] }).data;
}

/** The refunds the payments fake made on one payment. */
export async function fakeRefundsOf(
  fakeUrl: string,
  paymentIntent: string,
): Promise<{ id: string; amount: number; payment_intent: string }[]> {
  const answer = (await (await fetch(`${fakeUrl}/_fake/refunds`)).json()) as {
    data: { id: string; amount: number; payment_intent: string }[];
  };
  return answer.data.filter((r) => r.payment_intent === paymentIntent);
}

/** The newest refund notice the payments fake recorded for one payment. */
export async function newestRefundNotice(fakeUrl: string, paymentIntent: string): Promise<FakeEvent> {
  const notices = (await fakeEvents(fakeUrl, "charge.refunded")).filter(
    (e) => e.data.object.payment_intent === paymentIntent,
  );
  expect(notices.length).toBeGreaterThan(0);
  return notices.at(-1)!;
}
