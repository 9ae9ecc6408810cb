/**
 * Fills that tell series apart without colour: solid, stripes, dots and cross-hatching, each in its
 * own colour too. Rendered once per page (an invisible SVG); charts refer to them as url(#id).
 */
export const PATTERN = {
  critical: "ct-pat-critical",
  major: "ct-pat-major",
  minor: "ct-pat-minor",
  purchased: "ct-pat-purchased",
  charged: "ct-pat-charged",
  recovered: "ct-pat-recovered",
  shipped: "ct-pat-shipped",
} as const;
export type PatternKey = keyof typeof PATTERN;

export const fill = (key: PatternKey) => `url(#${PATTERN[key]})`;

export function ChartPatterns() {
  return (
    <svg width="0" height="0" aria-hidden="true" focusable="false" style={{ position: "absolute" }}>
      <defs>
        <pattern id={PATTERN.critical} width="6" height="6" patternUnits="userSpaceOnUse">
          <rect width="6" height="6" fill="var(--color-sev-critical)" />
        </pattern>
        <pattern id={PATTERN.major} width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <rect width="6" height="6" fill="#fde9d7" />
          <rect width="3.2" height="6" fill="var(--color-sev-major)" />
        </pattern>
        <pattern id={PATTERN.minor} width="6" height="6" patternUnits="userSpaceOnUse">
          <rect width="6" height="6" fill="#fbf1cf" />
          <circle cx="3" cy="3" r="1.6" fill="var(--color-sev-minor)" />
        </pattern>
        <pattern id={PATTERN.purchased} width="6" height="6" patternUnits="userSpaceOnUse">
          <rect width="6" height="6" fill="var(--color-fjord-700)" />
        </pattern>
        <pattern id={PATTERN.charged} width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <rect width="6" height="6" fill="var(--color-ink-100)" />
          <rect width="3" height="6" fill="var(--color-ink-700)" />
        </pattern>
        <pattern id={PATTERN.recovered} width="6" height="6" patternUnits="userSpaceOnUse">
          <rect width="6" height="6" fill="var(--color-fjord-100)" />
          <path d="M0 3h6M3 0v6" stroke="var(--color-fjord-700)" strokeWidth="1.4" />
        </pattern>
        <pattern id={PATTERN.shipped} width="6" height="6" patternUnits="userSpaceOnUse">
          <rect width="6" height="6" fill="var(--color-ink-50)" />
          <circle cx="3" cy="3" r="1.5" fill="var(--color-ink-900)" />
        </pattern>
      </defs>
    </svg>
  );
}

/** A legend entry: the same fill as the bars, with a word. */
export function Swatch({ pattern, label }: { pattern: PatternKey; label: string }) {
  return (
    <span className="inline-flex items-center gap-1.5">
      <svg width="14" height="14" aria-hidden="true" focusable="false">
        <rect width="14" height="14" fill={fill(pattern)} stroke="var(--color-ink-700)" strokeWidth="0.8" />
      </svg>
      {label}
    </span>
  );
}
