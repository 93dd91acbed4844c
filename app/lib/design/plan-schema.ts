import { z } from "zod";

/*
 * The JSON body of POST /api/plan. Sizes are inches, money integer cents. Numbers must be JSON
 * numbers (no strings, no coercion) and finite; every unknown key is refused. A wall unit, cap,
 * liner, border unit or paver may be given inline or as a catalog reference { "id": n }, which
 * is only meaningful with the company whose catalog it is ("company": "<slug>").
 */

const SLUG = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;

const UNIT_WORDS = { in: "inches", ft: "feet" } as const;

function measure(label: string, min: number, max: number, unit: keyof typeof UNIT_WORDS = "in") {
  const range = `${label} must be between ${min} and ${max} ${unit}.`;
  return z
    .number({
      error: (issue) =>
        issue.input === undefined ? `${label} is required.` : `${label} must be a number of ${UNIT_WORDS[unit]}.`,
    })
    .min(min, { error: range })
    .max(max, { error: range });
}

function wholeNumber(label: string, min: number, max: number) {
  const range = `${label} must be a whole number from ${min} to ${max}.`;
  return z
    .number({ error: (issue) => (issue.input === undefined ? `${label} is required.` : `${label} must be a number.`) })
    .int({ error: range })
    .min(min, { error: range })
    .max(max, { error: range });
}

function object<T extends z.core.$ZodLooseShape>(label: string, shape: T, whenMissing = `${label} is required.`) {
  return z.strictObject(shape, {
    error: (issue) =>
      issue.code === "unrecognized_keys"
        ? undefined
        : issue.input === undefined
          ? whenMissing
          : `${label} must be an object.`,
  });
}

const priceCents = wholeNumber("Price", 0, 10_000_000).optional();
const name = z
  .string({ error: "Name must be text." })
  .trim()
  .min(1, { error: "Name must be 1 to 80 characters." })
  .max(80, { error: "Name must be 1 to 80 characters." })
  .optional();

const catalogId = z
  .number({
    error: (issue) => (issue.input === undefined ? "A catalog id is required." : "A catalog id must be a number."),
  })
  .int({ error: "A catalog id is a whole number above 0." })
  .positive({ error: "A catalog id is a whole number above 0." });

export type CatalogRef = { id: number };

/** True for a `{ id }` catalog reference rather than an inline size. */
export function isCatalogRef(value: unknown): value is CatalogRef {
  return typeof value === "object" && value !== null && "id" in value;
}

/*
 * An inline spec or a catalog reference, chosen by whether the object has an "id" key, so the
 * errors come from the one the client meant (a plain union would only say "Invalid input").
 */
function specOrCatalogRef<S extends z.ZodType, R extends z.ZodType>(spec: S, ref: R) {
  return z.unknown().transform((value, ctx): z.output<S> | z.output<R> => {
    const result = (isCatalogRef(value) ? ref : spec).safeParse(value);
    if (result.success) return result.data;
    for (const issue of result.error.issues) {
      ctx.addIssue(
        issue.code === "unrecognized_keys"
          ? { code: "unrecognized_keys", keys: issue.keys, path: issue.path, message: issue.message }
          : { code: "custom", path: issue.path, message: issue.message },
      );
    }
    return z.NEVER;
  });
}

const wallUnitSpec = object("Wall unit", {
  faceIn: measure("Face length", 2, 36),
  backIn: measure("Back length", 2, 36),
  depthIn: measure("Depth", 2, 24),
  heightIn: measure("Height", 1, 12),
  priceCents,
  name,
}).refine((unit) => unit.backIn <= unit.faceIn, {
  path: ["backIn"],
  error: "Back length must not be longer than the face length: the narrow end faces the fire.",
});

const innerOverhangIn = measure("Inner overhang", 0, 6);
const outerOverhangIn = measure("Outer overhang", 0, 12);

const CAP_MISSING = "Cap is required: give the cap blank, a catalog id, or null for no caps.";

const capSpec = object(
  "Cap",
  {
    lengthIn: measure("Cap length", 4, 48),
    depthIn: measure("Cap depth", 4, 36),
    thicknessIn: measure("Cap thickness", 0.5, 8),
    innerOverhangIn,
    outerOverhangIn: outerOverhangIn.optional(),
    priceCents,
    name,
  },
  CAP_MISSING,
);

// A catalog cap still needs the overhangs, which are choices for this pit, not part of the stock item.
const capRef = object("Cap", {
  id: catalogId,
  innerOverhangIn: innerOverhangIn.optional(),
  outerOverhangIn: outerOverhangIn.optional(),
});

const linerSpec = z.discriminatedUnion(
  "kind",
  [
    object("Liner", { kind: z.literal("none") }),
    object("Liner", {
      kind: z.literal("steel-ring"),
      outsideDiameterIn: measure("Ring outside diameter", 12, 96),
      heightIn: measure("Ring height", 2, 36),
      priceCents,
      name,
    }),
    object("Liner", {
      kind: z.literal("firebrick"),
      lengthIn: measure("Firebrick length", 4, 18),
      widthIn: measure("Firebrick width", 1, 9),
      heightIn: measure("Firebrick thickness", 0.5, 6),
      priceCents,
      name,
    }),
  ],
  { error: "Liner kind must be none, steel-ring or firebrick." },
);

