import type { CapTemplate, TemplatePoint } from "~/domain/cap-template";
import { formatInches } from "~/domain/units";
import { formatDegrees } from "~/lib/cut-sheet/cut-list";

/*
 * The full-size cap template as pages of drawing commands, in PDF points on US Letter paper.
 * Pure: the PDF renderer only plays the commands back, so tests can measure what gets drawn.
 *
 * Scale: PDF user space has 72 units to the inch (ISO 32000-1:2008, §8.3.2.3), so a length of
 * x in is drawn 72·x pt long. The template is cut into tiles, each printed on one sheet; tiles
 * overlap by OVERLAP_IN so neighbours can be lined up on the alignment targets and taped.
 */

export const PT_PER_IN = 72;
export const LETTER_PT = { width: 612, height: 792 } as const;
/** Printers leave about a quarter inch blank at each edge; half an inch is safe on any of them. */
export const PAGE_MARGIN_PT = 36;
export const HEADER_PT = 40;
export const FOOTER_PT = 92;
export const OVERLAP_IN = 0.5;
/** Room around the blank for marks and labels, in. */
export const TEMPLATE_MARGIN_IN = 0.6;
export const CALIBRATION_PT = 72;

export type Point = [x: number, y: number];

export type DrawCommand =
  | { op: "path"; points: Point[]; closed: boolean; widthPt: number; colour: string; dash?: [number, number] }
  | {
      op: "rect";
      x: number;
      y: number;
      w: number;
      h: number;
      widthPt: number;
      stroke?: string;
      fill?: string;
      dash?: [number, number];
    }
  | { op: "circle"; x: number; y: number; r: number; widthPt: number; stroke: string }
  | {
      op: "text";
      x: number;
      y: number;
      text: string;
      sizePt: number;
      colour: string;
      bold?: boolean;
      align?: "left" | "center" | "right";
      width?: number;
    }
  | { op: "clip-begin"; x: number; y: number; w: number; h: number }
  | { op: "clip-end" };

export type TemplateSheet = {
  /** "A1": column letter, row number, as on the sheet map. */
  label: string;
  col: number;
  row: number;
  /** The printable window on the page, in pt. */
  area: { x: number; y: number; w: number; h: number };
  /** The part of the template (canvas inches) this sheet shows. */
  window: { x: number; y: number; w: number; h: number };
  commands: DrawCommand[];
};

export type TemplateLayout = {
  /** True when the blank runs down the page (fewer sheets that way). */
  isRotated: boolean;
  cols: number;
  rows: number;
  canvas: { widthIn: number; heightIn: number };
  sheets: TemplateSheet[];
  /** Where the 1 in square is drawn on every sheet, pt. */
  calibration: { x: number; y: number; size: number };
  /** Maps a template point (in) to canvas inches (before tiling). */
  toCanvas: (p: TemplatePoint) => Point;
};

const AREA = {
  x: PAGE_MARGIN_PT,
  y: PAGE_MARGIN_PT + HEADER_PT,
  w: LETTER_PT.width - 2 * PAGE_MARGIN_PT,
  h: LETTER_PT.height - 2 * PAGE_MARGIN_PT - HEADER_PT - FOOTER_PT,
};

/** Sheets needed to cover a length with windows of `windowIn` overlapping by OVERLAP_IN. */
export function countTiles(lengthIn: number, windowIn: number): number {
  if (lengthIn <= windowIn) return 1;
  return Math.ceil((lengthIn - OVERLAP_IN) / (windowIn - OVERLAP_IN) - 1e-9);
}

const INK = "#1f1b19";
const SOFT = "#8a8178";
const ACCENT = "#c0501a";

