import type { PriceBreakdown } from "~/domain/pricing";
import { formatMoney } from "~/lib/format/money";

/**
 * A price breakdown as stored with a plan; plans saved before markup and margin were told apart carry `marginCents`.
 */
export type StoredBreakdown = Partial<PriceBreakdown> &
  Pick<
    PriceBreakdown,
    | "materialsCents"
    | "labourHours"
    | "labourCents"
    | "overheadCents"
    | "totalCents"
    | "lowCents"
    | "highCents"
    | "lines"
  > & {
    marginCents?: number;
  };

const percentOf = (part: number, whole: number) => (whole > 0 ? Math.round((part / whole) * 10_000) / 100 : 0);

/**
 * Reads a stored breakdown into today's shape. Older plans priced their "margin" as a markup on
 * (materials + labour + overhead) with the rate as a cost, and had no other lines; that is what they show.
 */
export function readBreakdown(stored: StoredBreakdown): PriceBreakdown {
  if (stored.profitBasis !== undefined && stored.costCents !== undefined) return stored as PriceBreakdown;
  const directCents = stored.materialsCents + stored.labourCents;
  const costCents = directCents + stored.overheadCents;
  const profitCents = stored.marginCents ?? stored.totalCents - costCents;
  const costRate = stored.labourHours > 0 ? stored.labourCents / stored.labourHours : 0;
  const factor = directCents > 0 ? stored.totalCents / directCents : 1;
  return {
    materialsCents: stored.materialsCents,
    materialsTaxCents: 0,
    labourHours: stored.labourHours,
    labourRateBasis: "cost",
    labourCostRateCents: Math.round(costRate),
    labourBilledRateCents: Math.round(costRate * factor),
    labourCents: stored.labourCents,
    siteCosts: [],
    directCents,
    overheadPct: percentOf(stored.overheadCents, directCents),
    overheadCents: stored.overheadCents,
    costCents,
    profitBasis: "markup",
    profitPct: percentOf(profitCents, costCents),
    profitCents,
    markupPct: percentOf(profitCents, costCents),
    marginPct: percentOf(profitCents, costCents + profitCents),
    workPriceCents: costCents + profitCents,
    permitCents: 0,
    salesTaxBasis: "materials",
    salesTaxPct: 0,
    salesTaxCents: 0,
    totalCents: stored.totalCents,
    lowCents: stored.lowCents,
    highCents: stored.highCents,
    lines: stored.lines,
  };
}

export type BreakdownRow = { label: string; detail?: string; cents: number; kind: "line" | "subtotal" | "total" };

const pct = (value: number) => `${Number(value.toFixed(2))} %`;
const rate = (cents: number) => `${formatMoney(cents)}/h`;

/** The breakdown as the office reads it, in the order the arithmetic runs, each figure named for what it is. */
export function describeBreakdown(b: PriceBreakdown): BreakdownRow[] {
  const rows: BreakdownRow[] = [{ label: "Materials at cost", cents: b.materialsCents, kind: "line" }];
  if (b.materialsTaxCents > 0) {
    rows.push({ label: `Sales tax on materials (${pct(b.salesTaxPct)})`, cents: b.materialsTaxCents, kind: "line" });
  }
  rows.push({
    label: `Labour at cost: ${b.labourHours} h × ${rate(b.labourCostRateCents)}`,
    detail:
      b.labourRateBasis === "billed"
        ? `Your billed rate, ${rate(b.labourBilledRateCents)}, less overhead and profit`
        : `Billed at ${rate(b.labourBilledRateCents)} once overhead and profit are added`,
    cents: b.labourCents,
    kind: "line",
  });
  for (const line of b.siteCosts) rows.push({ label: line.label, cents: line.cents, kind: "line" });
  rows.push({ label: "Job cost", cents: b.directCents, kind: "subtotal" });
  rows.push({ label: `Overhead (${pct(b.overheadPct)} of job cost)`, cents: b.overheadCents, kind: "line" });
  rows.push({ label: "Cost", cents: b.costCents, kind: "subtotal" });
  rows.push(
    b.profitBasis === "markup"
      ? {
          label: `Markup (${pct(b.profitPct)} on cost)`,
          detail: `A margin of ${pct(b.marginPct)} of the price`,
          cents: b.profitCents,
          kind: "line",
        }
      : {
          label: `Margin (${pct(b.profitPct)} of the price)`,
          detail: `A markup of ${pct(b.markupPct)} on cost`,
          cents: b.profitCents,
          kind: "line",
        },
  );
  rows.push({ label: "Price of the work", cents: b.workPriceCents, kind: "subtotal" });
  if (b.permitCents > 0) rows.push({ label: "Permit fees (at cost)", cents: b.permitCents, kind: "line" });
  if (b.salesTaxCents > 0)
    rows.push({ label: `Sales tax (${pct(b.salesTaxPct)} of the work)`, cents: b.salesTaxCents, kind: "line" });
  rows.push({ label: "Estimate", cents: b.totalCents, kind: "total" });
  return rows;
}
