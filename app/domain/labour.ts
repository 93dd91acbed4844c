/**
 * Labour: the crew's hours, task by task, from the work itself (areas, pieces set, saw cuts, weights
 * carried, soil hauled) times the company's production rates (factors.ts). Each task and the total
 * are rounded to 0.01 h, never floored.
 *
 * Saw time (derived here from the factors): each cut takes a handling time per pass plus its cut
 * face (length × depth through the piece) divided by the rate the saw clears stone. A piece deeper
 * than the saw's single-pass depth (about 5 in for a 14 in blade, from memory) is cut from both
 * sides: two passes, the same cut face.
 */
import type { CapPlan } from "~/domain/caps";
import { formatNumber } from "~/domain/number-text";
import type { CompanyFactors } from "~/domain/factors";
import type { LinerPlan } from "~/domain/liner";
import type { PatioPlan } from "~/domain/patio";
import { weighConcrete, type BaseEstimate, type MaterialLine } from "~/domain/quantities";
import type { RingPlan, WallUnitSize } from "~/domain/ring";

export type LabourTaskKey =
  | "setup"
  | "base"
  | "spoil"
  | "carry"
  | "first-course"
  | "courses"
  | "saw-cuts"
  | "mark-caps"
  | "caps"
  | "liner"
  | "patio";

export type LabourTask = { task: LabourTaskKey; label: string; hours: number };

/** One kind of saw cut: how many, how long and how deep each is, and the passes it takes. */
export type SawCutGroup = {
  what: string;
  count: number;
  lengthIn: number;
  depthIn: number;
  passes: number;
  minutesEach: number;
};

export type LabourEstimate = {
  hours: number;
  tasks: LabourTask[];
  sawCuts: number;
  sawGroups: SawCutGroup[];
  /** Weight carried from the delivery to the pit (wall units, cap blanks, firebrick, as ordered), lb. */
  carriedLb: number;
  /** Heaviest wall unit and cap blank, lb (null without caps). */
  wallUnitLb: number;
  capBlankLb: number | null;
};

const roundHours = (hours: number) => Math.round(hours * 100) / 100;

/** Minutes one cut takes: passes × handling + (length × depth) / rate; passes = ceil(depth / saw depth). */
export function timeSawCut(
  lengthIn: number,
  depthIn: number,
  factors: CompanyFactors,
): { passes: number; minutes: number } {
  const passes = Math.max(1, Math.ceil(depthIn / factors.sawMaxCutDepthIn - 1e-9));
  return {
    passes,
    minutes: passes * factors.sawHandlingMinutesPerPass + (lengthIn * depthIn) / factors.sawCutIn2PerMinute,
  };
}

/**
 * Every saw cut of the job, by kind (whole cuts): two side cuts per cap and a rip per ripped cap;
 * two radial cuts per closure unit; two back trims per trimmed unit (each runs the unit's depth);
 * one rip per brick of a ripped firebrick row. Border and field paver cuts are in the patio's rate.
 */
export function listSawCuts(args: {
  ring: RingPlan;
  wallUnit: WallUnitSize;
  caps: CapPlan | null;
  liner: LinerPlan | null;
  factors: CompanyFactors;
}): SawCutGroup[] {
  const { ring, wallUnit, caps, liner, factors } = args;
  const groups: SawCutGroup[] = [];
  const add = (what: string, count: number, lengthIn: number, depthIn: number) => {
    if (count <= 0) return;
    const { passes, minutes } = timeSawCut(lengthIn, depthIn, factors);
    groups.push({ what, count, lengthIn, depthIn, passes, minutesEach: minutes });
  };
  if (caps) {
    add("cap side cuts", 2 * caps.count, caps.sideCutLengthIn, caps.thicknessIn);
    if (caps.ripToDepthIn !== null) add("cap rips", caps.count, caps.blankLengthIn, caps.thicknessIn);
  }
  // A radial cut through a wall unit runs its depth T and goes through its height H.
  const radialCutIn = wallUnit.depthIn;
  if (ring.closure) add("closure cuts", 2 * ring.closure.countPerCourse * ring.courses, radialCutIn, wallUnit.heightIn);
  if (ring.backTrimPerSideIn > 0) add("back trims", 2 * ring.unitCount * ring.courses, radialCutIn, wallUnit.heightIn);
  if (liner?.kind === "firebrick" && liner.fits && liner.ripCuts > 0) {
    // Ripped along its length, through its thickness.
    add("firebrick rips", liner.ripCuts, brickLength(liner), liner.thicknessIn);
  }
  return groups;
}

