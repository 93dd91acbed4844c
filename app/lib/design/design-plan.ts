import { DEFAULT_FACTORS, type CompanyFactors } from "~/domain/factors";
import { computePlan, PlanGeometryError, type Plan, type PlanInput } from "~/domain/plan";
import { formatLength, inToMm, type LengthUnit } from "~/domain/units";
import type { CatalogChoice, Design } from "~/lib/design/design";
import { FALLBACK_COLOURS, pickColour, type PitSceneInput } from "~/domain/pit-layout";
import { toEnginePart } from "~/lib/catalog/catalog-parts";
import type { StoredPlan, StoredPlanInput } from "~/lib/design/stored-plan";

/*
 * Bridges a homeowner's design (catalog choices) and the engine: the /api/plan request it makes,
 * the same design as the engine's inline input (for the browser's instant redraw), the drawing's
 * input built from a plan and the parts it was made from, and the summary shown in e-mails and pages.
 */

export type PublicPlan = Omit<Plan, "price"> & { price: { lowCents: number; highCents: number } | null };

export type PlanRequestBody = Record<string, unknown>;

const byId = (catalog: CatalogChoice[], id: number | null) =>
  id === null ? undefined : catalog.find((i) => i.id === id);

/** The site distances the homeowner gave (ft), as the engine's `site`; absent when none were. */
function siteOf(design: Design): { site?: { setbackFt?: number; propertyLineFt?: number; branchesFt?: number } } {
  const site = {
    ...(design.setbackFt != null ? { setbackFt: design.setbackFt } : {}),
    ...(design.propertyLineFt != null ? { propertyLineFt: design.propertyLineFt } : {}),
    ...(design.branchesFt != null ? { branchesFt: design.branchesFt } : {}),
  };
  return Object.keys(site).length ? { site } : {};
}

/**
 * The catalog items a design uses and the ring it asks for: the one reading of a design that both
 * the plan request and the inline input are built from.
 */
function chooseDesignItems(design: Design, catalog: CatalogChoice[], factors?: Partial<CompanyFactors>) {
  const gapIn = factors?.linerMinGapIn ?? DEFAULT_FACTORS.linerMinGapIn;
  const ring = design.linerKind === "steel-ring" ? byId(catalog, design.ringId) : undefined;
  const steelRing = toEnginePart(ring, "steel-ring");
  // A design does not name its firebrick: the first one the company offers (in catalog order).
  const firebrick = design.linerKind === "firebrick" ? catalog.find((i) => i.kind === "firebrick") : undefined;
  const hasPatio = design.patioRadiusFt > 0;
  return {
    // Sized to the insert: the smallest whole-unit ring that clears it with the company's gravel gap.
    ringTarget:
      design.fitToRing && steelRing
        ? { bowlDiameterIn: steelRing.outsideDiameterIn + 2 * gapIn, fit: "at-least" as const }
        : { unitCount: design.unitCount },
    stone: byId(catalog, design.stoneId),
    cap: byId(catalog, design.capId),
    liner: steelRing ? ring : firebrick,
    border: hasPatio ? byId(catalog, design.borderId) : undefined,
    paver: hasPatio ? byId(catalog, design.paverId) : undefined,
  };
}

/** The JSON body for POST /api/plan: catalog references plus the company, so prices apply. */
export function designToPlanRequest(
  design: Design,
  companySlug: string,
  catalog: CatalogChoice[],
  factors?: Partial<CompanyFactors>,
): PlanRequestBody {
  const items = chooseDesignItems(design, catalog, factors);
  return {
    company: companySlug,
    ring: items.ringTarget,
    wallUnit: { id: design.stoneId },
    courses: design.courses,
    cap: design.capId === null ? null : { id: design.capId, innerOverhangIn: design.innerOverhangIn },
    liner: items.liner ? { id: items.liner.id } : { kind: "none" },
    patio:
      items.border && items.paver
        ? { outsideRadiusIn: design.patioRadiusFt * 12, border: { id: items.border.id }, paver: { id: items.paver.id } }
        : null,
    ...siteOf(design),
  };
}

/**
 * The same design as the engine's inline input, from the public catalog (sizes, no prices), so the
 * browser can redraw the geometry at once while the priced answer comes from the server.
 */
export function designToPlanInput(
  design: Design,
  catalog: CatalogChoice[],
  factors?: Partial<CompanyFactors>,
): PlanInput | null {
  const items = chooseDesignItems(design, catalog, factors);
  const wallUnit = toEnginePart(items.stone, "wall-unit");
  if (!wallUnit) return null;
  const cap = toEnginePart(items.cap, "cap");
  const liner = toEnginePart(items.liner, "steel-ring") ?? toEnginePart(items.liner, "firebrick");
  const border = toEnginePart(items.border, "border-unit");
  const paver = toEnginePart(items.paver, "paver");
  return {
    ring: items.ringTarget,
    wallUnit,
    courses: design.courses,
    cap: cap ? { ...cap, innerOverhangIn: design.innerOverhangIn } : null,
    liner: liner ?? { kind: "none" },
    patio: border && paver ? { outsideRadiusIn: design.patioRadiusFt * 12, border, paver } : null,
    ...siteOf(design),
  };
}

