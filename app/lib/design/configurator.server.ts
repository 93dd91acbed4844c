import type { CatalogItem } from "~/db/schema";
import { resolveFactors, type CompanyFactors } from "~/domain/factors";
import type { Plan } from "~/domain/plan";
import { pickSizes } from "~/lib/catalog/catalog-kinds";
import type { CatalogChoice, Design } from "~/lib/design/design";
import { designToPlanRequest, type SummaryLine } from "~/lib/design/design-plan";
import { formatPlanErrors, planRequestSchema, type PlanFieldError } from "~/lib/design/plan-schema";
import { PlanRequestError, resolvePlanRequest, runPlan, type Resolved } from "~/lib/design/plan.server";
import { STORED_PLAN_VERSION, type StoredPlanRecord } from "~/lib/design/stored-plan";

/** A catalog item as the public configurator sees it: sizes and colours, never prices. */
export function toCatalogChoice(item: CatalogItem): CatalogChoice {
  const { id, kind, name, colourName, colourHex } = item;
  return { id, kind, name, colourName, colourHex, ...pickSizes(item) };
}

export type DesignPlan =
  { plan: Plan; resolved: Resolved; errors: [] } | { plan: null; resolved: null; errors: PlanFieldError[] };

/** The full plan for a design (cost breakdown included), through the same request path as POST /api/plan. */
export async function planForDesign(
  companySlug: string,
  design: Design,
  catalog: CatalogChoice[],
  factors?: Partial<CompanyFactors>,
): Promise<DesignPlan> {
  const parsed = planRequestSchema.safeParse(designToPlanRequest(design, companySlug, catalog, factors));
  if (!parsed.success) return { plan: null, resolved: null, errors: formatPlanErrors(parsed.error) };
  try {
    const resolved = await resolvePlanRequest(parsed.data);
    return { plan: runPlan(resolved), resolved, errors: [] };
  } catch (error) {
    if (error instanceof PlanRequestError) return { plan: null, resolved: null, errors: error.errors };
    throw error;
  }
}

/**
 * The record saved with a request or a revision: the design, the parts and prices the plan was made from, and the plan.
 */
export function recordPlan(args: {
  design: Design;
  summary: SummaryLine[];
  resolved: Resolved;
  plan: Plan;
}): StoredPlanRecord {
  const { design, summary, resolved, plan } = args;
  return {
    design: {
      version: STORED_PLAN_VERSION,
      choices: design,
      summary,
      inputs: {
        engine: resolved.input,
        factors: resolveFactors(resolved.factors),
        supplyPrices: { ...resolved.supplyPrices },
      },
    },
    plan,
  };
}
