import { expect, test } from "vitest";
import { checkSite, siteAllowances, type SiteMeasures } from "~/domain/site-checks";

/*
 * The measured yard against the company's rules. IFC §307.4.2 sets 25 ft from structures for
 * recreational fires (towns vary); a skid steer needs about 66 in of way in (from memory); the rest
 * is common practice, no source.
 */
const GOOD: SiteMeasures = {
  structureFt: 30,
  propertyLineFt: 30,
  branchesFt: null,
  slope: "level",
  soil: "loam",
  accessWidthIn: 72,
};
const RULES = { setbackFt: 25, narrowAccessIn: 36 };

test("a yard that clears every rule raises nothing; distances exactly at the setback and a way in exactly a skid steer wide are fine", () => {
  expect(checkSite(GOOD, RULES)).toEqual([]);
  expect(
    checkSite(
      {
        ...GOOD,
        structureFt: 25,
        propertyLineFt: 25,
        branchesFt: 25,
        accessWidthIn: 66,
        soil: "sand",
        slope: "gentle",
      },
      RULES,
    ),
  ).toEqual([]);
});

test("a crowded, narrow, steep clay yard: every problem in words, most serious first", () => {
  const checks = checkSite(
    { structureFt: 20, propertyLineFt: 12.5, branchesFt: 18, slope: "steep", soil: "clay", accessWidthIn: 30.4 },
    RULES,
  );
  expect(checks).toEqual([
    {
      code: "structure-too-close",
      message:
        "Measured 20 ft to the nearest structure; the setback is 25 ft (International Fire Code §307.4.2 sets 25 ft for recreational fires; local rules vary). Move the pit or get the fire authority's word first.",
    },
    {
      code: "branches-over",
      message:
        "Branches 18 ft from the fire: sparks rise, so trim them back or move the pit (common practice, no source).",
    },
    {
      code: "property-line",
      message:
        "12.5 ft to the property line: many towns set their own distance from the line; check the town's rule before building.",
    },
    {
      code: "narrow-access",
      message:
        "The way in is 30 in wide, under 36 in: stone and base go in by hand cart, so the narrow-access allowance applies.",
    },
    {
      code: "steep-slope",
      message:
        "Steep ground: the pad is cut level into the slope and the low side built up, so the slope allowance applies.",
    },
    {
      code: "soft-soil",
      message: "Clay holds water: dig the base deeper and give it a way to drain (common practice, no source).",
    },
  ]);
});

test("a gate wide enough for barrows but not a skid steer (about 66 in), and fill that settles, are said so", () => {
  expect(checkSite({ ...GOOD, accessWidthIn: 36, soil: "fill" }, RULES)).toEqual([
    {
      code: "narrow-access",
      message: "The way in is 36 in wide: barrows and a walk-behind loader fit, a skid steer (about 66 in) does not.",
    },
    {
      code: "soft-soil",
      message: "Fill settles: dig to firm ground or compact it in lifts before the base (common practice, no source).",
    },
  ]);
  expect(checkSite({ ...GOOD, accessWidthIn: 65.9 }, RULES).map((c) => c.code)).toEqual(["narrow-access"]);
  expect(checkSite({ ...GOOD, soil: "rock" }, RULES)).toEqual([]);
});

test("allowances follow the measured site: narrow access and steep ground each add the company's sum, and a sum of 0 adds no line", () => {
  const rules = { narrowAccessIn: 36, narrowAccessAllowanceCents: 35_000, steepSlopeAllowanceCents: 50_000 };
  expect(siteAllowances({ slope: "steep", accessWidthIn: 30.4 }, rules)).toEqual([
    { key: "narrow-access", label: "Narrow access (30 in): material carried in by hand", cents: 35_000 },
    { key: "steep-slope", label: "Steep ground: pad cut level and built up", cents: 50_000 },
  ]);
  expect(siteAllowances({ slope: "gentle", accessWidthIn: 36 }, rules)).toEqual([]);
  expect(
    siteAllowances(
      { slope: "steep", accessWidthIn: 30 },
      { ...rules, narrowAccessAllowanceCents: 0, steepSlopeAllowanceCents: 0 },
    ),
  ).toEqual([]);
});
