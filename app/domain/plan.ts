/**
 * computePlan: the whole estimate for one round fire pit, from the wall ring to the price. Pure
 * and synchronous; all lengths in inches, money in integer cents, the result JSON-serialisable.
 */
import { fireOpeningOf, listCautions, listWarnings, type Caution, type Warning } from "~/domain/advice";
import { planCaps, type CapBlank, type CapPlan } from "~/domain/caps";
import { resolveFactors, type CompanyFactors, type SupplyPrices } from "~/domain/factors";
import { planFirebrick, planSteelRing, type LinerPlan } from "~/domain/liner";
import { planPatio, type PatioPlan } from "~/domain/patio";
import { PlanGeometryError } from "~/domain/plan-geometry-error";
import { estimateLabour, type LabourEstimate } from "~/domain/labour";
import { priceJob, type PriceEstimate, type UnitPrices } from "~/domain/pricing";
import {
  SUNDRY_KEYS,
  estimateAdhesive,
  estimateBase,
  listMaterials,
  type AdhesiveEstimate,
  type BaseEstimate,
  type MaterialLine,
} from "~/domain/quantities";
import { findRingForBowl, planRing, type RingPlan, type RingTarget, type WallUnitSize } from "~/domain/ring";

export { PlanGeometryError };

/** Sanded joints between caps are about 3/16 in (common practice, no source). */
export const DEFAULT_JOINT_IN = 3 / 16;

type Priced = { priceCents?: number; name?: string };

export type WallUnitInput = WallUnitSize & Priced;
export type CapInput = CapBlank & Priced;
export type LinerInput =
  | { kind: "none" }
  | ({ kind: "steel-ring"; outsideDiameterIn: number; heightIn: number } & Priced)
  | ({ kind: "firebrick"; lengthIn: number; widthIn: number; heightIn: number } & Priced);
export type PatioInput = {
  outsideRadiusIn: number;
  border: { widthIn: number; lengthIn: number } & Priced;
  paver: { lengthIn: number; widthIn: number } & Priced;
};

export type PlanInput = {
  ring: RingTarget;
  wallUnit: WallUnitInput;
  courses: number;
  cap: CapInput | null;
  jointIn?: number;
  liner?: LinerInput;
  patio?: PatioInput | null;
  /** Distances from the fire, ft: nearest structure (setbackFt), property line, overhanging branches. */
  site?: { setbackFt?: number; propertyLineFt?: number; branchesFt?: number };
};

export type PlanOptions = { factors?: Partial<CompanyFactors>; supplyPrices?: SupplyPrices };

export type Plan = {
  ring: RingPlan;
  caps: CapPlan | null;
  liner: LinerPlan | null;
  patio: PatioPlan | null;
  base: BaseEstimate;
  adhesive: AdhesiveEstimate;
  materials: MaterialLine[];
  labour: LabourEstimate;
  price: PriceEstimate | null;
  /** Supplies on the order that the company has not priced: left out of the price (see SUNDRY_KEYS). */
  unpricedItems: string[];
  /** The fire's clear opening: inside the firebrick or ring, or the bowl, in. */
  fireOpeningIn: number;
  warnings: Warning[];
  cautions: Caution[];
};

/**
 * Computes the full plan (in, ft², yd³, integer cents; see each part for its rounding); throws PlanGeometryError when
 * it cannot be built.
 */
