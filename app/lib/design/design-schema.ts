import { z } from "zod";
import { fieldErrors } from "~/lib/format/form-fields";
import { MAX_COURSES } from "~/domain/ring";
import { MAX_INNER_OVERHANG_IN, PATIO_RADIUS_FT, type CatalogChoice } from "~/lib/design/design";

/*
 * A design as search params, checked strictly. The public configurator forgives bad values (a shared
 * link should always open); a staff revision is saved, so every value must be one we offer.
 */

const id = (label: string) =>
  z
    .string()
    .regex(/^\d{1,9}$/, { error: `${label} must be a catalog item's id.` })
    .transform(Number);
const optionalParam = <T extends z.ZodType>(schema: T) =>
  z.preprocess((v) => (v === null || v === "" ? undefined : v), schema.optional());

function numberIn(label: string, min: number, max: number, unit: string) {
  return z
    .string()
    .regex(/^\d+(\.\d+)?$/, { error: `${label} must be a number from ${min} to ${max}${unit}.` })
    .transform(Number)
    .pipe(
      z
        .number()
        .min(min, `${label} must be from ${min} to ${max}${unit}.`)
        .max(max, `${label} must be from ${min} to ${max}${unit}.`),
    );
}

export const designParamsSchema = z.object({
  stone: id("Wall stone"),
  units: numberIn("Units a course", 3, 200, "").pipe(z.number().int("Units a course must be a whole number.")),
  fit: optionalParam(z.literal("ring", { error: 'Fit must be "ring" or left out.' })),
  courses: numberIn("Courses", 1, MAX_COURSES, "").pipe(z.number().int("Courses must be a whole number.")),
  cap: z.union([z.literal("none"), id("Cap")], { error: 'Cap must be a catalog id or "none".' }),
  overhang: numberIn("Overhang toward the fire", 0, MAX_INNER_OVERHANG_IN, " in"),
  liner: z.enum(["none", "steel-ring", "firebrick"], { error: "Liner must be none, steel-ring or firebrick." }),
  ring: optionalParam(id("Ring insert")),
  patio: numberIn("Patio radius", 0, PATIO_RADIUS_FT.max, " ft").refine((v) => v === 0 || v >= PATIO_RADIUS_FT.min, {
    message: `Patio radius must be 0 (no patio) or from ${PATIO_RADIUS_FT.min} to ${PATIO_RADIUS_FT.max} ft.`,
  }),
  paver: optionalParam(id("Pavers")),
  border: optionalParam(id("Border")),
  setback: optionalParam(numberIn("Distance to the nearest building", 0, 500, " ft")),
  propertyLine: optionalParam(numberIn("Distance to the property line", 0, 500, " ft")),
  branches: optionalParam(numberIn("Distance to overhanging branches", 0, 500, " ft")),
  unit: optionalParam(z.enum(["in", "mm"], { error: "Unit must be in or mm." })),
});

const KEYS = Object.keys(designParamsSchema.shape);

/** Checks a design query string against the schema and the company's active catalog; field → message. */
export function checkDesignParams(query: string, catalog: CatalogChoice[]): Record<string, string> {
  const params = new URLSearchParams(query);
  const raw = Object.fromEntries(KEYS.map((k) => [k, params.get(k) ?? undefined]));
  const parsed = designParamsSchema.safeParse(raw);
  if (!parsed.success) return fieldErrors(parsed.error, "design");
  const errors: Record<string, string> = {};
  const v = parsed.data;
  const offered = (itemId: number | undefined, kinds: string[]) =>
    itemId !== undefined && catalog.some((i) => i.id === itemId && kinds.includes(i.kind));
  if (!offered(v.stone, ["wall-unit"])) errors.stone = "Choose a wall stone you offer.";
  if (v.cap !== "none" && !offered(v.cap, ["cap"])) errors.cap = "Choose a cap you offer, or no caps.";
  if (v.liner === "steel-ring" && !offered(v.ring, ["steel-ring"]))
    errors.ring = "Choose a steel ring insert you offer.";
  if (v.liner === "firebrick" && !catalog.some((i) => i.kind === "firebrick")) errors.liner = "You offer no firebrick.";
  if (v.patio > 0) {
    if (!offered(v.paver, ["paver"])) errors.paver = "Choose pavers you offer.";
    if (!offered(v.border, ["border-unit"])) errors.border = "Choose a border unit you offer.";
  }
  return errors;
}
