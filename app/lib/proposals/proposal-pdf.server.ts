import PDFDocument from "pdfkit";
import { withWideText } from "~/lib/platform/pdf-fonts.server";
import { collectPdf, CONTENT_W, ensureRoom, heading, ruleAcross, type Doc } from "~/lib/platform/pdf-layout.server";
import { basePriceCents, chooseAddOns, depositCents, proposalTotalCents } from "~/domain/proposal-money";
import { PAGE_MARGIN_PT } from "~/lib/cut-sheet/cap-template-layout";
import { formatMoney } from "~/lib/format/money";
import { describeDeposit, type ProposalDocument } from "~/lib/proposals/proposal-document";

/*
 * The proposal (or change order) as a PDF, made with pdfkit like the cut sheet: built-in Helvetica,
 * and embedded Noto for text in other scripts.
 * The same document and the same choices always give the same bytes: the creation date is the
 * sending time, and pdfkit derives the file id from the document's info, so the SHA-256 of an
 * accepted PDF can be checked again later by rendering it anew.
 */

export type SignatureFacts = {
  name: string;
  signedAtLabel: string;
  signedAtIso: string;
  ip: string;
  userAgent: string;
  acceptedSha256: string;
};

// Also the supplier order's colours and headings, so the documents a company sends look alike.
export const INK = "#1f1b19";
export const SOFT = "#574e47";
export const ACCENT = "#b14c12";
export const RULE = "#d6c9b7";
export const HEADING = { room: 48, gapLines: 0.7, size: 12.5, ink: INK, accent: ACCENT };

export function paragraph(
  doc: Doc,
  text: string,
  options: { size?: number; colour?: string; bold?: boolean } = {},
): void {
  doc.font(options.bold ? "Helvetica-Bold" : "Helvetica").fontSize(options.size ?? 10);
  ensureRoom(doc, doc.heightOfString(text, { width: CONTENT_W }) + 4);
  doc.fillColor(options.colour ?? INK).text(text, PAGE_MARGIN_PT, doc.y, { width: CONTENT_W });
  doc.moveDown(0.25);
}

export function bullets(doc: Doc, lines: string[]): void {
  for (const line of lines) {
    doc.font("Helvetica").fontSize(10);
    const h = doc.heightOfString(line, { width: CONTENT_W - 14 });
    ensureRoom(doc, h + 4);
    const y = doc.y;
    doc.fillColor(ACCENT).text("•", PAGE_MARGIN_PT, y, { lineBreak: false });
    doc.fillColor(INK).text(line, PAGE_MARGIN_PT + 14, y, { width: CONTENT_W - 14 });
    doc.y = y + h + 3;
  }
}

/** Money rows: label left, amount right; a row never splits across pages. */
function moneyRows(doc: Doc, rows: { label: string; cents: number; bold?: boolean }[]): void {
  const amountW = 110;
  for (const row of rows) {
    const font = row.bold ? "Helvetica-Bold" : "Helvetica";
    doc.font(font).fontSize(10.5);
    const h = doc.heightOfString(row.label, { width: CONTENT_W - amountW - 8 });
    ensureRoom(doc, h + 6);
    const y = doc.y;
    doc.fillColor(INK).text(row.label, PAGE_MARGIN_PT, y, { width: CONTENT_W - amountW - 8 });
    doc
      .font(font)
      .text(formatMoney(row.cents), PAGE_MARGIN_PT + CONTENT_W - amountW, y, { width: amountW, align: "right" });
    doc.y = y + h + 4;
    ruleAcross(doc, doc.y - 2, RULE, 0.3);
  }
}

/** The money as the document states it for the chosen add-ons, cents. */
export function proposalFigures(document: ProposalDocument, chosenKeys: readonly string[]) {
  const base = basePriceCents(document.fixedPriceCents, document.allowances);
  const chosen = chooseAddOns(document.addOns, chosenKeys);
  const total = proposalTotalCents(base, chosen);
  return { base, chosen, total, deposit: depositCents(document.deposit, total) };
}

/**
 * Renders the document with the homeowner's chosen add-ons; with `signature`, adds the signature
 * block (who, when, from where, and the SHA-256 of the PDF they accepted). Resolves to the bytes.
 */
