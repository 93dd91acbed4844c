/*
 * A post whose body is not a form (JSON, plain text, none, a broken multipart) gets a 415 saying what
 * is accepted, from every action that reads a form, never a 500 (the HTTP semantics of 415
 * Unsupported Media Type, RFC 9110 §15.5.16); another write method gets a 405 with Allow (§15.5.6).
 */
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { leads, proposals, users } from "~/db/schema";
import { startSession } from "~/lib/auth/session.server";
import { db } from "~/lib/platform/db.server";
import { NOT_A_FORM, readForm, textFields } from "~/lib/platform/forms.server";
import { securityMiddleware } from "~/lib/platform/security.server";
import { action as leadAction } from "~/routes/app-lead";
import { action as designAction } from "~/routes/app-lead-design";
import { action as composeAction } from "~/routes/app-lead-proposal";
import { action as changeOrderAction } from "~/routes/app-lead-change-order";
import { action as buildAction } from "~/routes/app-lead-build";
import { action as jobOrdersAction } from "~/routes/app-lead-supplier-orders";
import { action as jobAction } from "~/routes/app-job";
import { action as scheduleAction } from "~/routes/app-schedule";
import { action as teamAction } from "~/routes/app-team";
import { action as settingsAction } from "~/routes/app-settings";
import { action as factorsAction } from "~/routes/app-factors";
import { action as termsAction } from "~/routes/app-settings-proposals";
import { action as catalogItemAction } from "~/routes/app-catalog-item";
import { action as suppliersAction } from "~/routes/app-suppliers";
import { action as supplierOrdersAction } from "~/routes/app-supplier-orders";
import { action as attentionAction } from "~/routes/app-attention";
import { action as consultHoursAction } from "~/routes/app-consult-hours";
import { action as calendarAction } from "~/routes/app-calendar";
import { action as inboxSeenAction } from "~/routes/app-inbox-seen";
import { action as myAction } from "~/routes/my";
import { action as proposalAction } from "~/routes/proposal";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

type Action = (args: never) => Promise<unknown>;
let owner = "";
let homeowner = "";
let leadId = "";
let token = "";

beforeAll(async () => {
  const { company } = await demoCompany();
  owner = await loginAs(company.id, "owner");
  const [person] = await db
    .insert(users)
    .values({ companyId: company.id, email: "not.a.form@example.test", name: "Form Tester", role: "homeowner" })
    .returning();
  homeowner = (await startSession(person!.id)).split(";")[0]!;
  // The seed's signed job with a booked build (Tobias Wren).
  const [won] = await db.select().from(leads).where(eq(leads.ref, "demo-cinder-slate-10"));
  leadId = String(won!.id);
  const [proposal] = await db.select().from(proposals).where(eq(proposals.leadId, won!.id));
  token = proposal!.token;
});

const BODIES: [string, RequestInit][] = [
  ["a JSON body", { body: '{"intent":"note"}', headers: { "Content-Type": "application/json" } }],
  ["a plain-text body", { body: "intent=note", headers: { "Content-Type": "text/plain" } }],
  ["no body and no type", {}],
  [
    "a broken multipart body",
    {
      body: "--x\r\nContent-Disposition: form-data; name=",
      headers: { "Content-Type": "multipart/form-data; boundary=x" },
    },
  ],
];

