import { formatLengthInput } from "~/domain/units";
import {
  DEFAULT_FACTORS,
  FACTOR_CHOICES,
  resolveFactors,
  type ChoiceFactorKey,
  type CompanyFactors,
  type NumericFactorKey,
} from "~/domain/factors";

/*
 * The owners' settings for every factor the engine uses, described once: the settings page, its
 * validation and the stored overrides are all built from FACTOR_DESCRIPTORS. A factor added to
 * CompanyFactors (app/domain/factors.ts) fails the type check here until it has a descriptor, and
 * then appears on the page with no other change. Defaults come from DEFAULT_FACTORS, never repeated.
 */

export type FactorGroup = "waste" | "base" | "adhesive" | "liner" | "patio" | "labour" | "price" | "extras" | "safety";

export const FACTOR_GROUPS: { id: FactorGroup; title: string; intro: string }[] = [
  { id: "price", title: "Labour rate, overhead and profit", intro: "How the job's cost becomes its price." },
  { id: "extras", title: "Other price lines", intro: "Per-job costs and taxes; 0 leaves a line out of the price." },
  { id: "labour", title: "Production rates", intro: "Labour for each task of the build, for the crew as a whole." },
  {
    id: "waste",
    title: "Spares, cuts and limits",
    intro: "What to order beyond the pieces laid, and the limits the layout keeps to.",
  },
  { id: "base", title: "Base", intro: "Compacted crushed stone under the pit and the patio." },
  { id: "adhesive", title: "Adhesive", intro: "Masonry adhesive for the glued courses and the caps." },
  { id: "liner", title: "Liner", intro: "Steel ring inserts and firebrick linings." },
  { id: "patio", title: "Patio", intro: "Base reach, border joints, edge restraint, bedding and joint sand." },
  { id: "safety", title: "Safety", intro: "Checked against every design's three distances." },
];

type Common = { label: string; help: string; group: FactorGroup };

/** A number typed in the factor's own unit; `money` ones are typed in dollars and stored in cents. */
export type NumberDescriptor = Common & {
  kind: "number" | "money";
  unit: string;
  /** Range and step in the unit typed (dollars for money). */
  min: number;
  max: number;
  step: number;
  /** Whole numbers only (counts). */
  whole?: boolean;
};

export type ChoiceDescriptor = Common & { kind: "choice"; options: { value: string; label: string }[] };

type DescriptorTable = { [K in NumericFactorKey]: NumberDescriptor } & { [K in ChoiceFactorKey]: ChoiceDescriptor };

const pct = (group: FactorGroup, label: string, max: number, help: string): NumberDescriptor => ({
  kind: "number",
  label,
  unit: "%",
  min: 0,
  max,
  step: 0.1,
  help,
  group,
});
const count = (group: FactorGroup, label: string, unit: string, max: number, help: string): NumberDescriptor => ({
  kind: "number",
  label,
  unit,
  min: 0,
  max,
  step: 1,
  whole: true,
  help,
  group,
});
const minutes = (label: string, help: string): NumberDescriptor => ({
  kind: "number",
  label,
  unit: "min",
  min: 0,
  max: 60,
  step: 0.5,
  help,
  group: "labour",
});
const dollars = (
  group: FactorGroup,
  label: string,
  unit: string,
  min: number,
  max: number,
  help: string,
): NumberDescriptor => ({
  kind: "money",
  label,
  unit,
  min,
  max,
  step: 0.01,
  help,
  group,
});

