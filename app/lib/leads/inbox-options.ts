import type { LeadStatus } from "~/db/enums";

/*
 * The inbox's columns, sorts and page size, shared by the page, the JSON API and the CSV export.
 * No zod here: the page imports this on the client.
 */

export const INBOX_PAGE_SIZE = 25;

export const INBOX_SORTS = ["received", "status", "customer", "town", "bowl", "price", "consult", "assignee"] as const;
export type InboxSort = (typeof INBOX_SORTS)[number];
export type SortDirection = "asc" | "desc";

/** The direction a column sorts in when first clicked: newest, biggest and furthest along first. */
export const FIRST_DIRECTION: Record<InboxSort, SortDirection> = {
  received: "desc",
  status: "asc",
  customer: "asc",
  town: "asc",
  bowl: "desc",
  price: "desc",
  consult: "asc",
  assignee: "asc",
};

export type InboxFilters = {
  status: LeadStatus | null;
  /** A user id, "none" for unassigned, or null for anyone. */
  assignee: number | "none" | null;
  /** Local calendar days in the company's time zone, inclusive. */
  from: string | null;
  to: string | null;
  q: string;
  sort: InboxSort;
  dir: SortDirection;
  page: number;
};

export const DEFAULT_INBOX_FILTERS: InboxFilters = {
  status: null,
  assignee: null,
  from: null,
  to: null,
  q: "",
  sort: "received",
  dir: "desc",
  page: 1,
};

/** The filters as search params, leaving defaults out so URLs stay short and shareable. */
export function inboxSearchParams(filters: InboxFilters): URLSearchParams {
  const params = new URLSearchParams();
  if (filters.status) params.set("status", filters.status);
  if (filters.assignee !== null) params.set("assignee", String(filters.assignee));
  if (filters.from) params.set("from", filters.from);
  if (filters.to) params.set("to", filters.to);
  if (filters.q) params.set("q", filters.q);
  if (filters.sort !== DEFAULT_INBOX_FILTERS.sort || filters.dir !== DEFAULT_INBOX_FILTERS.dir) {
    params.set("sort", filters.sort);
    params.set("dir", filters.dir);
  }
  if (filters.page > 1) params.set("page", String(filters.page));
  return params;
}

export type InboxRow = {
  id: number;
  status: LeadStatus;
  pausedStage: LeadStatus | null;
  customerName: string;
  email: string;
  phone: string;
  town: string;
  bowlDiameterIn: number;
  stoneName: string;
  priceLowCents: number | null;
  priceHighCents: number | null;
  consult: { startsAt: string; label: string } | null;
  assignee: { id: number; name: string } | null;
  createdAt: string;
  receivedLabel: string;
  ageLabel: string;
  isUnseen: boolean;
};

export type InboxPage = {
  /** The search string these rows answer (defaults left out), so the page can match polls to filters. */
  query: string;
  filters: InboxFilters;
  rows: InboxRow[];
  total: number;
  page: number;
  pageCount: number;
  pageSize: number;
  counts: Record<LeadStatus | "all", number>;
  unseenCount: number;
  /** Rows created after this instant are marked unseen; null means the person never opened the inbox. */
  unseenSince: string | null;
  generatedAt: string;
};
