import PDFDocument from "pdfkit";
import { layoutCapTemplate } from "~/domain/cap-template";
import { layoutTemplateSheets, LETTER_PT, PAGE_MARGIN_PT, type DrawCommand } from "~/lib/cut-sheet/cap-template-layout";
import type { CutSheet } from "~/lib/cut-sheet/cut-sheet.server";
import { drawCapFigure, drawRingFigure } from "~/lib/cut-sheet/cut-sheet-figures";
import { withWideText } from "~/lib/platform/pdf-fonts.server";
import {
  BOTTOM,
  collectPdf,
  CONTENT_W,
  ensureRoom,
  heading,
  ruleAcross,
  type Doc,
} from "~/lib/platform/pdf-layout.server";

/*
 * The printable cut sheet as a PDF, made with pdfkit's built-in Helvetica (Noto where a name needs it):
 * the cut tables, the material order and the crew's cautions, a page of drawings, then the
 * full-size cap template tiled over Letter sheets. Geometry comes as drawing commands from pure
 * modules (cap-template-layout, cut-sheet-figures); this file only plays them back and sets text.
 */

const INK = "#1f1b19";
const SOFT = "#6f655d";
const ACCENT = "#c0501a";
const RULE = "#d6c9b7";

/** Draws commands in page points. Text is set without line breaking so it never spills onto a new page. */
export function playCommands(doc: Doc, commands: DrawCommand[]): void {
  for (const c of commands) {
    switch (c.op) {
      case "path": {
        const [first, ...rest] = c.points;
        if (!first) break;
        doc.save();
        doc.moveTo(first[0], first[1]);
        for (const p of rest) doc.lineTo(p[0], p[1]);
        if (c.closed) doc.closePath();
        doc.lineWidth(c.widthPt).strokeColor(c.colour);
        if (c.dash) doc.dash(c.dash[0], { space: c.dash[1] });
        doc.stroke();
        doc.restore();
        break;
      }
      case "rect": {
        doc.save();
        doc.rect(c.x, c.y, c.w, c.h).lineWidth(c.widthPt);
        if (c.dash) doc.dash(c.dash[0], { space: c.dash[1] });
        if (c.fill && c.stroke) doc.fillAndStroke(c.fill, c.stroke);
        else if (c.fill) doc.fill(c.fill);
        else doc.stroke(c.stroke ?? INK);
        doc.restore();
        break;
      }
      case "circle":
        doc.save();
        doc.circle(c.x, c.y, c.r).lineWidth(c.widthPt).stroke(c.stroke);
        doc.restore();
        break;
      case "text":
        doc
          .font(c.bold ? "Helvetica-Bold" : "Helvetica")
          .fontSize(c.sizePt)
          .fillColor(c.colour)
          .text(
            c.text,
            c.x,
            c.y,
            c.width !== undefined ? { width: c.width, align: c.align ?? "left" } : { lineBreak: false },
          );
        break;
      case "clip-begin":
        doc.save();
        doc.rect(c.x, c.y, c.w, c.h).clip();
        break;
      case "clip-end":
        doc.restore();
        break;
    }
  }
}

/** Keeps only the text of a sheet's art that lands inside its window; lines are clipped, text is culled. */
function cullText(commands: DrawCommand[], area: { x: number; y: number; w: number; h: number }): DrawCommand[] {
  let isInsideClip = false;
  return commands.filter((c) => {
    if (c.op === "clip-begin") isInsideClip = true;
    if (c.op === "clip-end") isInsideClip = false;
    if (!isInsideClip || c.op !== "text") return true;
    return c.x >= area.x - 2 && c.x <= area.x + area.w - 20 && c.y >= area.y - 2 && c.y <= area.y + area.h - 10;
  });
}

// What heading() takes: room checked, a 0.6-line gap, 13 pt type, the rule and its gap (points).
const HEADING_H = 40;
const HEADING = { room: HEADING_H, gapLines: 0.6, size: 13, ink: INK, accent: ACCENT };

type TableRow = { label: string; value: string };

function rowHeight(doc: Doc, row: TableRow, labelW: number): number {
  const valueW = CONTENT_W - labelW - 8;
  doc.font("Helvetica").fontSize(9.5);
  const valueH = doc.heightOfString(row.value, { width: valueW });
  return Math.max(valueH, doc.font("Helvetica-Bold").heightOfString(row.label, { width: labelW }));
}

/**
 * A headed two-column table (label, value). Rows never split across pages; a table that fits on one
 * page starts on a new page rather than break, and one longer than a page repeats its heading,
 * marked "(continued)", on each page it runs onto, so no page of rows goes without a title.
 */
function headedTable(doc: Doc, title: string, rows: TableRow[], labelW = 140): void {
  const valueW = CONTENT_W - labelW - 8;
  const heights = rows.map((row) => rowHeight(doc, row, labelW) + 3);
  const total = heights.reduce((sum, h) => sum + h, 0) + HEADING_H;
  if (doc.y + total > BOTTOM && total <= BOTTOM - PAGE_MARGIN_PT) doc.addPage();
  heading(doc, title, HEADING);
  rows.forEach((row, i) => {
    const h = heights[i]! - 3;
    if (doc.y + h + 5 > BOTTOM) {
      doc.addPage();
      heading(doc, `${title} (continued)`, HEADING);
    }
    const y = doc.y;
    doc.font("Helvetica-Bold").fontSize(9.5).fillColor(INK).text(row.label, PAGE_MARGIN_PT, y, { width: labelW });
    doc
      .font("Helvetica")
      .fontSize(9.5)
      .fillColor(INK)
      .text(row.value, PAGE_MARGIN_PT + labelW + 8, y, { width: valueW });
    doc.y = y + h + 3;
    ruleAcross(doc, doc.y - 1.5, RULE, 0.3);
  });
}

