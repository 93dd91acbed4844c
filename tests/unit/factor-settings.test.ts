import Fraction from "fraction.js";
/*
 * The owners' estimating factors: one descriptor per factor, checked input, stored overrides that
 * reach every plan (configurator, plan API, revisions). Ranges are the product's own choices.
 */
import { eq } from "drizzle-orm";
import { beforeAll, expect, test } from "vitest";
import { companies, type Company } from "~/db/schema";
import { DEFAULT_FACTORS, type CompanyFactors } from "~/domain/factors";
import { db } from "~/lib/platform/db.server";
import { factorSettingsSchema } from "~/lib/settings/factor-schema";
import {
  checkStoredFactor,
  FACTOR_DESCRIPTORS,
  FACTOR_ROWS,
  publicFactors,
  readCompanyFactors,
  toFormValue,
} from "~/lib/settings/factor-settings";
import { planRequestSchema } from "~/lib/design/plan-schema";
import { resolvePlanRequest, runPlan } from "~/lib/design/plan.server";
import { describeBreakdown, readBreakdown } from "~/lib/design/price-breakdown";
import { action as factorsAction, loader as factorsLoader } from "~/routes/app-factors";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

const defaultsAsForm = () =>
  Object.fromEntries(FACTOR_ROWS.map((row) => [row.key, toFormValue(row, DEFAULT_FACTORS[row.key])]));

test("every factor the engine uses has exactly one descriptor, and every default lies inside its own range", () => {
  expect(FACTOR_ROWS.map((r) => r.key).sort()).toEqual(Object.keys(DEFAULT_FACTORS).sort());
  for (const row of FACTOR_ROWS) {
    expect(row.default, row.key).toBe(DEFAULT_FACTORS[row.key]);
    expect(checkStoredFactor(row.key, DEFAULT_FACTORS[row.key]), row.key).toBe(DEFAULT_FACTORS[row.key]);
    expect(row.label.length, row.key).toBeGreaterThan(2);
    expect(row.help.length, row.key).toBeGreaterThan(5);
  }
});

test("the defaults typed into the form read back as the defaults (money typed in dollars, stored in cents)", () => {
  const form = defaultsAsForm();
  expect(form.labourRateCentsPerHour).toBe("75.00");
  expect(form.priceRoundCents).toBe("50.00");
  expect(factorSettingsSchema.parse(form)).toEqual(DEFAULT_FACTORS);
  expect(factorSettingsSchema.parse({ ...form, deliveryCents: "125.505" }).deliveryCents).toBe(12_551);
});

test("bad input names the field and what is allowed", () => {
  const result = factorSettingsSchema.safeParse({
    ...defaultsAsForm(),
    baseDepthIn: "1",
    wallUnitMinSpares: "1.5",
    gluedCourses: "two",
    profitBasis: "both",
  });
  expect(result.success).toBe(false);
  const messages = Object.fromEntries(result.error!.issues.map((i) => [String(i.path[0]), i.message]));
  expect(messages.baseDepthIn).toBe("Base depth under the pit must be between 2 and 12 in (51–305 mm)."); // 50.8 and 304.8 mm at 25.4 mm per inch (NIST SP 811)
  expect(messages.wallUnitMinSpares).toBe("At least this many spare wall units must be a whole number from 0 to 10.");
  expect(messages.gluedCourses).toBe("Glued courses must be a number.");
  expect(messages.profitBasis).toBe("Choose one of the options for “We set our profit as”.");
});

test("length factors take tape readings and millimetres: 1 1/4, 1-1/4, 5/4 and 31.75 mm are all 1.25 in (fraction.js; 25.4 mm per inch, NIST SP 811)", () => {
  for (const typed of ["1 1/4", "1-1/4", "5/4", "31.75 mm"]) {
    expect(factorSettingsSchema.parse({ ...defaultsAsForm(), linerMinGapIn: typed }).linerMinGapIn, typed).toBe(
      new Fraction(5, 4).valueOf(),
    );
  }
  // A length in feet takes metres too: 7.62 m is 25 ft exactly (1 ft = 0.3048 m).
  expect(
    factorSettingsSchema.parse({ ...defaultsAsForm(), edgeRestraintPieceFt: "3.048 m" }).edgeRestraintPieceFt,
  ).toBeCloseTo(10, 12);
});

