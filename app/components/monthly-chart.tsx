import { useId } from "react";
import { formatMoneyWhole } from "~/lib/format/money";

export type ChartMonth = {
  month: string;
  label: string;
  jobsBuilt: number;
  revenueCents: number;
  grossProfitCents: number;
};

const WIDTH = 640;
const HEIGHT = 280;
const PAD = { top: 16, right: 12, bottom: 50, left: 78 };
// Text in viewBox units: the chart never draws narrower than 30rem, so it reads at 12 px or more.
const TEXT = 16;

/** A round top for the value axis: 1, 2 or 5 × a power of ten at or above the largest value. */
function niceCeiling(value: number): number {
  if (value <= 0) return 1;
  const power = 10 ** Math.floor(Math.log10(value));
  for (const step of [1, 2, 5, 10]) if (step * power >= value) return step * power;
  return 10 * power;
}

/**
 * Revenue and gross profit per month as paired bars, drawn as inline SVG. The figure has a title and
 * a description for screen readers; the page's table holds the same numbers.
 */
export function MonthlyChart({ months }: { months: ChartMonth[] }) {
  const id = useId();
  const lowest = Math.min(0, ...months.map((m) => m.grossProfitCents));
  const top = niceCeiling(Math.max(...months.map((m) => m.revenueCents), 1));
  const bottom = lowest < 0 ? -niceCeiling(-lowest) : 0;
  const plotW = WIDTH - PAD.left - PAD.right;
  const plotH = HEIGHT - PAD.top - PAD.bottom;
  const y = (cents: number) => PAD.top + ((top - cents) / (top - bottom)) * plotH;
  const band = plotW / months.length;
  const bar = Math.min(40, band / 3);
  const ticks = [0, 0.25, 0.5, 0.75, 1].map((f) => bottom + (top - bottom) * f);
  const description = months
    .map(
      (m) =>
        `${m.label}: ${m.jobsBuilt} job${m.jobsBuilt === 1 ? "" : "s"} built, revenue ${formatMoneyWhole(m.revenueCents)}, gross profit ${formatMoneyWhole(m.grossProfitCents)}`,
    )
    .join("; ");
  return (
    <figure className="mt-3 flex flex-col gap-2">
      {/* On a phone the chart keeps a readable size and scrolls sideways. */}
      <div className="overflow-x-auto" tabIndex={0} role="region" aria-label="Chart of revenue and gross profit">
        <svg
          viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
          className="h-auto w-full max-w-3xl min-w-[30rem]"
          role="img"
          aria-labelledby={`${id}-title ${id}-desc`}
        >
          <title id={`${id}-title`}>Revenue and gross profit by month</title>
          <desc id={`${id}-desc`}>{description}.</desc>
          {ticks.map((t) => (
            <g key={t}>
              <line
                x1={PAD.left}
                x2={WIDTH - PAD.right}
                y1={y(t)}
                y2={y(t)}
                stroke="#d9d0c4"
                strokeWidth={t === 0 ? 1.5 : 0.75}
              />
              <text x={PAD.left - 6} y={y(t) + 5} textAnchor="end" fontSize={TEXT} fill="#4a423c">
                {formatMoneyWhole(Math.round(t))}
              </text>
            </g>
          ))}
          {months.map((m, i) => {
            const cx = PAD.left + band * i + band / 2;
            const profitTop = y(Math.max(0, m.grossProfitCents));
            const profitHeight = Math.abs(y(m.grossProfitCents) - y(0));
            return (
              <g key={m.month}>
                <rect
                  x={cx - bar - 2}
                  y={y(m.revenueCents)}
                  width={bar}
                  height={y(0) - y(m.revenueCents)}
                  fill="#b14c12"
                />
                <rect x={cx + 2} y={profitTop} width={bar} height={profitHeight} fill="#4d6b3c" />
                <text x={cx} y={HEIGHT - PAD.bottom + 20} textAnchor="middle" fontSize={TEXT} fill="#2d2825">
                  {m.label.slice(0, 3)}
                  {i === 0 || m.month.endsWith("-01") ? (
                    <tspan x={cx} dy={TEXT + 2} fill="#4a423c">
                      {m.month.slice(0, 4)}
                    </tspan>
                  ) : null}
                </text>
              </g>
            );
          })}
        </svg>
      </div>
      <figcaption className="flex flex-wrap gap-4 text-sm">
        <span className="flex items-center gap-2">
          <span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm bg-[#b14c12]" /> Revenue
        </span>
        <span className="flex items-center gap-2">
          <span aria-hidden="true" className="inline-block h-3 w-3 rounded-sm bg-[#4d6b3c]" /> Gross profit
        </span>
        <span className="text-char-600">The same figures are in the table below.</span>
      </figcaption>
    </figure>
  );
}