/** Lays the template out on Letter sheets: tiles with overlaps, targets, labels and a 1 in square on each. */
export function layoutTemplateSheets(template: CapTemplate, title: string): TemplateLayout {
  const l = template.blankLengthIn;
  const w = template.blankDepthIn;
  const m = TEMPLATE_MARGIN_IN;
  const windowW = AREA.w / PT_PER_IN;
  const windowH = AREA.h / PT_PER_IN;
  const flat = { cols: countTiles(l + 2 * m, windowW), rows: countTiles(w + 2 * m, windowH) };
  const turned = { cols: countTiles(w + 2 * m, windowW), rows: countTiles(l + 2 * m, windowH) };
  const isRotated = turned.cols * turned.rows < flat.cols * flat.rows;
  const { cols, rows } = isRotated ? turned : flat;
  const canvas = isRotated ? { widthIn: w + 2 * m, heightIn: l + 2 * m } : { widthIn: l + 2 * m, heightIn: w + 2 * m };
  // Turned a quarter turn (not mirrored): the blank's length runs down the page, its fire side on the right.
  const toCanvas = (p: TemplatePoint): Point => (isRotated ? [w + m - p[1], p[0] + m] : [p[0] + m, p[1] + m]);

  const art = drawTemplateArt(template, toCanvas, { cols, rows, windowW, windowH, canvas });
  const stepW = windowW - OVERLAP_IN;
  const stepH = windowH - OVERLAP_IN;
  const calibration = {
    x: PAGE_MARGIN_PT,
    y: LETTER_PT.height - PAGE_MARGIN_PT - CALIBRATION_PT,
    size: CALIBRATION_PT,
  };
  const sheets: TemplateSheet[] = [];
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < cols; col++) {
      const window = { x: col * stepW, y: row * stepH, w: windowW, h: windowH };
      const label = `${String.fromCharCode(65 + col)}${row + 1}`;
      const toPage = (p: Point): Point => [
        AREA.x + (p[0] - window.x) * PT_PER_IN,
        AREA.y + (p[1] - window.y) * PT_PER_IN,
      ];
      const commands: DrawCommand[] = [
        {
          op: "text",
          x: PAGE_MARGIN_PT,
          y: PAGE_MARGIN_PT,
          text: `${title}: cap template, sheet ${label} of ${cols * rows} (full size)`,
          sizePt: 11,
          colour: INK,
          bold: true,
          width: AREA.w - 90,
        },
        {
          op: "text",
          x: PAGE_MARGIN_PT,
          y: PAGE_MARGIN_PT + 15,
          text: "Trim along the frame where a neighbour sheet overlaps, line up the targets, tape. Then lay it on the blank, corners on corners.",
          sizePt: 8,
          colour: SOFT,
          width: AREA.w - 90,
        },
        ...drawSheetMap(cols, rows, col, row),
        { op: "clip-begin", ...AREA },
        ...art.map((c) => placeCommand(c, toPage)),
        { op: "clip-end" },
        { op: "rect", ...AREA, widthPt: 0.5, stroke: SOFT, dash: [2, 2] },
        ...drawOverlapEdges(col, row, cols, rows, stepW, stepH, window, toPage),
        {
          op: "rect",
          x: calibration.x,
          y: calibration.y,
          w: CALIBRATION_PT,
          h: CALIBRATION_PT,
          widthPt: 0.75,
          stroke: INK,
        },
        {
          op: "text",
          x: calibration.x + CALIBRATION_PT + 12,
          y: calibration.y + 8,
          text: "Check the scale: this square must measure exactly 1 in (25.4 mm) on each side.",
          sizePt: 9,
          colour: INK,
          bold: true,
          width: AREA.w - CALIBRATION_PT - 12,
        },
        {
          op: "text",
          x: calibration.x + CALIBRATION_PT + 12,
          y: calibration.y + 24,
          text: 'Print at 100 % ("Actual size"), never "Fit to page". If the square is off, the template is off: do not cut from it.',
          sizePt: 8,
          colour: SOFT,
          width: AREA.w - CALIBRATION_PT - 12,
        },
      ];
      sheets.push({ label, col, row, area: AREA, window, commands });
    }
  }
  return { isRotated, cols, rows, canvas, sheets, calibration, toCanvas };
}