const borderSpec = object("Border unit", {
  widthIn: measure("Border width", 2, 36),
  lengthIn: measure("Border unit length", 2, 36),
  priceCents,
  name,
});

const paverSpec = object("Paver", {
  lengthIn: measure("Paver length", 2, 36),
  widthIn: measure("Paver width", 2, 36),
  priceCents,
  name,
});

const catalogRef = (label: string) => object(label, { id: catalogId });

const patioSchema = object("Patio", {
  outsideRadiusIn: measure("Patio outside radius", 24, 600),
  border: specOrCatalogRef(borderSpec, catalogRef("Border unit")),
  paver: specOrCatalogRef(paverSpec, catalogRef("Paver")),
});

const FIT_MESSAGE = "Ring fit must be at-least, nearest or exact.";

const ringSchema = object("Ring", {
  unitCount: wholeNumber("Units per course", 3, 200).optional(),
  bowlDiameterIn: measure("Bowl diameter", 12, 120).optional(),
  fit: z.enum(["at-least", "nearest", "exact"], { error: FIT_MESSAGE }).optional(),
})
  .superRefine((ring, ctx) => {
    const hasCount = ring.unitCount !== undefined;
    const hasBowl = ring.bowlDiameterIn !== undefined;
    if (hasCount === hasBowl) {
      ctx.addIssue({
        code: "custom",
        path: [],
        message: hasCount
          ? "Give either unitCount, or bowlDiameterIn with fit, not both."
          : "Give unitCount, or bowlDiameterIn with fit.",
      });
    } else if (hasBowl && ring.fit === undefined) {
      ctx.addIssue({ code: "custom", path: ["fit"], message: `${FIT_MESSAGE} It is required with bowlDiameterIn.` });
    } else if (hasCount && ring.fit !== undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["fit"],
        message: "Ring fit only goes with bowlDiameterIn, not unitCount.",
      });
    }
  })
  .transform((ring) =>
    ring.unitCount !== undefined
      ? { unitCount: ring.unitCount }
      : { bowlDiameterIn: ring.bowlDiameterIn as number, fit: ring.fit as "at-least" | "nearest" | "exact" },
  );

/** The plan request: a PlanInput whose parts may be catalog references, plus the company slug. */
export const planRequestSchema = object("The request body", {
  company: z
    .string({ error: "Company must be text." })
    .max(64, { error: "Company must be a slug of at most 64 characters." })
    .regex(SLUG, { error: 'Company must be a lowercase slug such as "stone-and-flame".' })
    .optional(),
  ring: ringSchema,
  wallUnit: specOrCatalogRef(wallUnitSpec, catalogRef("Wall unit")),
  courses: wholeNumber("Courses", 1, 12),
  cap: specOrCatalogRef(capSpec, capRef).nullable(),
  jointIn: measure("Joint", 0, 0.75).optional(),
  liner: specOrCatalogRef(linerSpec, catalogRef("Liner")).optional(),
  patio: patioSchema.nullable().optional(),
  site: object("Site", {
    setbackFt: measure("Distance to the nearest structure", 0, 500, "ft").optional(),
    propertyLineFt: measure("Distance to the property line", 0, 500, "ft").optional(),
    branchesFt: measure("Distance to overhanging branches", 0, 500, "ft").optional(),
  }).optional(),
}).superRefine((request, ctx) => {
  if (request.company !== undefined) return;
  const refs: string[] = [];
  if (isCatalogRef(request.wallUnit)) refs.push("wallUnit");
  if (isCatalogRef(request.cap)) refs.push("cap");
  if (isCatalogRef(request.liner)) refs.push("liner");
  if (request.patio && isCatalogRef(request.patio.border)) refs.push("patio.border");
  if (request.patio && isCatalogRef(request.patio.paver)) refs.push("patio.paver");
  if (refs.length > 0) {
    ctx.addIssue({
      code: "custom",
      path: ["company"],
      message: `Company is required when a part is given by catalog id (${refs.join(", ")}).`,
    });
  }
});

export type PlanRequest = z.output<typeof planRequestSchema>;

export type PlanFieldError = { path: string; message: string };

/** Flattens zod issues into one message per dotted field path ("cap.depthIn"); unknown keys get a path each. */
export function formatPlanErrors(error: z.ZodError): PlanFieldError[] {
  const errors: PlanFieldError[] = [];
  const seen = new Set<string>();
  const add = (path: PropertyKey[], message: string) => {
    const entry = { path: path.map(String).join("."), message };
    const key = `${entry.path}\u0000${message}`;
    if (!seen.has(key)) {
      seen.add(key);
      errors.push(entry);
    }
  };
  for (const issue of error.issues) {
    if (issue.code === "unrecognized_keys") {
      for (const key of issue.keys) add([...issue.path, key], `Unknown field "${key}".`);
    } else {
      add(issue.path, issue.message);
    }
  }
  return errors;
}
