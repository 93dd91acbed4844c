import type { CatalogItem, CatalogKind, Company } from "~/db/schema";
import type { CompanyFactors, SupplyPrices } from "~/domain/factors";
import {
  computePlan,
  PlanGeometryError,
  type CapInput,
  type LinerInput,
  type Plan,
  type PlanInput,
  type PatioInput,
  type WallUnitInput,
} from "~/domain/plan";
import { loadOfferedCatalog } from "~/lib/catalog/catalog.server";
import { readCompanyFactors } from "~/lib/settings/factor-settings";
import { toEnginePart, type PartByKind, type PartKind } from "~/lib/catalog/catalog-parts";
import { isCatalogRef, type PlanFieldError, type PlanRequest } from "~/lib/design/plan-schema";

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

export type Resolved = {
  input: PlanInput;
  factors?: Partial<CompanyFactors>;
  supplyPrices?: SupplyPrices;
  company: Company | null;
};

/**
 * Turns a validated request into the engine's input: catalog references become the company's own
 * parts (sizes, names, prices and colours; active items only, of the right kind), through the one
 * mapping in catalog-parts.ts. Unknown ids answer 422 naming the field.
 */
export async function resolvePlanRequest(request: PlanRequest): Promise<Resolved> {
  const offered = request.company ? await loadOfferedCatalog(request.company) : null;
  if (request.company && !offered) {
    throw new PlanRequestError(404, [{ path: "company", message: "No contractor has that address." }]);
  }
  const company = offered?.company ?? null;
  const catalog = offered?.catalog ?? [];
  function pick<K extends PartKind>(path: string, id: number, kinds: K[]): PartByKind[K] {
    const item = catalog.find((i) => i.id === id && kinds.some((kind) => kind === i.kind));
    const kind = kinds.find((k) => k === item?.kind);
    const part = kind ? toEnginePart(item, kind) : null;
    if (!part) {
      throw new PlanRequestError(422, [
        {
          path: `${path}.id`,
          message: `This contractor offers no ${kinds.join(" or ").replace(/-/g, " ")} with id ${id}.`,
        },
      ]);
    }
    return part;
  }

  const wallUnit: WallUnitInput = isCatalogRef(request.wallUnit)
    ? pick("wallUnit", request.wallUnit.id, ["wall-unit"])
    : request.wallUnit;

  let cap: CapInput | null = null;
  if (request.cap && isCatalogRef(request.cap)) {
    cap = {
      ...pick("cap", request.cap.id, ["cap"]),
      innerOverhangIn: request.cap.innerOverhangIn ?? 1,
      ...(request.cap.outerOverhangIn !== undefined ? { outerOverhangIn: request.cap.outerOverhangIn } : {}),
    };
  } else if (request.cap) {
    cap = request.cap;
  }

  const liner: LinerInput | undefined =
    request.liner && isCatalogRef(request.liner)
      ? pick("liner", request.liner.id, ["steel-ring", "firebrick"])
      : request.liner;

  let patio: PatioInput | null = null;
  if (request.patio) {
    const { border, paver } = request.patio;
    patio = {
      outsideRadiusIn: request.patio.outsideRadiusIn,
      border: isCatalogRef(border) ? pick("patio.border", border.id, ["border-unit"]) : border,
      paver: isCatalogRef(paver) ? pick("patio.paver", paver.id, ["paver"]) : paver,
    };
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
    if (error instanceof PlanGeometryError)
      throw new PlanRequestError(422, [{ path: error.path, message: error.message }]);
    throw error;
  }
}

/** What anyone may see of a plan: the price range without the cost breakdown. */
export function publicPlan(plan: Plan) {
  return { ...plan, price: plan.price ? { lowCents: plan.price.lowCents, highCents: plan.price.highCents } : null };
}
