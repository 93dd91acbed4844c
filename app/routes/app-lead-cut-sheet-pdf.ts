import type { Route } from "./+types/app-lead-cut-sheet-pdf";
import { STAFF_ROLES } from "~/db/enums";
import { renderCutSheetPdf } from "~/lib/cut-sheet/cut-sheet-pdf.server";
import { loadCutSheet } from "~/lib/cut-sheet/cut-sheet.server";
import { requireUser } from "~/lib/auth/session.server";
import { parseLeadId } from "~/lib/auth/staff.server";

/** GET /app/leads/:leadId/cut-sheet.pdf: the cut sheet with the full-size cap template, for print. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: STAFF_ROLES });
  const sheet = await loadCutSheet(user, parseLeadId(params.leadId));
  if (!sheet) throw new Response("Not found", { status: 404 });
  const pdf = await renderCutSheetPdf(sheet);
  const slug =
    sheet.customerName
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-|-$/g, "") || "job";
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Length": String(pdf.byteLength),
      // A download, opened in the computer's own PDF viewer: it prints at actual size, and the site's
      // strict Content-Security-Policy (object-src 'none') would keep a browser's built-in viewer out.
      "Content-Disposition": `attachment; filename="cut-sheet-${sheet.leadId}-${slug}-${sheet.day}.pdf"`,
      "Cache-Control": "private, no-store",
    },
  });
}
