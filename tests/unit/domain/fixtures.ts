import type { PlanInput, PlanOptions } from "~/domain/plan";

// Illustrative job used across the domain tests: a 12/8/8 tapered unit (4 in high), three courses
// of 14, 16 × 12 in cap blanks with a 2 in inner overhang, a 35 in steel ring. Prices are made up.
export const TYPICAL_PIT: PlanInput = {
  ring: { unitCount: 14 },
  wallUnit: { faceIn: 12, backIn: 8, depthIn: 8, heightIn: 4, priceCents: 650 },
  courses: 3,
  cap: { lengthIn: 16, depthIn: 12, thicknessIn: 2.5, innerOverhangIn: 2, priceCents: 2200 },
  liner: { kind: "steel-ring", outsideDiameterIn: 35, heightIn: 10, priceCents: 22000 },
};

export const SUPPLY_PRICES: NonNullable<PlanOptions["supplyPrices"]> = {
  aggregatePerTonCents: 4500,
  adhesivePerCartridgeCents: 900,
  beddingSandPerTonCents: 5000,
  jointSandPerBagCents: 3500,
};

export const PATIO: NonNullable<PlanInput["patio"]> = {
  outsideRadiusIn: 96,
  border: { widthIn: 6, lengthIn: 12, priceCents: 400 },
  paver: { lengthIn: 8, widthIn: 4, priceCents: 90 },
};
