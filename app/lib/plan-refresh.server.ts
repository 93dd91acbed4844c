import type { Plan } from "~/domain/plan";
import { planForDesign } from "~/lib/configurator.server";
import type { CatalogChoice, Design } from "~/lib/design";

/*
 * Plans are stored with each lead and revision as the engine made them then. A plan from an older
 * engine lacks the figures the crew builds from today (lining height, bond layout, arcs between the
 * cut lines…), so the cut list and the lead page recompute it from the stored design choices with
 * the company's current catalog and factors. The quoted price stays on the lead as sent. When that
 * is no longer possible (a catalog item is gone) the stored plan is kept and said to be old.
 */

/** True when the plan carries every figure of the current engine. */
export function isCurrentPlan(plan: Plan): boolean {
  return typeof (plan as Partial<Plan>).fireOpeningIn === "number";
}

/** The stored plan, or the same design recomputed by today's engine when the stored one is older. */
export async function refreshStoredPlan(
  plan: Plan,
  design: Design,
  companySlug: string,
  catalog: CatalogChoice[],
): Promise<{ plan: Plan; isLegacy: boolean }> {
  if (isCurrentPlan(plan)) return { plan, isLegacy: false };
  const fresh = await planForDesign(companySlug, design, catalog);
  return fresh.plan ? { plan: fresh.plan, isLegacy: false } : { plan, isLegacy: true };
}
