import type { CatalogItem } from "~/db/schema";
import type { CompanyFactors } from "~/domain/factors";
import type { Plan } from "~/domain/plan";
import type { CatalogChoice, Design } from "~/lib/design";
import { designToPlanRequest } from "~/lib/design-plan";
import { formatPlanErrors, planRequestSchema, type PlanFieldError } from "~/lib/plan-schema";
import { PlanRequestError, resolvePlanRequest, runPlan } from "~/lib/plan.server";

/** A catalog item as the public configurator sees it: sizes and colours, never prices. */
export function toCatalogChoice(item: CatalogItem): CatalogChoice {
  const { id, kind, name, colourName, colourHex, faceIn, backIn, depthIn, heightIn, lengthIn, widthIn, thicknessIn, diameterIn } = item;
  return { id, kind, name, colourName, colourHex, faceIn, backIn, depthIn, heightIn, lengthIn, widthIn, thicknessIn, diameterIn };
}

/** The full plan for a design (cost breakdown included), through the same request path as POST /api/plan. */
export async function planForDesign(
  companySlug: string,
  design: Design,
  catalog: CatalogChoice[],
  factors?: Partial<CompanyFactors>,
): Promise<{ plan: Plan | null; errors: PlanFieldError[] }> {
  const parsed = planRequestSchema.safeParse(designToPlanRequest(design, companySlug, catalog, factors));
  if (!parsed.success) return { plan: null, errors: formatPlanErrors(parsed.error) };
  try {
    return { plan: runPlan(await resolvePlanRequest(parsed.data)), errors: [] };
  } catch (error) {
    if (error instanceof PlanRequestError) return { plan: null, errors: error.errors };
    throw error;
  }
}