export const FACTOR_DESCRIPTORS: DescriptorTable = {
  labourRateBasis: {
    kind: "choice",
    group: "price",
    label: "The labour rate is",
    options: [
      { value: "cost", label: "What an hour of labour costs us (overhead and profit go on top)" },
      { value: "billed", label: "What we bill the customer for an hour of labour" },
    ],
    help: "The breakdown shows both figures either way: the cost per hour and what an hour comes to in the price.",
  },
  labourRateCentsPerHour: dollars(
    "price",
    "Labour rate",
    "$/h",
    0,
    500,
    "Per labour-hour, for the crew as a whole; cost or billed as chosen above.",
  ),
  overheadPct: pct(
    "price",
    "Overhead",
    100,
    "Added to the job's cost (materials, labour, delivery, equipment, disposal).",
  ),
  profitBasis: {
    kind: "choice",
    group: "price",
    label: "We set our profit as",
    options: [
      { value: "markup", label: "A markup on cost (profit ÷ cost)" },
      { value: "margin", label: "A margin of the price (profit ÷ price)" },
    ],
    help: "A 25 % markup on cost and a 20 % margin of price give the same price.",
  },
  profitPct: pct(
    "price",
    "Profit",
    300,
    "A markup on cost or a margin of price, as chosen above; a margin stays below 90 %.",
  ),
  priceSpreadPct: pct(
    "price",
    "Price range spread",
    50,
    "Homeowners see the price as a range this far either side of your estimate.",
  ),
  priceRoundCents: dollars(
    "price",
    "Round the range to",
    "$",
    0.01,
    1000,
    "The range's low end is rounded down and its high end up to a multiple of this.",
  ),

  deliveryCents: dollars(
    "extras",
    "Delivery, per job",
    "$",
    0,
    5000,
    "Delivering the materials to the site; a job cost, so overhead and profit apply.",
  ),
  equipmentCents: dollars(
    "extras",
    "Equipment hire, per job",
    "$",
    0,
    5000,
    "Plate compactor, wet saw and the like; a job cost.",
  ),
  disposalCents: dollars(
    "extras",
    "Disposal, per job",
    "$",
    0,
    5000,
    "Tip fees or a skip for spoil and debris; a job cost.",
  ),
  permitCents: dollars(
    "extras",
    "Permit fees, per job",
    "$",
    0,
    5000,
    "Passed through at cost: no overhead, profit or sales tax.",
  ),
  salesTaxPct: {
    kind: "number",
    group: "extras",
    label: "Sales tax",
    unit: "%",
    min: 0,
    max: 20,
    step: 0.001,
    help: "Your state's and town's rate; 0 where the work is not taxed. Check with your tax adviser.",
  },
  salesTaxBasis: {
    kind: "choice",
    group: "extras",
    label: "Sales tax is charged on",
    options: [
      { value: "materials", label: "The materials we buy (a job cost)" },
      { value: "price", label: "The price of the work (added to the customer's price)" },
    ],
    help: "States differ: in many, a contractor pays the tax on materials; in others the customer pays it on the job. Permits are never taxed here.",
  },

  setupHours: {
    kind: "number",
    group: "labour",
    label: "Layout, set-up and clean-up, per job",
    unit: "h",
    min: 0,
    max: 16,
    step: 0.25,
    help: "Once per job.",
  },
  basePrepHoursPerFt2: {
    kind: "number",
    group: "labour",
    label: "Excavate and compact the base",
    unit: "h/ft²",
    min: 0,
    max: 1,
    step: 0.01,
    help: "Per ft² of the base under the pit.",
  },
  minutesPerFirstCourseUnit: minutes("Set and level a first-course unit", "Per unit of the first course."),
  minutesPerUnitSet: minutes("Stack and glue an upper unit", "Per unit above the first course."),
  sawHandlingMinutesPerPass: {
    kind: "number",
    group: "labour",
    label: "Handling per saw pass",
    unit: "min",
    min: 0.1,
    max: 3,
    step: 0.1,
    help: "Setting a piece on the saw, lining it up and taking it off, each pass.",
  },
  sawCutIn2PerMinute: {
    kind: "number",
    group: "labour",
    label: "Wet-saw cutting speed",
    unit: "in²/min",
    min: 5,
    max: 200,
    step: 1,
    help: "Cut face cleared per minute (length of cut × depth) through your units.",
  },
  sawMaxCutDepthIn: {
    kind: "number",
    group: "labour",
    label: "Deepest one-pass saw cut",
    unit: "in",
    min: 2,
    max: 8,
    step: 0.25,
    help: "About 5 in for a 14 in blade; deeper cuts take a pass from each side.",
  },
  minutesPerCapMark: minutes("Mark a cap blank", "Per cap, from the template or the marks."),
  carryHoursPerTon: {
    kind: "number",
    group: "labour",
    label: "Unload and carry to the pit",
    unit: "h/t",
    min: 0,
    max: 4,
    step: 0.05,
    help: "Per short ton delivered, by hand or cart.",
  },
  spoilHoursPerYd3: {
    kind: "number",
    group: "labour",
    label: "Load and haul away spoil",
    unit: "h/yd³",
    min: 0,
    max: 6,
    step: 0.05,
    help: "Per loose cubic yard of excavated soil.",
  },
  spoilSwellFactor: {
    kind: "number",
    group: "labour",
    label: "Soil swell when dug",
    unit: "×",
    min: 1,
    max: 1.5,
    step: 0.01,
    help: "Loose volume per volume in the ground (common soil about 1.2–1.3).",
  },
  minutesPerCapSet: minutes("Glue and set a cap", "Per cap."),
  steelRingHours: {
    kind: "number",
    group: "labour",
    label: "Set a steel ring and backfill",
    unit: "h",
    min: 0,
    max: 8,
    step: 0.25,
    help: "Once per steel ring insert.",
  },
  minutesPerFirebrick: minutes("Set a firebrick", "Per brick of the lining."),
  patioHoursPerFt2: {
    kind: "number",
    group: "labour",
    label: "Patio",
    unit: "h/ft²",
    min: 0,
    max: 1,
    step: 0.01,
    help: "Base, bedding, border, field cuts and joint sand, per ft² paved.",
  },

  wallUnitSparePct: pct("waste", "Spare wall units", 25, "Of the units laid, rounded up (common practice: about 5 %)."),
  wallUnitMinSpares: count("waste", "At least this many spare wall units", "units", 10, "However small the job."),
  capSpares: count("waste", "Spare cap blanks", "blanks", 10, "For breakage and a bad cut."),
  firebrickSparePct: pct("waste", "Spare firebrick", 25, "Of the bricks laid, rounded up."),
  borderUnitSparePct: pct("waste", "Spare border units", 25, "Of the border course, rounded up; never fewer than one."),
  paverWasteFloorPct: pct(
    "waste",
    "Paver spares beyond the cuts",
    20,
    "Cut pavers are counted from the layout; this covers breakage on top (common practice: about 5 %).",
  ),

  baseDepthIn: {
    kind: "number",
    group: "base",
    label: "Base depth under the pit",
    unit: "in",
    min: 2,
    max: 12,
    step: 0.25,
    help: "Compacted, laid in lifts (about 4–6 in is usual).",
  },
  baseBeyondFaceIn: {
    kind: "number",
    group: "base",
    label: "Base past the wall",
    unit: "in",
    min: 0,
    max: 24,
    step: 0.25,
    help: "How far the base runs past the wall's outside corners.",
  },
  patioBaseDepthIn: {
    kind: "number",
    group: "base",
    label: "Base depth under a patio",
    unit: "in",
    min: 2,
    max: 12,
    step: 0.25,
    help: "Compacted, for foot traffic.",
  },
  baseLooseFactor: {
    kind: "number",
    group: "base",
    label: "Loose to compacted volume",
    unit: "×",
    min: 1,
    max: 1.6,
    step: 0.01,
    help: "Loose stone per compacted volume (about 1.2–1.3).",
  },
  baseWastePct: pct("base", "Base stone waste", 30, "For spillage and uneven ground."),
  baseTonsPerYd3: {
    kind: "number",
    group: "base",
    label: "Base stone weight",
    unit: "t/yd³",
    min: 0.8,
    max: 2.2,
    step: 0.01,
    help: "Short tons per loose cubic yard; ask your supplier.",
  },

  adhesiveBeadInPerCartridge: {
    kind: "number",
    group: "adhesive",
    label: "Bead length per cartridge",
    unit: "in",
    min: 20,
    max: 400,
    step: 1,
    help: "A 10.1 fl oz cartridge holds 18.2 in³: about 165 in of 3/8 in bead if every drop came out.",
  },
  adhesiveBeadsPerUnit: count(
    "adhesive",
    "Beads along each unit",
    "beads",
    4,
    "Per glued layer, as the unit maker's instructions show.",
  ),
  gluedCourses: count("adhesive", "Glued courses", "courses", 12, "Counted from the top course down."),
  adhesiveYieldPct: {
    kind: "number",
    group: "adhesive",
    label: "Usable share of a cartridge",
    unit: "%",
    min: 50,
    max: 100,
    step: 1,
    help: "A cartridge never empties fully: some stays in the tube and nozzle.",
  },
  glueCaps: {
    kind: "number",
    group: "adhesive",
    label: "Glue the caps down",
    unit: "1 = yes, 0 = no",
    min: 0,
    max: 1,
    step: 1,
    whole: true,
    help: "Caps are normally glued to the top course with a heat-rated masonry adhesive.",
  },

  linerMinGapIn: {
    kind: "number",
    group: "liner",
    label: "Gap around a steel ring",
    unit: "in",
    min: 0.5,
    max: 2,
    step: 0.0625,
    help: "Smallest gap each side between the insert and the wall, backfilled with gravel: units vary about ±1/8 in and steel grows when hot.",
  },
  steelRingRaiseOverIn: {
    kind: "number",
    group: "liner",
    label: "Raise a steel ring when it sits lower than",
    unit: "in",
    min: 0,
    max: 6,
    step: 0.125,
    help: "Below the caps' underside; the ring is then set on a gravel bed.",
  },
  linerTopClearanceIn: {
    kind: "number",
    group: "liner",
    label: "Space under the caps",
    unit: "in",
    min: 0,
    max: 1,
    step: 0.0625,
    help: "Between the top of a liner and the underside of the caps, so the caps bear on the block.",
  },
  refractoryJointIn: {
    kind: "number",
    group: "liner",
    label: "Firebrick joint",
    unit: "in",
    min: 0.03125,
    max: 0.25,
    step: 0.03125,
    help: "Refractory mortar joint between bricks.",
  },
  refractoryMortarYieldPct: {
    kind: "number",
    group: "liner",
    label: "Refractory mortar in the joints",
    unit: "%",
    min: 25,
    max: 100,
    step: 1,
    help: "Share of a pail that ends up in the joints.",
  },
  firebrickMinRipIn: {
    kind: "number",
    group: "liner",
    label: "Narrowest ripped firebrick row",
    unit: "in",
    min: 0.5,
    max: 3,
    step: 0.125,
    help: "A thinner top row is left out and the lining stops lower.",
  },
  fillBagFt3: {
    kind: "number",
    group: "liner",
    label: "Fill bag",
    unit: "ft³",
    min: 0.25,
    max: 1,
    step: 0.05,
    help: "Loose volume of one bag of sand or pea gravel for the gap and the ring's bed.",
  },

  minBondOffsetIn: {
    kind: "number",
    group: "waste",
    label: "Smallest joint offset between courses",
    unit: "in",
    min: 1,
    max: 6,
    step: 0.25,
    help: "Joints closer than this to the joints below are warned about (about 3 in is usual).",
  },
  minCutPiecePct: pct(
    "waste",
    "Narrowest cut piece",
    60,
    "Of a whole unit's length, for closures and border pieces (about a third is usual).",
  ),
  capMaxOuterOverhangIn: {
    kind: "number",
    group: "waste",
    label: "Most a cap may overhang outside",
    unit: "in",
    min: 1,
    max: 4,
    step: 0.125,
    help: "Anywhere along the cap; 1–2 in is usual.",
  },
  capMatchMaxExtraOffcutPct: pct(
    "waste",
    "Extra offcut allowed to match the wall",
    30,
    "Percentage points more of each blank a cap count matching the wall units may waste.",
  ),
  minMarkFromCornerIn: {
    kind: "number",
    group: "waste",
    label: "Closest mark to a blank's corner",
    unit: "in",
    min: 0,
    max: 1,
    step: 0.0625,
    help: "Factory corners chip and are rarely square.",
  },
  concreteLbPerFt3: {
    kind: "number",
    group: "waste",
    label: "Concrete density",
    unit: "lb/ft³",
    min: 120,
    max: 150,
    step: 1,
    help: "Gives the weight of each unit and cap on the cut sheet.",
  },

  borderMaxJointIn: {
    kind: "number",
    group: "patio",
    label: "Widest border joint",
    unit: "in",
    min: 0.0625,
    max: 0.5,
    step: 0.0625,
    help: "At the outside of the border course (paver joints are usually 1/16–3/16 in).",
  },
  patioBaseBeyondEdgeMinIn: {
    kind: "number",
    group: "patio",
    label: "Patio base past the paver edge, at least",
    unit: "in",
    min: 4,
    max: 12,
    step: 0.25,
    help: "The base runs past the edge by its depth, never less than this.",
  },
  edgeSpikeSpacingIn: {
    kind: "number",
    group: "patio",
    label: "Edge restraint spike spacing",
    unit: "in",
    min: 6,
    max: 24,
    step: 1,
    help: "About every 12 in.",
  },
  edgeRestraintPieceFt: {
    kind: "number",
    group: "patio",
    label: "Edge restraint piece",
    unit: "ft",
    min: 4,
    max: 20,
    step: 1,
    help: "The length you buy.",
  },
  beddingSandDepthIn: {
    kind: "number",
    group: "patio",
    label: "Bedding sand depth",
    unit: "in",
    min: 0.5,
    max: 2,
    step: 0.125,
    help: "Screeded under the pavers.",
  },
  sandTonsPerYd3: {
    kind: "number",
    group: "patio",
    label: "Bedding sand weight",
    unit: "t/yd³",
    min: 0.8,
    max: 2.2,
    step: 0.01,
    help: "Short tons per cubic yard.",
  },
  jointSandLbPerFt2: {
    kind: "number",
    group: "patio",
    label: "Joint sand",
    unit: "lb/ft²",
    min: 0,
    max: 5,
    step: 0.05,
    help: "Per ft² paved; depends on the joints and the paver size.",
  },
  jointSandBagLb: {
    kind: "number",
    group: "patio",
    label: "Joint sand bag",
    unit: "lb",
    min: 10,
    max: 100,
    step: 1,
    help: "The bag size you buy.",
  },

  requiredSetbackFt: {
    kind: "number",
    group: "safety",
    label: "Required setback from buildings",
    unit: "ft",
    min: 5,
    max: 100,
    step: 0.5,
    help: "Use your fire authority's figure. The International Fire Code's is 25 ft for recreational fires; towns range from 10 to 50 ft.",
  },
  requiredPropertyLineFt: {
    kind: "number",
    group: "safety",
    label: "Required distance from the property line",
    unit: "ft",
    min: 0,
    max: 50,
    step: 0.5,
    help: "Your town's figure; many ask about 10 ft.",
  },
  requiredBranchClearanceFt: {
    kind: "number",
    group: "safety",
    label: "Required clearance from branches and wires",
    unit: "ft",
    min: 0,
    max: 50,
    step: 0.5,
    help: "Measured to overhanging branches and wires.",
  },
};