const ROUTES: { url: () => string; action: Action; params: () => Record<string, string>; who: () => string }[] = [
  { url: () => `/app/leads/${leadId}`, action: leadAction, params: () => ({ leadId }), who: () => owner },
  { url: () => `/app/leads/${leadId}/design`, action: designAction, params: () => ({ leadId }), who: () => owner },
  { url: () => `/app/leads/${leadId}/proposal`, action: composeAction, params: () => ({ leadId }), who: () => owner },
  {
    url: () => `/app/leads/${leadId}/change-order`,
    action: changeOrderAction,
    params: () => ({ leadId }),
    who: () => owner,
  },
  { url: () => `/app/leads/${leadId}/build`, action: buildAction, params: () => ({ leadId }), who: () => owner },
  {
    url: () => `/app/leads/${leadId}/supplier-orders`,
    action: jobOrdersAction,
    params: () => ({ leadId }),
    who: () => owner,
  },
  { url: () => `/app/jobs/${leadId}`, action: jobAction, params: () => ({ leadId }), who: () => owner },
  { url: () => "/app/schedule", action: scheduleAction, params: () => ({}), who: () => owner },
  { url: () => "/app/team", action: teamAction, params: () => ({}), who: () => owner },
  { url: () => "/app/settings", action: settingsAction, params: () => ({}), who: () => owner },
  { url: () => "/app/settings/factors", action: factorsAction, params: () => ({}), who: () => owner },
  { url: () => "/app/settings/proposals", action: termsAction, params: () => ({}), who: () => owner },
  { url: () => "/app/catalog/new", action: catalogItemAction, params: () => ({}), who: () => owner },
  { url: () => "/app/suppliers", action: suppliersAction, params: () => ({}), who: () => owner },
  { url: () => "/app/supplier-orders", action: supplierOrdersAction, params: () => ({}), who: () => owner },
  { url: () => "/app/attention", action: attentionAction, params: () => ({}), who: () => owner },
  { url: () => "/app/consult-hours", action: consultHoursAction, params: () => ({}), who: () => owner },
  { url: () => "/app/calendar", action: calendarAction, params: () => ({}), who: () => owner },
  { url: () => "/app/inbox/seen", action: inboxSeenAction, params: () => ({}), who: () => owner },
  { url: () => "/my", action: myAction, params: () => ({}), who: () => homeowner },
  { url: () => `/p/${token}`, action: proposalAction, params: () => ({ token }), who: () => "" },
];

async function statusOf(run: () => Promise<unknown>): Promise<{ status: number; body: unknown }> {
  let value: unknown;
  try {
    value = await run();
  } catch (thrown) {
    value = thrown;
  }
  if (value instanceof Response) return { status: value.status, body: await value.text() };
  if (value && typeof value === "object" && "init" in value) {
    const wrapped = value as { data: unknown; init: { status?: number } | null };
    return { status: wrapped.init?.status ?? 200, body: wrapped.data };
  }
  throw new Error(`not an answer: ${String(value)}`);
}

describe.each(BODIES)("%s", (_label, init) => {
  for (const route of ROUTES) {
    test(`POST ${route.url
      .toString()
      .replace(/^\(\) => |[`"]/g, "")
      .replace(/\$\{(\w+)\}/g, ":$1")} answers 415 saying what is accepted`, async () => {
      const request = requestWithCookie(route.url(), route.who() || undefined, {
        method: "POST",
        ...init,
        headers: { Origin: "http://localhost", ...(init.headers as Record<string, string> | undefined) },
      });
      expect(await statusOf(() => route.action(routeArgs(request, route.params())))).toEqual({
        status: 415,
        body: NOT_A_FORM,
      });
    });
  }
});

test("no route reads a form body except through readForm (the sign-in reads a copy, and answers 400 itself)", () => {
  const dir = path.resolve("app/routes");
  const offenders = readdirSync(dir, { recursive: true, encoding: "utf8" })
    .filter((f) => /\.tsx?$/.test(f) && f !== "login.tsx")
    .filter((f) => /\.formData\(\)/.test(readFileSync(path.join(dir, f), "utf8")));
  expect(offenders).toEqual([]);
});

test.each(["PUT", "PATCH", "DELETE"])("%s is refused with 405 and Allow, before any action runs", async (method) => {
  const request = requestWithCookie(`/app/leads/${leadId}`, owner, {
    method,
    body: "intent=note&note=hello",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: "http://localhost" },
  });
  let ran = false;
  const response = (await securityMiddleware(routeArgs(request, { leadId }) as never, async () => {
    ran = true;
    return new Response("ran");
  })) as Response;
  expect([response.status, response.headers.get("Allow"), ran]).toEqual([405, "GET, HEAD, OPTIONS, POST", false]);
});

test("readForm hands actions text as a reader sees it: control, bidirectional and zero-width characters gone, line breaks kept; passwords exactly as typed", async () => {
  // Unicode Standard Annex #9 for the bidirectional controls; C0 controls per ISO/IEC 6429.
  const body = new URLSearchParams({
    reason: "\u200b\u200b\u200b\u200b",
    note: "Line one\r\nLine\u0007 two\u202e\u2066\ufeff",
    password: "pa\u200bss\u0007word",
    confirm: "pa\u200bss\u0007word",
  });
  const form = await readForm(
    new Request("http://localhost/x", {
      method: "POST",
      body,
      headers: { "Content-Type": "application/x-www-form-urlencoded" },
    }),
  );
  expect(textFields(form)).toEqual({
    reason: "",
    note: "Line one\nLine two",
    password: "pa\u200bss\u0007word",
    confirm: "pa\u200bss\u0007word",
  });
});
