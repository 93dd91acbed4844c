import type { Route } from "./+types/app-inbox-csv";
import { getCompany } from "~/lib/catalog/catalog.server";
import { parseInboxQuery } from "~/lib/leads/inbox-schema";
import { exportInboxCsv } from "~/lib/leads/inbox.server";
import { requireUser } from "~/lib/auth/session.server";
import { OFFICE_ROLES } from "~/lib/auth/staff.server";
import { zonedDay } from "~/lib/format/zoned-time";

/** GET /app/inbox.csv: every lead under the inbox's filters (all pages), as a CSV download. */
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: OFFICE_ROLES });
  const parsed = parseInboxQuery(new URL(request.url).searchParams);
  if (!parsed.ok) {
    const lines = Object.entries(parsed.errors).map(([field, message]) => `${field}: ${message}`);
    return new Response(`These filters could not be used.\n${lines.join("\n")}\n`, {
      status: 400,
      headers: { "Content-Type": "text/plain; charset=utf-8" },
    });
  }
  const company = await getCompany(user.companyId);
  const csv = await exportInboxCsv(company.id, company.timeZone, parsed.filters);
  const fileName = `emberwright-leads-${company.slug}-${zonedDay(new Date(), company.timeZone)}.csv`;
  // A byte-order mark so spreadsheet programs read the file as UTF-8 (names with accents).
  return new Response(`\uFEFF${csv}`, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${fileName}"`,
      "Cache-Control": "private, no-store",
    },
  });
}
