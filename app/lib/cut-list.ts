import type { Caution } from "~/domain/advice";
import type { Plan } from "~/domain/plan";
import { formatInches } from "~/domain/units";

/*
 * The cut list: what the crew measures, marks and cuts, in their words, from the plan. One model
 * for the lead page, the printable sheet and the PDF, so all three always say the same thing.
 * Lengths print to the nearest 1/16 in (a tape's reading), angles to a tenth of a degree.
 */

export type CutRow = { key: string; label: string; value: string };
export type CutSection = { id: "wall" | "caps" | "liner" | "patio"; title: string; rows: CutRow[] };
export type CutListPlan = Pick<Plan, "ring" | "caps" | "liner" | "patio">;

/** Degrees to one decimal, without a trailing ".0": 15 → "15°", 16.3636 → "16.4°". */
export function formatDegrees(deg: number): string {
  const rounded = Math.round(deg * 10) / 10;
  return `${Number.isInteger(rounded) ? rounded.toFixed(0) : rounded.toFixed(1)}°`;
}

const f = formatInches;
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function wallRows(ring: CutListPlan["ring"]): CutRow[] {
  const closure = ring.closure;
  const rows: CutRow[] = [
    {
      key: "units-per-course",
      label: "Units a course",
      value: closure
        ? `${ring.unitsPerCourse}: ${ring.unitCount} whole + ${plural(closure.countPerCourse, "closure unit")}`
        : `${ring.unitsPerCourse}, all whole`,
    },
    { key: "courses", label: "Courses", value: `${ring.courses} (${ring.totalUnits} pieces in all), ${f(ring.wallHeightIn)} high with the cap` },
    { key: "layout-radius", label: "Layout radius", value: `${f(ring.edgeDistanceIn)} from the centre pin to the middle of each unit's back` },
    { key: "diameters", label: "Bowl and outside", value: `${f(ring.bowlDiameterIn)} inside, ${f(ring.outsideDiameterIn)} outside, across the flats` },
    {
      key: "joints",
      label: "Joints",
      value:
        ring.limitedBy === "face"
          ? ring.backGapIn > 1 / 32
            ? `Face joints closed; ${f(ring.backGapIn)} V-gap at the back`
            : "Face and back joints closed"
          : `Backs touch; ${f(ring.faceGapIn)} open joint at the face`,
    },
    {
      key: "closure",
      label: "Closure units",
      value: closure
        ? `${closure.countPerCourse} a course (${closure.countPerCourse * ring.courses} in all): ${f(closure.faceWidthIn)} at the face, ${f(closure.backWidthIn)} at the back, two radial cuts ${formatDegrees(closure.angleDeg)} apart`
        : "None",
    },
    {
      key: "back-trim",
      label: "Back trims",
      value:
        ring.backTrimPerSideIn > 0
          ? `${f(ring.backTrimPerSideIn)} off each back corner of every whole unit (${ring.unitCount * ring.courses} units)`
          : "None",
    },
    {
      key: "running-bond",
      label: "Running bond",
      value: `Turn every other course ${formatDegrees(ring.runningBondDeg)} (half a unit), so each joint sits over the middle of the unit below`,
    },
  ];
  return rows;
}