export type FactorKey = keyof CompanyFactors;

export type FactorRow = (NumberDescriptor | ChoiceDescriptor) & { key: FactorKey; default: number | string };

/** Every descriptor with its key and its default from DEFAULT_FACTORS, in table order. */
export const FACTOR_ROWS: FactorRow[] = (Object.keys(FACTOR_DESCRIPTORS) as FactorKey[]).map((key) => ({
  ...FACTOR_DESCRIPTORS[key],
  key,
  default: DEFAULT_FACTORS[key],
}));

/** The most a margin of price may be: at 100 % the price would be infinite. */
export const MAX_MARGIN_PCT = 90;

/** A stored value (cents for money) as typed into the form (dollars for money). */
export function toFormValue(row: FactorRow, value: number | string): string {
  if (row.kind === "money" && typeof value === "number") return (value / 100).toFixed(2);
  if (row.kind === "number" && row.unit === "in" && typeof value === "number") return formatLengthInput(value);
  return String(value);
}

/** Factors the configurator's browser may see: everything but money and how the price is made. */
export function publicFactors(factors: CompanyFactors): Partial<CompanyFactors> {
  const shown: Record<string, unknown> = {};
  for (const row of FACTOR_ROWS) {
    if (row.group !== "price" && row.group !== "extras") shown[row.key] = factors[row.key];
  }
  return shown as Partial<CompanyFactors>;
}

