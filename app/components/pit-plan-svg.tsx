import { formatLength as formatLengthIn, type LengthUnit } from "~/domain/units";
import {
  FALLBACK_COLOURS,
  FIREBRICK_COLOUR,
  STEEL_RING_COLOUR,
  drawPitPlan,
  pickColour,
  type PitSceneInput,
  type PlanPoint,
  type PlanPolygon,
} from "~/domain/pit-layout";

export type PitPlanSvgProps = {
  input: PitSceneInput;
  unit: LengthUnit;
  /** Prints a length given in inches; defaults to 1/16 in fractions or whole mm by `unit`. */
  formatLength?: (inches: number) => string;
  className?: string;
  /** 0 puts the drawing in the tab order, so keyboard and screen-reader users reach its description. */
  tabIndex?: number;
};

const INK = "#413a35";
const SOFT_INK = "#6f655d";
const ACCENT = "#d4611a";
const BOWL_FILL = "#e8e3db";

// Plan y runs north (up); SVG y runs down.
const sx = (p: PlanPoint) => p[0];
const sy = (p: PlanPoint) => -p[1];
const num = (n: number) => Number(n.toFixed(3));

function pathOf(polygon: PlanPolygon): string {
  return `M${polygon.map((p) => `${num(sx(p))} ${num(sy(p))}`).join("L")}Z`;
}

/** A filled arrowhead with its tip at (x, y), pointing along (dx, dy) in SVG coordinates. */
function arrowHead(x: number, y: number, dx: number, dy: number, size: number): string {
  const len = Math.hypot(dx, dy) || 1;
  const ux = dx / len;
  const uy = dy / len;
  const bx = x - ux * size;
  const by = y - uy * size;
  const w = size * 0.35;
  return `M${num(x)} ${num(y)}L${num(bx - uy * w)} ${num(by + ux * w)}L${num(bx + uy * w)} ${num(by - ux * w)}Z`;
}

/** A dimension line between two SVG points with arrowheads at both ends. */
function DimensionLine({
  x1,
  y1,
  x2,
  y2,
  size,
  stroke,
}: {
  x1: number;
  y1: number;
  x2: number;
  y2: number;
  size: number;
  stroke: number;
}) {
  return (
    <g>
      <line x1={num(x1)} y1={num(y1)} x2={num(x2)} y2={num(y2)} stroke={INK} strokeWidth={stroke} />
      <path d={arrowHead(x1, y1, x1 - x2, y1 - y2, size)} fill={INK} />
      <path d={arrowHead(x2, y2, x2 - x1, y2 - y1, size)} fill={INK} />
    </g>
  );
}

/** Text with a pale halo so it stays readable over pavers and units. */
function Label({
  x,
  y,
  size,
  anchor = "middle",
  children,
}: {
  x: number;
  y: number;
  size: number;
  anchor?: "start" | "middle" | "end";
  children: string;
}) {
  return (
    <text
      x={num(x)}
      y={num(y)}
      fontSize={num(size)}
      textAnchor={anchor}
      fill="#1f1b19"
      stroke="#fbf8f3"
      strokeWidth={num(size * 0.28)}
      strokeLinejoin="round"
      paintOrder="stroke"
      fontWeight={700}
    >
      {children}
    </text>
  );
}

/** Summary of the pit's key sizes, for screen readers and the figure's label. */
export function describePitPlan(input: PitSceneInput, format: (inches: number) => string): string {
  const { measurements: m } = drawPitPlan(input);
  const parts = [
    `bowl diameter ${format(m.bowlDiameterIn)}`,
    `outside diameter ${format(m.outsideDiameterIn)}`,
    `${input.ring.unitCount} wall units a course`,
  ];
  const closures = input.ring.closure?.countPerCourse ?? 0;
  if (closures) parts.push(`${closures} closure unit${closures > 1 ? "s" : ""} a course`);
  parts.push(`${input.ring.courses} course${input.ring.courses === 1 ? "" : "s"}`);
  if (input.caps) parts.push(`${input.caps.count} caps`);
  if (input.liner.kind === "steel-ring") parts.push(`steel ring ${format(input.liner.outsideDiameterIn)} across`);
  if (input.liner.kind === "firebrick") parts.push(`firebrick lining, ${input.liner.perRow} a row`);
  if (input.patio) parts.push(`patio radius ${format(input.patio.outsideRadiusIn)}`);
  return `Plan view of the fire pit: ${parts.join(", ")}.`;
}

