import type { Company } from "~/db/schema";
import { resolveFactors } from "~/domain/factors";
import { computePlan, type PlanInput } from "~/domain/plan";
import { createLead } from "~/lib/leads/leads.server";
import { STORED_PLAN_VERSION, type StoredPlanRecord } from "~/lib/design/stored-plan";

let n = 0;

/** A saved plan made from inline parts (no catalog): a 14-unit ring of 12/8/8 × 4 in units, three courses. */
export function createTestPlanRecord(): StoredPlanRecord {
  const input: PlanInput = {
    ring: { unitCount: 14 },
    wallUnit: { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4, name: "Hearthline Taper", priceCents: 900 },
    courses: 3,
    cap: null,
    liner: { kind: "none" },
    patio: null,
  };
  const choices = {
    stoneId: 1,
    unitCount: 14,
    fitToRing: false,
    courses: 3,
    capId: null,
    innerOverhangIn: 1,
    linerKind: "none",
    ringId: null,
    patioRadiusFt: 0,
    paverId: null,
    borderId: null,
    setbackFt: null,
    propertyLineFt: null,
    branchesFt: null,
    unit: "in",
  } as const;
  return {
    design: {
      version: STORED_PLAN_VERSION,
      choices,
      summary: [{ label: "Bowl", value: "36 9/16 in across inside" }],
      inputs: { engine: input, factors: resolveFactors(), supplyPrices: {} },
    },
    plan: computePlan(input),
  };
}

/** A minimal saved request for a company (no photos), as the configurator would save it. */
export async function createTestLead(company: Company, email = `lead${Date.now()}-${++n}@example.test`) {
  return createLead({
    company,
    form: {
      customerName: "Wren Castellano",
      email,
      phone: "555 010 1234",
      street: "3 Hollow Oak Way",
      town: "Millbrook Falls",
      buildWindow: "this-season",
      notes: "",
      consent: "on",
    },
    photos: [],
    origin: "http://localhost",
    snapshot: {
      record: createTestPlanRecord(),
      stoneName: "Hearthline Taper",
      bowlDiameterIn: 36.575,
      priceLowCents: 200000,
      priceHighCents: 250000,
      summary: [],
    },
  });
}