/** The company columns that hold some factors (older settings); everything else is in factorsJson. */
export const COLUMN_FACTORS = {
  labourRateCentsPerHour: "labourRateCents",
  overheadPct: "overheadPct",
  // The column keeps its historical name; it holds the profit percentage on the company's chosen basis.
  profitPct: "marginPct",
  priceSpreadPct: "priceSpreadPct",
  requiredSetbackFt: "setbackFt",
} as const satisfies Partial<Record<FactorKey, string>>;

type CompanyFactorSource = { factorsJson: string } & {
  [C in (typeof COLUMN_FACTORS)[keyof typeof COLUMN_FACTORS]]: number;
};

/** Checks one stored value against its descriptor (money in cents); undefined when it does not hold. */
export function checkStoredFactor(key: FactorKey, value: unknown): number | string | undefined {
  const row = FACTOR_DESCRIPTORS[key];
  if (row.kind === "choice") {
    return (FACTOR_CHOICES[key as ChoiceFactorKey] as readonly unknown[]).includes(value)
      ? (value as string)
      : undefined;
  }
  if (typeof value !== "number" || !Number.isFinite(value)) return undefined;
  const scale = row.kind === "money" ? 100 : 1;
  if (value < row.min * scale - 1e-9 || value > row.max * scale + 1e-9) return undefined;
  if (row.whole && !Number.isInteger(value)) return undefined;
  return value;
}

