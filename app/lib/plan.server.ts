import type { CatalogItem, CatalogKind, Company } from "~/db/schema";
import type { CompanyFactors, SupplyPrices } from "~/domain/factors";
import { computePlan, PlanGeometryError, type CapInput, type LinerInput, type Plan, type PlanInput, type PatioInput, type WallUnitInput } from "~/domain/plan";
import { loadOfferedCatalog } from "~/lib/catalog.server";
import { readCompanyFactors } from "~/lib/factor-settings";
import { isCatalogRef, type PlanFieldError, type PlanRequest } from "~/lib/plan-schema";

/** The engine's factors for a company: its settings (columns and checked overrides) over the defaults. */
export function companyFactors(company: Company): Partial<CompanyFactors> {
  return readCompanyFactors(company);
}

/** Prices of the bulk supplies: the first offered item of each kind. */
export function supplyPricesFrom(catalog: CatalogItem[]): SupplyPrices {
  const first = (kind: CatalogKind) => catalog.find((i) => i.kind === kind)?.priceCents ?? null;
  return {
    aggregatePerTonCents: first("aggregate"),
    adhesivePerCartridgeCents: first("adhesive"),
    beddingSandPerTonCents: first("bedding-sand"),
    jointSandPerBagCents: first("joint-sand"),
    refractoryMortarPerPailCents: first("refractory-mortar"),
    fillPerBagCents: first("fill"),
    edgeRestraintPerPieceCents: first("edge-restraint"),
    edgeSpikeCents: first("edge-spike"),
  };
}

export class PlanRequestError extends Error {
  constructor(
    readonly status: 404 | 422,
    readonly errors: PlanFieldError[],
  ) {
    super(errors.map((e) => `${e.path}: ${e.message}`).join("; "));
  }
}

type Resolved = { input: PlanInput; factors?: Partial<CompanyFactors>; supplyPrices?: SupplyPrices; company: Company | null };

/**
 * Turns a validated request into the engine's input: catalog references become the company's own
 * sizes and prices (active items only, of the right kind). Unknown ids answer 422 naming the field.
 */
export async function resolvePlanRequest(request: PlanRequest): Promise<Resolved> {
  const offered = request.company ? await loadOfferedCatalog(request.company) : null;
  if (request.company && !offered) {
    throw new PlanRequestError(404, [{ path: "company", message: "No contractor has that address." }]);
  }
  const company = offered?.company ?? null;
  const catalog = offered?.catalog ?? [];
  const pick = (path: string, id: number, kinds: CatalogKind[]): CatalogItem => {
    const item = catalog.find((i) => i.id === id && kinds.includes(i.kind));
    if (!item) {
      throw new PlanRequestError(422, [
        { path: `${path}.id`, message: `This contractor offers no ${kinds.join(" or ").replace(/-/g, " ")} with id ${id}.` },
      ]);
    }
    return item;
  };
  const named = (item: CatalogItem) => ({ name: item.name, priceCents: item.priceCents });

  const wallUnit: WallUnitInput = isCatalogRef(request.wallUnit)
    ? (() => {
        const item = pick("wallUnit", request.wallUnit.id, ["wall-unit"]);
        return { faceIn: item.faceIn!, backIn: item.backIn!, depthIn: item.depthIn!, heightIn: item.heightIn!, ...named(item) };
      })()
    : request.wallUnit;

  let cap: CapInput | null = null;
  if (request.cap && isCatalogRef(request.cap)) {
    const item = pick("cap", request.cap.id, ["cap"]);
    cap = {
      lengthIn: item.lengthIn!,
      depthIn: item.depthIn!,
      thicknessIn: item.thicknessIn!,
      innerOverhangIn: request.cap.innerOverhangIn ?? 1,
      ...(request.cap.outerOverhangIn !== undefined ? { outerOverhangIn: request.cap.outerOverhangIn } : {}),
      ...named(item),
    };
  } else if (request.cap) {
    cap = request.cap;
  }

  let liner: LinerInput | undefined;
  if (request.liner && isCatalogRef(request.liner)) {
    const item = pick("liner", request.liner.id, ["steel-ring", "firebrick"]);
    liner =
      item.kind === "steel-ring"
        ? { kind: "steel-ring", outsideDiameterIn: item.diameterIn!, heightIn: item.heightIn!, ...named(item) }
        : { kind: "firebrick", lengthIn: item.lengthIn!, widthIn: item.widthIn!, heightIn: item.heightIn!, ...named(item) };
  } else {
    liner = request.liner;
  }

  let patio: PatioInput | null = null;
  if (request.patio) {
    const border = isCatalogRef(request.patio.border)
      ? (() => {
          const item = pick("patio.border", request.patio.border.id, ["border-unit"]);
          return { widthIn: item.widthIn!, lengthIn: item.lengthIn!, ...named(item) };
        })()
      : request.patio.border;
    const paver = isCatalogRef(request.patio.paver)
      ? (() => {
          const item = pick("patio.paver", request.patio.paver.id, ["paver"]);
          return { lengthIn: item.lengthIn!, widthIn: item.widthIn!, ...named(item) };
        })()
      : request.patio.paver;
    patio = { outsideRadiusIn: request.patio.outsideRadiusIn, border, paver };
  }

  const input: PlanInput = {
    ring: request.ring,
    wallUnit,
    courses: request.courses,
    cap,
    ...(request.jointIn !== undefined ? { jointIn: request.jointIn } : {}),
    ...(liner ? { liner } : {}),
    patio,
    ...(request.site ? { site: request.site } : {}),
  };
  return company
    ? { input, company, factors: companyFactors(company), supplyPrices: supplyPricesFrom(catalog) }
    : { input, company: null };
}

/** Runs the engine; impossible geometry becomes a 422 naming the field, in plain words. */
export function runPlan(resolved: Resolved): Plan {
  try {
    return computePlan(resolved.input, { factors: resolved.factors, supplyPrices: resolved.supplyPrices });
  } catch (error) {
    if (error instanceof PlanGeometryError) throw new PlanRequestError(422, [{ path: error.path, message: error.message }]);
    throw error;
  }
}

/** What anyone may see of a plan: the price range without the cost breakdown. */
export function publicPlan(plan: Plan) {
  return { ...plan, price: plan.price ? { lowCents: plan.price.lowCents, highCents: plan.price.highCents } : null };
}
