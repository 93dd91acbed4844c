import { z } from "zod";
import { toCleanLines } from "~/lib/format/clean-text";
import { SLOPES, SOILS, SPOIL_PLANS, UTILITY_MARKS } from "~/db/enums";
import { formLength } from "~/lib/format/form-fields";
import { parseLength } from "~/domain/units";

/** Words for the visit form's choices, shared by the form, the lead page and the proposal. */
export const SLOPE_LABEL: Record<(typeof SLOPES)[number], string> = {
  level: "Level (under 1 in of fall in 4 ft)",
  gentle: "Gentle slope (about 1–4 in in 4 ft)",
  steep: "Steep (more than 4 in in 4 ft)",
};
export const SOIL_LABEL: Record<(typeof SOILS)[number], string> = {
  sand: "Sandy, drains fast",
  loam: "Loam, firm",
  clay: "Clay, holds water",
  rock: "Rock or ledge near the surface",
  fill: "Fill or loose ground",
};
export const UTILITY_LABEL: Record<(typeof UTILITY_MARKS)[number], string> = {
  "marked-clear": "Marked, none near the pit",
  "marked-near": "Marked, one runs near the pit",
  "not-marked-yet": "Not marked yet: call 811 before digging",
};
export const SPOIL_LABEL: Record<(typeof SPOIL_PLANS)[number], string> = {
  "haul-away": "Haul it away",
  "spread-on-site": "Spread it on site",
  "pile-for-homeowner": "Leave a pile for the homeowner",
};

const optionalFeet = z
  .string()
  .trim()
  .transform((s, ctx) => {
    if (s === "") return null;
    const lengthIn = parseLength(s, "ft");
    const n = lengthIn === null ? NaN : lengthIn / 12;
    if (!Number.isFinite(n) || n < 0 || n > 500 + 1e-9) {
      ctx.addIssue({
        code: "custom",
        message: "Branches must be between 0 and 500 ft, or left empty when none hang over.",
      });
      return z.NEVER;
    }
    return n;
  });

/** The site visit form; every message names its field and what is allowed. */
export const siteVisitSchema = z.object({
  structureFt: formLength("Distance to the nearest structure", 0, 500, "ft"),
  propertyLineFt: formLength("Distance to the property line", 0, 500, "ft"),
  branchesFt: z.preprocess((v) => v ?? "", optionalFeet),
  slope: z.enum(SLOPES, { error: "Choose the ground's slope." }),
  soil: z.enum(SOILS, { error: "Choose the soil." }),
  accessWidthIn: formLength("Access width", 12, 240),
  utilityMarks: z.enum(UTILITY_MARKS, { error: "Say whether the utilities are marked." }),
  spoil: z.enum(SPOIL_PLANS, { error: "Say where the dug soil goes." }),
  notes: z.string().overwrite(toCleanLines).trim().max(2000, "Notes must be at most 2,000 characters.").default(""),
});

export type SiteVisitInput = z.output<typeof siteVisitSchema>;
