import { z } from "zod";
import type { Route } from "./+types/leads";
import { getCompany } from "~/lib/catalog/catalog.server";
import { parseInboxQuery } from "~/lib/leads/inbox-schema";
import { inboxSeenAt, loadInboxPage } from "~/lib/leads/inbox.server";
import { OFFICE_ROLES, requireApiUser } from "~/lib/auth/staff.server";

const sinceSchema = z.iso.datetime({ error: "Since must be an ISO 8601 UTC time like 2026-12-02T14:00:00.000Z." });

/**
 * GET /api/leads: one page of the inbox as JSON, with the same filters as /app/inbox. Polled by the
 * inbox; reading it does not count as viewing the inbox. `since` sets which leads are marked unseen
 * (default: the person's last inbox visit).
 */
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireApiUser(request, OFFICE_ROLES);
  const params = new URL(request.url).searchParams;
  const parsed = parseInboxQuery(params);
  const errors = parsed.ok ? [] : Object.entries(parsed.errors).map(([path, message]) => ({ path, message }));
  const sinceRaw = params.get("since");
  const since = sinceRaw === null || sinceRaw === "" ? null : sinceSchema.safeParse(sinceRaw);
  if (since && !since.success) errors.push({ path: "since", message: since.error.issues[0]!.message });
  if (!parsed.ok || errors.length) return Response.json({ errors }, { status: 400 });

  const company = await getCompany(user.companyId);
  let unseenSince = since?.success ? since.data : null;
  if (!since) {
    // Never opened the inbox: nothing counts as unseen yet (as on the page itself).
    unseenSince = (await inboxSeenAt(user.id)) ?? new Date().toISOString();
  }
  const page = await loadInboxPage({
    companyId: company.id,
    timeZone: company.timeZone,
    filters: parsed.filters,
    unseenSince,
  });
  return Response.json(page, { headers: { "Cache-Control": "private, no-store" } });
}