/**
 * The geometry of a design computed in the browser with the company's public factors (no prices); null when it cannot
 * be built.
 */
export function planLocally(
  design: Design,
  catalog: CatalogChoice[],
  factors?: Partial<CompanyFactors>,
): PublicPlan | null {
  const input = designToPlanInput(design, catalog, factors);
  if (!input) return null;
  try {
    return computePlan(input, { factors }) as PublicPlan;
  } catch (error) {
    if (error instanceof PlanGeometryError) return null;
    throw error;
  }
}

/** What the drawing reads of a plan: the engine's own numbers. */
export type DrawnPlan = Pick<StoredPlan, "ring" | "caps" | "liner" | "patio" | "base">;

/**
 * The preview's input: the parts' sizes and colours from the input the plan was made from (stored
 * with a saved plan), every placement from the plan itself. Never reads the catalog.
 */
export function planToSceneInput(plan: DrawnPlan, input: StoredPlanInput): PitSceneInput {
  const { wallUnit, cap } = input;
  const liner = plan.liner;
  const linerInput = input.liner;
  const patioInput = input.patio;
  const colour = (part: { colourHex?: string } | null | undefined, fallback: string) =>
    pickColour(part?.colourHex, fallback);
  return {
    wallUnit: {
      faceIn: wallUnit.faceIn,
      backIn: wallUnit.backIn,
      depthIn: wallUnit.depthIn,
      heightIn: wallUnit.heightIn,
      colourHex: colour(wallUnit, FALLBACK_COLOURS.wall),
    },
    ring: {
      unitCount: plan.ring.unitCount,
      courses: plan.ring.courses,
      edgeDistanceIn: plan.ring.edgeDistanceIn,
      runningBondDeg: plan.ring.runningBondDeg,
      closure: plan.ring.closure,
    },
    caps: plan.caps
      ? {
          count: plan.caps.count,
          innerWidthIn: plan.caps.innerWidthIn,
          outerWidthIn: plan.caps.outerWidthIn,
          innerEdgeDistanceIn: plan.caps.innerEdgeDistanceIn,
          outerEdgeDistanceIn: plan.caps.outerEdgeDistanceIn,
          thicknessIn: plan.caps.thicknessIn,
          colourHex: colour(cap, FALLBACK_COLOURS.cap),
        }
      : null,
    liner:
      liner?.kind === "steel-ring"
        ? { kind: "steel-ring", outsideDiameterIn: liner.outsideDiameterIn, heightIn: liner.heightIn }
        : liner?.kind === "firebrick" && liner.fits && linerInput?.kind === "firebrick"
          ? {
              kind: "firebrick",
              perRow: liner.bricksPerRow,
              rows: liner.rows,
              lengthIn: linerInput.lengthIn,
              widthIn: liner.rowHeightIn,
              heightIn: liner.thicknessIn,
            }
          : { kind: "none" },
    patio:
      plan.patio && patioInput
        ? {
            outsideRadiusIn: plan.patio.outsideRadiusIn,
            borderWidthIn: plan.patio.borderWidthIn,
            borderInnerEdgeDistanceIn: plan.patio.borderInnerEdgeDistanceIn,
            // Plans from before the engine closed the course with one or two pieces: one cut piece.
            borderWholeCount: plan.patio.borderWholeCount ?? plan.patio.borderUnitCount - 1,
            borderClosureCount: plan.patio.borderClosureCount ?? 1,
            borderUnitAngleDeg: plan.patio.borderUnitAngleDeg,
            borderUnitLengthIn: patioInput.border.lengthIn,
            lastBorderUnitLengthIn: plan.patio.lastBorderUnitLengthIn,
            borderColourHex: colour(patioInput.border, FALLBACK_COLOURS.border),
            fieldColourHex: colour(patioInput.paver, FALLBACK_COLOURS.field),
          }
        : null,
    basePadRadiusIn: plan.base.radiusIn,
  };
}

/** The preview of a design being edited: its parts from today's catalog, its placements from the plan. */
export function designToSceneInput(plan: DrawnPlan, design: Design, catalog: CatalogChoice[]): PitSceneInput | null {
  const input = designToPlanInput(design, catalog);
  return input ? planToSceneInput(plan, input) : null;
}

export type SummaryLine = { label: string; value: string };

/*
 * What a wall of this height (cap included) is good for. Common practice, no source: a chair seat
 * is about 18 in high and seat walls are built 18–20 in; a footrest for someone in a chair sits lower,
 * about 10–16 in; a wall above about 24 in is too tall to sit on and reads as a counter to lean on.
 */
