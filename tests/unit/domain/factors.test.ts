import { expect, test } from "vitest";
import { DEFAULT_FACTORS, FACTOR_CHOICES, resolveFactors, type CompanyFactors } from "~/domain/factors";

test("a company's numbers override the defaults one by one; the rest stay as they are", () => {
  const factors = resolveFactors({ capSpares: 3, baseDepthIn: 8 });
  expect(factors).toEqual({ ...DEFAULT_FACTORS, capSpares: 3, baseDepthIn: 8 });
  expect(resolveFactors()).toEqual(DEFAULT_FACTORS);
  expect(resolveFactors()).not.toBe(DEFAULT_FACTORS);
  // A zero is a real setting (no spares), not a missing one.
  expect(resolveFactors({ capSpares: 0 }).capSpares).toBe(0);
});

test("numbers that are not finite numbers are ignored, never passed to the engine", () => {
  const junk = {
    capSpares: Number.NaN,
    baseDepthIn: Number.POSITIVE_INFINITY,
    gluedCourses: "2",
    overheadPct: null,
  } as unknown as Partial<CompanyFactors>;
  expect(resolveFactors(junk)).toEqual(DEFAULT_FACTORS);
});

test("the pricing choices take only their listed words; anything else keeps the default", () => {
  expect(FACTOR_CHOICES).toEqual({
    labourRateBasis: ["cost", "billed"],
    profitBasis: ["markup", "margin"],
    salesTaxBasis: ["materials", "price"],
  });
  const chosen = resolveFactors({ labourRateBasis: "billed", profitBasis: "margin", salesTaxBasis: "price" });
  expect([chosen.labourRateBasis, chosen.profitBasis, chosen.salesTaxBasis]).toEqual(["billed", "margin", "price"]);
  const back = resolveFactors({ labourRateBasis: "cost", profitBasis: "markup", salesTaxBasis: "materials" });
  expect([back.labourRateBasis, back.profitBasis, back.salesTaxBasis]).toEqual(["cost", "markup", "materials"]);
  const wrong = resolveFactors({
    labourRateBasis: "hourly",
    profitBasis: 1,
    salesTaxBasis: "",
  } as unknown as Partial<CompanyFactors>);
  expect([wrong.labourRateBasis, wrong.profitBasis, wrong.salesTaxBasis]).toEqual(["cost", "markup", "materials"]);
  // A word is no number: a numeric factor given a choice's word stays at its default.
  expect(resolveFactors({ capSpares: "margin" } as unknown as Partial<CompanyFactors>).capSpares).toBe(
    DEFAULT_FACTORS.capSpares,
  );
});

test("the defaults price as the engine always has: a cost rate with overhead and a markup on cost, untaxed, no extra lines", () => {
  expect(DEFAULT_FACTORS).toMatchObject({
    labourRateBasis: "cost",
    profitBasis: "markup",
    salesTaxBasis: "materials",
    salesTaxPct: 0,
    deliveryCents: 0,
    equipmentCents: 0,
    disposalCents: 0,
    permitCents: 0,
  });
  // International Fire Code §307.4.2: 25 ft from structures for recreational fires.
  expect(DEFAULT_FACTORS.requiredSetbackFt).toBe(25);
});
