import type { Caution } from "~/domain/advice";
import type { Plan } from "~/domain/plan";
import { formatInches } from "~/domain/units";

/*
 * The cut list: what the crew measures, marks and cuts, in their words, from the plan. One model
 * for the lead page, the printable sheet and the PDF, so all three always say the same thing.
 * Lengths print to the nearest 1/16 in (a tape's reading), angles to a tenth of a degree.
 */

export type CutRow = { key: string; label: string; value: string };
export type CutSection = { id: "wall" | "caps" | "liner" | "patio" | "handling"; title: string; rows: CutRow[] };
export type CutListPlan = Pick<Plan, "ring" | "caps" | "liner" | "patio"> & Partial<Pick<Plan, "base" | "labour">>;

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
    {
      key: "courses",
      label: "Courses",
      value: `${ring.courses} (${ring.totalUnits} pieces in all), ${f(ring.wallHeightIn)} high with the cap`,
    },
    {
      key: "layout-radius",
      label: "Layout radius",
      value: `${f(ring.edgeDistanceIn)} from the centre pin to the middle of each unit's back`,
    },
    {
      key: "diameters",
      label: "Bowl and outside",
      value: `${f(ring.bowlDiameterIn)} inside, ${f(ring.outsideDiameterIn)} outside, across the flats`,
    },
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
      value: describeBond(ring),
    },
  ];
  return rows;
}

function describeBond(ring: CutListPlan["ring"]): string {
  if (ring.courses < 2) return "One course: no bond to keep";
  const offset = ring.bondOffsetIn !== null ? f(ring.bondOffsetIn) : "";
  const shift = ring.bondClosureShift;
  if (ring.closure && shift) {
    const units = shift.wholeUnits ? `${plural(shift.wholeUnits, "whole unit")} and ` : "";
    return `Odd courses: start the closure${ring.closure.countPerCourse === 2 ? "s" : ""} on one chalk line. Even courses: start ${ring.closure.countPerCourse === 2 ? "them" : "it"} ${units}${f(shift.partFaceIn)} further round (measured along the outside face), a turn of ${formatDegrees(ring.runningBondDeg)}. Every joint then sits at least ${offset} from the joints below.`;
  }
  return `Turn every other course ${formatDegrees(ring.runningBondDeg)} (half a unit), so each joint sits over the middle of the unit below, ${offset} from its joints`;
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
      value:
        caps.ripToDepthIn !== null
          ? `Rip each blank to ${f(caps.ripToDepthIn)} deep first`
          : "None: use the blank's full depth",
    },
    { key: "cap-inner-width", label: "Inner width", value: `${f(caps.innerWidthIn)} (fire side)` },
    { key: "cap-outer-width", label: "Outer width", value: f(caps.outerWidthIn) },
    {
      key: "cap-inner-mark",
      label: "Inner mark",
      value: `${f(caps.innerMarkIn)} from each corner along the fire-side edge, or ${f(caps.innerHalfWidthIn)} each side of the blank's centre line`,
    },
    {
      key: "cap-outer-mark",
      label: "Outer mark",
      value: `${f(caps.outerMarkIn)} from each corner along the outer edge, or ${f(caps.outerHalfWidthIn)} each side of the centre line`,
    },
    {
      key: "cap-side-cut",
      label: "Side cuts",
      value: `Join the marks: ${f(caps.sideCutLengthIn)} long, ${formatDegrees(caps.offSquareDeg)} off square`,
    },
    { key: "cap-joint", label: "Joint", value: `${f(caps.jointIn)} between caps` },
    {
      key: "cap-overhang",
      label: "Overhang",
      value: `${f(caps.innerOverhangIn)} over the fire, ${f(caps.outerOverhangIn)} past the outside face, at the middle of a wall unit`,
    },
    {
      key: "cap-overhang-range",
      label: "Overhang along a cap",
      value: `Outside ${f(caps.overhangRange.outerMinIn)} to ${f(caps.overhangRange.outerMaxIn)}; over the fire ${f(caps.overhangRange.innerMinIn)} to ${f(caps.overhangRange.innerMaxIn)} (corners and mid-edge against the wall's flats and corners)`,
    },
    {
      key: "cap-inner-arc",
      label: "Arced inner edge (optional)",
      value: `Trammel ${f(caps.innerRadiusIn)} from the centre pin through both inner corners; bows ${f(caps.innerSagittaIn)} into the cap at the middle; ${formatDegrees(caps.innerArcDeg)}, ${f(caps.innerArcLengthIn)} along the arc. Leaves ${f(caps.arcedOverhangRange.innerMinIn)} to ${f(caps.arcedOverhangRange.innerMaxIn)} over the fire`,
    },
    {
      key: "cap-outer-arc",
      label: "Arced outer edge (optional)",
      value: `Trammel ${f(caps.outerRadiusIn)} from the centre pin; meets each side cut ${f(caps.outerCornerTrimIn)} in from the outer corner; ${formatDegrees(caps.outerArcDeg)}, ${f(caps.outerArcLengthIn)} along the arc between the cuts. Leaves ${f(caps.arcedOverhangRange.outerMinIn)} to ${f(caps.arcedOverhangRange.outerMaxIn)} past the outside face`,
    },
    {
      key: "cap-offcut",
      label: "Offcut",
      value:
        caps.count === caps.fewestCount
          ? `About ${Math.round(caps.offcutShare * 100)} % of each blank${caps.countReason === "matches-wall" ? " (the count matches the wall's units)" : ""}`
          : `About ${Math.round(caps.offcutShare * 100)} % of each blank: ${caps.count} caps match the wall's units; ${caps.fewestCount} would waste ${Math.round(caps.fewestOffcutShare * 100)} %`,
    },
  ];
}

