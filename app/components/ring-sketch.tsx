/** A plan-view sketch of a ring of tapered units under a ring of wedge caps (decorative). */
export function RingSketch({ className = "" }: { className?: string }) {
  const units = 14;
  const caps = 12;
  const cx = 160;
  const cy = 160;
  const wedge = (n: number, i: number, r1: number, r2: number, gapDeg: number) => {
    const half = Math.PI / n - (gapDeg * Math.PI) / 360;
    const mid = (2 * Math.PI * i) / n;
    const at = (r: number, a: number) => `${(cx + r * Math.cos(a)).toFixed(1)},${(cy + r * Math.sin(a)).toFixed(1)}`;
    return `M${at(r1, mid - half)} L${at(r2, mid - half)} L${at(r2, mid + half)} L${at(r1, mid + half)} Z`;
  };
  return (
    <svg
      viewBox="0 0 320 320"
      className={className}
      role="img"
      aria-label="Plan view of a ring of tapered wall units with wedge-cut caps"
    >
      <circle cx={cx} cy={cy} r="150" fill="#e8dfd2" />
      {Array.from({ length: caps }, (_, i) => (
        <path key={`c${i}`} d={wedge(caps, i, 84, 140, 1.2)} fill="#b9a993" stroke="#6f655d" strokeWidth="1" />
      ))}
      {Array.from({ length: units }, (_, i) => (
        <path
          key={`u${i}`}
          d={wedge(units, i + 0.5, 96, 128, 1.6)}
          fill="none"
          stroke="#413a35"
          strokeWidth="1"
          strokeDasharray="3 3"
        />
      ))}
      <circle cx={cx} cy={cy} r="84" fill="#2d2825" />
      <path
        d="M160 112c14 17 27 30 27 48a27 27 0 0 1-54 0c0-11 5-19 12-25-.4 8 3 14 8 16-2-15 1-27 7-39z"
        fill="#eb7a31"
      />
      <line x1={cx} y1={cy} x2={cx + 140} y2={cy} stroke="#d4611a" strokeWidth="1.5" strokeDasharray="5 4" />
      <circle cx={cx} cy={cy} r="3" fill="#d4611a" />
    </svg>
  );
}
