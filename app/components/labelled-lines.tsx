/** One "label: value" line of a summary. */
export type LabelledLine = { label: string; value: string };

/**
 * A list of "label: value" lines as a description list: the design in short, key figures, a cut
 * sheet's summary. The caller sets the grid (columns, gaps, text size) with `className`; `wrap` lets a
 * long value drop under its label on a narrow screen.
 */
export function LabelledLines({
  lines,
  className,
  labelClassName = "font-bold text-char-700",
  wrap = false,
}: {
  lines: readonly LabelledLine[];
  className: string;
  labelClassName?: string;
  wrap?: boolean;
}) {
  return (
    <dl className={className}>
      {lines.map((line) => (
        <div key={line.label} className={wrap ? "flex flex-wrap gap-x-2" : "flex gap-2"}>
          <dt className={labelClassName}>{line.label}:</dt>
          <dd>{line.value}</dd>
        </div>
      ))}
    </dl>
  );
}
