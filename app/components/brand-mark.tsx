/** Emberwright's mark: a ring of tapered blocks seen from above with a flame rising from the bowl. */
export function BrandMark({ className = "h-8 w-8" }: { className?: string }) {
  const blocks = Array.from({ length: 10 }, (_, i) => i * 36);
  return (
    <svg viewBox="0 0 64 64" className={className} aria-hidden="true" focusable="false">
      <circle cx="32" cy="32" r="31" fill="#1f1b19" />
      {blocks.map((deg) => (
        <path
          key={deg}
          d="M26.6 9.2 L37.4 9.2 L35.8 15.6 L28.2 15.6 Z"
          fill="#d6c9b7"
          transform={`rotate(${deg} 32 32)`}
        />
      ))}
      <path
        d="M32 20c3.8 4.6 7.4 8.2 7.4 13.1a7.4 7.4 0 0 1-14.8 0c0-2.9 1.4-5.1 3.2-6.9-.1 2.3.8 3.8 2.3 4.4-.6-4 .3-7.5 1.9-10.6z"
        fill="#eb7a31"
      />
      <path d="M32 30.2c1.8 2.1 3.1 3.7 3.1 5.5a3.1 3.1 0 0 1-6.2 0c0-1.6 1.3-3.3 3.1-5.5z" fill="#fbc194" />
    </svg>
  );
}

export function Wordmark({ tone = "dark" }: { tone?: "dark" | "light" }) {
  return (
    <span className="inline-flex items-center gap-2">
      <BrandMark />
      <span className={`text-xl font-extrabold tracking-tight ${tone === "light" ? "text-ash-50" : "text-char-900"}`}>
        Ember<span className="text-ember-500">wright</span>
      </span>
    </span>
  );
}