export function computePlan(input: PlanInput, options: PlanOptions = {}): Plan {
  const factors = resolveFactors(options.factors);
  const jointIn = input.jointIn ?? DEFAULT_JOINT_IN;
  const { wallUnit, cap } = input;
  const liner = input.liner ?? { kind: "none" };
  const patioInput = input.patio ?? null;

  const ring = planRing({
    target: input.ring,
    wallUnit,
    courses: input.courses,
    capThicknessIn: cap ? cap.thicknessIn : 0,
  });
  const caps = cap
    ? planCaps({
        edgeDistanceIn: ring.edgeDistanceIn,
        wallDepthIn: wallUnit.depthIn,
        cap,
        jointIn,
        spares: factors.capSpares,
        minMarkIn: factors.minMarkFromCornerIn,
        wallSides: ring.unitsPerCourse,
        wallOutsideCornerRadiusIn: ring.outsideCornerRadiusIn,
        // Back corners: where backs touch they sit on a/cos(π/N); a V-gap or trim leaves them nearer the middle line.
        wallBackCornerRadiusIn: ring.edgeDistanceIn / Math.cos(Math.PI / ring.unitsPerCourse),
        matchMaxExtraOffcutPct: factors.capMatchMaxExtraOffcutPct,
      })
    : null;

  // The liner stops at the top of the block, less a clearance under the caps so they bear on the block.
  const blockTopIn = ring.courses * wallUnit.heightIn;
  const linedHeightIn = Math.max(0, blockTopIn - (cap ? factors.linerTopClearanceIn : 0));
  let linerPlan: LinerPlan | null = null;
  if (liner.kind === "steel-ring") {
    for (const key of ["outsideDiameterIn", "heightIn"] as const) {
      if (!Number.isFinite(liner[key]) || liner[key] <= 0) {
        throw new PlanGeometryError(`liner.${key}`, "This size must be a length above 0 in.");
      }
    }
    linerPlan = planSteelRing({
      bowlDiameterIn: ring.bowlDiameterIn,
      insert: liner,
      minGapIn: factors.linerMinGapIn,
      linedHeightIn,
      wallSides: ring.unitsPerCourse,
      raiseOverIn: factors.steelRingRaiseOverIn,
    });
  } else if (liner.kind === "firebrick") {
    for (const key of ["lengthIn", "widthIn", "heightIn"] as const) {
      if (!Number.isFinite(liner[key]) || liner[key] <= 0) {
        throw new PlanGeometryError(`liner.${key}`, "This size must be a length above 0 in.");
      }
    }
    linerPlan = planFirebrick({
      bowlDiameterIn: ring.bowlDiameterIn,
      linedHeightIn,
      brick: liner,
      jointIn: factors.refractoryJointIn,
      minRipIn: factors.firebrickMinRipIn,
      wallSides: ring.unitsPerCourse,
    });
  }

  const patio = patioInput
    ? planPatio({
        patio: patioInput,
        pitOutsideEdgeDistanceIn: ring.edgeDistanceIn + wallUnit.depthIn,
        // Caps overhang above grade, so only the wall's own corners limit the border at grade.
        pitOutsideCornerRadiusIn: ring.outsideCornerRadiusIn,
        factors,
      })
    : null;

  const base = estimateBase({ ring, patio, factors });
  const adhesive = estimateAdhesive({ ring, wallUnit, hasCaps: caps !== null, factors });
  const linerName = liner.kind === "none" ? undefined : liner.name;
  const materials = listMaterials({
    ring,
    wallUnit,
    caps,
    capName: cap?.name,
    liner: linerPlan,
    linerName,
    patio,
    borderName: patioInput?.border.name,
    paverName: patioInput?.paver.name,
    base,
    adhesive,
    factors,
  });
  const labour = estimateLabour({ ring, wallUnit, caps, liner: linerPlan, patio, base, materials, factors });

  const supply = options.supplyPrices ?? {};
  const unitPrices: UnitPrices = {
    "wall-unit": wallUnit.priceCents,
    cap: cap?.priceCents,
    "steel-ring": liner.kind === "steel-ring" ? liner.priceCents : undefined,
    firebrick: liner.kind === "firebrick" ? liner.priceCents : undefined,
    paver: patioInput?.paver.priceCents,
    "border-unit": patioInput?.border.priceCents,
    aggregate: supply.aggregatePerTonCents,
    adhesive: supply.adhesivePerCartridgeCents,
    "bedding-sand": supply.beddingSandPerTonCents,
    "joint-sand": supply.jointSandPerBagCents,
    "refractory-mortar": supply.refractoryMortarPerPailCents,
    fill: supply.fillPerBagCents,
    "edge-restraint": supply.edgeRestraintPerPieceCents,
    "edge-spike": supply.edgeSpikeCents,
  };
  // Sundries a company has not priced yet are left out of the price and named, rather than
  // leaving the whole job unpriced; every other line must be priced.
  const isPriced = (m: MaterialLine) => typeof unitPrices[m.key] === "number" && Number.isFinite(unitPrices[m.key]);
  const unpricedItems = materials.filter((m) => SUNDRY_KEYS.includes(m.key) && !isPriced(m)).map((m) => m.item);
  const priceable = materials.filter((m) => !SUNDRY_KEYS.includes(m.key) || isPriced(m));
  const price = priceJob({ materials: priceable, unitPrices, labourHours: labour.hours, factors });

  const site = input.site ?? {};
  for (const [key, label] of [
    ["setbackFt", "setback"],
    ["propertyLineFt", "distance to the property line"],
    ["branchesFt", "distance to overhanging branches"],
  ] as const) {
    const value = site[key];
    if (value !== undefined && (!Number.isFinite(value) || value < 0)) {
      throw new PlanGeometryError(`site.${key}`, `The ${label} must be a distance of 0 ft or more.`);
    }
  }
  const warnings = listWarnings({
    ring,
    caps,
    liner: linerPlan,
    ringForLiner:
      linerPlan?.kind === "steel-ring" && !linerPlan.fits
        ? findRingForBowl(wallUnit, linerPlan.requiredBowlDiameterIn)
        : null,
    limits: { capMaxOuterOverhangIn: factors.capMaxOuterOverhangIn, minBondOffsetIn: factors.minBondOffsetIn },
  });
  const fireOpeningIn = fireOpeningOf(ring, linerPlan);
  const cautions = listCautions({
    linerKind: liner.kind,
    requiredSetbackFt: factors.requiredSetbackFt,
    site: { structureFt: site.setbackFt, propertyLineFt: site.propertyLineFt, branchesFt: site.branchesFt },
    limits: {
      requiredPropertyLineFt: factors.requiredPropertyLineFt,
      requiredBranchClearanceFt: factors.requiredBranchClearanceFt,
    },
    fireOpeningIn,
    weights: { wallUnitLb: labour.wallUnitLb, capBlankLb: labour.capBlankLb, lbPerFt3: factors.concreteLbPerFt3 },
    handheldCuts: caps !== null,
    patio,
  });

  return {
    ring,
    caps,
    liner: linerPlan,
    patio,
    base,
    adhesive,
    materials,
    labour,
    price,
    unpricedItems,
    fireOpeningIn,
    warnings,
    cautions,
  };
}
