/**
 * A finished job's money, all integer cents: the balance due on completion, what the job cost against
 * what the plan said it would, and the month-by-month sums the owner reads. Hours are decimal hours.
 */

export type BalanceParts = {
  /** The signed proposal's fixed price with its allowances, before add-ons. */
  proposalPriceCents: number;
  /** The add-ons the homeowner chose when signing. */
  addOnsCents: number;
  /** The signed change orders' differences, summed (negative is a credit). */
  changeOrdersCents: number;
  /** The deposit paid. */
  depositCents: number;
};

export type Balance = BalanceParts & {
  /** Proposal total + change orders: what the whole job comes to. */
  contractCents: number;
  /** Contract − deposit: due on completion; negative is a credit owed to the homeowner. */
  amountCents: number;
};

function assertCents(name: string, value: number): void {
  if (!Number.isSafeInteger(value)) throw new RangeError(`${name} must be whole cents, got ${value}`);
}

/**
 * The balance due when the job is built: the signed proposal's total (price + chosen add-ons) plus
 * every signed change order, less the deposit paid.
 */
export function balanceDue(args: {
  proposalPriceCents: number;
  proposalTotalCents: number;
  changeOrderDeltasCents: readonly number[];
  depositPaidCents: number;
}): Balance {
  assertCents("proposal price", args.proposalPriceCents);
  assertCents("proposal total", args.proposalTotalCents);
  assertCents("deposit", args.depositPaidCents);
  args.changeOrderDeltasCents.forEach((d) => assertCents("change order", d));
  if (args.proposalTotalCents < args.proposalPriceCents)
    throw new RangeError("the proposal's total cannot be less than its price before add-ons");
  if (args.depositPaidCents < 0) throw new RangeError("a deposit cannot be negative");
  const changeOrdersCents = args.changeOrderDeltasCents.reduce((sum, d) => sum + d, 0);
  const contractCents = args.proposalTotalCents + changeOrdersCents;
  return {
    proposalPriceCents: args.proposalPriceCents,
    addOnsCents: args.proposalTotalCents - args.proposalPriceCents,
    changeOrdersCents,
    depositCents: args.depositPaidCents,
    contractCents,
    amountCents: contractCents - args.depositPaidCents,
  };
}

/** A stored balance's contract total from its parts. */
export function contractOf(parts: BalanceParts): number {
  return parts.proposalPriceCents + parts.addOnsCents + parts.changeOrdersCents;
}

export type PricedLine = { item: string; unitPriceCents: number };
export type OrderedLine = { item: string; suppliedQuantity: number };

/**
 * Material as ordered: each ordered line's quantity as it arrives (in the plan's unit) at the plan's
 * unit price for the same item. Lines the plan has no price for are named, and count nothing.
 */
export function orderedMaterialCents(
  ordered: readonly OrderedLine[],
  prices: readonly PricedLine[],
): { cents: number; unpriced: string[] } {
  let cents = 0;
  const unpriced: string[] = [];
  for (const line of ordered) {
    const price = prices.find((p) => p.item === line.item);
    if (!price) {
      unpriced.push(line.item);
      continue;
    }
    cents += Math.round(line.suppliedQuantity * price.unitPriceCents);
  }
  return { cents, unpriced };
}

export type CostSide = {
  labourHours: number;
  labourCents: number;
  materialCents: number;
  extrasCents: number;
  totalCents: number;
};

export type JobCost = {
  estimated: CostSide;
  actual: CostSide;
  /** Actual − estimated: positive means the job cost more than planned. */
  differenceCents: number;
  revenueCents: number;
  /** Revenue − actual cost. */
  grossProfitCents: number;
  /** Actual ÷ estimated cost (1 is on the estimate); null when nothing was estimated. */
  accuracy: number | null;
};

/**
 * What a job was expected to cost (the plan's labour hours at the labour cost rate, plus the plan's
 * material) against what it did cost (the hours worked at the same rate, the material as ordered,
 * and the extras bought on site), and the gross profit on the job's revenue.
 */
export function jobCost(args: {
  plannedHours: number;
  labourCostRateCents: number;
  plannedMaterialCents: number;
  workedHours: number;
  /** Material as ordered from suppliers; null when nothing was ordered through them (the plan's material counts). */
  orderedMaterialCents: number | null;
  extrasCents: number;
  revenueCents: number;
}): JobCost {
  for (const [name, value] of [
    ["planned hours", args.plannedHours],
    ["worked hours", args.workedHours],
  ] as const)
    if (!Number.isFinite(value) || value < 0) throw new RangeError(`${name} must be 0 or more, got ${value}`);
  assertCents("labour cost rate", args.labourCostRateCents);
  assertCents("planned material", args.plannedMaterialCents);
  assertCents("extras", args.extrasCents);
  assertCents("revenue", args.revenueCents);
  const side = (hours: number, materialCents: number, extrasCents: number): CostSide => {
    const labourCents = Math.round(hours * args.labourCostRateCents);
    return {
      labourHours: hours,
      labourCents,
      materialCents,
      extrasCents,
      totalCents: labourCents + materialCents + extrasCents,
    };
  };
  const estimated = side(args.plannedHours, args.plannedMaterialCents, 0);
  const actual = side(args.workedHours, args.orderedMaterialCents ?? args.plannedMaterialCents, args.extrasCents);
  return {
    estimated,
    actual,
    differenceCents: actual.totalCents - estimated.totalCents,
    revenueCents: args.revenueCents,
    grossProfitCents: args.revenueCents - actual.totalCents,
    accuracy: estimated.totalCents > 0 ? actual.totalCents / estimated.totalCents : null,
  };
}

export type MonthJob = { month: string; revenueCents: number; estimatedCents: number; actualCents: number };

export type MonthRow = {
  /** "YYYY-MM". */
  month: string;
  jobsBuilt: number;
  revenueCents: number;
  estimatedCents: number;
  actualCents: number;
  grossProfitCents: number;
  /** Σ actual ÷ Σ estimated cost of the month's jobs; null when nothing was estimated. */
  accuracy: number | null;
};

/**
 * Sums built jobs by the month they were built, oldest month first. Accuracy is the month's total
 * actual cost over its total estimated cost (a ratio of sums, so a large job weighs more than a small one).
 */
export function monthlyReport(jobs: readonly MonthJob[]): MonthRow[] {
  const byMonth = new Map<string, MonthRow>();
  for (const job of jobs) {
    if (!/^\d{4}-(0[1-9]|1[0-2])$/.test(job.month)) throw new RangeError(`not a month: ${job.month}`);
    const row = byMonth.get(job.month) ?? {
      month: job.month,
      jobsBuilt: 0,
      revenueCents: 0,
      estimatedCents: 0,
      actualCents: 0,
      grossProfitCents: 0,
      accuracy: null,
    };
    row.jobsBuilt += 1;
    row.revenueCents += job.revenueCents;
    row.estimatedCents += job.estimatedCents;
    row.actualCents += job.actualCents;
    row.grossProfitCents += job.revenueCents - job.actualCents;
    byMonth.set(job.month, row);
  }
  return [...byMonth.values()]
    .map((row) => ({ ...row, accuracy: row.estimatedCents > 0 ? row.actualCents / row.estimatedCents : null }))
    .sort((a, b) => a.month.localeCompare(b.month));
}
