/**
 * Every contractor-editable number the estimate depends on. Company settings override any of
 * them; the defaults below are starting points, each tagged with where it comes from. Percent
 * values are 0–100 (15 means 15 %), matching how the company settings store them.
 */
export type CompanyFactors = {
  /** Extra wall units for breakage, % of units laid. */
  wallUnitSparePct: number;
  /** Never fewer spare wall units than this. */
  wallUnitMinSpares: number;
  /** Extra cap blanks for breakage and a bad cut. */
  capSpares: number;
  firebrickSparePct: number;
  borderUnitSparePct: number;

  /** Compacted base depth under the pit, in. */
  baseDepthIn: number;
  /** How far the base reaches past the pit's outside corners, in. */
  baseBeyondFaceIn: number;
  /** Compacted base depth under a patio, in. */
  patioBaseDepthIn: number;
  /** Loose volume per compacted volume of base aggregate. */
  baseLooseFactor: number;
  /** Extra aggregate for spillage and uneven ground, %. */
  baseWastePct: number;
  /** Weight of loose base aggregate, short tons per yd³. */
  baseTonsPerYd3: number;

  /** Length of 3/8 in bead one 10.1 fl oz cartridge lays, in. */
  adhesiveBeadInPerCartridge: number;
  /** Beads run along each unit (or cap) for every glued layer. */
  adhesiveBeadsPerUnit: number;
  /** Courses glued to the one below, counted from the top. Caps are always glued. */
  gluedCourses: number;
  /** Share of a cartridge that ends up in the bead (the rest stays in the tube and nozzle), %. */
  adhesiveYieldPct: number;
  /** Glue the caps to the top course (1) or leave them dry (0). */
  glueCaps: number;

  /** Smallest gap each side between a steel ring insert and the wall, in. */
  linerMinGapIn: number;
  /** Raise a steel ring on a gravel bed when its top sits more than this below the cap's underside, in. */
  steelRingRaiseOverIn: number;
  /** Space left between the top of a liner and the underside of the caps, in. */
  linerTopClearanceIn: number;
  /** Refractory mortar joint between firebricks, in. */
  refractoryJointIn: number;
  /** Share of a pail of refractory mortar that ends up in the joints, %. */
  refractoryMortarYieldPct: number;
  /** A ripped top row of firebrick narrower than this is left out (the lining stops lower), in. */
  firebrickMinRipIn: number;
  /** Loose volume of one bag of fill sand or pea gravel, ft³. */
  fillBagFt3: number;

  /** Smallest distance along the face between a joint and the joints of the course below, in. */
  minBondOffsetIn: number;

  /** Widest joint allowed at the outside of a border course, in. */
  borderMaxJointIn: number;
  /** Narrowest cut border piece, as a share of a whole unit's length, %. */
  minCutPiecePct: number;
  /** Smallest share of waste ordered for field pavers, %; the cut count raises it. */
  paverWasteFloorPct: number;
  /** How far a patio base reaches past the paver edge at the least, in (the base depth when that is more). */
  patioBaseBeyondEdgeMinIn: number;
  /** Spacing of the spikes that hold the edge restraint, in. */
  edgeSpikeSpacingIn: number;
  /** Length of one piece of edge restraint, ft. */
  edgeRestraintPieceFt: number;

  /** A cap's overhang past the wall's outside face should not pass this anywhere along the cap, in. */
  capMaxOuterOverhangIn: number;
  /**
   * A cap count matching the wall's units may waste at most this many points more of each blank than the fewest caps,
   * %.
   */
  capMatchMaxExtraOffcutPct: number;
  /** No mark closer than this to a blank's corner (factory corners chip and are rarely square), in. */
  minMarkFromCornerIn: number;

  /** Density of concrete units, lb per ft³: gives the weight of each unit and cap. */
  concreteLbPerFt3: number;
  /** Deepest cut a 14 in masonry saw makes in one pass, in; deeper cuts take a pass from each side. */
  sawMaxCutDepthIn: number;
  /** Setting a piece on the saw, lining it up and taking it off, per pass, labour-minutes. */
  sawHandlingMinutesPerPass: number;
  /** Cut face a wet saw clears per minute (length of cut × depth), in² per minute. */
  sawCutIn2PerMinute: number;
  /** Unloading the delivery and carrying it to the pit, labour-hours per short ton. */
  carryHoursPerTon: number;
  /** Marking one cap blank from the template or the marks, labour-minutes. */
  minutesPerCapMark: number;
  /** Loading and hauling away excavated soil, labour-hours per loose yd³. */
  spoilHoursPerYd3: number;
  /** Swell of excavated soil: loose volume per bank volume. */
  spoilSwellFactor: number;

  /** The company's required distance from the fire to the property line, ft. */
  requiredPropertyLineFt: number;
  /** The company's required clearance from the fire to overhanging branches and wires, ft. */
  requiredBranchClearanceFt: number;

  beddingSandDepthIn: number;
  /** Weight of bedding sand, short tons per yd³. */
  sandTonsPerYd3: number;
  /** Joint sand used per ft² of paving, lb. */
  jointSandLbPerFt2: number;
  jointSandBagLb: number;

  /** The company's required distance from the fire to structures and combustibles, ft. */
  requiredSetbackFt: number;

  /** Layout, set-up and clean-up for the job, labour-hours. */
  setupHours: number;
  /** Excavating and compacting the pit's base, labour-hours per ft² of base. */
  basePrepHoursPerFt2: number;
  /** Setting one wall unit above the first course, labour-minutes. */
  minutesPerUnitSet: number;
  /** Setting and levelling one first-course unit, labour-minutes. */
  minutesPerFirstCourseUnit: number;
  /** Gluing and setting one cap, labour-minutes. */
  minutesPerCapSet: number;
  /** Setting a steel ring insert and backfilling its gap, labour-hours. */
  steelRingHours: number;
  /** Setting one firebrick, labour-minutes. */
  minutesPerFirebrick: number;
  /** Base, bedding, border, field cuts and joint sand for a patio, labour-hours per ft². */
  patioHoursPerFt2: number;

  labourRateCentsPerHour: number;
  overheadPct: number;
  /** The company's profit, %: a markup on cost or a margin of price, as `profitBasis` says. */
  profitPct: number;
  /** The quoted range runs this % either side of the total. */
  priceSpreadPct: number;
  /** The range's ends are rounded out to a multiple of this, cents (low down, high up). */
  priceRoundCents: number;

  /** What `labourRateCentsPerHour` is: the crew's cost per hour, or what the customer pays per hour. */
  labourRateBasis: LabourRateBasis;
  /** What `profitPct` is: a markup on cost (profit ÷ cost) or a margin of price (profit ÷ price). */
  profitBasis: ProfitBasis;
  /** Delivery of materials to the site, cents per job (a job cost: overhead and profit apply). */
  deliveryCents: number;
  /** Equipment hire (plate compactor, wet saw…), cents per job (a job cost). */
  equipmentCents: number;
  /** Spoil and debris disposal (tip fees, a skip), cents per job (a job cost). */
  disposalCents: number;
  /** Permit fees, cents per job, passed through at cost: no overhead, profit or sales tax. */
  permitCents: number;
  /** Sales tax, %; 0 where the work is not taxed. */
  salesTaxPct: number;
  /** What the tax is charged on: the materials the company buys (a job cost) or the price of the work. */
  salesTaxBasis: SalesTaxBasis;
};

