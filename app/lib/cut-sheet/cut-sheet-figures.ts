import type { CapTemplate } from "~/domain/cap-template";
import { formatInches } from "~/domain/units";
import type { DrawCommand, Point } from "~/lib/cut-sheet/cap-template-layout";
import { formatDegrees } from "~/lib/cut-sheet/cut-list";
import { drawPitPlan, measureUnitStepRad, type PitSceneInput } from "~/domain/pit-layout";

/*
 * The cut sheet's two scaled drawings as drawing commands in PDF points: one cap on its blank with
 * every measurement the crew marks, and the ring's first course with its diameters and layout radius.
 * Pure, like the template layout; the PDF renderer only plays the commands back.
 */

export type Box = { x: number; y: number; w: number; h: number };

const INK = "#1f1b19";
const SOFT = "#8a8178";
const ACCENT = "#c0501a";

function arrow(tip: Point, from: Point, size: number): DrawCommand {
  const dx = tip[0] - from[0];
  const dy = tip[1] - from[1];
  const len = Math.hypot(dx, dy) || 1;
  const ux = dx / len;
  const uy = dy / len;
  const bx = tip[0] - ux * size;
  const by = tip[1] - uy * size;
  const half = size * 0.35;
  return {
    op: "path",
    points: [tip, [bx - uy * half, by + ux * half], [bx + uy * half, by - ux * half]],
    closed: true,
    widthPt: 0.8,
    colour: INK,
  };
}

function dimension(a: Point, b: Point, label: string, labelAt: Point, colour = INK, width = 80): DrawCommand[] {
  return [
    { op: "path", points: [a, b], closed: false, widthPt: 0.6, colour },
    arrow(a, b, 5),
    arrow(b, a, 5),
    {
      op: "text",
      x: labelAt[0] - width / 2,
      y: labelAt[1],
      text: label,
      sizePt: 8,
      colour,
      bold: true,
      align: "center",
      width,
    },
  ];
}

const extension = (a: Point, b: Point): DrawCommand => ({
  op: "path",
  points: [a, b],
  closed: false,
  widthPt: 0.4,
  colour: SOFT,
  dash: [2, 2],
});

/** One cap on its blank, scaled into the box, with marks, widths, depth and angle. */
export function drawCapFigure(t: CapTemplate, offSquareDeg: number, box: Box): DrawCommand[] {
  const l = t.blankLengthIn;
  const w = t.blankDepthIn;
  // Room for two rows of dimensions above and below and a depth dimension on the right.
  const scale = Math.min(box.w / (l + 3.2), box.h / (w + 4.6));
  const ox = box.x + (box.w - (l + 3.2) * scale) / 2 + 0.4 * scale;
  const oy = box.y + 2.3 * scale;
  const at = (x: number, y: number): Point => [ox + x * scale, oy + y * scale];
  const [il, ir, or, ol] = t.corners;
  const row = 13;
  const top1 = oy - row;
  const top2 = oy - 2 * row - 4;
  const bottom1 = oy + w * scale + row;
  const bottom2 = oy + w * scale + 2 * row + 4;
  const commands: DrawCommand[] = [
    {
      op: "rect",
      x: at(0, 0)[0],
      y: at(0, 0)[1],
      w: l * scale,
      h: w * scale,
      widthPt: 0.6,
      stroke: SOFT,
      fill: "#f4eee5",
    },
    { op: "path", points: [at(...il), at(...ir), at(...or), at(...ol)], closed: true, widthPt: 1.6, colour: INK },
    extension(at(0, 0), [at(0, 0)[0], top2]),
    extension(at(l, 0), [at(l, 0)[0], top2]),
    extension(at(...il), [at(...il)[0], top2]),
    extension(at(...ir), [at(...ir)[0], top1]),
    ...dimension(
      [at(0, 0)[0], top1],
      [at(...il)[0], top1],
      formatInches(il[0]),
      [at(il[0] / 2, 0)[0], top1 - 10],
      ACCENT,
      60,
    ),
    ...dimension(
      [at(...ir)[0], top1],
      [at(l, 0)[0], top1],
      formatInches(l - ir[0]),
      [at(l - il[0] / 2, 0)[0], top1 - 10],
      ACCENT,
      60,
    ),
    ...dimension([at(...il)[0], top2], [at(...ir)[0], top2], `inner ${formatInches(ir[0] - il[0])}`, [
      at(l / 2, 0)[0],
      top2 - 10,
    ]),
    extension(at(0, w), [at(0, w)[0], bottom2]),
    extension(at(l, w), [at(l, w)[0], bottom2]),
    extension(at(...ol), [at(...ol)[0], bottom1]),
    extension(at(...or), [at(...or)[0], bottom2]),
    ...dimension(
      [at(0, w)[0], bottom1],
      [at(...ol)[0], bottom1],
      formatInches(ol[0]),
      [at(ol[0] / 2, 0)[0], bottom1 + 3],
      ACCENT,
      60,
    ),
    ...dimension(
      [at(...or)[0], bottom1],
      [at(l, w)[0], bottom1],
      formatInches(l - or[0]),
      [at(l - ol[0] / 2, 0)[0], bottom1 + 3],
      ACCENT,
      60,
    ),
    ...dimension([at(...ol)[0], bottom2], [at(...or)[0], bottom2], `outer ${formatInches(or[0] - ol[0])}`, [
      at(l / 2, 0)[0],
      bottom2 + 3,
    ]),
    ...dimension(
      [at(l, 0)[0] + 14, at(0, 0)[1]],
      [at(l, 0)[0] + 14, at(0, t.capDepthIn)[1]],
      formatInches(t.capDepthIn),
      [at(l, 0)[0] + 44, at(0, t.capDepthIn / 2)[1] - 4],
      INK,
      56,
    ),
    {
      op: "text",
      x: at(l / 2, 0)[0] - 60,
      y: at(0, 0)[1] + 5,
      text: "fire side",
      sizePt: 8,
      colour: SOFT,
      align: "center",
      width: 120,
    },
    {
      op: "text",
      x: at((il[0] + ol[0]) / 2, 0)[0] + 6,
      y: at(0, t.capDepthIn * 0.55)[1],
      text: `${formatDegrees(offSquareDeg)} off square`,
      sizePt: 8,
      colour: INK,
      bold: true,
      width: 90,
    },
  ];
  if (t.ripLineIn !== null) {
    commands.push({
      op: "path",
      points: [at(0, t.ripLineIn), at(l, t.ripLineIn)],
      closed: false,
      widthPt: 0.8,
      colour: ACCENT,
      dash: [4, 2],
    });
    commands.push({
      op: "text",
      x: at(0, 0)[0] + 4,
      y: at(0, t.ripLineIn)[1] + 2,
      text: "rip",
      sizePt: 7,
      colour: ACCENT,
      bold: true,
    });
  }
  return commands;
}