/** A command in canvas inches, moved to page points (lengths scaled 72 pt to the inch). */
function placeCommand(command: DrawCommand, toPage: (p: Point) => Point): DrawCommand {
  switch (command.op) {
    case "path":
      return { ...command, points: command.points.map(toPage) };
    case "circle": {
      const [x, y] = toPage([command.x, command.y]);
      return { ...command, x, y, r: command.r * PT_PER_IN };
    }
    case "text": {
      const [x, y] = toPage([command.x, command.y]);
      return { ...command, x, y, width: command.width !== undefined ? command.width * PT_PER_IN : undefined };
    }
    case "rect": {
      const [x, y] = toPage([command.x, command.y]);
      return { ...command, x, y, w: command.w * PT_PER_IN, h: command.h * PT_PER_IN };
    }
    default:
      return command;
  }
}

/** The small grid in the corner of each sheet showing where it goes. */
function drawSheetMap(cols: number, rows: number, col: number, row: number): DrawCommand[] {
  const cell = 10;
  const x0 = LETTER_PT.width - PAGE_MARGIN_PT - cols * cell;
  const y0 = PAGE_MARGIN_PT;
  const commands: DrawCommand[] = [];
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      commands.push({
        op: "rect",
        x: x0 + c * cell,
        y: y0 + r * cell,
        w: cell,
        h: cell,
        widthPt: 0.5,
        stroke: INK,
        fill: r === row && c === col ? ACCENT : undefined,
      });
    }
  }
  return commands;
}

/** Where the neighbouring sheets' windows begin: the overlap strip, drawn on this sheet. */
function drawOverlapEdges(
  col: number,
  row: number,
  cols: number,
  rows: number,
  stepW: number,
  stepH: number,
  window: TemplateSheet["window"],
  toPage: (p: Point) => Point,
): DrawCommand[] {
  const commands: DrawCommand[] = [];
  const line = (a: Point, b: Point): DrawCommand => ({
    op: "path",
    points: [toPage(a), toPage(b)],
    closed: false,
    widthPt: 0.5,
    colour: ACCENT,
    dash: [4, 3],
  });
  if (col + 1 < cols) commands.push(line([(col + 1) * stepW, window.y], [(col + 1) * stepW, window.y + window.h]));
  if (row + 1 < rows) commands.push(line([window.x, (row + 1) * stepH], [window.x + window.w, (row + 1) * stepH]));
  return commands;
}