test("a margin of price must stay below 90 %; the same figure as a markup on cost is allowed", () => {
  const form = { ...defaultsAsForm(), profitPct: "95" };
  expect(factorSettingsSchema.safeParse({ ...form, profitBasis: "markup" }).success).toBe(true);
  const margin = factorSettingsSchema.safeParse({ ...form, profitBasis: "margin" });
  expect(margin.error?.issues.map((i) => [i.path[0], i.message])).toEqual([
    ["profitPct", "A margin of price must be between 0 and 90 % (at 100 % the price would have no end)."],
  ]);
});

test("stored overrides are checked on the way out: unreadable, unknown or out-of-range values fall back to the default", () => {
  const columns = { labourRateCents: 9000, overheadPct: 12, marginPct: 18, priceSpreadPct: 10, setbackFt: 20 };
  const read = (factorsJson: string) => readCompanyFactors({ ...columns, factorsJson });
  expect(read("not json")).toEqual({
    ...DEFAULT_FACTORS,
    labourRateCentsPerHour: 9000,
    overheadPct: 12,
    profitPct: 18,
    priceSpreadPct: 10,
    requiredSetbackFt: 20,
  });
  const factors = read(
    JSON.stringify({
      capSpares: 3,
      baseDepthIn: 40,
      gluedCourses: 1.5,
      profitBasis: "margin",
      salesTaxBasis: "nothing",
      overheadPct: 99,
      shoeSize: 9,
    }),
  );
  expect(factors.capSpares).toBe(3);
  expect(factors.baseDepthIn).toBe(DEFAULT_FACTORS.baseDepthIn);
  expect(factors.gluedCourses).toBe(DEFAULT_FACTORS.gluedCourses);
  expect(factors.profitBasis).toBe("margin");
  expect(factors.salesTaxBasis).toBe(DEFAULT_FACTORS.salesTaxBasis);
  // The overhead lives in its column; a stray copy in the JSON is not read.
  expect(factors.overheadPct).toBe(12);
  expect("shoeSize" in factors).toBe(false);
  expect(read("[1,2]")).toEqual(read("{}"));
});

test("the configurator's browser sees geometry and quantity factors, never rates, profit or taxes", () => {
  const shown = publicFactors({ ...DEFAULT_FACTORS, labourRateCentsPerHour: 12_345 });
  expect(shown.capSpares).toBe(DEFAULT_FACTORS.capSpares);
  expect(shown.linerMinGapIn).toBe(DEFAULT_FACTORS.linerMinGapIn);
  for (const key of [
    "labourRateCentsPerHour",
    "profitPct",
    "profitBasis",
    "overheadPct",
    "salesTaxPct",
    "permitCents",
    "deliveryCents",
  ] as const) {
    expect(key in shown, key).toBe(false);
  }
  for (const key of Object.keys(shown))
    expect(["price", "extras"]).not.toContain(FACTOR_DESCRIPTORS[key as keyof CompanyFactors].group);
});

test("a breakdown stored before markup and margin were told apart reads as a markup on cost", () => {
  // The old engine: materials $522.00, labour 10 h $750.00, overhead $190.80, "margin" $292.56 (20 % on cost), total
  // $1,755.36.
  const old = {
    materialsCents: 52_200,
    labourHours: 10,
    labourCents: 75_000,
    overheadCents: 19_080,
    marginCents: 29_256,
    totalCents: 175_536,
    lowCents: 150_000,
    highCents: 200_000,
    lines: [],
  };
  const b = readBreakdown(old);
  expect([
    b.profitBasis,
    b.profitPct,
    b.markupPct,
    b.marginPct,
    b.labourCostRateCents,
    b.labourBilledRateCents,
  ]).toEqual(["markup", 20, 20, 16.67, 7500, 10_350]);
  expect(describeBreakdown(b).map((r) => [r.label, r.cents])).toEqual([
    ["Materials at cost", 52_200],
    ["Labour at cost: 10 h × $75.00/h", 75_000],
    ["Job cost", 127_200],
    ["Overhead (15 % of job cost)", 19_080],
    ["Cost", 146_280],
    ["Markup (20 % on cost)", 29_256],
    ["Price of the work", 175_536],
    ["Estimate", 175_536],
  ]);
  expect(describeBreakdown(b).find((r) => r.label.startsWith("Markup"))?.detail).toBe(
    "A margin of 16.67 % of the price",
  );
});

