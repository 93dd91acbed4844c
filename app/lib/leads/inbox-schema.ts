import { z } from "zod";
import { fieldErrors } from "~/lib/format/form-fields";
import { LEAD_STATUSES } from "~/db/enums";
import { DEFAULT_INBOX_FILTERS, FIRST_DIRECTION, INBOX_SORTS, type InboxFilters } from "~/lib/leads/inbox-options";

const optional = (schema: z.ZodType) =>
  z.preprocess((v) => (v === "" || v === null ? undefined : v), schema.optional());

const day = (label: string) => z.iso.date({ error: `${label} must be a date like 2026-12-02.` });

/** The inbox's filters from search params; every field is checked and named in its message. */
export const inboxQuerySchema = z
  .object({
    status: optional(z.enum(LEAD_STATUSES, { error: `Stage must be one of: ${LEAD_STATUSES.join(", ")}.` })),
    assignee: optional(
      z.union(
        [
          z.literal("none"),
          z
            .string()
            .regex(/^\d{1,9}$/)
            .transform(Number),
        ],
        {
          error: 'Assignee must be a team member\'s id or "none".',
        },
      ),
    ),
    from: optional(day("From")),
    to: optional(day("To")),
    q: z.string().trim().max(100, "Search must be at most 100 characters.").default(""),
    sort: optional(z.enum(INBOX_SORTS, { error: `Sort must be one of: ${INBOX_SORTS.join(", ")}.` })),
    dir: optional(z.enum(["asc", "desc"], { error: 'Direction must be "asc" or "desc".' })),
    page: optional(
      z
        .string()
        .regex(/^\d{1,6}$/, { error: "Page must be a whole number from 1." })
        .transform(Number)
        .pipe(z.number().min(1, "Page must be a whole number from 1.")),
    ),
  })
  .refine((v) => !v.from || !v.to || (v.from as string) <= (v.to as string), {
    path: ["to"],
    message: "To must be on or after From: the end date comes before the start date.",
  });

export type InboxQueryResult = { ok: true; filters: InboxFilters } | { ok: false; errors: Record<string, string> };

const KEYS = ["status", "assignee", "from", "to", "q", "sort", "dir", "page"] as const;

/** Reads and checks the inbox filters; unknown params are ignored, repeated ones take the first value. */
export function parseInboxQuery(params: URLSearchParams): InboxQueryResult {
  const raw = Object.fromEntries(KEYS.map((k) => [k, params.get(k) ?? undefined]));
  const parsed = inboxQuerySchema.safeParse(raw);
  if (!parsed.success) {
    return { ok: false, errors: fieldErrors(parsed.error) };
  }
  const v = parsed.data as {
    status?: InboxFilters["status"];
    assignee?: number | "none";
    from?: string;
    to?: string;
    q: string;
    sort?: InboxFilters["sort"];
    dir?: InboxFilters["dir"];
    page?: number;
  };
  const sort = v.sort ?? "received";
  return {
    ok: true,
    filters: {
      status: v.status ?? null,
      assignee: v.assignee ?? null,
      from: v.from ?? null,
      to: v.to ?? null,
      q: v.q,
      sort,
      dir: v.dir ?? FIRST_DIRECTION[sort],
      page: v.page ?? 1,
    },
  };
}

/**
 * The filters that can still be used when some were refused: each refused field is dropped (both
 * dates when the range is backwards), so the inbox keeps showing a list beside the messages.
 */
export function usableInboxFilters(params: URLSearchParams, errors: Record<string, string>): InboxFilters {
  const kept = new URLSearchParams(params);
  for (const key of Object.keys(errors)) kept.delete(key);
  if (errors.to && kept.has("from")) kept.delete("from");
  const result = parseInboxQuery(kept);
  return result.ok ? result.filters : DEFAULT_INBOX_FILTERS;
}
