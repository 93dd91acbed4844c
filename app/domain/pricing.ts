/**
 * Labour and price. Labour-hours come from the work itself (base area, units set, saw cuts, caps,
 * liner, patio area) times the company's rates; the price is the job's cost (materials, labour,
 * delivery, equipment, disposal), plus overhead, plus profit (a markup on cost or a margin of
 * price), plus permits at cost and sales tax, quoted as a range. Money is integer cents, rounded
 * to the nearest cent (Math.round: halves up) at each step shown in the breakdown.
 */
import type { CompanyFactors, LabourRateBasis, ProfitBasis, SalesTaxBasis } from "~/domain/factors";
import type { MaterialKey, MaterialLine, MaterialUnit } from "~/domain/quantities";

export type LabourTaskKey = "setup" | "base" | "first-course" | "courses" | "saw-cuts" | "caps" | "liner" | "patio";

export type LabourTask = { task: LabourTaskKey; label: string; hours: number };

export type LabourEstimate = { hours: number; tasks: LabourTask[]; sawCuts: number };

export type PriceLine = {
  item: string;
  quantity: number;
  unit: MaterialUnit;
  unitPriceCents: number;
  totalCents: number;
};

export type SiteCostKey = "delivery" | "equipment" | "disposal";

export type SiteCostLine = { key: SiteCostKey; label: string; cents: number };

/**
 * How the price was reached, every amount integer cents:
 * materials + materials tax + labour cost + site costs = job cost (directCents);
 * + overhead = cost; + profit = price of the work; + permits + sales tax on the price = total.
 */
export type PriceBreakdown = {
  materialsCents: number;
  /** Sales tax paid on the materials (salesTaxBasis "materials"), a job cost; 0 otherwise. */
  materialsTaxCents: number;
  labourHours: number;
  labourRateBasis: LabourRateBasis;
  /** What an hour of labour costs the company (entered, or worked back from a billed rate). */
  labourCostRateCents: number;
  /** What an hour of labour comes to in the price of the work, after overhead and profit. */
  labourBilledRateCents: number;
  /** Labour at cost: hours × cost rate. */
  labourCents: number;
  siteCosts: SiteCostLine[];
  directCents: number;
  overheadPct: number;
  overheadCents: number;
  costCents: number;
  profitBasis: ProfitBasis;
  /** The profit percentage as the company set it, on `profitBasis`. */
  profitPct: number;
  profitCents: number;
  /** The same profit both ways, to 0.01 %: profit ÷ cost and profit ÷ price of the work. */
  markupPct: number;
  marginPct: number;
  workPriceCents: number;
  permitCents: number;
  salesTaxBasis: SalesTaxBasis;
  salesTaxPct: number;
  /** Sales tax on the price of the work (salesTaxBasis "price"); 0 otherwise. */
  salesTaxCents: number;
  totalCents: number;
  lowCents: number;
  highCents: number;
  lines: PriceLine[];
};

export type PriceEstimate = { lowCents: number; highCents: number; breakdown: PriceBreakdown };

/** Unit prices by material, integer cents; a missing or null price leaves the job unpriced. */
export type UnitPrices = Partial<Record<MaterialKey, number | null | undefined>>;

/** Rounds a cents amount down (or up) to a multiple of `stepCents`; steps below 1 cent leave it whole. */
export function roundToStep(cents: number, stepCents: number, direction: "down" | "up"): number {
  const step = Math.max(1, Math.round(stepCents));
  return (direction === "down" ? Math.floor(cents / step) : Math.ceil(cents / step)) * step;
}

const SITE_COSTS: { key: SiteCostKey; label: string; factor: "deliveryCents" | "equipmentCents" | "disposalCents" }[] =
  [
    { key: "delivery", label: "Delivery", factor: "deliveryCents" },
    { key: "equipment", label: "Equipment hire", factor: "equipmentCents" },
    { key: "disposal", label: "Disposal", factor: "disposalCents" },
  ];

const toHundredths = (value: number) => Math.round(value * 100) / 100;

/**
 * How many times its cost one cent of job cost comes to in the price of the work: overhead, then
 * profit — (1 + o)(1 + p) for a markup on cost, (1 + o) / (1 − p) for a margin of price. Null when a
 * margin of 100 % or more leaves no price.
 */