/** "cost": overhead and profit go on top of the rate; "billed": the rate is what labour comes to in the price. */
export type LabourRateBasis = "cost" | "billed";
/** "markup": profit = cost × p; "margin": profit = price × p, so price = cost ÷ (1 − p). */
export type ProfitBasis = "markup" | "margin";
/** "materials": tax on the materials' cost, a job cost; "price": tax on the price of the work, added last. */
export type SalesTaxBasis = "materials" | "price";

/** The factors that are a choice between words rather than a number, with their allowed values. */
export const FACTOR_CHOICES = {
  labourRateBasis: ["cost", "billed"],
  profitBasis: ["markup", "margin"],
  salesTaxBasis: ["materials", "price"],
} as const satisfies Partial<Record<keyof CompanyFactors, readonly string[]>>;

export type ChoiceFactorKey = keyof typeof FACTOR_CHOICES;
export type NumericFactorKey = Exclude<keyof CompanyFactors, ChoiceFactorKey>;

export const DEFAULT_FACTORS: CompanyFactors = {
  wallUnitSparePct: 5, // common practice, no source: wall units +5 % or 1–2 spares
  wallUnitMinSpares: 1, // common practice, no source
  capSpares: 1, // common practice, no source: caps + 1 spare
  firebrickSparePct: 5, // common practice, no source
  borderUnitSparePct: 5, // common practice, no source

  baseDepthIn: 6, // from memory: compacted dense-graded stone 4–6 in, in lifts
  baseBeyondFaceIn: 6, // from memory: about 6 in past the outside face
  patioBaseDepthIn: 4, // from memory: 4–6 in under foot-traffic paving
  baseLooseFactor: 1.25, // from memory: loose ≈ compacted × 1.2–1.3
  baseWastePct: 10, // common practice, no source: aggregate +10–15 %
  baseTonsPerYd3: 1.4, // from memory: about 1.4 t per yd³ of crushed stone

  // 10.1 US fl oz = 10.1 × 231/128 in³ = 18.23 in³ (NIST SP 811); a 3/8 in bead has
  // π(3/16)² = 0.1104 in² of section, so one cartridge lays 18.23 / 0.1104 ≈ 165 in (derived here).
  adhesiveBeadInPerCartridge: 165,
  adhesiveBeadsPerUnit: 2, // from memory: unit makers' gluing instructions show two beads
  gluedCourses: 1, // 0–12 courses; common practice, no source: glue at least the top course and the caps
  // 50–100 %; common practice, no source: a cartridge never empties fully (tube, nozzle, first squeeze).
  adhesiveYieldPct: 85,
  glueCaps: 1, // 0 or 1; common practice, no source: caps are always glued down

  // 0.5–2 in. Common practice, no source: about 1/2 in a side, because wall units vary about ±1/8 in
  // (ASTM C1372 dimensional tolerance, from memory) and steel grows about 6.5e-6 per °F (published
  // coefficient of carbon steel): 36 in × 6.5e-6 × 800 °F ≈ 0.19 in across; the gap takes gravel.
  linerMinGapIn: 0.5,
  steelRingRaiseOverIn: 1, // 0–6 in; common practice, no source
  linerTopClearanceIn: 0.125, // 0–1 in; common practice, no source: a joint's width under the caps
  refractoryJointIn: 0.0625, // 1/32–1/4 in; supplier literature (from memory): thin dipped joints about 1/16 in
  refractoryMortarYieldPct: 50, // 25–100 %; common practice, no source: dipping and scraping waste half
  firebrickMinRipIn: 1, // 1/2–3 in; common practice, no source: a thinner strip snaps on the saw
  fillBagFt3: 0.5, // 0.25–1 ft³; from memory: the common bag of sand or pea gravel holds 0.5 ft³

  minBondOffsetIn: 3, // 1–6 in; common practice, no source: joints at least about 3 in from those below

  borderMaxJointIn: 0.1875, // 1/16–1/2 in; ICPI (from memory): paver joints 1/16–3/16 in
  minCutPiecePct: 33, // 20–60 %; common practice, no source: no cut piece under about a third of a unit
  paverWasteFloorPct: 5, // 0–20 %; common practice, no source: breakage even without cuts
  patioBaseBeyondEdgeMinIn: 6, // 4–12 in; ICPI Tech Spec 2: past the edge by the base depth, never under 6 in
  edgeSpikeSpacingIn: 12, // 6–24 in; ICPI construction guidance: spikes about every 12 in
  edgeRestraintPieceFt: 8, // 4–20 ft; from memory: plastic paver edging sold in 8 ft pieces

  capMaxOuterOverhangIn: 3, // 1–4 in; common practice, no source: usual 1–2 in, unsupported past 3 in
  capMatchMaxExtraOffcutPct: 10, // 0–30 points; common practice, no source: matching caps look better, not at any waste
  minMarkFromCornerIn: 0.25, // 0–1 in; common practice, no source: corners chip and are rarely square

  concreteLbPerFt3: 142, // 120–150 lb/ft³; from memory: concrete about 140–145 lb/ft³
  sawMaxCutDepthIn: 5, // 2–8 in; from memory: a 14 in blade cuts about 5 in deep in one pass
  sawHandlingMinutesPerPass: 0.5, // 0.1–3 min; common practice, no source
  sawCutIn2PerMinute: 40, // 5–200 in²/min; from memory: a wet saw through dense concrete
  carryHoursPerTon: 1, // 0–4 h/t; common practice, no source: two people carrying by hand or cart
  minutesPerCapMark: 2, // 0–10 min; common practice, no source
  spoilHoursPerYd3: 1.5, // 0–6 h/yd³; common practice, no source: shovel and barrow to a truck
  spoilSwellFactor: 1.25, // 1–1.5; from memory: common soil swells 20–30 % when dug

  requiredPropertyLineFt: 10, // 0–50 ft; from memory: local ordinances often ask 10 ft from the lot line
  requiredBranchClearanceFt: 10, // 0–50 ft; common practice, no source: clear of overhanging branches and wires

  beddingSandDepthIn: 1, // common practice, no source: 1 in screeded bedding
  sandTonsPerYd3: 1.35, // from memory
  jointSandLbPerFt2: 1, // from memory: polymeric sand coverage varies with joint and paver size
  jointSandBagLb: 50, // from memory: the common bag size

  requiredSetbackFt: 25, // International Fire Code §307.4.2: 25 ft from structures and combustibles

  // Labour, from memory: a two-person crew builds a 3-course, 14-unit pit with 12 cut caps and a
  // steel ring in roughly 8–14 labour-hours; these split that figure across the work.
  setupHours: 2,
  basePrepHoursPerFt2: 0.15,
  minutesPerUnitSet: 3,
  minutesPerFirstCourseUnit: 5,
  minutesPerCapSet: 5,
  steelRingHours: 0.5,
  minutesPerFirebrick: 2,
  patioHoursPerFt2: 0.12,

  labourRateCentsPerHour: 7500, // placeholder, set by each company
  overheadPct: 15, // placeholder, set by each company
  profitPct: 20, // placeholder, set by each company
  priceSpreadPct: 12, // placeholder, set by each company
  priceRoundCents: 5000, // round the range to $50

  labourRateBasis: "cost", // the arithmetic the engine has always used: overhead and profit on top
  profitBasis: "markup", // likewise: profit as a percentage of cost
  deliveryCents: 0, // set by each company; 0 leaves the line out
  equipmentCents: 0,
  disposalCents: 0,
  permitCents: 0,
  salesTaxPct: 0, // set by each company from its state's rules; 0 means untaxed
  salesTaxBasis: "materials",
};

