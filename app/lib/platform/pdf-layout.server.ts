import type PDFDocument from "pdfkit";
import { LETTER_PT, PAGE_MARGIN_PT } from "~/lib/cut-sheet/cap-template-layout";

/*
 * Text layout shared by the printed documents (cut sheet, proposal): the Letter page's text column,
 * headings with their rule, hairlines between rows, and collecting pdfkit's output. Each document
 * keeps its own colours and heading size, so a proposal renders the same bytes as before (an accepted
 * proposal's SHA-256 is checked by rendering it again).
 */

export type Doc = InstanceType<typeof PDFDocument>;

export const CONTENT_W = LETTER_PT.width - 2 * PAGE_MARGIN_PT;
/** The lowest y text may reach; the footer line sits below it. */
export const BOTTOM = LETTER_PT.height - PAGE_MARGIN_PT - 18;

/** How a document sets its section headings: room kept for them, the gap above (lines), type size, rule colour. */
export type HeadingStyle = { room: number; gapLines: number; size: number; ink: string; accent: string };

/** Starts a new page when `height` points of content would pass the bottom. */
export function ensureRoom(doc: Doc, height: number): void {
  if (doc.y + height > BOTTOM) doc.addPage();
}

/** A full-width line across the text column at `y`. */
export function ruleAcross(doc: Doc, y: number, colour: string, lineWidth: number): void {
  doc
    .save()
    .moveTo(PAGE_MARGIN_PT, y)
    .lineTo(PAGE_MARGIN_PT + CONTENT_W, y)
    .lineWidth(lineWidth)
    .stroke(colour)
    .restore();
}

/** A section heading in bold with an accent rule under it, kept off the bottom of a page. */
export function heading(doc: Doc, text: string, style: HeadingStyle): void {
  ensureRoom(doc, style.room);
  doc.moveDown(style.gapLines);
  doc
    .font("Helvetica-Bold")
    .fontSize(style.size)
    .fillColor(style.ink)
    .text(text, PAGE_MARGIN_PT, doc.y, { width: CONTENT_W });
  const y = doc.y + 2;
  ruleAcross(doc, y, style.accent, 0.8);
  doc.y = y + 5;
}

/** The document's bytes once `doc.end()` has been called. */
export function collectPdf(doc: Doc): Promise<Buffer> {
  const chunks: Buffer[] = [];
  doc.on("data", (chunk: Buffer) => chunks.push(chunk));
  return new Promise<Buffer>((resolve, reject) => {
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
}
