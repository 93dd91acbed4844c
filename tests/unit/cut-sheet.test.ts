/*
 * The printable cut sheet: what its PDF says (read back with pdf-parse), and that its cap template
 * is full size. PDF user space has 72 units to the inch (ISO 32000-1:2008, §8.3.2.3), so a 1 in
 * square is 72 × 72 and an edge of c in is 72·c long once every transformation is applied.
 */
import { inflateSync } from "node:zlib";
import { eq } from "drizzle-orm";
import { PDFParse } from "pdf-parse";
import { beforeAll, expect, test } from "vitest";
import { leads, type Lead } from "~/db/schema";
import { layoutCapTemplate } from "~/domain/cap-template";
import type { Plan } from "~/domain/plan";
import { formatInches } from "~/domain/units";
import {
  CALIBRATION_PT,
  layoutTemplateSheets,
  LETTER_PT,
  OVERLAP_IN,
  PT_PER_IN,
  type DrawCommand,
} from "~/lib/cut-sheet/cap-template-layout";
import { db } from "~/lib/platform/db.server";
import { loader as cutSheetLoader } from "~/routes/app-lead-cut-sheet";
import { loader as pdfLoader } from "~/routes/app-lead-cut-sheet-pdf";
import { demoCompany, routeArgs } from "./support/demo";
import { requestWithCookie } from "./support/fixtures";
import { loginAs } from "./support/login";

let lead: Lead;
let plan: Plan;
let pdf: Buffer;
let text = "";
let pageCount = 0;

beforeAll(async () => {
  const { company } = await demoCompany();
  [lead] = (await db.select().from(leads).where(eq(leads.ref, "demo-cinder-slate-10"))) as [Lead];
  plan = JSON.parse(lead.planJson) as Plan;
  // The crew member the job is given to prints it.
  const cookie = await loginAs(company.id, "crew");
  const response = (await pdfLoader(
    routeArgs(requestWithCookie(`/app/leads/${lead.id}/cut-sheet.pdf`, cookie), { leadId: String(lead.id) }),
  )) as Response;
  expect(response.headers.get("Content-Type")).toBe("application/pdf");
  pdf = Buffer.from(await response.arrayBuffer());
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  const result = await parser.getText();
  // Lines wrap where the page ends them; compare with single spaces.
  text = result.text.replace(/\s+/g, " ");
  pageCount = result.total;
  await parser.destroy();
});

test("the PDF prints the plan's cap marks from each corner, as the sheet formats them (to 1/16 in)", () => {
  const caps = plan.caps!;
  expect(text).toContain(`Inner mark ${formatInches(caps.innerMarkIn)} from each corner`);
  expect(text).toContain(`Outer mark ${formatInches(caps.outerMarkIn)} from each corner`);
  expect(text).toContain(`Inner width ${formatInches(caps.innerWidthIn)}`);
  expect(text).toContain(`Outer width ${formatInches(caps.outerWidthIn)}`);
  expect(text).toContain(`${formatInches(caps.sideCutLengthIn)} long, 15° off square`);
  // The same marks again on the template sheets, where the crew lays the paper on the blank.
  expect(text.split(formatInches(caps.innerMarkIn)).length - 1).toBeGreaterThanOrEqual(3);
});

test("the PDF holds the wall cut list, the material order and the crew's safety cautions", () => {
  expect(text).toContain(`Units a course ${plan.ring.unitsPerCourse}, all whole`);
  expect(text).toContain(`Layout radius ${formatInches(plan.ring.edgeDistanceIn)}`);
  expect(text).toMatch(/Running bond Turn every other course 12\.9°/);
  for (const material of plan.materials) expect(text).toContain(material.item);
  expect(text).toContain("OSHA 29 CFR 1926.1153");
  expect(text).toContain("1926.702(i)");
  expect(text).toContain("two people");
  expect(text).toContain("local codes");
});

test("the crew's PDF carries the site address but no price, e-mail or phone", () => {
  expect(text).toContain("11 Cinderbrook Lane, Millbrook Falls");
  expect(text).not.toMatch(/\$\d/);
  expect(text).not.toContain(lead.email);
  expect(text).not.toContain("018-3307");
});

test("the PDF has the content pages, a page of drawings and one page per template sheet", () => {
  const layout = layoutTemplateSheets(layoutCapTemplate(plan.caps!), "x");
  expect(text).toContain("Drawings (to scale on this page, not full size)");
  expect(text).toContain(`cap template, sheet A1 of ${layout.sheets.length} (full size)`);
  expect(pageCount).toBeGreaterThanOrEqual(layout.sheets.length + 2);
  expect(pageCount).toBeLessThanOrEqual(layout.sheets.length + 4);
});

