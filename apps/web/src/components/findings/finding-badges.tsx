import { FINDING_STATE_EXPLANATIONS, FINDING_STATE_LABELS, SEVERITY_LABELS, type FindingState, type Severity } from "@coldtrail/core";

/**
 * Severity and state of a finding: always a word and a shape, colour only as a third cue. Warm colours
 * are kept for severity; states use the ink neutrals and the accent.
 */

const SEVERITY_TONE: Record<Severity, string> = {
  critical: "border-sev-critical/50 bg-red-50 text-sev-critical",
  major: "border-sev-major/50 bg-orange-50 text-sev-major",
  minor: "border-sev-minor/50 bg-amber-50 text-sev-minor",
};

export function SeverityIcon({ severity, className = "h-3.5 w-3.5" }: { severity: Severity; className?: string }) {
  // Critical: octagon; major: triangle; minor: circle — different shapes, not just colours.
  return (
    <svg viewBox="0 0 16 16" className={className} aria-hidden="true" focusable="false">
      {severity === "critical" && <path d="M5 1h6l4 4v6l-4 4H5l-4-4V5z" fill="currentColor" />}
      {severity === "major" && <path d="M8 1l7.5 13.5H.5z" fill="currentColor" />}
      {severity === "minor" && <circle cx="8" cy="8" r="6.5" fill="currentColor" />}
      <path d={severity === "minor" ? "M8 7v4.5M8 4.5v.5" : "M8 5v4.5M8 11.5v.5"} stroke="white" strokeWidth="1.8" strokeLinecap="round" />
    </svg>
  );
}

export function SeverityBadge({ severity }: { severity: Severity }) {
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-md border px-1.5 py-0.5 text-xs font-semibold ${SEVERITY_TONE[severity]}`}
      data-severity={severity}
    >
      <SeverityIcon severity={severity} />
      {SEVERITY_LABELS[severity]}
    </span>
  );
}

const STATE_TONE: Record<FindingState, string> = {
  open: "border-ink-400 bg-white text-ink-900",
  fix_proposed: "border-fjord-500 bg-fjord-50 text-fjord-800",
  closed: "border-ok/50 bg-green-50 text-ok",
  waived: "border-ink-300 bg-ink-100 text-ink-700",
  no_longer_found: "border-ok/40 bg-white text-ok",
};

export function StateIcon({ state, className = "h-3.5 w-3.5" }: { state: FindingState; className?: string }) {
  return (
    <svg viewBox="0 0 16 16" className={className} aria-hidden="true" focusable="false" fill="none" stroke="currentColor" strokeWidth="1.6">
      {state === "open" && <circle cx="8" cy="8" r="6" />}
      {state === "fix_proposed" && (
        <>
          <circle cx="8" cy="8" r="6" />
          <path d="M8 2a6 6 0 0 1 0 12z" fill="currentColor" stroke="none" />
        </>
      )}
      {state === "closed" && (
        <>
          <circle cx="8" cy="8" r="6" fill="currentColor" stroke="none" />
          <path d="M5 8.2l2 2 4-4.4" stroke="white" strokeWidth="1.8" />
        </>
      )}
      {state === "waived" && (
        <>
          <circle cx="8" cy="8" r="6" />
          <path d="M3.8 12.2l8.4-8.4" />
        </>
      )}
      {state === "no_longer_found" && (
        <>
          <circle cx="8" cy="8" r="6" strokeDasharray="2.2 1.8" />
          <path d="M5 8.2l2 2 4-4.4" />
        </>
      )}
    </svg>
  );
}

export function StateBadge({ state }: { state: FindingState }) {
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-md border px-1.5 py-0.5 text-xs font-semibold ${STATE_TONE[state]}`}
      title={FINDING_STATE_EXPLANATIONS[state]}
      data-state={state}
    >
      <StateIcon state={state} />
      {FINDING_STATE_LABELS[state]}
    </span>
  );
}

/** Due date with words: overdue, due today, in N days (today = calendar date to compare with). */
export function DueText({ dueOn, today, active }: { dueOn: string | null; today: string; active: boolean }) {
  if (!dueOn) return <span className="text-ink-500">No due date</span>;
  const days = Math.round((Date.parse(`${dueOn}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / 86_400_000);
  if (!active) return <span className="tabular whitespace-nowrap text-ink-600">{dueOn}</span>;
  if (days < 0)
    return (
      <span className="tabular inline-flex items-center gap-1 whitespace-nowrap font-semibold text-sev-critical">
        <span aria-hidden="true">⚠</span>
        {dueOn} · overdue {-days} d
      </span>
    );
  return (
    <span className={`tabular whitespace-nowrap ${days <= 7 ? "font-semibold text-ink-950" : "text-ink-700"}`}>
      {dueOn} · {days === 0 ? "due today" : `in ${days} d`}
    </span>
  );
}
