/**
 * A proposal's money, all in integer cents: the fixed price with its site allowances, the add-ons
 * the homeowner ticks, the deposit, and the job's totals once change orders are signed.
 */

export type AddOn = { key: string; label: string; cents: number };
export type DepositRule = { kind: "percent"; basisPoints: number } | { kind: "fixed"; cents: number };

/** The price before add-ons: the fixed price plus each allowance, cents. */
export function basePriceCents(fixedPriceCents: number, allowances: { cents: number }[]): number {
  return allowances.reduce((sum, a) => sum + a.cents, fixedPriceCents);
}

/** The add-ons chosen, in the proposal's order; keys that are not offered are refused. */
export function chooseAddOns(offered: AddOn[], chosenKeys: readonly string[]): AddOn[] {
  const unknown = chosenKeys.filter((k) => !offered.some((a) => a.key === k));
  if (unknown.length) throw new RangeError(`Not an add-on of this proposal: ${unknown.join(", ")}`);
  return offered.filter((a) => chosenKeys.includes(a.key));
}

/** The total the homeowner signs for: base price plus the chosen add-ons, cents. */
export function proposalTotalCents(baseCents: number, chosen: AddOn[]): number {
  return chosen.reduce((sum, a) => sum + a.cents, baseCents);
}

/**
 * The deposit on a total, cents: a percentage rounded half up to the cent (basis points, so 30 % is
 * 3000 and the arithmetic stays in integers), or a fixed amount; never more than the total.
 */
export function depositCents(rule: DepositRule, totalCents: number): number {
  const raw = rule.kind === "fixed" ? rule.cents : Math.floor((totalCents * rule.basisPoints + 5_000) / 10_000);
  return Math.max(0, Math.min(raw, totalCents));
}

/** A change order's difference: the new price of the work less the price it replaces (negative is a credit), cents. */
export function changeOrderDeltaCents(previousCents: number, revisedCents: number): number {
  return revisedCents - previousCents;
}

export type JobTotals = {
  /** The signed proposal's total plus every signed change order's difference. */
  contractCents: number;
  depositCents: number;
  /** Due on completion: contract less the deposit; negative means a credit owed to the homeowner. */
  balanceCents: number;
};

/** The job's totals: always the signed proposal plus the signed change orders, cents. */
export function jobTotals(
  signed: { totalCents: number; depositCents: number },
  signedChangeOrderDeltas: number[],
): JobTotals {
  const contractCents = signedChangeOrderDeltas.reduce((sum, d) => sum + d, signed.totalCents);
  return { contractCents, depositCents: signed.depositCents, balanceCents: contractCents - signed.depositCents };
}