export function priceFactor(factors: Pick<CompanyFactors, "overheadPct" | "profitPct" | "profitBasis">): number | null {
  const overhead = 1 + factors.overheadPct / 100;
  if (factors.profitBasis === "markup") return overhead * (1 + factors.profitPct / 100);
  if (factors.profitPct >= 100) return null;
  return overhead / (1 - factors.profitPct / 100);
}

/**
 * Prices the job in integer cents; null when a price is missing or a margin of 100 % or more is set.
 * Each amount is rounded to the cent (Math.round) where the breakdown shows it: every material line,
 * the materials' tax, labour, overhead, profit and the tax on the price; the range is rounded out to
 * the company's step (low down, high up).
 */
export function priceJob(args: {
  materials: MaterialLine[];
  unitPrices: UnitPrices;
  labourHours: number;
  factors: CompanyFactors;
}): PriceEstimate | null {
  const { materials, unitPrices, labourHours, factors } = args;
  const lines: PriceLine[] = [];
  for (const material of materials) {
    const unitPriceCents = unitPrices[material.key];
    if (typeof unitPriceCents !== "number" || !Number.isFinite(unitPriceCents)) return null;
    lines.push({
      item: material.item,
      quantity: material.quantity,
      unit: material.unit,
      unitPriceCents,
      totalCents: Math.round(material.quantity * unitPriceCents),
    });
  }
  const factor = priceFactor(factors);
  if (factor === null) return null;
  const taxOnMaterials = factors.salesTaxBasis === "materials";
  const materialsCents = lines.reduce((sum, line) => sum + line.totalCents, 0);
  const materialsTaxCents = taxOnMaterials ? Math.round((materialsCents * factors.salesTaxPct) / 100) : 0;

  // A billed rate is worked back to its cost so that labour comes to exactly the billed rate in the price.
  const enteredRate = factors.labourRateCentsPerHour;
  const billed = factors.labourRateBasis === "billed";
  const labourCostRate = billed ? enteredRate / factor : enteredRate;
  const labourCents = Math.round(labourHours * labourCostRate);

  const siteCosts: SiteCostLine[] = SITE_COSTS.filter((c) => factors[c.factor] > 0).map((c) => ({
    key: c.key,
    label: c.label,
    cents: Math.round(factors[c.factor]),
  }));
  const directCents = materialsCents + materialsTaxCents + labourCents + siteCosts.reduce((sum, c) => sum + c.cents, 0);
  const overheadCents = Math.round((directCents * factors.overheadPct) / 100);
  const costCents = directCents + overheadCents;
  const profitCents =
    factors.profitBasis === "markup"
      ? Math.round((costCents * factors.profitPct) / 100)
      : Math.round((costCents * factors.profitPct) / (100 - factors.profitPct));
  const workPriceCents = costCents + profitCents;
  const permitCents = Math.round(factors.permitCents);
  const salesTaxCents = taxOnMaterials ? 0 : Math.round((workPriceCents * factors.salesTaxPct) / 100);
  const totalCents = workPriceCents + permitCents + salesTaxCents;

  const lowCents = Math.max(
    0,
    roundToStep(Math.round(totalCents * (1 - factors.priceSpreadPct / 100)), factors.priceRoundCents, "down"),
  );
  const highCents = roundToStep(
    Math.round(totalCents * (1 + factors.priceSpreadPct / 100)),
    factors.priceRoundCents,
    "up",
  );
  return {
    lowCents,
    highCents,
    breakdown: {
      materialsCents,
      materialsTaxCents,
      labourHours,
      labourRateBasis: factors.labourRateBasis,
      labourCostRateCents: Math.round(labourCostRate),
      labourBilledRateCents: Math.round(billed ? enteredRate : enteredRate * factor),
      labourCents,
      siteCosts,
      directCents,
      overheadPct: factors.overheadPct,
      overheadCents,
      costCents,
      profitBasis: factors.profitBasis,
      profitPct: factors.profitPct,
      profitCents,
      markupPct: costCents > 0 ? toHundredths((profitCents / costCents) * 100) : 0,
      marginPct: workPriceCents > 0 ? toHundredths((profitCents / workPriceCents) * 100) : 0,
      workPriceCents,
      permitCents,
      salesTaxBasis: factors.salesTaxBasis,
      salesTaxPct: factors.salesTaxPct,
      salesTaxCents,
      totalCents,
      lowCents,
      highCents,
      lines,
    },
  };
}
