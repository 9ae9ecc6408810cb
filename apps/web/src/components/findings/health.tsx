import type { HealthTrend, RecordHealth } from "@coldtrail/core";

/** Record health as a number with a word for its band, and the calculation on hover/focus and in text. */
export function HealthScore({ health, size = "md" }: { health: RecordHealth | null; size?: "md" | "lg" }) {
  if (!health) return <span className="text-sm text-ink-600">Not audited yet</span>;
  const band = health.score >= 95 ? "Good" : health.score >= 85 ? "Fair" : "Poor";
  const icon = band === "Good" ? "●" : band === "Fair" ? "◐" : "○";
  return (
    <span className="inline-flex flex-col">
      <span className={`tabular font-semibold text-ink-950 ${size === "lg" ? "text-3xl" : "text-lg"}`} data-testid="health-score">
        {health.score.toFixed(1)}
        <span className="ml-1 text-sm font-medium text-ink-700">
          <span aria-hidden="true">{icon} </span>
          {band}
        </span>
      </span>
      <span className="tabular text-xs text-ink-600">{health.formula}</span>
    </span>
  );
}

export function TrendText({ trend, since }: { trend: HealthTrend | null; since?: string | null }) {
  if (!trend) return <span className="text-sm text-ink-600">No audit to compare with yet</span>;
  const icon = trend.direction === "better" ? "▲" : trend.direction === "worse" ? "▼" : "■";
  return (
    <span className="text-sm text-ink-800" data-testid="health-trend">
      <span aria-hidden="true">{icon} </span>
      {trend.words}
      {since && <span className="text-ink-600"> since the audit of {since.slice(0, 10)}</span>}
    </span>
  );
}