export function renderProposalPdf(
  document: ProposalDocument,
  options: { chosenKeys: readonly string[]; createdAt: string; signature?: SignatureFacts | null },
): Promise<Buffer> {
  const isChange = document.kind === "change-order";
  const created = new Date(options.createdAt);
  // Names and addresses may be in any script: text the built-in font cannot set uses embedded Noto.
  const doc = withWideText(
    new PDFDocument({
      size: "LETTER",
      margin: PAGE_MARGIN_PT,
      info: {
        Title: `${document.title} (${document.number})`,
        Author: document.letterhead.name,
        Creator: "Emberwright",
        Subject: isChange ? "Change order" : "Fire pit proposal",
        CreationDate: created,
        ModDate: created,
      },
    }),
  );
  const done = collectPdf(doc);

  const head = document.letterhead;
  doc
    .font("Helvetica-Bold")
    .fontSize(16)
    .fillColor(INK)
    .text(head.name, PAGE_MARGIN_PT, PAGE_MARGIN_PT, { width: CONTENT_W });
  doc
    .font("Helvetica")
    .fontSize(9)
    .fillColor(SOFT)
    .text(
      [head.address, head.phone, head.email, head.licence ? `Licence ${head.licence}` : ""]
        .filter(Boolean)
        .join("  ·  "),
      { width: CONTENT_W },
    );
  doc.moveDown(1);
  doc
    .font("Helvetica-Bold")
    .fontSize(9)
    .fillColor(ACCENT)
    .text(isChange ? "CHANGE ORDER" : "PROPOSAL", { characterSpacing: 1.5 });
  doc.font("Helvetica-Bold").fontSize(18).fillColor(INK).text(document.title, { width: CONTENT_W });
  paragraph(
    doc,
    `${document.number} for ${document.customer.name}, ${document.customer.street}, ${document.customer.town}. Prepared ${document.preparedOn}; valid until ${document.validUntil}.`,
    { size: 9.5, colour: SOFT },
  );

  const figures = proposalFigures(document, options.chosenKeys);

  if (document.change) {
    heading(doc, "What changes", HEADING);
    if (document.change.added.length) {
      paragraph(doc, "Added or changed:", { bold: true });
      bullets(doc, document.change.added);
    }
    if (document.change.removed.length) {
      paragraph(doc, "No longer part of the job:", { bold: true });
      bullets(doc, document.change.removed);
    }
    heading(doc, "Price", HEADING);
    moneyRows(doc, [
      { label: "The job as signed so far", cents: document.change.previousContractCents },
      {
        label: document.change.deltaCents >= 0 ? "This change adds" : "This change credits",
        cents: document.change.deltaCents,
      },
      {
        label: "The job with this change",
        cents: document.change.previousContractCents + document.change.deltaCents,
        bold: true,
      },
    ]);
    paragraph(
      doc,
      "The difference is added to (or credited against) the balance due on completion; the deposit already paid stands.",
      { size: 9.5, colour: SOFT },
    );
  } else {
    heading(doc, "The design", HEADING);
    for (const line of document.design) paragraph(doc, `${line.label}: ${line.value}`, { size: 10 });
    heading(doc, "Scope of work", HEADING);
    bullets(doc, document.scope);
    if (document.siteFacts.length) {
      heading(doc, "What we measured at the site visit", HEADING);
      bullets(doc, document.siteFacts);
    }
    heading(doc, "Price", HEADING);
    moneyRows(doc, [
      { label: "Fixed price for the work above", cents: document.fixedPriceCents },
      ...document.allowances.map((a) => ({ label: a.label, cents: a.cents })),
      ...figures.chosen.map((a) => ({ label: `Add-on: ${a.label}`, cents: a.cents })),
      { label: "Total", cents: figures.total, bold: true },
    ]);
    const notChosen = document.addOns.filter((a) => !figures.chosen.includes(a));
    if (notChosen.length)
      paragraph(
        doc,
        `Add-ons not chosen: ${notChosen.map((a) => `${a.label} (${formatMoney(a.cents)})`).join("; ")}.`,
        { size: 9.5, colour: SOFT },
      );
    heading(doc, "Payment schedule", HEADING);
    moneyRows(doc, [
      { label: `Deposit on signing (${describeDeposit(document.deposit)})`, cents: figures.deposit },
      { label: "Balance on completion", cents: figures.total - figures.deposit },
    ]);
    heading(doc, "Included", HEADING);
    bullets(doc, document.included);
    heading(doc, "Not included", HEADING);
    bullets(doc, document.excluded);
  }
  heading(doc, "Codes and cautions", HEADING);
  bullets(doc, document.cautions);

  heading(doc, "Acceptance", HEADING);
  if (options.signature) {
    const s = options.signature;
    paragraph(doc, `Signed electronically by ${s.name} on ${s.signedAtLabel} (${s.signedAtIso}).`, { bold: true });
    paragraph(
      doc,
      `${s.name} typed their full name and ticked their consent to sign electronically (US ESIGN Act, 15 U.S.C. §7001, and the Uniform Electronic Transactions Act). Address: ${s.ip}. Browser: ${s.userAgent}.`,
      { size: 9.5 },
    );
    paragraph(
      doc,
      `SHA-256 of the PDF accepted (this document as it stood before this signature): ${s.acceptedSha256}`,
      { size: 8.5, colour: SOFT },
    );
    paragraph(
      doc,
      isChange ? "The change is part of the job from this signature." : "The job is booked once the deposit is paid.",
      { size: 9.5 },
    );
  } else {
    paragraph(
      doc,
      `Not signed. To accept, open the link ${head.name} sent you, type your full name and consent to sign electronically.`,
      { size: 9.5, colour: SOFT },
    );
  }
  doc.end();
  return done;
}
