import type { CatalogKind, LeadStatus, OrderUnit } from "~/db/schema";

/*
 * The demo scenario. Every company, person, product name and price here is invented.
 */

export const DEMO_PASSWORD = "ember-demo-2026";

type SeedItem = {
  kind: CatalogKind;
  name: string;
  colourName?: string;
  colourHex?: string;
  faceIn?: number;
  backIn?: number;
  depthIn?: number;
  heightIn?: number;
  lengthIn?: number;
  widthIn?: number;
  thicknessIn?: number;
  diameterIn?: number;
  priceCents: number;
  /**
   * Ordering: the supplier's name (from the company's `suppliers`), how it is sold, pack size or step, weight of one
   * order unit (lb).
   */
  supplier?: string;
  orderUnit?: OrderUnit;
  unitsPerOrderUnit?: number;
  orderUnitWeightLb?: number;
};

export type SeedCompany = {
  slug: string;
  name: string;
  email: string;
  phone: string;
  town: string;
  timeZone: string;
  consultFeeCents: number;
  setbackFt: number;
  labourRateCents: number;
  overheadPct: number;
  marginPct: number;
  priceSpreadPct: number;
  staff: { email: string; name: string; role: "owner" | "estimator" | "crew" }[];
  suppliers: { name: string; email: string; phone: string }[];
  catalog: SeedItem[];
};

/*
 * Ordering terms of the demo catalog, invented for the demo (no maker's figures). Weights: the unit's
 * volume × 142 lb/ft³ (the engine's concrete density, from memory), plus about 40 lb for the pallet
 * (common practice, no source); a 9 in firebrick straight about 7.5 lb (from memory).
 */
const YARD = "Millbrook Stone Yard";
const HEARTH = "Kestrel Hearth Supply";

