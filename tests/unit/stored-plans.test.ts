/*
 * A request shows, prints and prices what was sent and revised, whatever happens to the catalog
 * afterwards: every saved plan keeps the parts, factors and prices it was made from, and the pages,
 * the cut sheet and its PDF are drawn from those and the plan's own numbers (common practice for
 * quotes, no source: a sent estimate is a record, not a live view of the price list).
 */
import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import path from "node:path";
import { eq, sql } from "drizzle-orm";
import { afterEach, beforeAll, expect, test, vi } from "vitest";
import { catalogItems, companies, leadRevisions, leads, type Lead } from "~/db/schema";
import { computePlan } from "~/domain/plan";
import { db } from "~/lib/platform/db.server";
import { designToSearchParams, type Design } from "~/lib/design/design";
import { readStoredPlan, STORED_PLAN_VERSION, toPlanInput } from "~/lib/design/stored-plan";
import { action as designAction } from "~/routes/app-lead-design";
import { loader as leadLoader } from "~/routes/app-lead";
import { loader as cutSheetLoader } from "~/routes/app-lead-cut-sheet";
import { loader as pdfLoader } from "~/routes/app-lead-cut-sheet-pdf";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

let companyId = 0;
let owner = "";
let demoLeads: Lead[] = [];

beforeAll(async () => {
  const { company } = await demoCompany();
  companyId = company.id;
  owner = await loginAs(companyId, "owner");
  demoLeads = await db.select().from(leads).where(eq(leads.companyId, companyId));
});

afterEach(() => {
  vi.useRealTimers();
});

const get = (url: string) => requestWithCookie(url, owner);

/** Everything a request's pages, cut sheet and PDF show, for every saved version of its design. */
async function showAll(lead: Lead) {
  const revisions = await db
    .select({ id: leadRevisions.id })
    .from(leadRevisions)
    .where(eq(leadRevisions.leadId, lead.id));
  const params = { leadId: String(lead.id) };
  const pages = [];
  for (const version of ["original", ...revisions.map((r) => String(r.id))]) {
    pages.push(await leadLoader(routeArgs(get(`/app/leads/${lead.id}?version=${version}`), params)));
  }
  const sheet = await cutSheetLoader(routeArgs(get(`/app/leads/${lead.id}/cut-sheet`), params));
  const pdf = (await pdfLoader(routeArgs(get(`/app/leads/${lead.id}/cut-sheet.pdf`), params))) as Response;
  const pdfSha256 = createHash("sha256")
    .update(Buffer.from(await pdf.arrayBuffer()))
    .digest("hex");
  return { pages, sheet, pdfSha256 };
}

/** Runs the data migration that gives older saved plans their inputs (drizzle/0009_stored_plan_inputs.sql). */
async function runInputsMigration() {
  const file = readFileSync(path.resolve("drizzle/0009_stored_plan_inputs.sql"), "utf8");
  for (const statement of file.split("--> statement-breakpoint")) await db.run(sql.raw(statement));
}

// Runs first: the tests after it change the catalog.
test("requests saved before plans kept their inputs get them once from the migration, sizes checked against the plan", async () => {
  const template = demoLeads.find((l) => l.ref === "demo-cinder-slate-08")!; // patio, caps, steel ring
  const { design } = readStoredPlan(template);
  const oldDesign = JSON.stringify({ choices: design.choices, summary: design.summary });
  const { id: _id, ref: _ref, ...row } = template;
  const [kept] = await db
    .insert(leads)
    .values({ ...row, ref: "before-inputs-1", designJson: oldDesign })
    .returning();
  // A second one whose wall unit and border are no longer in the catalog at all.
  const goneChoices = { ...design.choices, stoneId: 987_654, borderId: 987_655 };
  const [gone] = await db
    .insert(leads)
    .values({
      ...row,
      ref: "before-inputs-2",
      designJson: JSON.stringify({ choices: goneChoices, summary: design.summary }),
    })
    .returning();

  await runInputsMigration();
  const [migrated] = await db.select().from(leads).where(eq(leads.id, kept!.id));
  const [derived] = await db.select().from(leads).where(eq(leads.id, gone!.id));

  const one = readStoredPlan(migrated!);
  // The catalog has not changed since the template was saved, so its stored parts are today's items.
  const stone = design.inputs.engine.wallUnit;
  expect(one.design.inputs.engine.wallUnit).toEqual(stone);
  expect(one.design.inputs.engine.cap).toEqual(design.inputs.engine.cap);
  expect(one.design.inputs.engine.liner).toEqual(design.inputs.engine.liner);
  expect(one.design.inputs.engine.patio).toEqual(design.inputs.engine.patio);
  expect(one.design.inputs.supplyPrices).toEqual(design.inputs.supplyPrices);
  // Re-planned from its migrated inputs, the request comes out as it was computed.
  const again = computePlan(toPlanInput(one.design.inputs.engine), {
    factors: one.design.inputs.factors,
    supplyPrices: one.design.inputs.supplyPrices,
  });
  expect(JSON.parse(JSON.stringify(again))).toEqual(one.plan);

  // With the items gone, the sizes are worked back from the plan's own numbers (regular-polygon chord).
  const two = readStoredPlan(derived!);
  const unit = two.design.inputs.engine.wallUnit;
  for (const key of ["faceIn", "backIn", "depthIn", "heightIn"] as const) expect(unit[key]).toBeCloseTo(stone[key], 9);
  expect(unit.colourHex).toBeUndefined();
  expect(two.design.inputs.engine.patio?.border.lengthIn).toBeCloseTo(design.inputs.engine.patio!.border.lengthIn, 9);

  // Once: a second run changes nothing.
  await runInputsMigration();
  const [still] = await db.select().from(leads).where(eq(leads.id, kept!.id));
  expect(still!.designJson).toBe(migrated!.designJson);
});

