/**
 * Labour and price. Labour-hours come from the work itself (base area, units set, saw cuts, caps,
 * liner, patio area) times the company's rates; the price is materials plus labour, then overhead,
 * then margin, quoted as a range. Money is integer cents, rounded with Math.round at each step.
 */
import type { CapPlan } from "~/domain/caps";
import type { CompanyFactors } from "~/domain/factors";
import type { LinerPlan } from "~/domain/liner";
import type { PatioPlan } from "~/domain/patio";
import type { BaseEstimate, MaterialKey, MaterialLine, MaterialUnit } from "~/domain/quantities";
import type { RingPlan } from "~/domain/ring";

export type LabourTaskKey = "setup" | "base" | "first-course" | "courses" | "saw-cuts" | "caps" | "liner" | "patio";

export type LabourTask = { task: LabourTaskKey; label: string; hours: number };

export type LabourEstimate = { hours: number; tasks: LabourTask[]; sawCuts: number };

export type PriceLine = { item: string; quantity: number; unit: MaterialUnit; unitPriceCents: number; totalCents: number };

export type PriceBreakdown = {
  materialsCents: number;
  labourHours: number;
  labourCents: number;
  overheadCents: number;
  marginCents: number;
  totalCents: number;
  lowCents: number;
  highCents: number;
  lines: PriceLine[];
};

export type PriceEstimate = { lowCents: number; highCents: number; breakdown: PriceBreakdown };

/** Unit prices by material, integer cents; a missing or null price leaves the job unpriced. */
export type UnitPrices = Partial<Record<MaterialKey, number | null | undefined>>;

const roundHours = (hours: number) => Math.round(hours * 100) / 100;

/** Saw cuts the job needs: 2 per cap, 1 rip per ripped cap, 2 per closure unit, 2 per back-trimmed unit (whole cuts). */
export function countSawCuts(ring: RingPlan, caps: CapPlan | null): number {
  const capCuts = caps ? caps.count * (2 + (caps.ripToDepthIn !== null ? 1 : 0)) : 0;
  const closureCuts = ring.closure ? 2 * ring.closure.countPerCourse * ring.courses : 0;
  const trimCuts = ring.backTrimPerSideIn > 0 ? 2 * ring.unitCount * ring.courses : 0;
  return capCuts + closureCuts + trimCuts;
}

/** Labour-hours for a crew, by task (each task and the total rounded to 0.01 h). */
export function estimateLabour(args: {
  ring: RingPlan;
  caps: CapPlan | null;
  liner: LinerPlan | null;
  patio: PatioPlan | null;
  base: BaseEstimate;
  factors: CompanyFactors;
}): LabourEstimate {
  const { ring, caps, liner, patio, base, factors } = args;
  const sawCuts = countSawCuts(ring, caps);
  const tasks: LabourTask[] = [
    { task: "setup", label: "Layout, set-up and clean-up", hours: factors.setupHours },
    {
      task: "base",
      label: `Excavate and compact the base (${base.pitAreaFt2.toFixed(1)} ft²)`,
      hours: base.pitAreaFt2 * factors.basePrepHoursPerFt2,
    },
    {
      task: "first-course",
      label: `Set and level the first course (${ring.unitsPerCourse} units)`,
      hours: (ring.unitsPerCourse * factors.minutesPerFirstCourseUnit) / 60,
    },
  ];
  const upperUnits = ring.totalUnits - ring.unitsPerCourse;
  if (upperUnits > 0) {
    tasks.push({
      task: "courses",
      label: `Stack and glue the upper courses (${upperUnits} units)`,
      hours: (upperUnits * factors.minutesPerUnitSet) / 60,
    });
  }
  if (sawCuts > 0) {
    tasks.push({ task: "saw-cuts", label: `Wet-saw cuts (${sawCuts})`, hours: (sawCuts * factors.minutesPerSawCut) / 60 });
  }
  if (caps) {
    tasks.push({ task: "caps", label: `Glue and set the caps (${caps.count})`, hours: (caps.count * factors.minutesPerCapSet) / 60 });
  }
  if (liner?.kind === "steel-ring") {
    tasks.push({ task: "liner", label: "Set the steel ring and backfill", hours: factors.steelRingHours });
  } else if (liner?.kind === "firebrick" && liner.fits) {
    tasks.push({
      task: "liner",
      label: `Line the bowl with firebrick (${liner.totalBricks})`,
      hours: (liner.totalBricks * factors.minutesPerFirebrick) / 60,
    });
  }
  if (patio) {
    tasks.push({
      task: "patio",
      label: `Patio: base, bedding, border and field (${patio.pavedAreaFt2.toFixed(0)} ft²)`,
      hours: patio.pavedAreaFt2 * factors.patioHoursPerFt2,
    });
  }
  const rounded = tasks.map((t) => ({ ...t, hours: roundHours(t.hours) }));
  return { hours: roundHours(rounded.reduce((sum, t) => sum + t.hours, 0)), tasks: rounded, sawCuts };
}

/** Rounds a cents amount down (or up) to a multiple of `stepCents`; steps below 1 cent leave it whole. */
export function roundToStep(cents: number, stepCents: number, direction: "down" | "up"): number {
  const step = Math.max(1, Math.round(stepCents));
  return (direction === "down" ? Math.floor(cents / step) : Math.ceil(cents / step)) * step;
}

/** Prices the job in integer cents (Math.round per line and per step; range rounded out to the step); null when a price is missing. */
export function priceJob(args: {
  materials: MaterialLine[];
  unitPrices: UnitPrices;
  labourHours: number;
  factors: CompanyFactors;
}): PriceEstimate | null {
  const { materials, unitPrices, labourHours, factors } = args;
  const lines: PriceLine[] = [];
  for (const material of materials) {
    const unitPriceCents = unitPrices[material.key];
    if (typeof unitPriceCents !== "number" || !Number.isFinite(unitPriceCents)) return null;
    lines.push({
      item: material.item,
      quantity: material.quantity,
      unit: material.unit,
      unitPriceCents,
      totalCents: Math.round(material.quantity * unitPriceCents),
    });
  }
  const materialsCents = lines.reduce((sum, line) => sum + line.totalCents, 0);
  const labourCents = Math.round(labourHours * factors.labourRateCentsPerHour);
  const directCents = materialsCents + labourCents;
  const overheadCents = Math.round((directCents * factors.overheadPct) / 100);
  const marginCents = Math.round(((directCents + overheadCents) * factors.marginPct) / 100);
  const totalCents = directCents + overheadCents + marginCents;
  const lowCents = Math.max(
    0,
    roundToStep(Math.round(totalCents * (1 - factors.priceSpreadPct / 100)), factors.priceRoundCents, "down"),
  );
  const highCents = roundToStep(Math.round(totalCents * (1 + factors.priceSpreadPct / 100)), factors.priceRoundCents, "up");
  return {
    lowCents,
    highCents,
    breakdown: { materialsCents, labourHours, labourCents, overheadCents, marginCents, totalCents, lowCents, highCents, lines },
  };
}
