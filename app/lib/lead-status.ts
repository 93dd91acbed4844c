import type { BuildWindow, LeadStatus } from "~/db/schema";

/** Status names in the workspace. */
export const STATUS_LABEL: Record<LeadStatus, string> = {
  new: "New",
  contacted: "Contacted",
  "consult-booked": "Consult booked",
  "proposal-sent": "Proposal sent",
  won: "Won",
  lost: "Lost",
};

/** The same statuses as a homeowner reads them. */
export const HOMEOWNER_STATUS_LABEL: Record<LeadStatus, string> = {
  new: "Received",
  contacted: "The contractor is in touch",
  "consult-booked": "Design consult booked",
  "proposal-sent": "Proposal sent to you",
  won: "Going ahead",
  lost: "Closed",
};

export const BUILD_WINDOW_LABEL: Record<BuildWindow, string> = {
  "within-a-month": "Within a month",
  "one-to-three-months": "In one to three months",
  "this-season": "Later this season",
  "next-year": "Next year",
  "not-sure": "Not sure yet",
};

