/**
 * The build's checklist: the plan turned into the steps a crew works through on site, in order,
 * each with a key that stays the same while the plan keeps that part (so a tick recorded against
 * "course-2" still means the second course after a revision changes the bowl). Pure: lengths in
 * inches, printed to the nearest 1/16 in as a tape reads.
 */
import type { AdhesiveEstimate, BaseEstimate } from "~/domain/quantities";
import type { CapPlan } from "~/domain/caps";
import type { PatioPlan } from "~/domain/patio";
import type { RingPlan } from "~/domain/ring";
import { formatInches } from "~/domain/units";

/** Days the adhesive is commonly left to cure before the first fire (common practice, no source). */
export const ADHESIVE_CURE_DAYS = 7;

export type BuildStepKey = string;
export type BuildStep = { key: BuildStepKey; title: string; detail: string };

export type BuildStepsInput = {
  ring: Pick<RingPlan, "courses" | "unitsPerCourse" | "edgeDistanceIn" | "runningBondDeg" | "closure">;
  caps: Pick<CapPlan, "count"> | null;
  liner:
    | { kind: "steel-ring"; outsideDiameterIn: number; bedDepthIn?: number }
    | { kind: "firebrick"; rows: number; bricksPerRow: number; rippedRows?: number; ripHeightIn?: number | null }
    | null;
  patio: Pick<PatioPlan, "outsideRadiusIn" | "borderUnitCount"> | null;
  /** Plans saved by older engines may lack the patio's base radius and the adhesive's layers. */
  base: Pick<BaseEstimate, "radiusIn"> & Partial<Pick<BaseEstimate, "patioRadiusIn">>;
  adhesive: Partial<Pick<AdhesiveEstimate, "gluedCourses" | "gluedCaps">>;
  /** Compacted base depth under the pit and under a patio, in (the plan's factors). */
  baseDepthIn: number;
  patioBaseDepthIn: number;
};

const f = formatInches;
const units = (n: number) => `${n} unit${n === 1 ? "" : "s"}`;
const degrees = (deg: number) => `${Math.round(deg * 10) / 10}°`;

/** The ordered steps of the build: base, each course, liner, caps, cure, patio, clean-up (absent parts left out). */
export function listBuildSteps(input: BuildStepsInput): BuildStep[] {
  const { ring, caps, liner, patio, base } = input;
  // Older plans did not record the glued layers: the top course and the caps, as the engine glues them.
  const adhesive = {
    gluedCourses: input.adhesive.gluedCourses ?? Math.min(1, ring.courses - 1),
    gluedCaps: input.adhesive.gluedCaps ?? caps !== null,
  };
  const steps: BuildStep[] = [
    {
      key: "dig-base",
      title: "Dig and lay the base",
      detail: `Dig a circle ${f(base.radiusIn * 2)} across (${f(base.radiusIn)} from the centre pin) and lay ${f(input.baseDepthIn)} of base, compacted in lifts.`,
    },
  ];
  const closures = ring.closure ? `, ${ring.closure.countPerCourse} of them cut as closure units` : "";
  // Adhesive goes on the top courses only (AdhesiveEstimate.gluedCourses counts down from the top).
  const firstGlued = ring.courses - adhesive.gluedCourses + 1;
  for (let course = 1; course <= ring.courses; course += 1) {
    if (course === 1) {
      steps.push({
        key: "course-1",
        title: "Set the first course level",
        detail: `${units(ring.unitsPerCourse)}${closures}, backs on the ${f(ring.edgeDistanceIn)} layout radius. Level each unit side to side and front to back before the next.`,
      });
      continue;
    }
    const glue = course >= firstGlued ? "glued to the course below" : "dry-stacked";
    const turn = course % 2 === 0 ? `, turned ${degrees(ring.runningBondDeg)} from the course below` : "";
    steps.push({
      key: `course-${course}`,
      title: `Course ${course} of ${ring.courses}`,
      detail: `${units(ring.unitsPerCourse)}${closures}${turn}, ${glue}.`,
    });
  }
  if (liner?.kind === "steel-ring") {
    steps.push({
      key: "liner",
      title: "Set the steel ring",
      detail:
        liner.bedDepthIn !== undefined && liner.bedDepthIn > 0
          ? `Lay a ${f(liner.bedDepthIn)} gravel bed in the bowl, set the ${f(liner.outsideDiameterIn)} ring on it, centred, and fill the gap round it with gravel.`
          : `Set the ${f(liner.outsideDiameterIn)} ring in the bowl, centred, and fill the gap round it with gravel.`,
    });
  } else if (liner?.kind === "firebrick") {
    const rip = liner.rippedRows && liner.ripHeightIn ? `, the top row ripped to ${f(liner.ripHeightIn)}` : "";
    steps.push({
      key: "liner",
      title: "Line the bowl with firebrick",
      detail: `${liner.rows} row${liner.rows === 1 ? "" : "s"} of ${liner.bricksPerRow} bricks on edge in refractory mortar${rip}; fill behind with sand.`,
    });
  }
  if (caps) {
    steps.push({
      key: "caps",
      title: adhesive.gluedCaps ? "Glue the caps" : "Set the caps",
      detail: `${caps.count} caps on the top course, joints even all round${adhesive.gluedCaps ? ", each on two beads of adhesive" : ""}.`,
    });
  }
  if (adhesive.gluedCourses > 0 || adhesive.gluedCaps) {
    steps.push({
      key: "cure",
      title: "Leave the adhesive to cure before the first fire",
      detail: `About ${ADHESIVE_CURE_DAYS} days before any fire; tell the homeowner the first day they may light one, and to keep the first fires small.`,
    });
  }
  if (patio) {
    const baseTo = base.patioRadiusIn ?? patio.outsideRadiusIn;
    steps.push({
      key: "patio",
      title: "Lay the patio",
      detail: `${f(input.patioBaseDepthIn)} of compacted base out to ${f(baseTo)} from the centre, then the ${patio.borderUnitCount} border units at ${f(patio.outsideRadiusIn)} and the pavers inside them.`,
    });
  }
  steps.push({
    key: "clean-up",
    title: "Clean up",
    detail: "Clear offcuts, spoil and packaging; sweep the site and rinse saw slurry away from drains.",
  });
  return steps;
}
