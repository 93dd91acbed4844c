import fc from "fast-check";
import { expect, test } from "vitest";
import { action as consultAction } from "~/routes/consult";
import { action as configuratorAction } from "~/routes/configurator";
import { action as loginAction } from "~/routes/login";
import { action as welcomeAction } from "~/routes/welcome";
import { action as webhookAction } from "~/routes/api/webhooks-stripe";
import { demoCompany, routeArgs } from "./support/demo";
import { createTestLead } from "./support/leads";

/** The HTTP status an action's outcome would be sent with (thrown Responses included). */
async function statusOf(run: () => Promise<unknown>): Promise<number> {
  try {
    const result = await run();
    if (result instanceof Response) return result.status;
    const init = (result as { init?: ResponseInit | null } | null)?.init;
    return init?.status ?? 200;
  } catch (thrown) {
    if (thrown instanceof Response) return thrown.status;
    throw thrown;
  }
}

// Hostile text: long strings, control characters, markup, SQL-ish and path-ish fragments.
const hostileText = fc.oneof(
  fc.string({ maxLength: 40 }),
  fc.string({ minLength: 3000, maxLength: 6000 }),
  fc.constantFrom(
    "<script>alert(1)</script>",
    "' OR 1=1 --",
    "../../etc/passwd",
    "\u0000\u202e",
    "1e309",
    "-0",
    "NaN",
    "🔥".repeat(50),
  ),
);
const formFields = fc.dictionary(
  fc.constantFrom(
    "customerName",
    "email",
    "phone",
    "street",
    "town",
    "buildWindow",
    "notes",
    "consent",
    "website",
    "design",
    "startsAt",
    "timeZone",
    "password",
    "confirm",
    "redirectTo",
    "__proto__",
    "constructor",
  ),
  hostileText,
);

let ip = 0;
function postForm(url: string, fields: Record<string, string>) {
  const body = new URLSearchParams(fields).toString();
  ip += 1;
  return new Request(url, {
    method: "POST",
    body,
    headers: {
      "Content-Type": "application/x-www-form-urlencoded",
      "Content-Length": String(body.length),
      "X-Forwarded-For": `10.77.${(ip >> 8) & 255}.${ip & 255}`,
    },
  });
}

const isClientOrOk = (status: number) => status < 500;

test("the request form answers every random and hostile body with 2xx, 3xx or 4xx, never 5xx (fast-check)", async () => {
  await demoCompany();
  await fc.assert(
    fc.asyncProperty(formFields, async (fields) => {
      const status = await statusOf(() =>
        configuratorAction(
          routeArgs(postForm("http://localhost/c/cinder-slate", fields), { companySlug: "cinder-slate" }),
        ),
      );
      expect(isClientOrOk(status), `status ${status}`).toBe(true);
    }),
    { numRuns: 60 },
  );
});

test("the sign-in form answers every random body with 3xx or 4xx (fast-check)", async () => {
  await fc.assert(
    fc.asyncProperty(fc.dictionary(fc.constantFrom("email", "password", "redirectTo"), hostileText), async (fields) => {
      const status = await statusOf(() => loginAction(routeArgs(postForm("http://localhost/login", fields))));
      expect(isClientOrOk(status), `status ${status}`).toBe(true);
    }),
    { numRuns: 40 },
  );
});

test("the consult booking and password forms never answer 5xx to hostile input (fast-check)", async () => {
  const { company } = await demoCompany();
  const lead = await createTestLead(company);
  await fc.assert(
    fc.asyncProperty(formFields, async (fields) => {
      const consult = await statusOf(() =>
        consultAction(
          routeArgs(postForm("http://localhost/c/cinder-slate/consult/x", fields), {
            companySlug: "cinder-slate",
            ref: lead.ref,
          }),
        ),
      );
      const welcome = await statusOf(() =>
        welcomeAction(routeArgs(postForm("http://localhost/welcome/t", fields), { token: "not-a-real-token" })),
      );
      expect(isClientOrOk(consult) && isClientOrOk(welcome), `${consult} ${welcome}`).toBe(true);
    }),
    { numRuns: 40 },
  );
});

test("the payment webhook answers 400 to any unsigned or forged body (fast-check)", async () => {
  await fc.assert(
    // Header values can only carry visible ASCII; a forged signature is any such string.
    fc.asyncProperty(
      fc.oneof(fc.json(), hostileText),
      fc.option(fc.stringMatching(/^[\x20-\x7e]{0,200}$/), { nil: undefined }),
      async (body, signature) => {
        const headers: Record<string, string> = { "Content-Type": "application/json" };
        if (signature !== undefined) headers["Stripe-Signature"] = signature;
        const status = await statusOf(() =>
          webhookAction(
            routeArgs(new Request("http://localhost/api/webhooks/stripe", { method: "POST", body, headers })),
          ),
        );
        expect(status).toBe(400);
      },
    ),
    { numRuns: 60 },
  );
});