export const DEMO_COMPANIES: SeedCompany[] = [
  {
    slug: "cinder-slate",
    name: "Cinder & Slate Outdoor Works",
    email: "office@cinder-slate.test",
    // 555-0100 to 555-0199 are set aside for fiction in every North American area code (NANPA).
    phone: "+12175550142",
    town: "Millbrook Falls",
    timeZone: "America/Chicago",
    consultFeeCents: 15000,
    setbackFt: 25,
    labourRateCents: 8500,
    overheadPct: 15,
    marginPct: 22,
    priceSpreadPct: 12,
    staff: [
      { email: "owner@cinder-slate.test", name: "Maren Okafor", role: "owner" },
      { email: "estimator@cinder-slate.test", name: "Theo Brandvold", role: "estimator" },
      { email: "crew@cinder-slate.test", name: "Dario Quist", role: "crew" },
    ],
    suppliers: [
      { name: YARD, email: "orders@millbrook-stone.test", phone: "+12175550163" },
      { name: HEARTH, email: "sales@kestrel-hearth.test", phone: "+12175550178" },
    ],
    catalog: [
      {
        kind: "wall-unit",
        name: "Hearthline Taper",
        colourName: "Ember Blend",
        colourHex: "#8f6b58",
        faceIn: 12,
        backIn: 8,
        depthIn: 8,
        heightIn: 4,
        priceCents: 485,
        supplier: YARD,
        orderUnit: "pallet",
        unitsPerOrderUnit: 72,
        orderUnitWeightLb: 1935,
      },
      {
        kind: "wall-unit",
        name: "Ridgeback Taper",
        colourName: "Granite Grey",
        colourHex: "#8a8782",
        faceIn: 11.5,
        backIn: 7.75,
        depthIn: 7,
        heightIn: 4,
        priceCents: 445,
        supplier: YARD,
        orderUnit: "pallet",
        unitsPerOrderUnit: 90,
        orderUnitWeightLb: 2030,
      },
      {
        kind: "wall-unit",
        name: "Kilnstone Grand Taper",
        colourName: "Charcoal",
        colourHex: "#4d4946",
        faceIn: 12,
        backIn: 8.75,
        depthIn: 9,
        heightIn: 6,
        priceCents: 740,
        supplier: YARD,
        orderUnit: "pallet",
        unitsPerOrderUnit: 40,
        orderUnitWeightLb: 1880,
      },
      {
        kind: "wall-unit",
        name: "Fieldcut Taper",
        colourName: "Sandstone Tan",
        colourHex: "#b79d7c",
        faceIn: 11,
        backIn: 7.5,
        depthIn: 7.5,
        heightIn: 3.5,
        priceCents: 395,
        supplier: YARD,
        orderUnit: "pallet",
        unitsPerOrderUnit: 100,
        orderUnitWeightLb: 2035,
      },
      {
        kind: "wall-unit",
        name: "Plainface Block",
        colourName: "Limestone",
        colourHex: "#c9c0b0",
        faceIn: 12,
        backIn: 12,
        depthIn: 8,
        heightIn: 4,
        priceCents: 360,
        supplier: YARD,
        orderUnit: "pallet",
        unitsPerOrderUnit: 60,
        orderUnitWeightLb: 1935,
      },
      {
        kind: "wall-unit",
        name: "Quarry Square",
        colourName: "Slate Brown",
        colourHex: "#6b5a4e",
        faceIn: 16,
        backIn: 16,
        depthIn: 8,
        heightIn: 6,
        priceCents: 690,
        supplier: YARD,
        orderUnit: "pallet",
        unitsPerOrderUnit: 30,
        orderUnitWeightLb: 1933,
      },
      {
        kind: "cap",
        name: "Sill Cap 16",
        colourName: "Charcoal",
        colourHex: "#55504c",
        lengthIn: 16,
        depthIn: 12,
        thicknessIn: 2.5,
        priceCents: 950,
        supplier: YARD,
        orderUnit: "each",
        orderUnitWeightLb: 39,
      },
      {
        kind: "cap",
        name: "Broad Cap 20",
        colourName: "Ember Blend",
        colourHex: "#94705c",
        lengthIn: 20,
        depthIn: 13,
        thicknessIn: 3,
        priceCents: 1420,
        supplier: YARD,
        orderUnit: "each",
        orderUnitWeightLb: 64,
      },
      {
        kind: "cap",
        name: "Bluestone-look Cap 18",
        colourName: "Blue Grey",
        colourHex: "#6c7379",
        lengthIn: 18,
        depthIn: 12,
        thicknessIn: 2.5,
        priceCents: 1280,
        supplier: YARD,
        orderUnit: "each",
        orderUnitWeightLb: 44,
      },
      {
        kind: "steel-ring",
        name: "Heavy Ring 36",
        colourName: "Black steel",
        colourHex: "#2a2a2a",
        diameterIn: 36,
        heightIn: 10,
        priceCents: 18900,
        supplier: HEARTH,
        orderUnit: "each",
        orderUnitWeightLb: 45,
      },
      {
        kind: "steel-ring",
        name: "Heavy Ring 42",
        colourName: "Black steel",
        colourHex: "#2a2a2a",
        diameterIn: 42,
        heightIn: 10,
        priceCents: 22900,
        supplier: HEARTH,
        orderUnit: "each",
        orderUnitWeightLb: 55,
      },
      {
        kind: "firebrick",
        name: "Firebrick straight",
        colourName: "Buff",
        colourHex: "#d9c39a",
        lengthIn: 9,
        widthIn: 4.5,
        heightIn: 2.5,
        priceCents: 310,
        supplier: HEARTH,
        orderUnit: "each",
        orderUnitWeightLb: 7.5,
      },
      {
        kind: "paver",
        name: "Courtyard Paver 6×9",
        colourName: "Autumn Blend",
        colourHex: "#a07d63",
        lengthIn: 9,
        widthIn: 6,
        thicknessIn: 2.375,
        priceCents: 95,
        supplier: YARD,
        orderUnit: "cube",
        unitsPerOrderUnit: 180,
        orderUnitWeightLb: 1930,
      },
      {
        kind: "paver",
        name: "Courtyard Paver 12×12",
        colourName: "Pewter",
        colourHex: "#8d8b87",
        lengthIn: 12,
        widthIn: 12,
        thicknessIn: 2.375,
        priceCents: 240,
        supplier: YARD,
        orderUnit: "cube",
        unitsPerOrderUnit: 70,
        orderUnitWeightLb: 2000,
      },
      {
        kind: "border-unit",
        name: "Rim Border 4×8",
        colourName: "Charcoal",
        colourHex: "#4f4a46",
        lengthIn: 8,
        widthIn: 4,
        thicknessIn: 2.375,
        priceCents: 80,
        supplier: YARD,
        orderUnit: "each",
        orderUnitWeightLb: 6.2,
      },
      {
        kind: "border-unit",
        name: "Rim Border 6×12",
        colourName: "Charcoal",
        colourHex: "#4f4a46",
        lengthIn: 12,
        widthIn: 6,
        thicknessIn: 2.375,
        priceCents: 165,
        supplier: YARD,
        orderUnit: "each",
        orderUnitWeightLb: 14,
      },
      {
        kind: "aggregate",
        name: "Crushed base 3/4 in minus",
        priceCents: 4800,
        supplier: YARD,
        orderUnit: "ton",
        unitsPerOrderUnit: 0.5,
      },
      {
        kind: "adhesive",
        name: "Masonry adhesive 10.1 oz",
        priceCents: 850,
        supplier: HEARTH,
        orderUnit: "case",
        unitsPerOrderUnit: 12,
        orderUnitWeightLb: 12,
      },
      {
        kind: "bedding-sand",
        name: "Concrete sand",
        priceCents: 4200,
        supplier: YARD,
        orderUnit: "ton",
        unitsPerOrderUnit: 0.5,
      },
      {
        kind: "joint-sand",
        name: "Polymeric joint sand 50 lb",
        priceCents: 2900,
        supplier: YARD,
        orderUnit: "bag",
        orderUnitWeightLb: 50,
      },
      {
        kind: "refractory-mortar",
        name: "Refractory mortar, 1 gal",
        priceCents: 3400,
        supplier: HEARTH,
        orderUnit: "pail",
        orderUnitWeightLb: 12,
      },
      {
        kind: "fill",
        name: "Pea gravel 0.5 ft³",
        priceCents: 650,
        supplier: YARD,
        orderUnit: "bag",
        orderUnitWeightLb: 50,
      },
      {
        kind: "edge-restraint",
        name: "Paver edging 8 ft",
        priceCents: 1150,
        supplier: YARD,
        orderUnit: "piece",
        orderUnitWeightLb: 4,
      },
      {
        kind: "edge-spike",
        name: "Edging spike 10 in",
        priceCents: 45,
        supplier: YARD,
        orderUnit: "each",
        orderUnitWeightLb: 0.4,
      },
    ],
  },
  {
    slug: "north-ridge",
    name: "North Ridge Hearth & Patio",
    email: "hello@north-ridge.test",
    phone: "+19705550117",
    town: "Cedar Hollow",
    timeZone: "America/Denver",
    consultFeeCents: 12500,
    setbackFt: 20,
    labourRateCents: 7800,
    overheadPct: 12,
    marginPct: 18,
    priceSpreadPct: 15,
    staff: [{ email: "owner@north-ridge.test", name: "Ilse Marchetti", role: "owner" }],
    suppliers: [{ name: "Cedar Hollow Landscape Depot", email: "desk@cedar-hollow-depot.test", phone: "+19705550121" }],
    catalog: [
      {
        kind: "wall-unit",
        name: "Timberline Taper",
        colourName: "Canyon Red",
        colourHex: "#8c5443",
        faceIn: 12,
        backIn: 8.25,
        depthIn: 7.5,
        heightIn: 4,
        priceCents: 470,
        supplier: "Cedar Hollow Landscape Depot",
        orderUnit: "pallet",
        unitsPerOrderUnit: 72,
        orderUnitWeightLb: 1900,
      },
      {
        kind: "cap",
        name: "Ridge Cap 18",
        colourName: "Slate",
        colourHex: "#5b6066",
        lengthIn: 18,
        depthIn: 12,
        thicknessIn: 2.5,
        priceCents: 1190,
      },
      {
        kind: "steel-ring",
        name: "Camp Ring 38",
        colourName: "Black steel",
        colourHex: "#2a2a2a",
        diameterIn: 38,
        heightIn: 10,
        priceCents: 19900,
      },
      {
        kind: "aggregate",
        name: "Road base",
        priceCents: 4500,
        supplier: "Cedar Hollow Landscape Depot",
        orderUnit: "cubic-yard",
        unitsPerOrderUnit: 0.5,
      },
      { kind: "adhesive", name: "Block glue", priceCents: 790 },
      { kind: "fill", name: "Pea gravel bag", priceCents: 600 },
    ],
  },
];

