import { computePlan, PlanGeometryError, type Plan } from "~/domain/plan";
import { toPlanInput, type StoredPlan, type StoredPlanRecord } from "~/lib/design/stored-plan";

/*
 * A saved plan is shown and built from the engine run on the inputs saved with it: the parts,
 * factors and prices it was made with, never today's catalog. For a plan made by this engine that
 * is the stored plan again (tests/unit/stored-plans.test.ts checks it); a plan from an older engine
 * gains the figures the crew builds from today (lining height, bond layout, arcs between the cut
 * lines…) while its parts and prices stay as saved. When today's engine refuses the saved inputs,
 * the stored plan is shown as it is and said to be old.
 */

export type ShownPlan = { plan: Plan; isLegacy: false } | { plan: StoredPlan; isLegacy: true };

/** The plan of a saved record as today's engine makes it from the record's own inputs. */
export function refreshStoredPlan(record: StoredPlanRecord): ShownPlan {
  const { engine, factors, supplyPrices } = record.design.inputs;
  try {
    return { plan: computePlan(toPlanInput(engine), { factors, supplyPrices }), isLegacy: false };
  } catch (error) {
    if (error instanceof PlanGeometryError) return { plan: record.plan, isLegacy: true };
    throw error;
  }
}
