import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import {
  companies,
  jobBalances,
  jobExtras,
  jobHours,
  proposals,
  supplierOrderDrops,
  supplierOrders,
  type JobBalance,
  type Lead,
} from "~/db/schema";
import {
  contractOf,
  jobCost,
  monthlyReport,
  orderedMaterialCents,
  type JobCost,
  type MonthRow,
} from "~/domain/job-money";
import type { RoundedLine } from "~/domain/supplier-order";
import { readBreakdown } from "~/lib/design/price-breakdown";
import { readStoredPlan } from "~/lib/design/stored-plan";
import { formatMoney } from "~/lib/format/money";
import { zonedDay } from "~/lib/format/zoned-time";
import { db } from "~/lib/platform/db.server";

/*
 * What a job cost the company against what its signed plan said it would: labour at the plan's
 * labour cost rate (the company's rate as it stood when the job was priced), material as ordered
 * from suppliers (or the plan's own material when nothing went through a supplier order), and the
 * extras the crew bought on site. For owners only: the routes check the role.
 */

// Orders that went to the yard; drafts may still change, and discarded or combined ones hold no drops.
const ORDERED_STATES = ["sent", "confirmed", "delivered"] as const;

export type JobCostView = JobCost & {
  /** Where the material figure came from. */
  materialSource: "supplier orders" | "the plan";
  /** Ordered items the plan has no price for (counted at nothing). */
  unpriced: string[];
  labourCostRateCents: number;
};

/**
 * The job's cost, estimated and actual; null when the job has no signed proposal to measure against.
 * The revenue is the job's contract (the balance's parts once built, else the signed papers).
 */
export async function jobCostFor(lead: Pick<Lead, "id" | "companyId">): Promise<JobCostView | null> {
  const [signed] = await db
    .select()
    .from(proposals)
    .where(
      and(
        eq(proposals.leadId, lead.id),
        eq(proposals.companyId, lead.companyId),
        eq(proposals.kind, "proposal"),
        eq(proposals.status, "signed"),
      ),
    )
    .orderBy(desc(proposals.signedAt))
    .limit(1);
  if (!signed) return null;
  const [changes, [hours], [extras], drops, [balance], [company]] = await Promise.all([
    db
      .select()
      .from(proposals)
      .where(and(eq(proposals.parentId, signed.id), eq(proposals.kind, "change-order"), eq(proposals.status, "signed")))
      .orderBy(asc(proposals.signedAt)),
    db
      .select({ total: sql<number>`coalesce(sum(${jobHours.hours}), 0)` })
      .from(jobHours)
      .where(and(eq(jobHours.leadId, lead.id), eq(jobHours.companyId, lead.companyId))),
    db
      .select({ total: sql<number>`coalesce(sum(${jobExtras.costCents}), 0)` })
      .from(jobExtras)
      .where(and(eq(jobExtras.leadId, lead.id), eq(jobExtras.companyId, lead.companyId))),
    db
      .select({ linesJson: supplierOrderDrops.linesJson })
      .from(supplierOrderDrops)
      .innerJoin(supplierOrders, eq(supplierOrders.id, supplierOrderDrops.orderId))
      .where(
        and(
          eq(supplierOrderDrops.leadId, lead.id),
          eq(supplierOrderDrops.companyId, lead.companyId),
          inArray(supplierOrders.status, ORDERED_STATES),
        ),
      ),
    db
      .select()
      .from(jobBalances)
      .where(and(eq(jobBalances.leadId, lead.id), eq(jobBalances.companyId, lead.companyId))),
    db.select({ labourRateCents: companies.labourRateCents }).from(companies).where(eq(companies.id, lead.companyId)),
  ]);
  // The scope the job was built to: the latest signed change order's plan, or the proposal's.
  const plan = readStoredPlan(changes.at(-1) ?? signed).plan;
  const breakdown = plan.price ? readBreakdown(plan.price.breakdown) : null;
  const labourCostRateCents = breakdown?.labourCostRateCents || company!.labourRateCents;
  const prices = breakdown?.lines ?? [];
  const ordered = drops.length
    ? orderedMaterialCents(
        drops.flatMap((d) =>
          (JSON.parse(d.linesJson) as RoundedLine[]).map((l) => ({
            item: l.item,
            suppliedQuantity: l.suppliedQuantity,
          })),
        ),
        prices,
      )
    : null;
  const revenueCents = balance
    ? contractOf(balance)
    : changes.reduce((sum, c) => sum + c.priceCents, signed.totalCents ?? signed.priceCents);
  const cost = jobCost({
    plannedHours: plan.labour.hours,
    labourCostRateCents,
    plannedMaterialCents: breakdown?.materialsCents ?? 0,
    workedHours: Number(hours?.total ?? 0),
    orderedMaterialCents: ordered?.cents ?? null,
    extrasCents: Number(extras?.total ?? 0),
    revenueCents,
  });
  return {
    ...cost,
    materialSource: ordered ? "supplier orders" : "the plan",
    unpriced: ordered?.unpriced ?? [],
    labourCostRateCents,
  };
}

