import { DEFAULT_FACTORS, type CompanyFactors } from "~/domain/factors";
import { computePlan, PlanGeometryError, type Plan, type PlanInput } from "~/domain/plan";
import { formatLength, inToMm, type LengthUnit } from "~/domain/units";
import type { CatalogChoice, Design } from "~/lib/design";
import type { PitSceneInput } from "~/domain/pit-layout";

/*
 * Bridges a homeowner's design (catalog choices) and the engine: the /api/plan request it makes,
 * the 3D/plan preview input built from the plan, and the summary shown in e-mails and pages.
 */

export type PublicPlan = Omit<Plan, "price"> & { price: { lowCents: number; highCents: number } | null };

export type PlanRequestBody = Record<string, unknown>;

const byId = (catalog: CatalogChoice[], id: number | null) => (id === null ? undefined : catalog.find((i) => i.id === id));

/** The site distances the homeowner gave (ft), as the engine's `site`; absent when none were. */
function siteOf(design: Design): { site?: { setbackFt?: number; propertyLineFt?: number; branchesFt?: number } } {
  const site = {
    ...(design.setbackFt != null ? { setbackFt: design.setbackFt } : {}),
    ...(design.propertyLineFt != null ? { propertyLineFt: design.propertyLineFt } : {}),
    ...(design.branchesFt != null ? { branchesFt: design.branchesFt } : {}),
  };
  return Object.keys(site).length ? { site } : {};
}

/** The JSON body for POST /api/plan: catalog references plus the company, so prices apply. */
export function designToPlanRequest(design: Design, companySlug: string, catalog: CatalogChoice[], factors?: Partial<CompanyFactors>): PlanRequestBody {
  const gapIn = factors?.linerMinGapIn ?? DEFAULT_FACTORS.linerMinGapIn;
  const ring = byId(catalog, design.ringId);
  const firebrick = catalog.find((i) => i.kind === "firebrick");
  const useRing = design.linerKind === "steel-ring" && ring?.diameterIn;
  return {
    company: companySlug,
    // Sized to the insert: the smallest whole-unit ring that clears it with the usual gravel gap.
    ring:
      design.fitToRing && useRing
        ? { bowlDiameterIn: ring.diameterIn! + 2 * gapIn, fit: "at-least" }
        : { unitCount: design.unitCount },
    wallUnit: { id: design.stoneId },
    courses: design.courses,
    cap: design.capId === null ? null : { id: design.capId, innerOverhangIn: design.innerOverhangIn },
    liner:
      useRing ? { id: ring.id } : design.linerKind === "firebrick" && firebrick ? { id: firebrick.id } : { kind: "none" },
    patio:
      design.patioRadiusFt > 0 && design.paverId !== null && design.borderId !== null
        ? { outsideRadiusIn: design.patioRadiusFt * 12, border: { id: design.borderId }, paver: { id: design.paverId } }
        : null,
    ...siteOf(design),
  };
}

/**
 * The same design as the engine's inline input, from the public catalog (sizes, no prices), so the
 * browser can redraw the geometry at once while the priced answer comes from the server.
 */
export function designToPlanInput(design: Design, catalog: CatalogChoice[], factors?: Partial<CompanyFactors>): PlanInput | null {
  const gapIn = factors?.linerMinGapIn ?? DEFAULT_FACTORS.linerMinGapIn;
  const stone = byId(catalog, design.stoneId);
  if (!stone?.faceIn || !stone.backIn || !stone.depthIn || !stone.heightIn) return null;
  const cap = byId(catalog, design.capId);
  const ring = byId(catalog, design.ringId);
  const brick = catalog.find((i) => i.kind === "firebrick");
  const paver = byId(catalog, design.paverId);
  const border = byId(catalog, design.borderId);
  const useRing = design.linerKind === "steel-ring" && ring?.diameterIn && ring.heightIn;
  return {
    ring: design.fitToRing && useRing ? { bowlDiameterIn: ring.diameterIn! + 2 * gapIn, fit: "at-least" } : { unitCount: design.unitCount },
    wallUnit: { faceIn: stone.faceIn, backIn: stone.backIn, depthIn: stone.depthIn, heightIn: stone.heightIn, name: stone.name },
    courses: design.courses,
    cap: cap?.lengthIn && cap.depthIn && cap.thicknessIn ? { lengthIn: cap.lengthIn, depthIn: cap.depthIn, thicknessIn: cap.thicknessIn, innerOverhangIn: design.innerOverhangIn, name: cap.name } : null,
    liner: useRing
      ? { kind: "steel-ring", outsideDiameterIn: ring.diameterIn!, heightIn: ring.heightIn!, name: ring.name }
      : design.linerKind === "firebrick" && brick?.lengthIn && brick.widthIn && brick.heightIn
        ? { kind: "firebrick", lengthIn: brick.lengthIn, widthIn: brick.widthIn, heightIn: brick.heightIn, name: brick.name }
        : { kind: "none" },
    patio:
      design.patioRadiusFt > 0 && paver?.lengthIn && paver.widthIn && border?.lengthIn && border.widthIn
        ? { outsideRadiusIn: design.patioRadiusFt * 12, border: { widthIn: border.widthIn, lengthIn: border.lengthIn, name: border.name }, paver: { lengthIn: paver.lengthIn, widthIn: paver.widthIn, name: paver.name } }
        : null,
    ...siteOf(design),
  };
}