function capRows(caps: NonNullable<CutListPlan["caps"]>): CutRow[] {
  return [
    {
      key: "cap-count",
      label: "Caps",
      value: `${caps.count} identical caps (+${caps.spares} spare blank${caps.spares === 1 ? "" : "s"}), ${f(caps.thicknessIn)} thick`,
    },
    { key: "cap-blank", label: "Blank", value: `${f(caps.blankLengthIn)} long × ${f(caps.blankDepthIn)} deep` },
    {
      key: "cap-rip",
      label: "Rip",
      value: caps.ripToDepthIn !== null ? `Rip each blank to ${f(caps.ripToDepthIn)} deep first` : "None: use the blank's full depth",
    },
    { key: "cap-inner-width", label: "Inner width", value: `${f(caps.innerWidthIn)} (fire side)` },
    { key: "cap-outer-width", label: "Outer width", value: f(caps.outerWidthIn) },
    { key: "cap-inner-mark", label: "Inner mark", value: `${f(caps.innerMarkIn)} from each corner, along the fire-side edge` },
    { key: "cap-outer-mark", label: "Outer mark", value: `${f(caps.outerMarkIn)} from each corner, along the outer edge` },
    {
      key: "cap-side-cut",
      label: "Side cuts",
      value: `Join the marks: ${f(caps.sideCutLengthIn)} long, ${formatDegrees(caps.offSquareDeg)} off square`,
    },
    { key: "cap-joint", label: "Joint", value: `${f(caps.jointIn)} between caps` },
    { key: "cap-overhang", label: "Overhang", value: `${f(caps.innerOverhangIn)} over the fire, ${f(caps.outerOverhangIn)} past the outside face` },
    {
      key: "cap-inner-arc",
      label: "Arced inner edge (optional)",
      value: `Trammel ${f(caps.innerRadiusIn)} from the centre pin through both inner corners; bows ${f(caps.innerSagittaIn)} into the cap at the middle`,
    },
    {
      key: "cap-outer-arc",
      label: "Arced outer edge (optional)",
      value: `Trammel ${f(caps.outerRadiusIn)} from the centre pin; takes ${f(caps.outerSagittaIn)} off each outer corner`,
    },
    { key: "cap-offcut", label: "Offcut", value: `About ${Math.round(caps.offcutShare * 100)} % of each blank` },
  ];
}

function linerRows(liner: NonNullable<CutListPlan["liner"]>): CutRow[] {
  if (liner.kind === "steel-ring") {
    return [
      { key: "liner-ring", label: "Steel ring", value: `${f(liner.outsideDiameterIn)} outside, ${f(liner.heightIn)} high` },
      {
        key: "liner-gap",
        label: "Gap to the wall",
        value: liner.fits
          ? `${f(liner.gapIn)} each side: fill with gravel`
          : `Does not fit: the ring needs a bowl of at least ${f(liner.requiredBowlDiameterIn)}`,
      },
    ];
  }
  if (!liner.fits) return [{ key: "liner-firebrick", label: "Firebrick", value: "Does not fit this bowl" }];
  return [
    {
      key: "liner-firebrick",
      label: "Firebrick",
      value: `${liner.bricksPerRow} a row × ${plural(liner.rows, "row")} = ${liner.totalBricks}, on edge, ${f(liner.linedHeightIn)} high`,
    },
    { key: "liner-firebox", label: "Firebox", value: `${f(liner.fireboxDiameterIn)} across inside the brick` },
    { key: "liner-joint", label: "Outer joints", value: `Open to ${f(liner.outerJointIn)} at the back of the brick` },
    { key: "liner-gap", label: "Gap to the wall", value: `${f(liner.gapToWallIn)}: fill with sand` },
  ];
}

function patioRows(patio: NonNullable<CutListPlan["patio"]>): CutRow[] {
  return [
    {
      key: "patio-border",
      label: "Border units",
      value: `${patio.borderUnitCount} in the course, the last cut to ${f(patio.lastBorderUnitLengthIn)} at its inner face`,
    },
    {
      key: "patio-border-angle",
      label: "Border layout",
      value: `${formatDegrees(patio.borderUnitAngleDeg)} a unit; outer joints open to ${f(patio.borderOuterJointIn)}`,
    },
    { key: "patio-field-radius", label: "Field cut radius", value: `Trammel ${f(patio.fieldCutRadiusIn)} from the centre pin` },
    { key: "patio-pavers", label: "Field pavers", value: `${patio.paverCount} (cuts included), ${Math.round(patio.pavedAreaFt2)} ft² paved` },
  ];
}

/** The cut list of a plan, section by section (wall, caps, liner, patio; absent parts left out). */
export function buildCutList(plan: CutListPlan): CutSection[] {
  const sections: CutSection[] = [{ id: "wall", title: "Wall", rows: wallRows(plan.ring) }];
  if (plan.caps) sections.push({ id: "caps", title: "Caps", rows: capRows(plan.caps) });
  if (plan.liner) sections.push({ id: "liner", title: "Liner", rows: linerRows(plan.liner) });
  if (plan.patio) sections.push({ id: "patio", title: "Patio", rows: patioRows(plan.patio) });
  return sections;
}

/** The cautions the crew should read on site: their own, and those meant for everyone. */
export function crewCautionsOf(cautions: Caution[]): Caution[] {
  return cautions.filter((c) => c.audience !== "homeowner");
}
