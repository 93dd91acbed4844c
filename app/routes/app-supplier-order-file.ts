import type { Route } from "./+types/app-supplier-order-file";
import { getCompany } from "~/lib/catalog/catalog.server";
import { requireUser } from "~/lib/auth/session.server";
import { renderSupplierOrderPdf } from "~/lib/suppliers/supplier-order-pdf.server";
import { buildOrderDocument, orderCsv, orderNumber, requireOrder } from "~/lib/suppliers/supplier-orders.server";
import { zonedDay } from "~/lib/format/zoned-time";

/** The order as a PDF or CSV, as the supplier gets it (owners only). */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request, { roles: ["owner"] });
  const order = await requireOrder(user.companyId, params.orderId);
  const company = await getCompany(user.companyId);
  const stamp = order.sentAt ?? order.updatedAt;
  const document = await buildOrderDocument(order, zonedDay(new Date(stamp), company.timeZone));
  const name = orderNumber(order.id).toLowerCase();
  if (params.file === "order.csv") {
    return new Response(orderCsv(document), {
      headers: {
        "Content-Type": "text/csv; charset=utf-8",
        "Content-Disposition": `attachment; filename="${name}.csv"`,
        "Cache-Control": "private, no-store",
      },
    });
  }
  if (params.file !== "order.pdf") throw new Response("Not found", { status: 404 });
  const pdf = await renderSupplierOrderPdf(document, stamp);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `inline; filename="${name}.pdf"`,
      "Cache-Control": "private, no-store",
    },
  });
}