function linerRows(liner: NonNullable<CutListPlan["liner"]>): CutRow[] {
  if (liner.kind === "steel-ring") {
    const rows: CutRow[] = [
      {
        key: "liner-ring",
        label: "Steel ring",
        value: `${f(liner.outsideDiameterIn)} outside, ${f(liner.heightIn)} high`,
      },
      {
        key: "liner-gap",
        label: "Gap to the wall",
        value: liner.fits
          ? `${f(liner.gapIn)} each side (at least ${f(liner.minGapIn)}): fill with pea gravel`
          : `Does not fit: the ring needs a bowl of at least ${f(liner.requiredBowlDiameterIn)}`,
      },
    ];
    rows.push({
      key: "liner-bed",
      label: "Height",
      value: liner.tooTall
        ? `The ring stands above the block (${f(liner.linedHeightIn)} under the caps): the caps would rest on it`
        : liner.bedDepthIn > 0
          ? `Set the ring on a ${f(liner.bedDepthIn)} bed of pea gravel, levelled and tamped, so its top comes to ${f(liner.linedHeightIn)}, just under the caps`
          : `Set on the bowl floor; its top sits ${f(liner.linedHeightIn - liner.heightIn)} under the caps`,
    });
    if (liner.fits && liner.fillFt3 > 0) {
      rows.push({
        key: "liner-fill",
        label: "Fill",
        value: `About ${liner.fillFt3.toFixed(1)} ft³ of pea gravel for the ${liner.bedDepthIn > 0 ? "bed and the " : ""}gap`,
      });
    }
    return rows;
  }
  if (!liner.fits) return [{ key: "liner-firebrick", label: "Firebrick", value: "Does not fit this bowl" }];
  return [
    {
      key: "liner-firebrick",
      label: "Firebrick",
      value: `${liner.bricksPerRow} a row × ${plural(liner.rows, "row")} = ${liner.totalBricks}, on edge, in refractory mortar (${f(liner.jointIn)} joints), ${f(liner.builtHeightIn)} high`,
    },
    {
      key: "liner-rip",
      label: "Top row",
      value:
        liner.ripHeightIn !== null
          ? `Rip each of the ${liner.bricksPerRow} top bricks to ${f(liner.ripHeightIn)} (${liner.ripCuts} rip cuts), so the lining stops at ${f(liner.builtHeightIn)}, under the caps`
          : `Whole bricks; the lining stops at ${f(liner.builtHeightIn)}, at or under the top of the block (${f(liner.linedHeightIn)})`,
    },
    { key: "liner-firebox", label: "Firebox", value: `${f(liner.fireboxDiameterIn)} across inside the brick` },
    {
      key: "liner-joint",
      label: "Outer joints",
      value: `Open to ${f(liner.outerJointIn)} at the back of the brick: fill with mortar`,
    },
    {
      key: "liner-gap",
      label: "Gap to the wall",
      value: `${f(liner.gapToWallIn)} at the middle of a brick: pour in about ${liner.fillFt3.toFixed(1)} ft³ of sand as the rows go up`,
    },
  ];
}

