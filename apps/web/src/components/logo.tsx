/** Coldtrail's mark: a trail of three descending dots turning into a line, drawn in the accent. */
export function Logo({ tone = "dark" }: { tone?: "dark" | "light" }) {
  const text = tone === "light" ? "text-white" : "text-ink-950";
  return (
    <span className={`inline-flex items-center gap-2 font-semibold tracking-tight ${text}`}>
      <svg width="28" height="28" viewBox="0 0 28 28" aria-hidden="true">
        <rect width="28" height="28" rx="7" className="fill-fjord-600" />
        <circle cx="7.5" cy="8" r="2.2" fill="white" />
        <circle cx="12.5" cy="12.5" r="2.2" fill="white" opacity="0.85" />
        <path d="M16 17 L21.5 21.5" stroke="white" strokeWidth="2.6" strokeLinecap="round" />
      </svg>
      <span className="text-lg">Coldtrail</span>
    </span>
  );
}
