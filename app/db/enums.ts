// The fixed vocabularies of the data model, apart from the tables so client code can import them
// without pulling in the ORM.

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

export const LEAD_STATUSES = ["new", "contacted", "consult-booked", "proposal-sent", "won", "lost"] as const;
export type LeadStatus = (typeof LEAD_STATUSES)[number];

export const BUILD_WINDOWS = ["within-a-month", "one-to-three-months", "this-season", "next-year", "not-sure"] as const;
export type BuildWindow = (typeof BUILD_WINDOWS)[number];
