import { z } from "zod";
import type { CautionCode, WarningCode } from "~/domain/advice";
import type { Plan, PlanInput } from "~/domain/plan";
import type { LabourTaskKey } from "~/domain/labour";
import type { MaterialKey, MaterialUnit } from "~/domain/quantities";
import type { Design } from "~/lib/design/design";

/*
 * A plan as it is saved with a request or a revision: the design the homeowner or the estimator
 * chose, the engine's input resolved from the catalog at that moment (sizes, names, prices and
 * colours of every part), the factors and supply prices it was priced with, and the engine's answer.
 * Whatever happens to the catalog later, the request is shown, drawn, printed and priced from this.
 *
 * Stored in two columns of `leads` and `lead_revisions`: `design_json` holds the version, the
 * design, its summary and the inputs; `plan_json` holds the engine's answer. Both are parsed by
 * readStoredPlan on every read. The plan's schema checks the parts the pages read and keeps every
 * other field as it was, so a newer engine's extra fields survive a round trip.
 *
 * Version history: 1 had no inputs (drawn from the catalog of the day); 2 keeps them. Rows of
 * version 1 were upgraded by drizzle/0009_stored_plan_inputs.sql.
 */

export const STORED_PLAN_VERSION = 2;

const length = z.number().finite();
const count = z.number().int().nonnegative();
const cents = z.number().int();
const hex = z.string().regex(/^#[0-9a-f]{6}$/i);
// Open vocabularies of the engine: kept as stored, shown by their stored message.
const code = <T extends string>() => z.custom<T>((value) => typeof value === "string" && value.length > 0);

// ---- The engine's input, as resolved when the plan was made (a superset of PlanInput) ----

const named = { name: z.string().optional(), priceCents: cents.optional(), colourHex: hex.optional() };

const wallUnitInputSchema = z.looseObject({
  faceIn: length,
  backIn: length,
  depthIn: length,
  heightIn: length,
  ...named,
});
const capInputSchema = z.looseObject({
  lengthIn: length,
  depthIn: length,
  thicknessIn: length,
  innerOverhangIn: length,
  outerOverhangIn: length.optional(),
  ...named,
});
const linerInputSchema = z.discriminatedUnion("kind", [
  z.looseObject({ kind: z.literal("none") }),
  z.looseObject({ kind: z.literal("steel-ring"), outsideDiameterIn: length, heightIn: length, ...named }),
  z.looseObject({ kind: z.literal("firebrick"), lengthIn: length, widthIn: length, heightIn: length, ...named }),
]);
const patioInputSchema = z.looseObject({
  outsideRadiusIn: length,
  border: z.looseObject({ widthIn: length, lengthIn: length, ...named }),
  paver: z.looseObject({ lengthIn: length, widthIn: length, ...named }),
});
const ringTargetSchema = z.union([
  z.object({ unitCount: count }),
  z.object({ bowlDiameterIn: length, fit: z.enum(["at-least", "nearest", "exact"]) }),
]);

export const storedPlanInputSchema = z.looseObject({
  ring: ringTargetSchema,
  wallUnit: wallUnitInputSchema,
  courses: count,
  cap: capInputSchema.nullable(),
  jointIn: length.optional(),
  liner: linerInputSchema.optional(),
  patio: patioInputSchema.nullable().optional(),
  site: z
    .looseObject({ setbackFt: length.optional(), propertyLineFt: length.optional(), branchesFt: length.optional() })
    .optional(),
});

export type StoredPlanInput = z.output<typeof storedPlanInputSchema>;

// ---- The design and its summary ----

const idOrNull = z.number().int().positive().nullable();

export const designSchema = z.object({
  stoneId: z.number().int().positive(),
  unitCount: count,
  fitToRing: z.boolean(),
  courses: count,
  capId: idOrNull,
  innerOverhangIn: length,
  linerKind: z.enum(["none", "steel-ring", "firebrick"]),
  ringId: idOrNull,
  patioRadiusFt: z.number().finite(),
  paverId: idOrNull,
  borderId: idOrNull,
  setbackFt: z.number().finite().nullable(),
  // Asked for since version 2 was first written; older records have none.
  propertyLineFt: z.number().finite().nullable().default(null),
  branchesFt: z.number().finite().nullable().default(null),
  unit: z.enum(["in", "mm"]),
}) satisfies z.ZodType<Design>;

const summaryLineSchema = z.object({ label: z.string(), value: z.string() });

export const storedDesignSchema = z.looseObject({
  version: z.literal(STORED_PLAN_VERSION, {
    error: `Stored plans must be version ${STORED_PLAN_VERSION}; run the migrations.`,
  }),
  choices: designSchema,
  summary: z.array(summaryLineSchema),
  inputs: z.looseObject({
    engine: storedPlanInputSchema,
    // The company's factors as resolved for this plan (numbers, and words such as a pricing basis).
    factors: z.record(z.string(), z.union([z.number(), z.string()])),
    supplyPrices: z.record(z.string(), cents.nullable().optional()),
  }),
});

export type StoredDesign = z.output<typeof storedDesignSchema>;

// ---- The engine's answer: the parts the pages, the drawings and the cut sheet read ----

const closureSchema = z.looseObject({
  faceWidthIn: length,
  backWidthIn: length,
  angleDeg: length,
  countPerCourse: z.union([z.literal(1), z.literal(2)]),
});
const neighbourSchema = z.looseObject({ unitCount: count, bowlDiameterIn: length }).nullable();

const ringPlanSchema = z.looseObject({
  unitCount: count,
  unitsPerCourse: count,
  courses: count,
  totalUnits: count,
  bowlDiameterIn: length,
  outsideDiameterIn: length,
  limitedBy: z.enum(["face", "back"]),
  faceGapIn: length,
  backGapIn: length,
  closure: closureSchema.nullable(),
  backTrimPerSideIn: length,
  wallHeightIn: length,
  runningBondDeg: length,
  tightestBowlDiameterIn: length.nullable(),
  edgeDistanceIn: length,
  outsideCornerRadiusIn: length,
  neighbours: z.looseObject({ below: neighbourSchema, above: neighbourSchema }),
});

const capPlanSchema = z.looseObject({
  count,
  blankLengthIn: length,
  blankDepthIn: length,
  thicknessIn: length,
  capDepthIn: length,
  innerWidthIn: length,
  outerWidthIn: length,
  innerMarkIn: length,
  outerMarkIn: length,
  offSquareDeg: length,
  sideCutLengthIn: length,
  innerOverhangIn: length,
  outerOverhangIn: length,
  innerEdgeDistanceIn: length,
  outerEdgeDistanceIn: length,
  innerRadiusIn: length,
  outerRadiusIn: length,
  innerSagittaIn: length,
  outerSagittaIn: length,
  innerArcDeg: length,
  outerArcDeg: length,
  innerArcLengthIn: length,
  outerArcLengthIn: length,
  ripToDepthIn: length.nullable(),
  offcutShare: length,
  spares: count,
  jointIn: length,
  outerCornerRadiusIn: length,
});

const linerPlanSchema = z.discriminatedUnion("kind", [
  z.looseObject({
    kind: z.literal("steel-ring"),
    outsideDiameterIn: length,
    heightIn: length,
    fits: z.boolean(),
    gapIn: length,
    requiredBowlDiameterIn: length,
    minGapIn: length,
  }),
  z.looseObject({
    kind: z.literal("firebrick"),
    fits: z.boolean(),
    bricksPerRow: count,
    rows: count,
    totalBricks: count,
    rowHeightIn: length,
    thicknessIn: length,
    innerEdgeDistanceIn: length,
    fireboxDiameterIn: length,
    outerJointIn: length,
    gapToWallIn: length,
    linedHeightIn: length,
  }),
]);

const patioPlanSchema = z.looseObject({
  outsideRadiusIn: length,
  borderWidthIn: length,
  borderUnitCount: count,
  // How the course closes; plans from before the engine cut tapered ends lack these.
  borderWholeCount: count.optional(),
  borderClosureCount: z.union([z.literal(0), z.literal(1), z.literal(2)]).optional(),
  borderLayout: z.enum(["square", "tapered"]).optional(),
  borderInnerEdgeDistanceIn: length,
  borderUnitAngleDeg: length,
  borderOuterJointIn: length,
  lastBorderUnitLengthIn: length,
  fieldCutRadiusIn: length,
  fieldAreaFt2: length,
  pavedAreaFt2: length,
  paverCount: count,
  beddingSandYd3: length,
  beddingSandTons: length,
  jointSandBags: count,
});

const materialLineSchema = z.looseObject({
  key: code<MaterialKey>(),
  item: z.string(),
  quantity: z.number().finite(),
  unit: code<MaterialUnit>(),
  note: z.string().optional(),
});

const priceLineSchema = z.looseObject({
  item: z.string(),
  quantity: z.number().finite(),
  unit: code<MaterialUnit>(),
  unitPriceCents: cents,
  totalCents: cents,
});

const priceSchema = z.looseObject({
  lowCents: cents,
  highCents: cents,
  // Breakdowns from before profit was named markup or margin carry marginCents (read by price-breakdown.ts).
  breakdown: z.looseObject({
    materialsCents: cents,
    labourHours: z.number().finite(),
    labourCents: cents,
    overheadCents: cents,
    marginCents: cents.optional(),
    totalCents: cents,
    lowCents: cents,
    highCents: cents,
    lines: z.array(priceLineSchema),
  }),
});

export const storedPlanSchema = z.looseObject({
  ring: ringPlanSchema,
  caps: capPlanSchema.nullable(),
  liner: linerPlanSchema.nullable(),
  patio: patioPlanSchema.nullable(),
  base: z.looseObject({ radiusIn: length, pitAreaFt2: length, compactedYd3: length, looseYd3: length, tons: length }),
  adhesive: z.looseObject({ gluedLayers: count, beadIn: length, cartridges: count }),
  materials: z.array(materialLineSchema),
  labour: z.looseObject({
    hours: z.number().finite(),
    tasks: z.array(z.looseObject({ task: code<LabourTaskKey>(), label: z.string(), hours: z.number().finite() })),
    sawCuts: count,
  }),
  price: priceSchema.nullable(),
  warnings: z.array(z.looseObject({ code: code<WarningCode>(), message: z.string() })),
  cautions: z.array(
    z.looseObject({ code: code<CautionCode>(), message: z.string(), audience: z.enum(["homeowner", "crew", "both"]) }),
  ),
});

export type StoredPlan = z.output<typeof storedPlanSchema>;

// A fresh plan from the engine is a stored plan: this fails to compile when the two drift apart.
export const asStoredPlan = (plan: Plan): StoredPlan => plan;
// And the stored input is what the engine takes.
export const toPlanInput = (input: StoredPlanInput): PlanInput => input;

/** A saved plan: the design with its inputs, and the engine's answer. */
export type StoredPlanRecord = { design: StoredDesign; plan: StoredPlan };

export class StoredPlanError extends Error {
  constructor(
    readonly column: "design_json" | "plan_json",
    readonly issues: string[],
  ) {
    super(`A saved plan does not read (${column}): ${issues.join("; ")}`);
    this.name = "StoredPlanError";
  }
}

function parseColumn<T extends z.ZodType>(schema: T, column: "design_json" | "plan_json", json: string): z.output<T> {
  let raw: unknown;
  try {
    raw = JSON.parse(json);
  } catch {
    throw new StoredPlanError(column, ["not JSON"]);
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) {
    throw new StoredPlanError(
      column,
      parsed.error.issues.slice(0, 5).map((issue) => `${issue.path.join(".") || "(root)"}: ${issue.message}`),
    );
  }
  return parsed.data;
}

/** Reads a saved plan's two columns; throws StoredPlanError naming the column and fields when they do not parse. */
export function readStoredPlan(row: { designJson: string; planJson: string }): StoredPlanRecord {
  return {
    design: parseColumn(storedDesignSchema, "design_json", row.designJson),
    plan: parseColumn(storedPlanSchema, "plan_json", row.planJson),
  };
}

/** Reads only the design column (its summary and choices), for pages that show no drawing. */
export function readStoredDesign(designJson: string): StoredDesign {
  return parseColumn(storedDesignSchema, "design_json", designJson);
}

/** The two column values for a plan just made, checked against the schema so they always read back. */
export function writeStoredPlan(record: StoredPlanRecord): { designJson: string; planJson: string } {
  return {
    designJson: JSON.stringify(storedDesignSchema.parse(record.design)),
    planJson: JSON.stringify(storedPlanSchema.parse(record.plan)),
  };
}