// The lining's brick length along the ring: its inner chord, 2·a_in·tan(π/M).
function brickLength(liner: Extract<LinerPlan, { kind: "firebrick" }>): number {
  return 2 * liner.innerEdgeDistanceIn * Math.tan(Math.PI / liner.bricksPerRow);
}

/** Labour-hours for a crew, by task (each task and the total rounded to 0.01 h). */
export function estimateLabour(args: {
  ring: RingPlan;
  wallUnit: WallUnitSize;
  caps: CapPlan | null;
  liner: LinerPlan | null;
  patio: PatioPlan | null;
  base: BaseEstimate;
  materials: MaterialLine[];
  factors: CompanyFactors;
}): LabourEstimate {
  const { ring, wallUnit, caps, liner, patio, base, materials, factors } = args;
  const ordered = (key: MaterialLine["key"]) => materials.find((m) => m.key === key)?.quantity ?? 0;
  const wallUnitLb = weighConcrete(
    ((wallUnit.faceIn + wallUnit.backIn) / 2) * wallUnit.depthIn * wallUnit.heightIn,
    factors.concreteLbPerFt3,
  );
  const capBlankLb = caps
    ? weighConcrete(caps.blankLengthIn * caps.blankDepthIn * caps.thicknessIn, factors.concreteLbPerFt3)
    : null;
  // Firebrick is weighed at the concrete figure too: a 9 in straight comes to about 8 lb (close to suppliers' figures,
  // from memory).
  const brickLb =
    liner?.kind === "firebrick" && liner.fits
      ? weighConcrete(brickLength(liner) * liner.rowHeightIn * liner.thicknessIn, factors.concreteLbPerFt3)
      : 0;
  const carriedLb =
    ordered("wall-unit") * wallUnitLb + ordered("cap") * (capBlankLb ?? 0) + ordered("firebrick") * brickLb;

  const sawGroups = listSawCuts({ ring, wallUnit, caps, liner, factors });
  const sawCuts = sawGroups.reduce((sum, g) => sum + g.count, 0);
  const sawMinutes = sawGroups.reduce((sum, g) => sum + g.count * g.minutesEach, 0);
  const spoilLooseYd3 = base.excavatedYd3 * factors.spoilSwellFactor;

  const tasks: LabourTask[] = [
    { task: "setup", label: "Layout, set-up and clean-up", hours: factors.setupHours },
    {
      task: "base",
      label: `Excavate and compact the base (${base.pitAreaFt2.toFixed(1)} ft²)`,
      hours: base.pitAreaFt2 * factors.basePrepHoursPerFt2,
    },
    {
      task: "spoil",
      label: `Haul away the dug soil (${spoilLooseYd3.toFixed(2)} yd³ loose)`,
      hours: spoilLooseYd3 * factors.spoilHoursPerYd3,
    },
    {
      task: "carry",
      label: `Unload and carry units, caps and brick to the pit (${formatNumber(Math.round(carriedLb))} lb)`,
      hours: (carriedLb / 2000) * factors.carryHoursPerTon,
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
    tasks.push({ task: "saw-cuts", label: `Wet-saw cuts (${sawCuts})`, hours: sawMinutes / 60 });
  }
  if (caps) {
    tasks.push({
      task: "mark-caps",
      label: `Mark the cap blanks (${caps.count})`,
      hours: (caps.count * factors.minutesPerCapMark) / 60,
    });
    tasks.push({
      task: "caps",
      label: `Glue and set the caps (${caps.count})`,
      hours: (caps.count * factors.minutesPerCapSet) / 60,
    });
  }
  if (liner?.kind === "steel-ring") {
    tasks.push({
      task: "liner",
      label:
        liner.bedDepthIn > 0
          ? "Lay the gravel bed, set the steel ring and backfill"
          : "Set the steel ring and backfill",
      hours: factors.steelRingHours,
    });
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
  return {
    hours: roundHours(rounded.reduce((sum, t) => sum + t.hours, 0)),
    tasks: rounded,
    sawCuts,
    sawGroups,
    carriedLb,
    wallUnitLb,
    capBlankLb,
  };
}