let company: Company;
let ownerCookie: string;

beforeAll(async () => {
  ({ company } = await demoCompany());
  ownerCookie = await loginAs(company.id, "owner");
});

const postFactors = (fields: Record<string, string>) =>
  factorsAction(
    routeArgs(
      requestWithCookie("/app/settings/factors", ownerCookie, {
        method: "POST",
        body: new URLSearchParams(fields),
        headers: { "Content-Type": "application/x-www-form-urlencoded" },
      }),
    ),
  ) as Promise<Response | { data: { errors: Record<string, string> }; init: { status: number } }>;

const reload = async () => (await db.select().from(companies).where(eq(companies.id, company.id)))[0]!;

async function planThroughApi() {
  const { catalog } = await demoCompany();
  const stone = catalog.find((i) => i.name === "Hearthline Taper")!;
  const cap = catalog.find((i) => i.name === "Sill Cap 16")!;
  const request = planRequestSchema.parse({
    company: company.slug,
    ring: { unitCount: 14 },
    wallUnit: { id: stone.id },
    courses: 3,
    cap: { id: cap.id, innerOverhangIn: 2 },
  });
  return runPlan(await resolvePlanRequest(request));
}

test("an owner's factors are stored per company and the plan API uses them at once; a reset restores the default", async () => {
  const loaded = (await factorsLoader(routeArgs(requestWithCookie("/app/settings/factors", ownerCookie)))) as {
    values: Record<string, string>;
  };
  // The demo company's own rate and profit, from its columns.
  expect(loaded.values.labourRateCentsPerHour).toBe("85.00");
  expect(loaded.values.profitPct).toBe("22");
  const before = await planThroughApi();
  expect(before.materials.find((m) => m.key === "cap")?.quantity).toBe(12 + DEFAULT_FACTORS.capSpares);

  const response = await postFactors({ ...loaded.values, capSpares: "3", profitBasis: "margin", permitCents: "90" });
  expect(response).toBeInstanceOf(Response);
  expect((response as Response).headers.get("Location")).toBe("/app/settings/factors?saved=1");
  const stored = await reload();
  // Only what differs from a default is stored, so a later change of a default reaches this company too.
  expect(JSON.parse(stored.factorsJson)).toEqual({ capSpares: 3, profitBasis: "margin", permitCents: 9000 });
  expect(stored.marginPct).toBe(22);

  const after = await planThroughApi();
  expect(after.materials.find((m) => m.key === "cap")?.quantity).toBe(15);
  expect(after.price?.breakdown.profitBasis).toBe("margin");
  expect(after.price?.breakdown.permitCents).toBe(9000);
  expect(after.price?.breakdown.marginPct).toBe(22);

  const reset = (await postFactors({
    ...loaded.values,
    capSpares: "3",
    profitBasis: "margin",
    permitCents: "90",
    reset: "capSpares",
  })) as Response;
  expect(reset.headers.get("Location")).toBe("/app/settings/factors?saved=capSpares");
  expect(JSON.parse((await reload()).factorsJson)).toEqual({ profitBasis: "margin", permitCents: 9000 });
  expect((await planThroughApi()).materials.find((m) => m.key === "cap")?.quantity).toBe(13);
});

test("bad input answers 400 with each error beside its field, and nothing is saved", async () => {
  const before = await reload();
  const loaded = (await factorsLoader(routeArgs(requestWithCookie("/app/settings/factors", ownerCookie)))) as {
    values: Record<string, string>;
  };
  const result = await postFactors({
    ...loaded.values,
    labourRateCentsPerHour: "99",
    baseDepthIn: "0.5",
    linerMinGapIn: "",
  });
  expect(result).not.toBeInstanceOf(Response);
  const { data, init } = result as { data: { errors: Record<string, string> }; init: { status: number } };
  expect(init.status).toBe(400);
  expect(data.errors).toEqual({
    baseDepthIn: "Base depth under the pit must be between 2 and 12 in (51–305 mm).", // 50.8 and 304.8 mm at 25.4 mm per inch (NIST SP 811)
    linerMinGapIn: "Enter the gap around a steel ring.",
  });
  const after = await reload();
  expect([after.labourRateCents, after.factorsJson]).toEqual([before.labourRateCents, before.factorsJson]);
});