/** The geometry of a design computed in the browser with the company's public factors (no prices); null when it cannot be built. */
export function planLocally(design: Design, catalog: CatalogChoice[], factors?: Partial<CompanyFactors>): PublicPlan | null {
  const input = designToPlanInput(design, catalog, factors);
  if (!input) return null;
  try {
    return computePlan(input, { factors }) as PublicPlan;
  } catch (error) {
    if (error instanceof PlanGeometryError) return null;
    throw error;
  }
}

/** The preview's input: real unit sizes from the catalog, placements from the plan. */
export function planToSceneInput(plan: PublicPlan, design: Design, catalog: CatalogChoice[]): PitSceneInput {
  const stone = byId(catalog, design.stoneId);
  const cap = byId(catalog, design.capId);
  const brick = catalog.find((i) => i.kind === "firebrick");
  const paver = byId(catalog, design.paverId);
  const border = byId(catalog, design.borderId);
  const liner = plan.liner;
  return {
    wallUnit: {
      faceIn: stone?.faceIn ?? 12,
      backIn: stone?.backIn ?? 8,
      depthIn: stone?.depthIn ?? 8,
      heightIn: stone?.heightIn ?? 4,
      colourHex: stone?.colourHex ?? "#8a8178",
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
          colourHex: cap?.colourHex ?? "#6f655d",
        }
      : null,
    liner:
      liner?.kind === "steel-ring"
        ? { kind: "steel-ring", outsideDiameterIn: liner.outsideDiameterIn, heightIn: liner.heightIn }
        : liner?.kind === "firebrick" && liner.fits
          ? {
              kind: "firebrick",
              perRow: liner.bricksPerRow,
              rows: liner.rows,
              lengthIn: brick?.lengthIn ?? 9,
              widthIn: liner.rowHeightIn,
              heightIn: liner.thicknessIn,
            }
          : { kind: "none" },
    patio: plan.patio
      ? {
          outsideRadiusIn: plan.patio.outsideRadiusIn,
          borderWidthIn: plan.patio.borderWidthIn,
          borderCount: plan.patio.borderUnitCount,
          borderColourHex: border?.colourHex ?? "#4f4a46",
          fieldColourHex: paver?.colourHex ?? "#a07d63",
        }
      : null,
  };
}

export type SummaryLine = { label: string; value: string };

/** Whether a wall (cap included) makes a comfortable seat: 17–20 in (from memory). */
export function describeSeat(wallHeightIn: number): string {
  if (wallHeightIn < 12) return "low: good for looking into the fire, too low to sit on";
  if (wallHeightIn < 17) return "a low seat";
  if (wallHeightIn <= 20) return "a comfortable seat";
  return "above seat height: good for resting feet on";
}

/** The design in a few plain lines (shown on pages and in e-mails). */
export function summarizeDesign(plan: PublicPlan, design: Design, catalog: CatalogChoice[], unit: LengthUnit = "in"): SummaryLine[] {
  const f = (inches: number) => formatLength(inches, unit);
  const stone = byId(catalog, design.stoneId);
  const cap = byId(catalog, design.capId);
  const ring = byId(catalog, design.ringId);
  const lines: SummaryLine[] = [
    { label: "Wall stone", value: stone ? `${stone.name}${stone.colourName ? `, ${stone.colourName}` : ""}` : "—" },
    { label: "Bowl", value: `${f(plan.ring.bowlDiameterIn)} across inside, ${plan.ring.unitsPerCourse} units a course` },
    { label: "Outside", value: `${f(plan.ring.outsideDiameterIn)} across` },
    { label: "Height", value: `${plan.ring.courses} courses, ${f(plan.ring.wallHeightIn)} with the cap (${describeSeat(plan.ring.wallHeightIn)})` },
    {
      label: "Cap",
      value: plan.caps && cap ? `${cap.name}: ${plan.caps.count} caps, ${f(plan.caps.innerOverhangIn)} over the fire` : "No caps",
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
export function describePreview(plan: PublicPlan, unit: LengthUnit): string {
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
    parts.push(`patio ${unit === "mm" ? `${(inToMm(acrossIn) / 1000).toFixed(2)} m` : `${Math.round((acrossIn / 12) * 10) / 10} ft`} across`);
  }
  return parts.join(" · ");
}