function patioRows(patio: NonNullable<CutListPlan["patio"]>, base: CutListPlan["base"]): CutRow[] {
  const closure =
    patio.borderClosureCount === 2
      ? `two closure pieces of ${f(patio.lastBorderUnitLengthIn)} each (one would be a sliver)`
      : patio.borderClosureCount === 1
        ? `one closure piece of ${f(patio.lastBorderUnitLengthIn)}`
        : "no closure piece";
  const rows: CutRow[] = [
    {
      key: "patio-border",
      label: "Border units",
      value: `${patio.borderUnitCount} in the course: ${patio.borderWholeCount} ${patio.borderLayout === "tapered" ? "tapered" : "whole"} and ${closure}, measured at the ${patio.borderLayout === "tapered" ? "outer" : "inner"} face`,
    },
    {
      key: "patio-border-angle",
      label: "Border layout",
      value:
        patio.borderLayout === "tapered"
          ? `Cut one end of every unit ${formatDegrees(patio.borderTaperDeg ?? 0)} off square and lay outer corners touching, cut end to square end: no open V-joints (${patio.borderCuts} cuts)`
          : `${formatDegrees(patio.borderUnitAngleDeg)} a unit, inner corners touching; outer joints open to ${f(patio.borderOuterJointIn)}`,
    },
    {
      key: "patio-field-radius",
      label: "Field cut radius",
      value: `Trammel ${f(patio.fieldCutRadiusIn)} from the centre pin`,
    },
    {
      key: "patio-pavers",
      label: "Field pavers",
      value: `${patio.paverCount}: ${patio.wholePaverCount} whole, ${patio.cutPaverCount} cut at the border and the pit, plus spares; ${Math.round(patio.pavedAreaFt2)} ft² paved`,
    },
    {
      key: "patio-edge",
      label: "Edge restraint",
      value: `${(patio.edgeRestraintIn / 12).toFixed(1)} ft round the outside, ${patio.edgeSpikes} spikes`,
    },
  ];
  if (base?.patioRadiusIn != null) {
    rows.push({
      key: "patio-base",
      label: "Base",
      value: `Dig and compact out to ${f(base.patioRadiusIn)} from the centre pin, ${f(base.patioRadiusIn - patio.outsideRadiusIn)} past the paver edge`,
    });
  }
  return rows;
}

function safetyRows(labour: NonNullable<CutListPlan["labour"]>): CutRow[] {
  const rows: CutRow[] = [
    {
      key: "weights",
      label: "Weights",
      value: `Wall unit about ${Math.round(labour.wallUnitLb)} lb${labour.capBlankLb !== null ? `, cap blank about ${Math.round(labour.capBlankLb)} lb` : ""}: lift heavy pieces with two people`,
    },
  ];
  for (const group of labour.sawGroups) {
    rows.push({
      key: `saw-${group.what.replace(/\s+/g, "-")}`,
      label: `Saw: ${group.what}`,
      value: `${group.count} × ${f(group.lengthIn)} long through ${f(group.depthIn)}${group.passes > 1 ? `, ${group.passes} passes each (deeper than the saw cuts in one)` : ""}`,
    });
  }
  return rows;
}

/** The cut list of a plan, section by section (wall, caps, liner, patio; absent parts left out). */
export function buildCutList(plan: CutListPlan): CutSection[] {
  const sections: CutSection[] = [{ id: "wall", title: "Wall", rows: wallRows(plan.ring) }];
  if (plan.caps) sections.push({ id: "caps", title: "Caps", rows: capRows(plan.caps) });
  if (plan.liner) sections.push({ id: "liner", title: "Liner", rows: linerRows(plan.liner) });
  if (plan.patio) sections.push({ id: "patio", title: "Patio", rows: patioRows(plan.patio, plan.base) });
  if (plan.labour) sections.push({ id: "handling", title: "Weights and saw work", rows: safetyRows(plan.labour) });
  return sections;
}

/** What a plan from an older engine shows instead of its cut list when it cannot be recomputed. */
export function legacyCutList(): CutSection[] {
  return [
    {
      id: "wall",
      title: "Wall",
      rows: [
        {
          key: "legacy",
          label: "Older plan",
          value:
            "This plan was made by an older estimate and one of its catalog items is no longer offered, so its cut list cannot be recomputed. Revise the design to get a cut list to build from.",
        },
      ],
    },
  ];
}

/** The cautions the crew should read on site: their own, and those meant for everyone. */
export function crewCautionsOf(cautions: Caution[]): Caution[] {
  return cautions.filter((c) => c.audience !== "homeowner");
}
