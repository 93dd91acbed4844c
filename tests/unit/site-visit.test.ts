/*
 * The estimator's site visit: what is measured, checked against the setback (International Fire
 * Code §307.4.2: 25 ft from structures for recreational fires; the company may set more) and the way
 * in; saved with its photos under the same rules as the homeowner's (OWASP File Upload Cheat Sheet).
 */
import { and, eq } from "drizzle-orm";
import { beforeAll, expect, test } from "vitest";
import { leadEvents, leadPhotos, leads, siteVisits } from "~/db/schema";
import { checkSite, siteAllowances } from "~/domain/site-checks";
import { db } from "~/lib/platform/db.server";
import { action as visitAction } from "~/routes/app-lead-visit";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { TINY_PNG } from "./support/images";
import { createTestLead } from "./support/leads";
import { loginAs } from "./support/login";

let cookie = "";
let companyId = 0;
beforeAll(async () => {
  const { company } = await demoCompany();
  companyId = company.id;
  cookie = await loginAs(company.id, "estimator");
});

const GOOD = {
  structureFt: "30",
  propertyLineFt: "28",
  branchesFt: "",
  slope: "gentle",
  soil: "loam",
  accessWidthIn: "42",
  utilityMarks: "marked-clear",
  spoil: "haul-away",
  notes: "Gate latch sticks.",
};

async function postVisit(
  leadId: number,
  fields: Record<string, string>,
  photos: { name: string; bytes: Uint8Array<ArrayBuffer>; type: string }[] = [],
) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  for (const p of photos) form.append("photos", new File([p.bytes], p.name, { type: p.type }));
  const body = new Response(form);
  const bytes = await body.arrayBuffer();
  const request = requestWithCookie(`/app/leads/${leadId}/visit`, cookie, {
    method: "POST",
    body: bytes,
    headers: { "Content-Type": body.headers.get("Content-Type")!, "Content-Length": String(bytes.byteLength) },
  });
  const result = (await visitAction(routeArgs(request, { leadId: String(leadId) }))) as
    Response | { data: { errors: Record<string, string> }; init: { status: number } };
  return result instanceof Response
    ? { status: result.status, errors: {} as Record<string, string> }
    : { status: result.init.status, errors: result.data.errors };
}

test("a saved visit measures the yard: the request moves to “yard measured”, its photo is kept as a site-visit photo, the timeline says so", async () => {
  const { company } = await demoCompany();
  const lead = await createTestLead(company);
  const answer = await postVisit(lead.id, GOOD, [{ name: "gate.png", bytes: TINY_PNG, type: "image/png" }]);
  expect(answer.status).toBe(302);
  const [row] = await db.select().from(leads).where(eq(leads.id, lead.id));
  expect(row!.status).toBe("measured");
  const [visit] = await db.select().from(siteVisits).where(eq(siteVisits.leadId, lead.id));
  expect(visit).toMatchObject({
    structureFt: 30,
    propertyLineFt: 28,
    branchesFt: null,
    slope: "gentle",
    accessWidthIn: 42,
    notes: "Gate latch sticks.",
  });
  const photos = await db.select().from(leadPhotos).where(eq(leadPhotos.leadId, lead.id));
  expect(photos.map((p) => [p.source, p.originalName])).toEqual([["site-visit", "gate.png"]]);
  const [event] = await db
    .select()
    .from(leadEvents)
    .where(and(eq(leadEvents.leadId, lead.id), eq(leadEvents.kind, "site-visit")));
  expect(event!.detail).toContain("Request in → Yard measured");

  // Saving again updates the one record; the stage stays.
  expect((await postVisit(lead.id, { ...GOOD, structureFt: "31.5" })).status).toBe(302);
  const visits = await db.select().from(siteVisits).where(eq(siteVisits.leadId, lead.id));
  expect(visits.map((v) => v.structureFt)).toEqual([31.5]);
});

test("a bad visit form answers 400 naming each field, and nothing is saved", async () => {
  const { company } = await demoCompany();
  const lead = await createTestLead(company);
  const answer = await postVisit(
    lead.id,
    { ...GOOD, structureFt: "far", accessWidthIn: "5", slope: "cliff", branchesFt: "-2" },
    [{ name: "notes.txt", bytes: new Uint8Array(Buffer.from("<script>alert(1)</script>")), type: "image/png" }],
  );
  expect(answer.status).toBe(400);
  expect(answer.errors).toEqual({
    structureFt: "Distance to the nearest structure must be a length, like 10, 10 1/2, 10.5 ft or 3.2 m.",
    accessWidthIn: "Access width must be between 12 and 240 in (305–6096 mm).", // 304.8 and 6096 mm (NIST SP 811)
    slope: "Choose the ground's slope.",
    branchesFt: "Branches must be between 0 and 500 ft, or left empty when none hang over.",
    photos: '"notes.txt" is not a JPEG, PNG or WebP photo.',
  });
  expect(await db.select().from(siteVisits).where(eq(siteVisits.leadId, lead.id))).toEqual([]);
  expect((await db.select().from(leads).where(eq(leads.id, lead.id)))[0]!.status).toBe("request");
  expect(companyId).toBeGreaterThan(0);
});

test("measured distances are checked against the setback: 20 ft from the house with a 25 ft setback is flagged (IFC §307.4.2), 30 ft is not", () => {
  const rules = { setbackFt: 25, narrowAccessIn: 36 };
  const base = {
    structureFt: 30,
    propertyLineFt: 40,
    branchesFt: null,
    slope: "level" as const,
    soil: "loam" as const,
    accessWidthIn: 72,
  };
  expect(checkSite(base, rules)).toEqual([]);
  expect(checkSite({ ...base, structureFt: 20 }, rules).map((c) => c.code)).toEqual(["structure-too-close"]);
  expect(checkSite({ ...base, structureFt: 20 }, rules)[0]!.message).toContain("§307.4.2");
  // Exactly at the setback passes: the rule is "at least 25 ft".
  expect(checkSite({ ...base, structureFt: 25 }, rules)).toEqual([]);
  expect(checkSite({ ...base, branchesFt: 12, soil: "clay" }, rules).map((c) => c.code)).toEqual([
    "branches-over",
    "soft-soil",
  ]);
});

test("a way in narrower than the company's limit and steep ground add their allowances, in cents", () => {
  const rules = { narrowAccessIn: 36, narrowAccessAllowanceCents: 35_000, steepSlopeAllowanceCents: 60_000 };
  expect(siteAllowances({ slope: "gentle", accessWidthIn: 36 }, rules)).toEqual([]);
  expect(siteAllowances({ slope: "steep", accessWidthIn: 30 }, rules).map((a) => [a.key, a.cents])).toEqual([
    ["narrow-access", 35_000],
    ["steep-slope", 60_000],
  ]);
  // A company that charges nothing extra adds no line.
  expect(
    siteAllowances(
      { slope: "steep", accessWidthIn: 30 },
      { ...rules, narrowAccessAllowanceCents: 0, steepSlopeAllowanceCents: 0 },
    ),
  ).toEqual([]);
  expect(
    checkSite(
      { structureFt: 40, propertyLineFt: 40, branchesFt: null, slope: "level", soil: "sand", accessWidthIn: 30 },
      { setbackFt: 25, narrowAccessIn: 36 },
    )[0]!.code,
  ).toBe("narrow-access");
});
