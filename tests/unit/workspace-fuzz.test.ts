/*
 * Random and hostile input against the workspace's API and forms (fast-check): the server answers
 * 2xx, 3xx or 4xx with a message, never throws (a 500), and a refused form changes nothing.
 */
import { count, eq } from "drizzle-orm";
import fc from "fast-check";
import { beforeAll, expect, test } from "vitest";
import { leadEvents, leads, users } from "~/db/schema";
import { db } from "~/lib/platform/db.server";
import { loader as apiLoader } from "~/routes/api/leads";
import { action as leadAction } from "~/routes/app-lead";
import { action as teamAction } from "~/routes/app-team";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

let companyId = 0;
let estimatorCookie = "";
let ownerCookie = "";
let leadId = 0;

beforeAll(async () => {
  const { company } = await demoCompany();
  companyId = company.id;
  estimatorCookie = await loginAs(companyId, "estimator");
  ownerCookie = await loginAs(companyId, "owner");
  leadId = (await db.select().from(leads).where(eq(leads.ref, "demo-cinder-slate-05")))[0]!.id;
});

const KEYS = ["status", "assignee", "from", "to", "q", "sort", "dir", "page", "since", "x"];
const hostile = fc.oneof(
  fc.string({ maxLength: 40 }),
  fc.constantFrom(
    "",
    "-1",
    "0",
    "1e9",
    "NaN",
    "null",
    "'; drop table leads; --",
    "%",
    "_",
    "\\",
    "2026-02-30",
    "9999-99-99",
    "new",
    "won",
    "none",
    "asc",
    "<script>",
  ),
  fc.integer().map(String),
  fc.string({ unit: "grapheme", maxLength: 12 }),
);

async function statusOf(run: () => Promise<unknown>): Promise<number> {
  try {
    const value = await run();
    if (value instanceof Response) return value.status;
    if (value && typeof value === "object" && "init" in value)
      return (value as { init: { status?: number } }).init.status ?? 200;
    return 200;
  } catch (thrown) {
    if (thrown instanceof Response) return thrown.status;
    throw thrown;
  }
}

test("GET /api/leads answers any query string with 200 or a 400 naming the fields, never a 500", async () => {
  await fc.assert(
    fc.asyncProperty(fc.dictionary(fc.constantFrom(...KEYS), hostile, { maxKeys: 6 }), async (params) => {
      const query = new URLSearchParams(params).toString();
      const response = await apiLoader(routeArgs(requestWithCookie(`/api/leads?${query}`, estimatorCookie)));
      expect([200, 400]).toContain(response.status);
      const body = (await response.json()) as { errors?: { path: string; message: string }[]; rows?: unknown[] };
      if (response.status === 400) {
        expect(body.errors!.length).toBeGreaterThan(0);
        for (const e of body.errors!) expect(KEYS).toContain(e.path);
      } else {
        expect(Array.isArray(body.rows)).toBe(true);
      }
    }),
    { numRuns: 150 },
  );
});

test("the lead page's forms answer random fields with a redirect or a 4xx, and a refused form writes nothing", async () => {
  const intents = fc.constantFrom("status", "note", "assign", "crew", "", "delete", "status ");
  const fields = fc.record(
    {
      intent: intents,
      status: hostile,
      reason: hostile,
      note: hostile,
      assigneeId: hostile,
      crewUserId: hostile,
    },
    { requiredKeys: ["intent"] },
  );
  await fc.assert(
    fc.asyncProperty(fields, async (form) => {
      const before = (await db.select({ n: count() }).from(leadEvents).where(eq(leadEvents.leadId, leadId)))[0]!.n;
      const request = requestWithCookie(`/app/leads/${leadId}`, estimatorCookie, {
        method: "POST",
        body: new URLSearchParams(form as Record<string, string>),
      });
      const status = await statusOf(() => leadAction(routeArgs(request, { leadId: String(leadId) })));
      expect(status === 302 || (status >= 400 && status < 500)).toBe(true);
      const after = (await db.select({ n: count() }).from(leadEvents).where(eq(leadEvents.leadId, leadId)))[0]!.n;
      expect(after).toBe(status === 302 ? before + 1 : before);
    }),
    { numRuns: 120 },
  );
});

test("the team page's forms answer random fields with a redirect or a 4xx, never a 500, and never lock the owner out", async () => {
  const fields = fc.record({
    intent: fc.constantFrom("role", "deactivate", "reactivate", "invite", "", "promote"),
    userId: fc.oneof(hostile, fc.constantFrom("1", "2", "3", "999999")),
    role: fc.oneof(hostile, fc.constantFrom("owner", "estimator", "crew", "homeowner")),
    name: hostile,
    email: fc.oneof(hostile, fc.emailAddress()),
  });
  await fc.assert(
    fc.asyncProperty(fields, async (form) => {
      const request = requestWithCookie("/app/team", ownerCookie, { method: "POST", body: new URLSearchParams(form) });
      const status = await statusOf(() => teamAction(routeArgs(request)));
      expect(status === 302 || (status >= 400 && status < 500)).toBe(true);
    }),
    { numRuns: 120 },
  );
  const [owner] = await db.select().from(users).where(eq(users.email, "owner@cinder-slate.test"));
  expect(owner).toMatchObject({ role: "owner", isActive: true });
});