const UNIT_WORDS = {
  each: ["each", "each"],
  ton: ["ton", "tons"],
  cartridge: ["cartridge", "cartridges"],
  bag: ["bag", "bags"],
  pail: ["pail", "pails"],
  piece: ["piece", "pieces"],
} as const;

/** Renders the whole cut sheet; resolves to the PDF's bytes. */
export function renderCutSheetPdf(sheet: CutSheet): Promise<Buffer> {
  // Names and addresses may be in any script: text the built-in font cannot set uses embedded Noto.
  const doc = withWideText(
    new PDFDocument({
      size: "LETTER",
      margin: PAGE_MARGIN_PT,
      bufferPages: true,
      info: {
        Title: `Cut sheet: ${sheet.customerName}, ${sheet.town}`,
        Author: sheet.companyName,
        Creator: "Emberwright",
        Subject: "Cut list, material order and full-size cap template",
      },
    }),
  );
  const done = collectPdf(doc);

  doc
    .font("Helvetica-Bold")
    .fontSize(9)
    .fillColor(ACCENT)
    .text("CUT SHEET", PAGE_MARGIN_PT, PAGE_MARGIN_PT, { characterSpacing: 1.5 });
  doc.font("Helvetica-Bold").fontSize(20).fillColor(INK).text(sheet.customerName, { width: CONTENT_W });
  doc.font("Helvetica").fontSize(10.5).fillColor(INK).text(`${sheet.street}, ${sheet.town}`, { width: CONTENT_W });
  doc
    .fontSize(9)
    .fillColor(SOFT)
    .text(`${sheet.companyName} · job #${sheet.leadId} · ${sheet.versionLabel} · printed ${sheet.printedOn}`, {
      width: CONTENT_W,
    });

  headedTable(
    doc,
    "The design",
    sheet.summary.map((l) => ({ label: l.label, value: l.value })),
    110,
  );

  for (const section of sheet.cutList) {
    headedTable(doc, `Cut list: ${section.title.toLowerCase()}`, section.rows);
  }

  headedTable(
    doc,
    "Material order",
    sheet.materials.map((m) => {
      const [one, many] = UNIT_WORDS[m.unit];
      return {
        label: `${m.quantity} ${m.quantity === 1 ? one : many}`,
        value: `${m.item}${m.note ? `: ${m.note}` : ""}`,
      };
    }),
    90,
  );

  heading(doc, "Safety on site", HEADING);
  for (const caution of sheet.cautions) {
    doc.font("Helvetica").fontSize(9.5);
    const h = doc.heightOfString(caution.message, { width: CONTENT_W - 12 });
    ensureRoom(doc, h + 6);
    const y = doc.y;
    doc.save().rect(PAGE_MARGIN_PT, y, 2.5, h).fill(ACCENT).restore();
    doc.fillColor(INK).text(caution.message, PAGE_MARGIN_PT + 10, y, { width: CONTENT_W - 12 });
    doc.y = y + h + 6;
  }
  doc
    .font("Helvetica-Oblique")
    .fontSize(8.5)
    .fillColor(SOFT)
    .text(
      "These notes do not replace your local codes, your fire authority or licensed trades (gas, electrical): where they say more, they win.",
      PAGE_MARGIN_PT,
      doc.y,
      { width: CONTENT_W },
    );

  doc.addPage();
  doc
    .font("Helvetica-Bold")
    .fontSize(13)
    .fillColor(INK)
    .text("Drawings (to scale on this page, not full size)", PAGE_MARGIN_PT, PAGE_MARGIN_PT);
  const capBox = { x: PAGE_MARGIN_PT, y: PAGE_MARGIN_PT + 40, w: CONTENT_W, h: 280 };
  if (sheet.caps) {
    doc
      .font("Helvetica-Bold")
      .fontSize(10)
      .fillColor(INK)
      .text(`One cap of ${sheet.caps.count}, on its blank`, PAGE_MARGIN_PT, PAGE_MARGIN_PT + 22);
    playCommands(doc, drawCapFigure(layoutCapTemplate(sheet.caps), sheet.caps.offSquareDeg, capBox));
  } else {
    doc
      .font("Helvetica")
      .fontSize(10)
      .fillColor(SOFT)
      .text("No caps on this job.", PAGE_MARGIN_PT, PAGE_MARGIN_PT + 22);
  }
  const ringTop = capBox.y + capBox.h + 20;
  doc
    .font("Helvetica-Bold")
    .fontSize(10)
    .fillColor(INK)
    .text("The ring: first course, caps dashed, closure units in orange", PAGE_MARGIN_PT, ringTop);
  playCommands(
    doc,
    drawRingFigure(sheet.sceneInput, { x: PAGE_MARGIN_PT, y: ringTop + 10, w: CONTENT_W, h: BOTTOM - ringTop - 14 }),
  );

  if (sheet.caps) {
    const layout = layoutTemplateSheets(layoutCapTemplate(sheet.caps), `${sheet.customerName}, job #${sheet.leadId}`);
    for (const page of layout.sheets) {
      doc.addPage({ size: "LETTER", margin: 0 });
      playCommands(doc, cullText(page.commands, page.area));
    }
  }

  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    // The footer sits below the bottom margin; without this pdfkit would start a new page for it.
    doc.page.margins.bottom = 0;
    doc
      .font("Helvetica")
      .fontSize(7.5)
      .fillColor(SOFT)
      .text(
        `${sheet.companyName} · ${sheet.customerName} · page ${i + 1} of ${range.count}`,
        PAGE_MARGIN_PT,
        LETTER_PT.height - 24,
        {
          width: CONTENT_W,
          align: "right",
          lineBreak: false,
        },
      );
  }
  doc.end();
  return done;
}
