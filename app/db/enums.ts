// The fixed vocabularies of the data model, apart from the tables so client code can import them
// without pulling in the ORM.

/** Whether `value` is one of `values`: a narrowing for text from a form, a URL or a stored row. */
export function isOneOf<T extends string>(values: readonly T[], value: unknown): value is T {
  return typeof value === "string" && (values as readonly string[]).includes(value);
}

export const ROLES = ["owner", "estimator", "crew", "homeowner"] as const;
export type Role = (typeof ROLES)[number];
export const STAFF_ROLES = ["owner", "estimator", "crew"] as const satisfies readonly Role[];

export const CATALOG_KINDS = [
  "wall-unit",
  "cap",
  "steel-ring",
  "firebrick",
  "paver",
  "border-unit",
  "aggregate",
  "adhesive",
  "bedding-sand",
  "joint-sand",
  "refractory-mortar",
  "fill",
  "edge-restraint",
  "edge-spike",
] as const;
export type CatalogKind = (typeof CATALOG_KINDS)[number];

/*
 * The stages of a pit job, in the order a job moves through them, named the way a hardscaper and a
 * homeowner talk about them; the last two are where a job stops rather than a step along it.
 * (Stored in leads.status; labels in app/lib/leads/lead-status.ts.)
 */
export const JOB_STEPS = [
  "request",
  "called-back",
  "consult-booked",
  "measured",
  "proposal-out",
  "signed",
  "stone-ordered",
  "build-booked",
  "built",
  "paid-in-full",
] as const;
export type JobStep = (typeof JOB_STEPS)[number];
export const STOPPED_STAGES = ["on-hold", "not-going-ahead"] as const;
export const LEAD_STATUSES = [...JOB_STEPS, ...STOPPED_STAGES] as const;
export type LeadStatus = (typeof LEAD_STATUSES)[number];
/** From the signed deposit on: the job is the crew's to build. */
export const SIGNED_STAGES = [
  "signed",
  "stone-ordered",
  "build-booked",
  "built",
  "paid-in-full",
] as const satisfies readonly JobStep[];

export const BUILD_WINDOWS = ["within-a-month", "one-to-three-months", "this-season", "next-year", "not-sure"] as const;
export type BuildWindow = (typeof BUILD_WINDOWS)[number];

// The site visit's choices (labels in app/lib/leads/site-visit-schema.ts).
export const SLOPES = ["level", "gentle", "steep"] as const;
export const SOILS = ["sand", "loam", "clay", "rock", "fill"] as const;
export const UTILITY_MARKS = ["marked-clear", "marked-near", "not-marked-yet"] as const;
export const SPOIL_PLANS = ["haul-away", "spread-on-site", "pile-for-homeowner"] as const;

/*
 * How a yard sells a catalog item (labels in app/lib/supplier-order-labels.ts): by the piece, in
 * whole packs of `unitsPerOrderUnit` pieces (pallet, cube, bundle, case), by the bag, pail or
 * cartridge, or in bulk by weight (short ton) or volume (cubic yard).
 */
export const ORDER_UNITS = [
  "each",
  "piece",
  "pallet",
  "cube",
  "bundle",
  "case",
  "bag",
  "pail",
  "cartridge",
  "ton",
  "cubic-yard",
] as const;
export type OrderUnit = (typeof ORDER_UNITS)[number];

/** A supplier order: drafted → sent → confirmed → delivered; a draft may be discarded or combined into another. */
export const SUPPLIER_ORDER_STATES = ["drafted", "sent", "confirmed", "delivered", "combined", "discarded"] as const;
export type SupplierOrderState = (typeof SUPPLIER_ORDER_STATES)[number];

// A build on the calendar is booked until it is cancelled (moving it keeps it booked).
export const BUILD_STATES = ["booked", "cancelled"] as const;
export type BuildState = (typeof BUILD_STATES)[number];
