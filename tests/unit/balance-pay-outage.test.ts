/*
 * The homeowner's "Pay the balance" on /my when the payment service does not answer: a clear 503
 * saying nothing was charged (as the deposit's Pay button answers), never a 500, and the balance
 * left as it was so the next press starts afresh.
 */
import { and, eq } from "drizzle-orm";
import Stripe from "stripe";
import { afterEach, expect, test, vi } from "vitest";
import { jobBalances, leads, users } from "~/db/schema";
import { startSession } from "~/lib/auth/session.server";
import { db } from "~/lib/platform/db.server";
import { stripe } from "~/lib/platform/payments.server";
import { action as myAction } from "~/routes/my";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";

afterEach(() => vi.restoreAllMocks());

test("pay-balance while the payment service is down: 503 naming the problem, nothing stored", async () => {
  const { company } = await demoCompany();
  // The seed's built job with its balance still open.
  const [lead] = await db
    .select()
    .from(leads)
    .where(and(eq(leads.companyId, company.id), eq(leads.customerName, "Perpetua Vance")));
  const [homeowner] = await db.select().from(users).where(eq(users.email, lead!.email));
  const cookie = (await startSession(homeowner!.id)).split(";")[0]!;
  const [before] = await db.select().from(jobBalances).where(eq(jobBalances.leadId, lead!.id));
  expect(before!.paidAt).toBeNull();
  const create = vi
    .spyOn(stripe.checkout.sessions, "create")
    .mockRejectedValue(
      new Stripe.errors.StripeConnectionError({ message: "connect ECONNREFUSED", type: "api_error" } as never),
    );
  vi.spyOn(console, "error").mockImplementation(() => {});

  const answer = (await myAction(
    routeArgs(
      requestWithCookie("/my", cookie, {
        method: "POST",
        body: new URLSearchParams({ intent: "pay-balance", leadId: String(lead!.id) }),
        headers: { "Content-Type": "application/x-www-form-urlencoded" },
      }),
    ),
  )) as { data: { error: string }; init: { status: number } };

  expect(create).toHaveBeenCalledTimes(1);
  expect(answer.init.status).toBe(503);
  expect(answer.data.error).toMatch(/^The payment service is not answering right now\. Nothing was charged/);
  const [after] = await db.select().from(jobBalances).where(eq(jobBalances.leadId, lead!.id));
  expect(after).toEqual(before);
});