test("every template sheet draws a 72 × 72 pt calibration square: 1 in at 72 units to the inch (ISO 32000-1, §8.3.2.3)", () => {
  const layout = layoutTemplateSheets(layoutCapTemplate(plan.caps!), "x");
  for (const sheet of layout.sheets) {
    const squares = sheet.commands.filter(
      (c): c is Extract<DrawCommand, { op: "rect" }> =>
        c.op === "rect" && c.w === CALIBRATION_PT && c.h === CALIBRATION_PT,
    );
    expect(squares).toHaveLength(1);
    expect(CALIBRATION_PT).toBe(PT_PER_IN);
    const [square] = squares;
    // Inside the page's printable area (half-inch margins).
    expect(square!.x).toBeGreaterThanOrEqual(36);
    expect(square!.y + square!.h).toBeLessThanOrEqual(LETTER_PT.height - 36);
  }
});

test("the template sheets draw the wedge at full size: its edges are 72 pt per inch of the plan's c1, c2 and side cut", () => {
  const caps = plan.caps!;
  const layout = layoutTemplateSheets(layoutCapTemplate(caps), "x");
  for (const sheet of layout.sheets) {
    const wedge = sheet.commands.find(
      (c): c is Extract<DrawCommand, { op: "path" }> =>
        c.op === "path" && c.closed && c.points.length === 4 && c.widthPt === 2,
    )!;
    const [il, ir, or, ol] = wedge.points as [number, number][];
    const len = (p: number[], q: number[]) => Math.hypot(p[0]! - q[0]!, p[1]! - q[1]!);
    expect(len(il!, ir!)).toBeCloseTo(caps.innerWidthIn * 72, 6);
    expect(len(ol!, or!)).toBeCloseTo(caps.outerWidthIn * 72, 6);
    expect(len(il!, ol!)).toBeCloseTo(caps.sideCutLengthIn * 72, 6);
  }
});

test("the template's sheets overlap by half an inch and together cover the whole template", () => {
  const layout = layoutTemplateSheets(layoutCapTemplate(plan.caps!), "x");
  const { widthIn, heightIn } = layout.canvas;
  for (const sheet of layout.sheets) {
    const right = layout.sheets.find((s) => s.row === sheet.row && s.col === sheet.col + 1);
    if (right) expect(sheet.window.x + sheet.window.w - right.window.x).toBeCloseTo(OVERLAP_IN, 9);
    const below = layout.sheets.find((s) => s.col === sheet.col && s.row === sheet.row + 1);
    if (below) expect(sheet.window.y + sheet.window.h - below.window.y).toBeCloseTo(OVERLAP_IN, 9);
    // Each window maps to the page at 72 pt to the inch.
    expect(sheet.window.w * PT_PER_IN).toBeCloseTo(sheet.area.w, 9);
    expect(sheet.window.h * PT_PER_IN).toBeCloseTo(sheet.area.h, 9);
  }
  const last = layout.sheets.at(-1)!;
  expect(last.window.x + last.window.w).toBeGreaterThanOrEqual(widthIn);
  expect(last.window.y + last.window.h).toBeGreaterThanOrEqual(heightIn);
  expect(layout.sheets).toHaveLength(layout.cols * layout.rows);
});

test("a small blank fits one sheet as it is; a slightly longer one is turned down the page rather than split", () => {
  // The printable window is 7.5 in wide and about 8.2 in tall; the template adds 0.6 in all round.
  const small = layoutTemplateSheets(
    layoutCapTemplate({
      ...plan.caps!,
      blankLengthIn: 6,
      blankDepthIn: 4,
      capDepthIn: 4,
      innerMarkIn: 1,
      outerMarkIn: 0.2,
      ripToDepthIn: null,
    }),
    "x",
  );
  expect(small.sheets).toHaveLength(1);
  expect(small.isRotated).toBe(false);
  const longer = layoutTemplateSheets(
    layoutCapTemplate({
      ...plan.caps!,
      blankLengthIn: 6.5,
      blankDepthIn: 5,
      capDepthIn: 5,
      innerMarkIn: 1,
      outerMarkIn: 0.2,
      ripToDepthIn: null,
    }),
    "x",
  );
  expect(longer.isRotated).toBe(true);
  expect(longer.sheets).toHaveLength(1);
});

/*
 * A small reader of PDF content streams: follows q/Q/cm (the current transformation matrix,
 * ISO 32000-1 §8.4.4) and reports every rectangle (re) and path point in default user space.
 */
type Matrix = [number, number, number, number, number, number];
const multiply = (m: Matrix, n: Matrix): Matrix => [
  m[0] * n[0] + m[1] * n[2],
  m[0] * n[1] + m[1] * n[3],
  m[2] * n[0] + m[3] * n[2],
  m[2] * n[1] + m[3] * n[3],
  m[4] * n[0] + m[5] * n[2] + n[4],
  m[4] * n[1] + m[5] * n[3] + n[5],
];
const apply = (m: Matrix, x: number, y: number): [number, number] => [
  m[0] * x + m[2] * y + m[4],
  m[1] * x + m[3] * y + m[5],
];