/*
 * Demo requests: a dozen per company, in every status. Names, addresses and e-mail addresses are
 * invented (example.test is reserved for testing; 555-01xx numbers are fictional). Designs are
 * given by catalog names and run through the real engine when seeded.
 */

export type SeedDesign = {
  stone: string;
  units?: number;
  courses: number;
  cap: string | null;
  overhang?: number;
  liner: "none" | "steel-ring" | "firebrick";
  ring?: string;
  /** Size the bowl to the ring insert. */
  fit?: boolean;
  patioFt?: number;
  paver?: string;
  border?: string;
  setbackFt?: number;
};

export type SeedLead = {
  customerName: string;
  email: string;
  phone: string;
  street: string;
  town: string;
  buildWindow: "within-a-month" | "one-to-three-months" | "this-season" | "next-year" | "not-sure";
  notes: string;
  status: LeadStatus;
  /** Why a job is on hold or not going ahead, and the step it stopped at. */
  stopReason?: string;
  pausedStage?: LeadStatus;
  /** How long ago the request came in, hours. */
  ageHours: number;
  /** Who works it: a staff e-mail of the company. */
  assignee: string | null;
  /** The crew member building a signed job. */
  crew?: string;
  /** Staff notes on the timeline, by staff e-mail. */
  staffNotes?: { by: string; text: string }[];
  design: SeedDesign;
  /** The job's papers: the site visit, the proposal and how far it got, a change order. */
  papers?: SeedPapers;
  /** The homeowner has an account (the demo password) holding this request, so "My requests" shows it. */
  homeownerAccount?: boolean;
};