/** The company's stored overrides (factorsJson), each checked; anything unreadable or out of range is dropped. */
export function readFactorOverrides(factorsJson: string): Partial<CompanyFactors> {
  let stored: unknown;
  try {
    stored = JSON.parse(factorsJson);
  } catch {
    return {};
  }
  if (!stored || typeof stored !== "object" || Array.isArray(stored)) return {};
  const overrides: Record<string, number | string> = {};
  for (const key of Object.keys(FACTOR_DESCRIPTORS) as FactorKey[]) {
    if (Object.hasOwn(COLUMN_FACTORS, key)) continue;
    const value = checkStoredFactor(key, (stored as Record<string, unknown>)[key]);
    if (value !== undefined) overrides[key] = value;
  }
  return overrides as Partial<CompanyFactors>;
}

/** Every factor of a company: its columns and checked overrides over the defaults. */
export function readCompanyFactors(company: CompanyFactorSource): CompanyFactors {
  const fromColumns: Record<string, number> = {};
  for (const [key, column] of Object.entries(COLUMN_FACTORS)) {
    const value = checkStoredFactor(key as FactorKey, company[column]);
    if (typeof value === "number") fromColumns[key] = value;
  }
  return resolveFactors({ ...readFactorOverrides(company.factorsJson), ...fromColumns });
}
