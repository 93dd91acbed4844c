import { count } from "drizzle-orm";
import { expect, test, vi } from "vitest";

// This file runs as a server configured for https://pits.example.test (each test file has its own
// process, so the setting stays here).
vi.hoisted(() => {
  process.env.APP_ORIGIN = "https://pits.example.test";
  process.env.HSTS_MAX_AGE = "31536000";
});

const { emailOutbox } = await import("~/db/schema");
const { db } = await import("~/lib/platform/db.server");
const { applySecurityHeaders, strictTransportSecurity } = await import("~/lib/platform/security.server");
const { action } = await import("~/routes/configurator");
const { demoCompany, routeArgs } = await import("./support/demo");

test("host-header link poisoning: a request posted with Host attacker.example mails links on the configured origin only", async () => {
  await demoCompany();
  const before = (await db.select({ n: count() }).from(emailOutbox))[0]!.n;
  const form = new FormData();
  const fields = {
    customerName: "Hana Okafor",
    email: "hana.okafor@example.test",
    phone: "(970) 555-0141",
    street: "3 Birch Row",
    town: "Millbrook Falls",
    buildWindow: "not-sure",
    consent: "on",
    design: "units=14&courses=4",
  };
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  const raw = new Request("http://attacker.example/c/cinder-slate", {
    method: "POST",
    body: form,
    headers: { Host: "attacker.example", "X-Forwarded-For": "203.0.113.80" },
  });
  const body = await raw.arrayBuffer();
  const request = new Request(raw.url, {
    method: "POST",
    body,
    headers: { ...Object.fromEntries(raw.headers), "Content-Length": String(body.byteLength) },
  });
  const response = await action(routeArgs(request, { companySlug: "cinder-slate" }));
  expect(response).toBeInstanceOf(Response);
  const rows = (await db.select().from(emailOutbox)).slice(before);
  expect(rows.length).toBeGreaterThan(0);
  const links = rows.flatMap((r) => r.text.match(/https?:\/\/[^\s)>\]"]+/g) ?? []);
  expect(links.length).toBeGreaterThan(0);
  for (const link of links) expect(link, link).not.toContain("attacker.example");
  expect(links.some((l) => l.startsWith("https://pits.example.test/"))).toBe(true);
});

test("HSTS: every answer carries Strict-Transport-Security when the configured origin is https", () => {
  expect(strictTransportSecurity()).toBe("max-age=31536000");
  const headers = new Headers();
  applySecurityHeaders(headers, "n");
  expect(headers.get("Strict-Transport-Security")).toBe("max-age=31536000");
});