export type MonthlyJobReport = { rows: MonthRow[]; timeZone: string };

/**
 * Built jobs by the month they were built (the day the balance fell due, in the company's time
 * zone), with their revenue, gross profit and estimate accuracy. Oldest month first.
 */
export async function monthlyJobReport(companyId: number): Promise<MonthlyJobReport> {
  const [company] = await db
    .select({ timeZone: companies.timeZone })
    .from(companies)
    .where(eq(companies.id, companyId));
  const timeZone = company!.timeZone;
  const balances: JobBalance[] = await db
    .select()
    .from(jobBalances)
    .where(eq(jobBalances.companyId, companyId))
    .orderBy(asc(jobBalances.openedAt));
  const jobs = [];
  for (const balance of balances) {
    const cost = await jobCostFor({ id: balance.leadId, companyId });
    if (!cost) continue;
    jobs.push({
      month: zonedDay(new Date(balance.openedAt), timeZone).slice(0, 7),
      revenueCents: cost.revenueCents,
      estimatedCents: cost.estimated.totalCents,
      actualCents: cost.actual.totalCents,
    });
  }
  return { rows: monthlyReport(jobs), timeZone };
}

const hoursText = (h: number) => `${Math.round(h * 100) / 100} h`;

/** The job cost as the owner reads it on the lead page: every figure in words, and which way it went. */
export function describeJobCost(cost: JobCostView) {
  const money = (cents: number) => formatMoney(cents);
  const signed = (cents: number) => (cents > 0 ? `+${money(cents)}` : cents < 0 ? `−${money(-cents)}` : money(0));
  return {
    rate: `${money(cost.labourCostRateCents)} an hour`,
    rows: [
      {
        label: "Labour",
        estimated: `${money(cost.estimated.labourCents)} (${hoursText(cost.estimated.labourHours)})`,
        actual: `${money(cost.actual.labourCents)} (${hoursText(cost.actual.labourHours)})`,
        difference: signed(cost.actual.labourCents - cost.estimated.labourCents),
      },
      {
        label: "Material",
        estimated: money(cost.estimated.materialCents),
        actual: `${money(cost.actual.materialCents)} (${cost.materialSource === "supplier orders" ? "as ordered" : "the plan's, no supplier order"})`,
        difference: signed(cost.actual.materialCents - cost.estimated.materialCents),
      },
      {
        label: "Extras on site",
        estimated: money(0),
        actual: money(cost.actual.extrasCents),
        difference: signed(cost.actual.extrasCents),
      },
    ],
    estimated: money(cost.estimated.totalCents),
    actual: money(cost.actual.totalCents),
    difference: signed(cost.differenceCents),
    verdict:
      cost.differenceCents > 0
        ? `The job cost ${money(cost.differenceCents)} more than estimated.`
        : cost.differenceCents < 0
          ? `The job came in ${money(-cost.differenceCents)} under the estimate.`
          : "The job cost exactly what was estimated.",
    revenue: money(cost.revenueCents),
    grossProfit: cost.grossProfitCents >= 0 ? money(cost.grossProfitCents) : `−${money(-cost.grossProfitCents)}`,
    margin: cost.revenueCents > 0 ? `${((cost.grossProfitCents / cost.revenueCents) * 100).toFixed(1)} %` : null,
    accuracy: cost.accuracy === null ? null : `${(cost.accuracy * 100).toFixed(0)} %`,
    unpriced: cost.unpriced,
  };
}
