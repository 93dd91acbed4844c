import PDFDocument from "pdfkit";
import { PAGE_MARGIN_PT } from "~/lib/cut-sheet/cap-template-layout";
import { describeOrderQuantity, formatDeliveryDay, formatPounds } from "~/lib/suppliers/order-units";
import { withWideText } from "~/lib/platform/pdf-fonts.server";
import { collectPdf, CONTENT_W, ensureRoom, heading, ruleAcross, type Doc } from "~/lib/platform/pdf-layout.server";
import { ACCENT, HEADING, INK, paragraph, RULE, SOFT } from "~/lib/proposals/proposal-pdf.server";
import type { SupplierOrderDocument } from "~/lib/suppliers/supplier-order-document";

/*
 * The supplier order as a PDF, set like the proposal (built-in Helvetica, embedded Noto for names
 * in other scripts, the same headings): who orders, one section per delivery with its date, site
 * address, access notes and lines, and the delivered weight. No prices: the yard prices its order.
 */

const QTY_W = 120;
const WEIGHT_W = 80;

function lineRow(doc: Doc, cells: [string, string, string], bold = false): void {
  doc.font(bold ? "Helvetica-Bold" : "Helvetica").fontSize(10);
  const itemW = CONTENT_W - QTY_W - WEIGHT_W - 16;
  const h = Math.max(doc.heightOfString(cells[0], { width: itemW }), doc.heightOfString(cells[1], { width: QTY_W }));
  ensureRoom(doc, h + 6);
  const y = doc.y;
  doc.fillColor(INK).text(cells[0], PAGE_MARGIN_PT, y, { width: itemW });
  doc.text(cells[1], PAGE_MARGIN_PT + itemW + 8, y, { width: QTY_W });
  doc.text(cells[2], PAGE_MARGIN_PT + CONTENT_W - WEIGHT_W, y, { width: WEIGHT_W, align: "right" });
  doc.y = y + h + 4;
  ruleAcross(doc, doc.y - 2, RULE, 0.3);
}

/** Renders the order; the same document and creation time always give the same bytes. */
export function renderSupplierOrderPdf(document: SupplierOrderDocument, createdAt: string): Promise<Buffer> {
  const created = new Date(createdAt);
  const doc = withWideText(
    new PDFDocument({
      size: "LETTER",
      margin: PAGE_MARGIN_PT,
      info: {
        Title: `Order ${document.number}`,
        Author: document.company.name,
        Creator: "Emberwright",
        Subject: `Supplier order to ${document.supplier.name}`,
        CreationDate: created,
        ModDate: created,
      },
    }),
  );
  const done = collectPdf(doc);

  const c = document.company;
  doc
    .font("Helvetica-Bold")
    .fontSize(16)
    .fillColor(INK)
    .text(c.name, PAGE_MARGIN_PT, PAGE_MARGIN_PT, { width: CONTENT_W });
  doc
    .font("Helvetica")
    .fontSize(9)
    .fillColor(SOFT)
    .text([c.address, c.phone, c.email].filter(Boolean).join("  ·  "), { width: CONTENT_W });
  doc.moveDown(1);
  doc.font("Helvetica-Bold").fontSize(9).fillColor(ACCENT).text("SUPPLIER ORDER", { characterSpacing: 1.5 });
  doc
    .font("Helvetica-Bold")
    .fontSize(18)
    .fillColor(INK)
    .text(`${document.number} to ${document.supplier.name}`, { width: CONTENT_W });
  paragraph(
    doc,
    `Prepared ${document.preparedOn}. ${document.drops.length === 1 ? "One delivery" : `${document.drops.length} deliveries`}, ${formatPounds(document.weightLb)} in all${document.unknownWeights.length ? ` (without ${document.unknownWeights.join(", ")}: weight not known)` : ""}.`,
    { size: 9.5, colour: SOFT },
  );
  paragraph(doc, `Please confirm by replying to ${c.email}${c.phone ? ` or calling ${c.phone}` : ""}.`, {
    size: 9.5,
    colour: SOFT,
  });

  for (const drop of document.drops) {
    heading(doc, `Deliver ${formatDeliveryDay(drop.requestedOn)} to ${drop.siteAddress}`, HEADING);
    paragraph(doc, drop.job, { size: 9.5, colour: SOFT });
    if (drop.accessNotes) paragraph(doc, `Access: ${drop.accessNotes}`, { size: 9.5 });
    lineRow(doc, ["Item", "Quantity", "Weight"], true);
    for (const line of drop.lines) {
      lineRow(doc, [
        line.item,
        describeOrderQuantity(line.orderQuantity, line.orderUnit),
        line.weightLb === null ? "—" : formatPounds(line.weightLb),
      ]);
    }
    lineRow(doc, ["Delivered weight", "", formatPounds(drop.weightLb)], true);
  }
  doc.end();
  return done;
}