export const SEAT_HEIGHTS_IN = {
  footrestFromIn: 10,
  lowSeatFromIn: 16,
  seatFromIn: 18,
  seatToIn: 20,
  tallFromIn: 24,
} as const;

/** Whether a wall (cap included, inches) suits looking, resting feet, sitting or leaning. */
export function describeSeat(wallHeightIn: number): string {
  const h = SEAT_HEIGHTS_IN;
  if (wallHeightIn < h.footrestFromIn) return "low: good for looking into the fire, too low to sit on or rest feet on";
  if (wallHeightIn < h.lowSeatFromIn) return "footrest height: good for resting feet on from a chair";
  if (wallHeightIn < h.seatFromIn) return "a low seat";
  if (wallHeightIn <= h.seatToIn) return "seat height: a comfortable seat";
  if (wallHeightIn <= h.tallFromIn) return "a high seat: a perch rather than a chair";
  return "too tall to sit on: a wall to lean on and set a drink on";
}

/** The design in a few plain lines (shown on pages and in e-mails). */
export function summarizeDesign(
  plan: PublicPlan,
  design: Design,
  catalog: CatalogChoice[],
  unit: LengthUnit = "in",
): SummaryLine[] {
  const f = (inches: number) => formatLength(inches, unit);
  const stone = byId(catalog, design.stoneId);
  const cap = byId(catalog, design.capId);
  const ring = byId(catalog, design.ringId);
  const lines: SummaryLine[] = [
    { label: "Wall stone", value: stone ? `${stone.name}${stone.colourName ? `, ${stone.colourName}` : ""}` : "—" },
    {
      label: "Bowl",
      value: `${f(plan.ring.bowlDiameterIn)} across inside, ${plan.ring.unitsPerCourse} units a course`,
    },
    { label: "Outside", value: `${f(plan.ring.outsideDiameterIn)} across` },
    {
      label: "Height",
      value: `${plan.ring.courses} courses, ${f(plan.ring.wallHeightIn)} with the cap (${describeSeat(plan.ring.wallHeightIn)})`,
    },
    {
      label: "Cap",
      value:
        plan.caps && cap
          ? `${cap.name}: ${plan.caps.count} caps, ${f(plan.caps.innerOverhangIn)} over the fire`
          : "No caps",
    },
    {
      label: "Liner",
      value:
        plan.liner?.kind === "steel-ring"
          ? `${ring?.name ?? "Steel ring"} (${f(plan.liner.outsideDiameterIn)} steel ring${plan.liner.bedDepthIn ? `, raised on a ${f(plan.liner.bedDepthIn)} gravel bed` : ""})`
          : plan.liner?.kind === "firebrick"
            ? plan.liner.fits
              ? `Firebrick, ${plan.liner.totalBricks} bricks on edge${plan.liner.ripHeightIn != null ? ", the top row cut to height" : ""}, ${f(plan.liner.fireboxDiameterIn)} across inside`
              : "Firebrick (does not fit this bowl)"
            : "None",
    },
  ];
  if (plan.patio) {
    const paver = byId(catalog, design.paverId);
    const border = byId(catalog, design.borderId);
    lines.push({
      label: "Patio",
      value: `${design.patioRadiusFt} ft radius, ${paver?.name ?? "pavers"} with a ${border?.name ?? "border"} edge`,
    });
  }
  const distances = [
    design.setbackFt != null ? `${design.setbackFt} ft to the nearest building` : null,
    design.propertyLineFt != null ? `${design.propertyLineFt} ft to the property line` : null,
    design.branchesFt != null ? `${design.branchesFt} ft to overhanging branches` : null,
  ].filter((d): d is string => d !== null);
  if (distances.length) lines.push({ label: "Site", value: distances.join(", ") });
  return lines;
}

/** The caption under the preview. */
export function describePreview(plan: Pick<StoredPlan, "ring" | "caps" | "patio">, unit: LengthUnit): string {
  const f = (inches: number) => formatLength(inches, unit);
  const parts = [
    `Bowl ${f(plan.ring.bowlDiameterIn)} across inside`,
    `${f(plan.ring.outsideDiameterIn)} outside`,
    `${f(plan.ring.wallHeightIn)} high`,
    `${plan.ring.unitsPerCourse} units in each of ${plan.ring.courses} courses`,
  ];
  if (plan.caps) parts.push(`${plan.caps.count} caps`);
  if (plan.patio) {
    const acrossIn = plan.patio.outsideRadiusIn * 2;
    // A patio reads better in feet than in inches.
    parts.push(
      `patio ${unit === "mm" ? `${(inToMm(acrossIn) / 1000).toFixed(2)} m` : `${Math.round((acrossIn / 12) * 10) / 10} ft`} across`,
    );
  }
  return parts.join(" · ");
}