test("editing and deleting catalog items changes no older request, its cut sheet or its PDF (before/after)", async () => {
  // The PDF and the pages carry today's date: hold the clock still so only the catalog moves.
  const now = new Date();
  vi.useFakeTimers({ toFake: ["Date"] });
  vi.setSystemTime(now);

  // One request also gets a staff revision, so revisions are covered too.
  const revised = demoLeads.find((l) => l.ref === "demo-cinder-slate-08") ?? demoLeads[0]!;
  const estimator = await loginAs(companyId, "estimator");
  const { design } = readStoredPlan(revised);
  const choices: Design = { ...design.choices, courses: design.choices.courses === 3 ? 4 : 3 };
  const saved = (await designAction(
    routeArgs(
      requestWithCookie(`/app/leads/${revised.id}/design`, estimator, {
        method: "POST",
        body: new URLSearchParams({ design: designToSearchParams(choices).toString() }),
      }),
      { leadId: String(revised.id) },
    ),
  )) as Response;
  expect(saved.status).toBe(302);

  const before = new Map<number, Awaited<ReturnType<typeof showAll>>>();
  for (const lead of demoLeads) before.set(lead.id, await showAll(lead));

  // Every item changes size, colour, name and price; then the items the requests use most are deleted.
  await db
    .update(catalogItems)
    .set({
      name: sql`${catalogItems.name} || ' (new batch)'`,
      colourHex: "#123456",
      priceCents: sql`${catalogItems.priceCents} * 2`,
      faceIn: sql`${catalogItems.faceIn} + 1`,
      backIn: sql`${catalogItems.backIn} + 0.5`,
      depthIn: sql`${catalogItems.depthIn} + 1`,
      heightIn: sql`${catalogItems.heightIn} + 0.5`,
      lengthIn: sql`${catalogItems.lengthIn} + 2`,
      widthIn: sql`${catalogItems.widthIn} + 1`,
      thicknessIn: sql`${catalogItems.thicknessIn} + 0.25`,
      diameterIn: sql`${catalogItems.diameterIn} + 3`,
    })
    .where(eq(catalogItems.companyId, companyId));
  const used = new Set(
    demoLeads.flatMap((l) => {
      const c = readStoredPlan(l).design.choices;
      return [c.stoneId, c.capId, c.ringId, c.borderId];
    }),
  );
  for (const id of used) if (id !== null) await db.delete(catalogItems).where(eq(catalogItems.id, id));
  await db.delete(catalogItems).where(eq(catalogItems.kind, "firebrick"));
  // The company's rates change too; a saved price stays what it was.
  await db.update(companies).set({ labourRateCents: 12_000, marginPct: 35 }).where(eq(companies.id, companyId));

  expect(demoLeads.length).toBeGreaterThan(5);
  for (const lead of demoLeads) {
    const after = await showAll(lead);
    expect(after).toEqual(before.get(lead.id));
  }
});

test("a saved plan's inputs are the whole story: the engine given them again makes the same plan", async () => {
  for (const lead of demoLeads) {
    const { design, plan } = readStoredPlan(lead);
    expect(design.version).toBe(STORED_PLAN_VERSION);
    const again = computePlan(toPlanInput(design.inputs.engine), {
      factors: design.inputs.factors,
      supplyPrices: design.inputs.supplyPrices,
    });
    expect(JSON.parse(JSON.stringify(again))).toEqual(plan);
  }
});

test("a stored plan that does not read is refused by name, not drawn from guesses", () => {
  const lead = demoLeads[0]!;
  expect(() =>
    readStoredPlan({ designJson: JSON.stringify({ choices: {}, summary: [] }), planJson: lead.planJson }),
  ).toThrow(/design_json.*version/);
  const plan = JSON.parse(lead.planJson);
  delete plan.ring.edgeDistanceIn;
  expect(() => readStoredPlan({ designJson: lead.designJson, planJson: JSON.stringify(plan) })).toThrow(
    /plan_json.*ring\.edgeDistanceIn/,
  );
});

test("fields a newer engine adds to a plan are kept on a round trip", () => {
  const lead = demoLeads[0]!;
  const plan = { ...JSON.parse(lead.planJson), fireOpeningIn: 30.5 };
  plan.ring = { ...plan.ring, bondOffsetIn: 3.25 };
  const read = readStoredPlan({ designJson: lead.designJson, planJson: JSON.stringify(plan) });
  expect(read.plan.fireOpeningIn).toBe(30.5);
  expect(read.plan.ring.bondOffsetIn).toBe(3.25);
});