function readContentStreams(bytes: Buffer): string[] {
  const streams: string[] = [];
  const raw = bytes.toString("latin1");
  const pattern = /stream\r?\n/g;
  let match: RegExpExecArray | null;
  while ((match = pattern.exec(raw))) {
    const start = match.index + match[0].length;
    const end = raw.indexOf("endstream", start);
    try {
      streams.push(inflateSync(bytes.subarray(start, end)).toString("latin1"));
    } catch {
      // Not a deflated stream (or a font program): skip it.
    }
  }
  return streams.filter((s) => /\b(re|cm|BT)\b/.test(s));
}

function interpret(stream: string) {
  const tokens = stream
    .replace(/\((?:\\.|[^\\)])*\)/g, " ")
    .replace(/<[0-9a-fA-F\s]*>/g, " ")
    .replace(/[[\]]/g, " ")
    .split(/\s+/)
    .filter(Boolean);
  let ctm: Matrix = [1, 0, 0, 1, 0, 0];
  const stack: Matrix[] = [];
  let operands: number[] = [];
  let path: [number, number][] = [];
  const rects: { x: number; y: number; w: number; h: number }[] = [];
  const paths: [number, number][][] = [];
  for (const token of tokens) {
    const n = Number(token);
    if (token !== "" && Number.isFinite(n)) {
      operands.push(n);
      continue;
    }
    switch (token) {
      case "q":
        stack.push(ctm);
        break;
      case "Q":
        ctm = stack.pop() ?? [1, 0, 0, 1, 0, 0];
        break;
      case "cm":
        ctm = multiply(operands.slice(-6) as Matrix, ctm);
        break;
      case "re": {
        const [x, y, w, h] = operands.slice(-4) as [number, number, number, number];
        const p = apply(ctm, x, y);
        const q = apply(ctm, x + w, y + h);
        rects.push({
          x: Math.min(p[0], q[0]),
          y: Math.min(p[1], q[1]),
          w: Math.abs(q[0] - p[0]),
          h: Math.abs(q[1] - p[1]),
        });
        break;
      }
      case "m":
        path = [apply(ctm, operands.at(-2)!, operands.at(-1)!)];
        break;
      case "l":
        path.push(apply(ctm, operands.at(-2)!, operands.at(-1)!));
        break;
      case "S":
      case "s":
        if (path.length) paths.push(path);
        path = [];
        break;
    }
    operands = [];
  }
  return { rects, paths };
}

test("read back from the PDF itself, each template page has a 72 × 72 square in default user space", () => {
  const layout = layoutTemplateSheets(layoutCapTemplate(plan.caps!), "x");
  const pages = readContentStreams(pdf).map(interpret);
  const withSquare = pages.filter((p) => p.rects.some((r) => Math.abs(r.w - 72) < 1e-6 && Math.abs(r.h - 72) < 1e-6));
  expect(withSquare).toHaveLength(layout.sheets.length);
});

test("read back from the PDF itself, the template wedge's inner edge is c1 × 72 pt long on every template page", () => {
  const caps = plan.caps!;
  const pages = readContentStreams(pdf).map(interpret);
  const isWedge = (p: [number, number][]) =>
    p.length === 4 && Math.abs(Math.hypot(p[0]![0] - p[1]![0], p[0]![1] - p[1]![1]) - caps.innerWidthIn * 72) < 0.01;
  const layout = layoutTemplateSheets(layoutCapTemplate(caps), "x");
  expect(pages.filter((p) => p.paths.some(isWedge))).toHaveLength(layout.sheets.length);
});

test("the printable cut sheet page has the same cut list and no prices for the crew", async () => {
  const cookie = await loginAs(lead.companyId, "crew");
  const { sheet } = (await cutSheetLoader(
    routeArgs(requestWithCookie(`/app/leads/${lead.id}/cut-sheet`, cookie), { leadId: String(lead.id) }),
  )) as {
    sheet: { cutList: { id: string; rows: { key: string; value: string }[] }[]; cautions: { audience: string }[] };
  };
  const caps = sheet.cutList.find((s) => s.id === "caps")!;
  expect(caps.rows.find((r) => r.key === "cap-inner-mark")!.value).toContain(formatInches(plan.caps!.innerMarkIn));
  expect(sheet.cautions.every((c) => c.audience !== "homeowner")).toBe(true);
  expect(sheet.cautions.map((c) => (c as { code?: string }).code)).toEqual(
    expect.arrayContaining(["wet-cutting", "heavy-lifting"]),
  );
  expect(JSON.stringify(sheet)).not.toMatch(/Cents|@example\.test/);
});