/** Everything drawn on the template itself, in canvas inches; each sheet shows its window of it. */
function drawTemplateArt(
  t: CapTemplate,
  toCanvas: (p: TemplatePoint) => Point,
  grid: { cols: number; rows: number; windowW: number; windowH: number; canvas: { widthIn: number; heightIn: number } },
): DrawCommand[] {
  const l = t.blankLengthIn;
  const w = t.blankDepthIn;
  const [il, ir, or, ol] = t.corners;
  const path = (
    points: TemplatePoint[],
    closed: boolean,
    widthPt: number,
    colour: string,
    dash?: [number, number],
  ): DrawCommand => ({
    op: "path",
    points: points.map(toCanvas),
    closed,
    widthPt,
    colour,
    ...(dash ? { dash } : {}),
  });
  const text = (at: TemplatePoint, value: string, sizePt: number, colour = INK, bold = false): DrawCommand => {
    const [x, y] = toCanvas(at);
    return { op: "text", x, y, text: value, sizePt, colour, bold };
  };
  const tick = (p: TemplatePoint, outward: number): DrawCommand => path([p, [p[0], p[1] + outward]], false, 1, ACCENT);
  const innerMark = formatInches(il[0]);
  const outerMark = formatInches(ol[0]);
  const commands: DrawCommand[] = [
    // The blank's edges: lay these on the blank's own edges.
    path(
      [
        [0, 0],
        [l, 0],
        [l, w],
        [0, w],
      ],
      true,
      0.75,
      SOFT,
    ),
    // The cut: bold, the line to saw along.
    path([il, ir, or, ol], true, 2, INK),
    // Marks on the long edges, with ticks running off the blank so they can be transferred.
    tick(il, -0.35),
    tick(ir, -0.35),
    tick([ol[0], w], 0.35),
    tick([or[0], w], 0.35),
    text([il[0] / 2 - 0.3, -0.45], innerMark, 9, ACCENT, true),
    text([l - il[0] / 2 - 0.3, -0.45], innerMark, 9, ACCENT, true),
    text([ol[0] / 2 - 0.3, w + 0.2], outerMark, 9, ACCENT, true),
    text([l - ol[0] / 2 - 0.3, w + 0.2], outerMark, 9, ACCENT, true),
    // The optional arcs, thin and dashed: only for arced edges.
    path(t.innerArc, false, 0.6, SOFT, [3, 2]),
    path(
      t.outerArc.filter(([, y]) => y <= w + 1e-9),
      false,
      0.6,
      SOFT,
      [3, 2],
    ),
    // Centre line of the cap, for squaring the template on the blank.
    path(
      [
        [l / 2, -0.3],
        [l / 2, w + 0.3],
      ],
      false,
      0.5,
      SOFT,
      [6, 2],
    ),
    text([l / 2 + 0.1, 0.25], "FIRE SIDE (inner edge)", 9, INK, true),
    text([l / 2 + 0.1, w - 0.45], "OUTER EDGE", 9, INK, true),
    text([il[0] + 0.15, 0.7], `inner ${formatInches(ir[0] - il[0])}`, 8),
    text([ol[0] + 0.15, Math.max(0.9, t.capDepthIn - 0.75)], `outer ${formatInches(or[0] - ol[0])}`, 8),
    text(
      [Math.min(il[0], ol[0]) + 0.4, t.capDepthIn / 2],
      `cut ${formatDegrees((Math.atan2(il[0] - ol[0], t.capDepthIn) * 180) / Math.PI)} off square`,
      8,
    ),
  ];
  if (t.ripLineIn !== null) {
    commands.push(
      path(
        [
          [0, t.ripLineIn],
          [l, t.ripLineIn],
        ],
        false,
        1,
        ACCENT,
        [6, 3],
      ),
    );
    commands.push(text([0.2, t.ripLineIn + 0.1], `rip line: ${formatInches(t.ripLineIn)} deep`, 8, ACCENT, true));
  }
  // Alignment targets in every overlap strip: each appears on both sheets at the same spot.
  const stepW = grid.windowW - OVERLAP_IN;
  const stepH = grid.windowH - OVERLAP_IN;
  const targets: Point[] = [];
  for (let c = 1; c < grid.cols; c++) {
    for (let y = 1; y < grid.canvas.heightIn; y += 2.5) targets.push([c * stepW + OVERLAP_IN / 2, y]);
  }
  for (let r = 1; r < grid.rows; r++) {
    for (let x = 1; x < grid.canvas.widthIn; x += 2.5) targets.push([x, r * stepH + OVERLAP_IN / 2]);
  }
  for (const [x, y] of targets) {
    commands.push({ op: "circle", x, y, r: 0.12, widthPt: 0.6, stroke: INK });
    commands.push({
      op: "path",
      points: [
        [x - 0.2, y],
        [x + 0.2, y],
      ],
      closed: false,
      widthPt: 0.6,
      colour: INK,
    });
    commands.push({
      op: "path",
      points: [
        [x, y - 0.2],
        [x, y + 0.2],
      ],
      closed: false,
      widthPt: 0.6,
      colour: INK,
    });
  }
  return commands;
}
