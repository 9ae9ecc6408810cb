import { IMPORT_STATE_LABELS, type ImportState } from "@coldtrail/core";

const LOOK: Record<ImportState, { icon: string; tone: string }> = {
  mapping: { icon: "⇄", tone: "border-fjord-600/50 bg-fjord-50 text-fjord-800" },
  checking: { icon: "◷", tone: "border-fjord-600/50 bg-fjord-50 text-fjord-800" },
  checked: { icon: "☐", tone: "border-fjord-600/50 bg-fjord-50 text-fjord-800" },
  importing: { icon: "◷", tone: "border-fjord-600/50 bg-fjord-50 text-fjord-800" },
  imported: { icon: "✓", tone: "border-ok/50 bg-green-50 text-ok" },
  failed: { icon: "✕", tone: "border-sev-critical/50 bg-red-50 text-sev-critical" },
  cancelled: { icon: "⊘", tone: "border-ink-300 bg-ink-100 text-ink-700" },
};

/** An import's state in words with an icon. */
export function ImportStateBadge({ state }: { state: ImportState }) {
  const look = LOOK[state];
  return (
    <span
      className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold ${look.tone}`}
      data-testid="import-state"
    >
      <span aria-hidden="true">{look.icon}</span>
      {IMPORT_STATE_LABELS[state]}
    </span>
  );
}