export type SeedVisit = {
  structureFt: number;
  propertyLineFt: number;
  branchesFt: number | null;
  slope: "level" | "gentle" | "steep";
  soil: "sand" | "loam" | "clay" | "rock" | "fill";
  accessWidthIn: number;
  utilityMarks: "marked-clear" | "marked-near" | "not-marked-yet";
  spoil: "haul-away" | "spread-on-site" | "pile-for-homeowner";
  notes: string;
};

export type SeedPapers = {
  visit: SeedVisit;
  proposal?: {
    fixedPrice: number;
    addOns: { label: string; price: number }[];
    /** How far it got: sent (and opened or not), signed awaiting the deposit, or signed with the deposit in. */
    state: "sent" | "opened" | "accepted" | "signed" | "expired";
    chosen?: number[];
    /** A signed change order for the difference, in dollars (the design is revised to match). */
    changeOrder?: { delta: number; courses: number };
  };
};

const VISIT_OK: SeedVisit = {
  structureFt: 31,
  propertyLineFt: 34,
  branchesFt: null,
  slope: "gentle",
  soil: "loam",
  accessWidthIn: 46,
  utilityMarks: "marked-clear",
  spoil: "haul-away",
  notes: "",
};

const CS_EST = "estimator@cinder-slate.test";
const CS_OWNER = "owner@cinder-slate.test";
const NR_OWNER = "owner@north-ridge.test";

