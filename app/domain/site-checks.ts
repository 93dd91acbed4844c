/**
 * What the estimator measured in the yard, checked against the company's setback and the way in.
 * Distances in feet from the centre of the pit, widths in inches. Measured values take the place of
 * the homeowner's guess. Every check defers to the local fire authority and codes.
 */

export type Slope = "level" | "gentle" | "steep";
export type Soil = "sand" | "loam" | "clay" | "rock" | "fill";

export type SiteMeasures = {
  structureFt: number;
  propertyLineFt: number;
  /** Nearest branch over the spot, measured along the ground; null when there are none. */
  branchesFt: number | null;
  slope: Slope;
  soil: Soil;
  accessWidthIn: number;
};

export type SiteRules = {
  /** The company's distance from structures and combustibles, ft (IFC §307.4.2 sets 25 ft; towns vary). */
  setbackFt: number;
  /** Narrower than this, material goes in by hand and the narrow-access allowance applies, in. */
  narrowAccessIn: number;
};

export type SiteCheckCode =
  "structure-too-close" | "property-line" | "branches-over" | "narrow-access" | "steep-slope" | "soft-soil";
export type SiteCheck = { code: SiteCheckCode; message: string };

// A loaded wheelbarrow or a walk-behind loader needs about a standard gate's width; a skid steer
// about 66 in (from memory; common practice, no source).
const SKID_STEER_WIDTH_IN = 66;

const ft = (v: number) => `${Number.isInteger(v) ? v : v.toFixed(1)} ft`;

/** The measured site's problems, most serious first; an empty list means nothing to flag. */
export function checkSite(m: SiteMeasures, rules: SiteRules): SiteCheck[] {
  const checks: SiteCheck[] = [];
  if (m.structureFt < rules.setbackFt) {
    checks.push({
      code: "structure-too-close",
      message: `Measured ${ft(m.structureFt)} to the nearest structure; the setback is ${ft(rules.setbackFt)} (International Fire Code §307.4.2 sets 25 ft for recreational fires; local rules vary). Move the pit or get the fire authority's word first.`,
    });
  }
  if (m.branchesFt !== null && m.branchesFt < rules.setbackFt) {
    checks.push({
      code: "branches-over",
      message: `Branches ${ft(m.branchesFt)} from the fire: sparks rise, so trim them back or move the pit (common practice, no source).`,
    });
  }
  if (m.propertyLineFt < rules.setbackFt) {
    checks.push({
      code: "property-line",
      message: `${ft(m.propertyLineFt)} to the property line: many towns set their own distance from the line; check the town's rule before building.`,
    });
  }
  if (m.accessWidthIn < rules.narrowAccessIn) {
    checks.push({
      code: "narrow-access",
      message: `The way in is ${Math.round(m.accessWidthIn)} in wide, under ${Math.round(rules.narrowAccessIn)} in: stone and base go in by hand cart, so the narrow-access allowance applies.`,
    });
  } else if (m.accessWidthIn < SKID_STEER_WIDTH_IN) {
    checks.push({
      code: "narrow-access",
      message: `The way in is ${Math.round(m.accessWidthIn)} in wide: barrows and a walk-behind loader fit, a skid steer (about ${SKID_STEER_WIDTH_IN} in) does not.`,
    });
  }
  if (m.slope === "steep") {
    checks.push({
      code: "steep-slope",
      message:
        "Steep ground: the pad is cut level into the slope and the low side built up, so the slope allowance applies.",
    });
  }
  if (m.soil === "clay" || m.soil === "fill") {
    checks.push({
      code: "soft-soil",
      message:
        m.soil === "clay"
          ? "Clay holds water: dig the base deeper and give it a way to drain (common practice, no source)."
          : "Fill settles: dig to firm ground or compact it in lifts before the base (common practice, no source).",
    });
  }
  return checks;
}

/** The price allowances the measured site calls for, in integer cents. */
export function siteAllowances(
  m: Pick<SiteMeasures, "slope" | "accessWidthIn">,
  rules: { narrowAccessIn: number; narrowAccessAllowanceCents: number; steepSlopeAllowanceCents: number },
): { key: "narrow-access" | "steep-slope"; label: string; cents: number }[] {
  const lines: { key: "narrow-access" | "steep-slope"; label: string; cents: number }[] = [];
  if (m.accessWidthIn < rules.narrowAccessIn && rules.narrowAccessAllowanceCents > 0) {
    lines.push({
      key: "narrow-access",
      label: `Narrow access (${Math.round(m.accessWidthIn)} in): material carried in by hand`,
      cents: rules.narrowAccessAllowanceCents,
    });
  }
  if (m.slope === "steep" && rules.steepSlopeAllowanceCents > 0) {
    lines.push({
      key: "steep-slope",
      label: "Steep ground: pad cut level and built up",
      cents: rules.steepSlopeAllowanceCents,
    });
  }
  return lines;
}