/** The ring's first course and caps (dashed) seen from above, scaled into the box, with its diameters. */
export function drawRingFigure(input: PitSceneInput, box: Box): DrawCommand[] {
  const plan = drawPitPlan(input);
  const m = plan.measurements;
  const capReach = plan.caps.length ? Math.max(...plan.caps.flat().map(([x, y]) => Math.hypot(x, y))) : 0;
  const reach = Math.max(m.wallCornerRadiusIn, capReach);
  const scale = Math.min(box.w, box.h - 40) / (2 * reach + 2);
  const cx = box.x + box.w / 2;
  const cy = box.y + 30 + (box.h - 30) / 2;
  // Plan y runs north; the page's y runs down.
  const at = ([x, y]: [number, number]): Point => [cx + x * scale, cy - y * scale];
  const a = m.bowlDiameterIn / 2;
  const outside = m.outsideDiameterIn / 2;
  // The radius runs to a unit's own centre line (units stand on multiples of the step), down-right.
  const step = measureUnitStepRad(input.ring);
  const radiusAngle = Math.round(-1.2 / step) * step;
  const commands: DrawCommand[] = [
    ...plan.caps.map((p): DrawCommand => ({
      op: "path",
      points: p.map(at),
      closed: true,
      widthPt: 0.5,
      colour: SOFT,
      dash: [3, 2],
    })),
    ...plan.wallUnits.map((p): DrawCommand => ({
      op: "path",
      points: p.map(at),
      closed: true,
      widthPt: 0.9,
      colour: INK,
    })),
    ...plan.closureUnits.map((p): DrawCommand => ({
      op: "path",
      points: p.map(at),
      closed: true,
      widthPt: 1.4,
      colour: ACCENT,
    })),
    ...dimension(at([-a, 0]), at([a, 0]), `bowl ${formatInches(m.bowlDiameterIn)}`, [cx, cy - 14], INK, 110),
    extension(at([-outside, 0]), [at([-outside, 0])[0], cy - reach * scale - 18]),
    extension(at([outside, 0]), [at([outside, 0])[0], cy - reach * scale - 18]),
    ...dimension(
      [at([-outside, 0])[0], cy - reach * scale - 12],
      [at([outside, 0])[0], cy - reach * scale - 12],
      `outside ${formatInches(m.outsideDiameterIn)}`,
      [cx, cy - reach * scale - 24],
      INK,
      130,
    ),
    {
      op: "path",
      points: [at([0, 0]), at([a * Math.cos(radiusAngle), a * Math.sin(radiusAngle)])],
      closed: false,
      widthPt: 0.8,
      colour: ACCENT,
    },
    {
      op: "text",
      x: cx + 4,
      y: cy + a * scale * 0.45,
      text: `layout radius ${formatInches(a)} to the middle of each back`,
      sizePt: 7.5,
      colour: ACCENT,
      bold: true,
      width: Math.max(80, a * scale * 0.9),
    },
    {
      op: "path",
      points: [
        [cx - 4, cy],
        [cx + 4, cy],
      ],
      closed: false,
      widthPt: 0.8,
      colour: ACCENT,
    },
    {
      op: "path",
      points: [
        [cx, cy - 4],
        [cx, cy + 4],
      ],
      closed: false,
      widthPt: 0.8,
      colour: ACCENT,
    },
  ];
  return commands;
}