export const DEMO_LEADS: Record<string, SeedLead[]> = {
  "cinder-slate": [
    {
      customerName: "Priya Vandermolen",
      email: "priya.vandermolen@example.test",
      phone: "+12175550100",
      street: "41 Thistledown Court",
      town: "Harrow Bend",
      buildWindow: "one-to-three-months",
      notes: "Flat lawn behind the garage, about 30 ft from the house.",
      status: "request",
      ageHours: 3,
      assignee: null,
      design: {
        stone: "Hearthline Taper",
        courses: 4,
        cap: "Sill Cap 16",
        liner: "steel-ring",
        ring: "Heavy Ring 36",
        fit: true,
        setbackFt: 30,
      },
    },
    {
      customerName: "Wendell Ashgrove",
      email: "wendell.ashgrove@example.test",
      phone: "+12175550101",
      street: "9 Larkin Hollow Road",
      town: "Millbrook Falls",
      buildWindow: "this-season",
      notes: "We want it big enough for six chairs. Gate is 40 in wide.",
      status: "request",
      ageHours: 27,
      assignee: null,
      design: {
        stone: "Kilnstone Grand Taper",
        units: 16,
        courses: 3,
        cap: "Broad Cap 20",
        liner: "firebrick",
        setbackFt: 35,
      },
    },
    {
      customerName: "Consuela Brightwater",
      email: "consuela.b@example.test",
      phone: "+12175550102",
      street: "1208 Orchard Spur",
      town: "Quillan Park",
      buildWindow: "within-a-month",
      notes: "",
      status: "request",
      ageHours: 52,
      assignee: CS_EST,
      design: {
        stone: "Ridgeback Taper",
        units: 15,
        courses: 4,
        cap: "Bluestone-look Cap 18",
        overhang: 1.5,
        liner: "steel-ring",
        ring: "Heavy Ring 36",
        setbackFt: 28,
      },
    },
    {
      customerName: "Marcus Oyelaran",
      email: "m.oyelaran@example.test",
      phone: "+12175550103",
      street: "77 Wicklow Lane",
      town: "Stoneleigh",
      buildWindow: "one-to-three-months",
      notes: "Slight slope toward the fence.",
      status: "called-back",
      ageHours: 4 * 24 + 5,
      assignee: CS_EST,
      staffNotes: [{ by: CS_EST, text: "Left a voicemail; he prefers texts after 5 pm." }],
      design: {
        stone: "Hearthline Taper",
        units: 13,
        courses: 3,
        cap: "Sill Cap 16",
        liner: "firebrick",
        setbackFt: 22,
      },
    },
    {
      customerName: "Hattie Lindqvist",
      email: "hattie.lindqvist@example.test",
      phone: "+12175550104",
      street: "3 Copper Kettle Way",
      town: "Copperfield Mills",
      buildWindow: "next-year",
      notes: "Planning ahead for spring.",
      status: "called-back",
      ageHours: 6 * 24 + 2,
      assignee: CS_OWNER,
      design: { stone: "Fieldcut Taper", units: 16, courses: 5, cap: "Sill Cap 16", liner: "none", setbackFt: 40 },
    },
    {
      customerName: "Benedikt Farrow",
      email: "benedikt.farrow@example.test",
      phone: "+12175550105",
      street: "560 Quarry Ridge Drive",
      town: "Millbrook Falls",
      buildWindow: "within-a-month",
      notes: "Would like it finished before our October party.",
      status: "consult-booked",
      ageHours: 9 * 24,
      assignee: CS_EST,
      staffNotes: [{ by: CS_EST, text: "Visit planned; bring the cap samples in charcoal and blue grey." }],
      design: {
        stone: "Hearthline Taper",
        courses: 4,
        cap: "Bluestone-look Cap 18",
        liner: "steel-ring",
        ring: "Heavy Ring 42",
        fit: true,
        setbackFt: 26,
      },
    },
    {
      customerName: "Ingrid Sola-Martens",
      email: "ingrid.sm@example.test",
      phone: "+12175550106",
      street: "18 Bramble Terrace",
      town: "Harrow Bend",
      buildWindow: "this-season",
      notes: "",
      status: "consult-booked",
      ageHours: 12 * 24 + 7,
      assignee: CS_OWNER,
      design: {
        stone: "Quarry Square",
        units: 12,
        courses: 3,
        cap: "Broad Cap 20",
        overhang: 2,
        liner: "firebrick",
        setbackFt: 25,
      },
    },
    {
      customerName: "Rafael Okonkwo-Reyes",
      email: "rafael.or@example.test",
      phone: "+12175550107",
      street: "2204 Foundry Street",
      town: "Quillan Park",
      buildWindow: "one-to-three-months",
      notes: "Round patio around it, please; the kids ride bikes there now.",
      status: "proposal-out",
      ageHours: 16 * 24,
      assignee: CS_EST,
      papers: {
        visit: {
          ...VISIT_OK,
          structureFt: 34,
          accessWidthIn: 34,
          notes: "Side gate is 34 in: pavers go in by hand cart.",
        },
        proposal: {
          fixedPrice: 6150,
          addOns: [
            { label: "Firebrick lining inside the steel ring", price: 540 },
            { label: "Sealing the patio", price: 380 },
          ],
          state: "opened",
        },
      },
      design: {
        stone: "Hearthline Taper",
        units: 14,
        courses: 4,
        cap: "Sill Cap 16",
        liner: "steel-ring",
        ring: "Heavy Ring 36",
        patioFt: 8,
        paver: "Courtyard Paver 6×9",
        border: "Rim Border 4×8",
        setbackFt: 32,
      },
    },
    {
      customerName: "Delphine Achterberg",
      email: "delphine.a@example.test",
      phone: "+12175550108",
      street: "64 Millrace Road",
      town: "Stoneleigh",
      buildWindow: "this-season",
      notes: "",
      status: "proposal-out",
      ageHours: 20 * 24 + 3,
      assignee: CS_EST,
      papers: {
        visit: { ...VISIT_OK, structureFt: 27, soil: "clay", notes: "Clay: dig the base to 8 in." },
        proposal: {
          fixedPrice: 2750,
          addOns: [{ label: "A second course of caps", price: 420 }],
          state: "accepted",
          chosen: [0],
        },
      },
      staffNotes: [{ by: CS_EST, text: "Proposal sent at the upper end of the range: she wants the wider caps." }],
      design: {
        stone: "Kilnstone Grand Taper",
        units: 15,
        courses: 3,
        cap: "Broad Cap 20",
        liner: "steel-ring",
        ring: "Heavy Ring 42",
        setbackFt: 27,
      },
    },
    {
      customerName: "Tobias Wren",
      email: "tobias.wren@example.test",
      phone: "+12175550109",
      street: "11 Cinderbrook Lane",
      town: "Millbrook Falls",
      buildWindow: "within-a-month",
      notes: "Back corner by the old maple; the stump is gone.",
      status: "signed",
      ageHours: 27 * 24,
      assignee: CS_EST,
      crew: "crew@cinder-slate.test",
      papers: {
        visit: { ...VISIT_OK, branchesFt: 28, notes: "Maple limbs well above; keep the pit where the stump was." },
        proposal: {
          fixedPrice: 2450,
          addOns: [{ label: "Firebrick lining", price: 520 }],
          state: "signed",
          changeOrder: { delta: 460, courses: 5 },
        },
      },
      staffNotes: [{ by: CS_OWNER, text: "Deposit received. Materials ordered for Thursday delivery." }],
      design: {
        stone: "Hearthline Taper",
        units: 14,
        courses: 4,
        cap: "Sill Cap 16",
        overhang: 2,
        liner: "steel-ring",
        ring: "Heavy Ring 36",
        setbackFt: 30,
      },
    },
    {
      customerName: "Mirela Castellanos",
      email: "mirela.c@example.test",
      phone: "+12175550110",
      street: "305 Kestrel Avenue",
      town: "Copperfield Mills",
      buildWindow: "one-to-three-months",
      notes: "",
      status: "signed",
      ageHours: 33 * 24,
      assignee: CS_OWNER,
      papers: {
        visit: VISIT_OK,
        proposal: {
          fixedPrice: 5600,
          addOns: [{ label: "Sealing the patio", price: 360 }],
          state: "signed",
          chosen: [0],
        },
      },
      design: {
        stone: "Ridgeback Taper",
        units: 16,
        courses: 4,
        cap: "Bluestone-look Cap 18",
        liner: "firebrick",
        patioFt: 7,
        paver: "Courtyard Paver 12×12",
        border: "Rim Border 6×12",
        setbackFt: 29,
      },
    },
    {
      customerName: "Gunnar Halvorsen",
      email: "gunnar.h@example.test",
      phone: "+12175550111",
      street: "47 Ironwood Bend",
      town: "Harrow Bend",
      buildWindow: "not-sure",
      notes: "Just pricing it out for now.",
      status: "not-going-ahead",
      stopReason: "Chose a portable steel fire bowl instead.",
      pausedStage: "called-back",
      ageHours: 40 * 24,
      assignee: CS_EST,
      design: { stone: "Plainface Block", units: 12, courses: 3, cap: null, liner: "none", setbackFt: 18 },
    },
    {
      customerName: "Odile Branscombe",
      email: "odile.b@example.test",
      phone: "+12175550112",
      street: "8 Saltmarsh Lane",
      town: "Stoneleigh",
      buildWindow: "this-season",
      notes: "Behind the greenhouse.",
      status: "measured",
      ageHours: 14 * 24,
      assignee: CS_EST,
      papers: {
        visit: {
          ...VISIT_OK,
          structureFt: 22,
          slope: "steep",
          notes: "Greenhouse 22 in from where she wants it: suggested moving it 4 ft east.",
        },
      },
      design: {
        stone: "Hearthline Taper",
        units: 14,
        courses: 4,
        cap: "Sill Cap 16",
        liner: "steel-ring",
        ring: "Heavy Ring 36",
        setbackFt: 28,
      },
    },
    {
      customerName: "Lachlan Ferreira-Moss",
      email: "lachlan.fm@example.test",
      phone: "+12175550113",
      street: "19 Tanners Row",
      town: "Quillan Park",
      buildWindow: "within-a-month",
      notes: "",
      status: "stone-ordered",
      ageHours: 36 * 24,
      assignee: CS_EST,
      crew: "crew@cinder-slate.test",
      papers: { visit: VISIT_OK, proposal: { fixedPrice: 2300, addOns: [], state: "signed" } },
      design: {
        stone: "Hearthline Taper",
        units: 13,
        courses: 3,
        cap: "Sill Cap 16",
        liner: "firebrick",
        setbackFt: 30,
      },
    },
    {
      customerName: "Sunniva Okoro",
      email: "sunniva.okoro@example.test",
      phone: "+12175550114",
      street: "2 Bellfounder Close",
      town: "Harrow Bend",
      buildWindow: "within-a-month",
      notes: "",
      status: "build-booked",
      ageHours: 42 * 24,
      assignee: CS_OWNER,
      homeownerAccount: true,
      papers: { visit: VISIT_OK, proposal: { fixedPrice: 2900, addOns: [], state: "signed" } },
      design: {
        stone: "Kilnstone Grand Taper",
        units: 15,
        courses: 3,
        cap: "Broad Cap 20",
        liner: "steel-ring",
        ring: "Heavy Ring 42",
        setbackFt: 33,
      },
    },
    {
      // Build booked, for the completion and balance journey.
      customerName: "Oriel Fenwick",
      email: "oriel.fenwick@example.test",
      phone: "+12175550134",
      street: "8 Pellmore Rise",
      town: "Harrow Bend",
      buildWindow: "within-a-month",
      notes: "",
      status: "build-booked",
      ageHours: 40 * 24,
      assignee: CS_OWNER,
      homeownerAccount: true,
      papers: { visit: VISIT_OK, proposal: { fixedPrice: 2900, addOns: [], state: "signed" } },
      design: {
        stone: "Kilnstone Grand Taper",
        units: 15,
        courses: 3,
        cap: "Broad Cap 20",
        liner: "steel-ring",
        ring: "Heavy Ring 42",
        setbackFt: 31,
      },
    },
    {
      // Build booked, for the crew's day on site.
      customerName: "Leontyne Marsh",
      email: "leontyne.marsh@example.test",
      phone: "+12175550135",
      street: "15 Tallowmere Lane",
      town: "Millbrook Falls",
      buildWindow: "within-a-month",
      notes: "",
      status: "build-booked",
      ageHours: 38 * 24,
      assignee: CS_OWNER,
      papers: { visit: VISIT_OK, proposal: { fixedPrice: 2900, addOns: [], state: "signed" } },
      design: {
        stone: "Kilnstone Grand Taper",
        units: 15,
        courses: 3,
        cap: "Broad Cap 20",
        liner: "steel-ring",
        ring: "Heavy Ring 42",
        setbackFt: 29,
      },
    },
    {
      // Signed and nothing more, for the whole job's journey from the stone order to paid in full:
      // $3,200 + the $240 add-on chosen = $3,440 signed, then a $380 change order for a fourth course.
      customerName: "Isolde Penhallow",
      email: "isolde.penhallow@example.test",
      phone: "+12175550138",
      street: "26 Quarrystone Walk",
      town: "Quillan Park",
      buildWindow: "within-a-month",
      notes: "Beside the lower terrace, clear of the shed.",
      status: "signed",
      ageHours: 30 * 24,
      assignee: CS_OWNER,
      crew: "crew@cinder-slate.test",
      homeownerAccount: true,
      papers: {
        visit: VISIT_OK,
        proposal: {
          fixedPrice: 3200,
          addOns: [{ label: "Spark screen, hinged", price: 240 }],
          chosen: [0],
          state: "signed",
          changeOrder: { delta: 380, courses: 4 },
        },
      },
      design: {
        stone: "Hearthline Taper",
        units: 14,
        courses: 3,
        cap: "Sill Cap 16",
        liner: "steel-ring",
        ring: "Heavy Ring 36",
        setbackFt: 30,
      },
    },
    {
      customerName: "Perpetua Vance",
      email: "perpetua.vance@example.test",
      phone: "+12175550115",
      street: "77 Cooper's Field",
      town: "Millbrook Falls",
      buildWindow: "within-a-month",
      notes: "",
      status: "built",
      ageHours: 50 * 24,
      assignee: CS_EST,
      homeownerAccount: true,
      papers: { visit: VISIT_OK, proposal: { fixedPrice: 2200, addOns: [], state: "signed" } },
      design: { stone: "Ridgeback Taper", units: 15, courses: 3, cap: "Sill Cap 16", liner: "none", setbackFt: 26 },
    },
    {
      customerName: "Hollis Drummond",
      email: "hollis.drummond@example.test",
      phone: "+12175550116",
      street: "140 Weir Road",
      town: "Copperfield Mills",
      buildWindow: "within-a-month",
      notes: "",
      status: "paid-in-full",
      ageHours: 70 * 24,
      assignee: CS_OWNER,
      papers: { visit: VISIT_OK, proposal: { fixedPrice: 2600, addOns: [], state: "signed" } },
      design: { stone: "Fieldcut Taper", units: 16, courses: 4, cap: "Sill Cap 16", liner: "firebrick", setbackFt: 40 },
    },
    {
      customerName: "Wilhelmina Arkwright",
      email: "wilhelmina.arkwright@example.test",
      phone: "+12175550136",
      street: "8 Saltmarsh Lane",
      town: "Harrow Bend",
      buildWindow: "within-a-month",
      notes: "",
      status: "paid-in-full",
      ageHours: 200 * 24,
      assignee: CS_OWNER,
      homeownerAccount: true,
      papers: {
        visit: VISIT_OK,
        proposal: {
          fixedPrice: 2450,
          addOns: [{ label: "Spark screen, hinged", price: 240 }],
          chosen: [0],
          state: "signed",
        },
      },
      design: {
        stone: "Ridgeback Taper",
        units: 14,
        courses: 3,
        cap: "Sill Cap 16",
        liner: "firebrick",
        setbackFt: 30,
      },
    },
    {
      customerName: "Caspian Thorne",
      email: "caspian.thorne@example.test",
      phone: "+12175550137",
      street: "31 Gristmill Road",
      town: "Millbrook Falls",
      buildWindow: "one-to-three-months",
      notes: "",
      status: "paid-in-full",
      ageHours: 160 * 24,
      assignee: CS_EST,
      papers: { visit: VISIT_OK, proposal: { fixedPrice: 2750, addOns: [], state: "signed" } },
      design: {
        stone: "Hearthline Taper",
        units: 14,
        courses: 3,
        cap: "Sill Cap 16",
        liner: "steel-ring",
        ring: "Heavy Ring 36",
        setbackFt: 29,
      },
    },
    {
      customerName: "Anouk Steenberg",
      email: "anouk.s@example.test",
      phone: "+12175550117",
      street: "5 Lantern Hill",
      town: "Stoneleigh",
      buildWindow: "next-year",
      notes: "",
      status: "on-hold",
      stopReason: "Waiting for the town's burn permit.",
      pausedStage: "measured",
      ageHours: 24 * 24,
      assignee: CS_EST,
      papers: { visit: { ...VISIT_OK, utilityMarks: "not-marked-yet" } },
      design: { stone: "Quarry Square", units: 12, courses: 3, cap: "Broad Cap 20", liner: "firebrick", setbackFt: 25 },
    },
    {
      customerName: "Ferdinand Lisle",
      email: "ferdinand.lisle@example.test",
      phone: "+12175550118",
      street: "63 Orchard Spur",
      town: "Quillan Park",
      buildWindow: "this-season",
      notes: "",
      status: "measured",
      ageHours: 45 * 24,
      assignee: CS_EST,
      staffNotes: [{ by: CS_EST, text: "Proposal ran out while he was travelling; call him about a new one." }],
      papers: { visit: VISIT_OK, proposal: { fixedPrice: 2350, addOns: [], state: "expired" } },
      design: {
        stone: "Hearthline Taper",
        units: 14,
        courses: 3,
        cap: "Sill Cap 16",
        liner: "steel-ring",
        ring: "Heavy Ring 36",
        setbackFt: 31,
      },
    },
  ],
  "north-ridge": [
    ["Amara Winterbourne", "Pinegate", "request", 5],
    ["Lucius Fenwright", "Cedar Hollow", "request", 30],
    ["Oriana Blackthorn", "Larchmont Flats", "request", 60],
    ["Silas Marrowby", "Cedar Hollow", "called-back", 80],
    ["Juniper Okafor-Hale", "Pinegate", "called-back", 120],
    ["Teodor Vasquez-Lin", "Larchmont Flats", "consult-booked", 200],
    ["Beatrix Ellingsworth", "Cedar Hollow", "consult-booked", 260],
    ["Casimir Dunmore", "Pinegate", "proposal-out", 330],
    ["Rosalind Quayle", "Larchmont Flats", "proposal-out", 400],
    ["Evander Hollis", "Cedar Hollow", "signed", 520],
    ["Marguerite Solberg", "Pinegate", "signed", 610],
    ["Ansel Greywood", "Cedar Hollow", "not-going-ahead", 700],
  ].map(([name, town, status, ageHours], i): SeedLead => {
    const [first, last] = String(name).toLowerCase().split(" ");
    return {
      customerName: String(name),
      email: `${first}.${last}@example.test`,
      phone: `+1970555${String(150 + i).padStart(4, "0")}`,
      street: `${120 + i * 14} ${["Aspen", "Juniper", "Ridgeview", "Granite"][i % 4]} ${["Road", "Court", "Way"][i % 3]}`,
      town: String(town),
      buildWindow: (["within-a-month", "one-to-three-months", "this-season", "next-year"] as const)[i % 4]!,
      notes: i % 3 === 0 ? "Near the back deck steps, on packed gravel." : "",
      status: status as SeedLead["status"],
      ...(status === "not-going-ahead" ? { stopReason: "Budget: postponed to next year." } : {}),
      ageHours: Number(ageHours),
      assignee: status === "request" && i < 2 ? null : NR_OWNER,
      design: {
        stone: "Timberline Taper",
        ...(i % 2 === 0 ? { units: 13 + (i % 4) } : {}),
        courses: 3 + (i % 2),
        cap: "Ridge Cap 18",
        liner: "steel-ring",
        ring: "Camp Ring 38",
        fit: i % 2 === 1,
        setbackFt: 20 + i,
      },
    };
  }),
};

/** Each demo company's letterhead for proposals (invented addresses and licence numbers). */
export const DEMO_LETTERHEADS: Record<string, { streetAddress: string; licenceNumber: string }> = {
  "cinder-slate": { streetAddress: "412 Kiln Yard Road, Millbrook Falls", licenceNumber: "HIC-0042-DEMO" },
  "north-ridge": { streetAddress: "88 Timber Mill Lane, Pinegate", licenceNumber: "NR-1187-DEMO" },
};
