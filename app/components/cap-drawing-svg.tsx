import { layoutCapTemplate, type CapTemplateInput } from "~/domain/cap-template";
import { formatInches } from "~/domain/units";
import { formatDegrees } from "~/lib/cut-sheet/cut-list";

const INK = "#413a35";
const SOFT = "#978873";
const ACCENT = "#d4611a";
const num = (n: number) => Number(n.toFixed(3));

type Props = {
  caps: CapTemplateInput & { offSquareDeg: number; sideCutLengthIn: number };
  className?: string;
};

/** One cap on its blank, dimensioned as the crew marks it: marks from each corner, both widths, depth and angle. */
export function CapDrawingSvg({ caps, className }: Props) {
  const t = layoutCapTemplate(caps);
  const l = t.blankLengthIn;
  const w = t.blankDepthIn;
  const d = t.capDepthIn;
  const font = Math.max(l, w) / 26;
  const stroke = font / 9;
  const gap = font * 1.7;
  const [il, ir, or, ol] = t.corners;
  const left = -font * 1.2;
  const right = l + font * 5.2;
  const top = -gap * 2 - font * 1.4;
  const bottom = w + gap * 2 + font * 0.8;
  const viewBox = `${num(left)} ${num(top)} ${num(right - left)} ${num(bottom - top)}`;

  const dim = (x1: number, x2: number, y: number, label: string, tone = INK) => {
    const a = font * 0.45;
    return (
      <g>
        <line x1={num(x1)} y1={num(y)} x2={num(x2)} y2={num(y)} stroke={tone} strokeWidth={stroke} />
        <path d={`M${num(x1)} ${num(y)}l${num(a)} ${num(-a / 3)}v${num((2 * a) / 3)}z`} fill={tone} />
        <path d={`M${num(x2)} ${num(y)}l${num(-a)} ${num(-a / 3)}v${num((2 * a) / 3)}z`} fill={tone} />
        <text
          x={num((x1 + x2) / 2)}
          y={num(y - font * 0.35)}
          fontSize={num(font)}
          textAnchor="middle"
          fill={tone}
          fontWeight={700}
        >
          {label}
        </text>
      </g>
    );
  };
  const extension = (x: number, y1: number, y2: number) => (
    <line
      x1={num(x)}
      y1={num(y1)}
      x2={num(x)}
      y2={num(y2)}
      stroke={SOFT}
      strokeWidth={stroke * 0.7}
      strokeDasharray={`${num(font / 4)} ${num(font / 5)}`}
    />
  );
  const label = `One cap of ${caps.count}: blank ${formatInches(l)} by ${formatInches(w)}, inner mark ${formatInches(caps.innerMarkIn)} and outer mark ${formatInches(caps.outerMarkIn)} from each corner, cuts ${formatDegrees(caps.offSquareDeg)} off square.`;

  return (
    <svg
      viewBox={viewBox}
      width="100%"
      role="img"
      aria-label={label}
      className={className}
      style={{ display: "block" }}
      fontFamily="inherit"
    >
      <title>One cap, dimensioned</title>
      <rect x={0} y={0} width={num(l)} height={num(w)} fill="#f4eee5" stroke={SOFT} strokeWidth={stroke} />
      <path
        d={`M${num(il[0])} ${num(il[1])}L${num(ir[0])} ${num(ir[1])}L${num(or[0])} ${num(or[1])}L${num(ol[0])} ${num(ol[1])}Z`}
        fill="#d6c9b7"
        stroke={INK}
        strokeWidth={stroke * 2}
      />
      {t.ripLineIn !== null ? (
        <g>
          <line
            x1={0}
            y1={num(d)}
            x2={num(l)}
            y2={num(d)}
            stroke={ACCENT}
            strokeWidth={stroke * 1.2}
            strokeDasharray={`${num(font / 2)} ${num(font / 4)}`}
          />
          <text
            x={num(l - font * 0.3)}
            y={num(d + (w - d) / 2 + font * 0.35)}
            fontSize={num(font * 0.8)}
            textAnchor="end"
            fill={ACCENT}
            fontWeight={700}
          >
            rip
          </text>
        </g>
      ) : null}
      <text x={num(l / 2)} y={num(font * 1.3)} fontSize={num(font * 0.85)} textAnchor="middle" fill={INK}>
        fire side
      </text>

      {extension(0, 0, -gap * 2)}
      {extension(l, 0, -gap * 2)}
      {extension(il[0], 0, -gap * 2)}
      {extension(ir[0], 0, -gap)}
      {dim(0, il[0], -gap, formatInches(caps.innerMarkIn), ACCENT)}
      {dim(ir[0], l, -gap, formatInches(caps.innerMarkIn), ACCENT)}
      {dim(il[0], ir[0], -gap * 2, `inner ${formatInches(caps.innerWidthIn)}`)}

      {extension(0, w, w + gap * 2)}
      {extension(l, w, w + gap * 2)}
      {extension(ol[0], d, w + gap)}
      {extension(or[0], d, w + gap * 2)}
      {dim(0, ol[0], w + gap, formatInches(caps.outerMarkIn), ACCENT)}
      {dim(or[0], l, w + gap, formatInches(caps.outerMarkIn), ACCENT)}
      {dim(ol[0], or[0], w + gap * 2, `outer ${formatInches(caps.outerWidthIn)}`)}

      <g>
        <line x1={num(l + font * 1.2)} y1={0} x2={num(l + font * 1.2)} y2={num(d)} stroke={INK} strokeWidth={stroke} />
        <text x={num(l + font * 1.6)} y={num(d / 2)} fontSize={num(font)} fill={INK} fontWeight={700}>
          {formatInches(d)}
        </text>
        <text x={num(l + font * 1.6)} y={num(d / 2 + font * 1.2)} fontSize={num(font * 0.8)} fill={INK}>
          deep
        </text>
      </g>
      <text
        x={num((il[0] + ol[0]) / 2 + font * 0.5)}
        y={num(d * 0.62)}
        fontSize={num(font * 0.85)}
        fill={INK}
        fontWeight={700}
      >
        {formatDegrees(caps.offSquareDeg)}
      </text>
      <text x={num((il[0] + ol[0]) / 2 + font * 0.5)} y={num(d * 0.62 + font)} fontSize={num(font * 0.75)} fill={INK}>
        off square
      </text>
    </svg>
  );
}