/** Dimensioned top-down plan of the pit (first course, caps, liner, patio); plain SVG, sized by its container. */
export function PitPlanSvg({ input, unit, formatLength, className, tabIndex }: PitPlanSvgProps) {
  const format = formatLength ?? ((inches: number) => formatLengthIn(inches, unit));
  const plan = drawPitPlan(input);
  const m = plan.measurements;
  const a = m.bowlDiameterIn / 2;
  const outsideEdge = m.outsideDiameterIn / 2;

  // Everything is sized against the drawing's reach, so labels read the same at any pit size.
  const extent = Math.max(m.extentRadiusIn, 1);
  const font = extent / 17;
  const stroke = extent / 320;
  const arrow = font * 0.55;
  const half = extent + font * 3.2;
  const viewBox = `${num(-half)} ${num(-half)} ${num(2 * half)} ${num(2 * half)}`;

  const wallColour = pickColour(input.wallUnit.colourHex, FALLBACK_COLOURS.wall);
  const capColour = pickColour(input.caps?.colourHex, FALLBACK_COLOURS.cap);
  const patio = input.patio;
  const borderColour = pickColour(patio?.borderColourHex, FALLBACK_COLOURS.border);
  const fieldColour = pickColour(patio?.fieldColourHex, FALLBACK_COLOURS.field);

  const capReach = plan.caps.length ? Math.max(...plan.caps.flat().map(([x, y]) => Math.hypot(x, y))) : 0;
  const pitReach = Math.max(m.wallCornerRadiusIn, capReach);
  // The outside diameter is dimensioned above the pit, between extension lines off the two faces.
  const odY = -(pitReach + font * 1.4);
  const summary = describePitPlan(input, format);

  const leader = (radius: number, angleDeg: number) => {
    const t = (angleDeg * Math.PI) / 180;
    return { x: radius * Math.cos(t), y: radius * Math.sin(t), dx: Math.cos(t), dy: Math.sin(t) };
  };
  const outer = patio ? leader(patio.outsideRadiusIn, 62) : null;
  const field = patio && m.fieldRadiusIn ? leader(m.fieldRadiusIn, 34) : null;

  return (
    <svg
      viewBox={viewBox}
      width="100%"
      role="img"
      aria-label={summary}
      tabIndex={tabIndex}
      data-unit={unit}
      className={className}
      style={{ display: "block" }}
      fontFamily="inherit"
    >
      <title>Fire pit plan</title>

      {patio && m.fieldRadiusIn !== null && (
        <g>
          <circle r={num(patio.outsideRadiusIn)} fill="none" stroke={SOFT_INK} strokeWidth={stroke} />
          <circle
            r={num(m.fieldRadiusIn)}
            fill={fieldColour}
            fillOpacity={0.55}
            stroke={SOFT_INK}
            strokeWidth={stroke}
          />
          {plan.borderUnits.map((polygon, i) => (
            <path key={i} d={pathOf(polygon)} fill={borderColour} stroke={INK} strokeWidth={stroke * 0.7} />
          ))}
        </g>
      )}

      <circle r={num(m.gravelRadiusIn)} fill={BOWL_FILL} />

      {plan.wallUnits.map((polygon, i) => (
        <path
          key={`w${i}`}
          d={pathOf(polygon)}
          fill={wallColour}
          stroke={INK}
          strokeWidth={stroke}
          strokeLinejoin="round"
        />
      ))}
      {plan.closureUnits.map((polygon, i) => (
        <path
          key={`c${i}`}
          d={pathOf(polygon)}
          fill={wallColour}
          stroke={ACCENT}
          strokeWidth={stroke * 1.6}
          strokeLinejoin="round"
        />
      ))}
      {plan.firebrick.map((polygon, i) => (
        <path key={`f${i}`} d={pathOf(polygon)} fill={FIREBRICK_COLOUR} stroke={INK} strokeWidth={stroke * 0.7} />
      ))}
      {plan.steelRingRadiusIn !== null && (
        <circle r={num(plan.steelRingRadiusIn)} fill="none" stroke={STEEL_RING_COLOUR} strokeWidth={stroke * 3} />
      )}
      {plan.caps.map((polygon, i) => (
        <path
          key={`k${i}`}
          d={pathOf(polygon)}
          fill={capColour}
          fillOpacity={0.3}
          stroke={SOFT_INK}
          strokeWidth={stroke}
          strokeDasharray={`${num(stroke * 6)} ${num(stroke * 4)}`}
        />
      ))}

      {/* Bowl diameter: through the centre, face to face across the opening. */}
      <DimensionLine x1={-a} y1={0} x2={a} y2={0} size={arrow} stroke={stroke * 1.2} />
      <Label x={0} y={-font * 0.75} size={font}>{`Bowl ${format(m.bowlDiameterIn)}`}</Label>

      <g stroke={SOFT_INK} strokeWidth={stroke}>
        <line
          x1={num(-outsideEdge)}
          y1={0}
          x2={num(-outsideEdge)}
          y2={num(odY - font * 0.4)}
          strokeDasharray={`${num(stroke * 4)} ${num(stroke * 4)}`}
        />
        <line
          x1={num(outsideEdge)}
          y1={0}
          x2={num(outsideEdge)}
          y2={num(odY - font * 0.4)}
          strokeDasharray={`${num(stroke * 4)} ${num(stroke * 4)}`}
        />
      </g>
      <DimensionLine x1={-outsideEdge} y1={odY} x2={outsideEdge} y2={odY} size={arrow} stroke={stroke * 1.2} />
      <Label x={0} y={odY - font * 0.45} size={font}>{`Outside ${format(m.outsideDiameterIn)}`}</Label>

      {outer && patio && (
        <g>
          <line x1={0} y1={0} x2={num(outer.x)} y2={num(outer.y)} stroke={ACCENT} strokeWidth={stroke * 1.2} />
          <path d={arrowHead(outer.x, outer.y, outer.dx, outer.dy, arrow)} fill={ACCENT} />
          <Label
            x={outer.x + font * 0.3}
            y={outer.y + font * 1.05}
            size={font}
            anchor="start"
          >{`Patio R ${format(patio.outsideRadiusIn)}`}</Label>
        </g>
      )}
      {field && m.fieldRadiusIn !== null && (
        <g>
          <line
            x1={0}
            y1={0}
            x2={num(field.x)}
            y2={num(field.y)}
            stroke={ACCENT}
            strokeWidth={stroke}
            strokeDasharray={`${num(stroke * 5)} ${num(stroke * 3)}`}
          />
          <path d={arrowHead(field.x, field.y, field.dx, field.dy, arrow * 0.8)} fill={ACCENT} />
          <Label
            x={field.x - font * 0.4}
            y={field.y - font * 0.5}
            size={font * 0.8}
            anchor="end"
          >{`Field R ${format(m.fieldRadiusIn)}`}</Label>
        </g>
      )}

      {/* Centre mark: a plain cross, no north arrow (a round pit can be turned any way). */}
      <g stroke={ACCENT} strokeWidth={stroke * 1.5}>
        <line x1={num(-font * 0.45)} y1={0} x2={num(font * 0.45)} y2={0} />
        <line x1={0} y1={num(-font * 0.45)} x2={0} y2={num(font * 0.45)} />
      </g>
      <circle r={num(font * 0.18)} fill="none" stroke={ACCENT} strokeWidth={stroke} />
    </svg>
  );
}