/** Prices of the bulk supplies the plan itself quantifies, integer cents. */
export type SupplyPrices = {
  aggregatePerTonCents?: number | null;
  adhesivePerCartridgeCents?: number | null;
  beddingSandPerTonCents?: number | null;
  jointSandPerBagCents?: number | null;
  /** Sundries: a plan still prices without them, and names them as not priced. */
  refractoryMortarPerPailCents?: number | null;
  fillPerBagCents?: number | null;
  edgeRestraintPerPieceCents?: number | null;
  edgeSpikeCents?: number | null;
};

const isChoiceKey = (key: keyof CompanyFactors): key is ChoiceFactorKey => Object.hasOwn(FACTOR_CHOICES, key);

/**
 * Merges company overrides over the defaults (no rounding); unknown, non-finite or unlisted-choice overrides are
 * ignored.
 */
export function resolveFactors(overrides?: Partial<CompanyFactors>): CompanyFactors {
  const factors: CompanyFactors = { ...DEFAULT_FACTORS };
  const chosen: Record<string, unknown> = factors;
  for (const key of Object.keys(DEFAULT_FACTORS) as (keyof CompanyFactors)[]) {
    const value: unknown = overrides?.[key];
    if (isChoiceKey(key)) {
      if ((FACTOR_CHOICES[key] as readonly unknown[]).includes(value)) chosen[key] = value;
    } else if (typeof value === "number" && Number.isFinite(value)) {
      chosen[key] = value;
    }
  }
  return factors;
}
