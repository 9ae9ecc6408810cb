import {
  REGISTER_LABELS,
  type ApplianceStatus,
  type CylinderStatus,
  type EquipmentCertificationState,
  type EquipmentStatus,
} from "@coldtrail/core";
import type { DueState } from "@coldtrail/db";

/** Days from `today` to `on` (both calendar dates). */
function daysFrom(today: string, on: string): number {
  return Math.round((Date.parse(`${on}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / 86_400_000);
}

const DUE: Record<DueState, { icon: string; tone: string }> = {
  overdue: { icon: "⚠", tone: "border-sev-critical/50 bg-red-50 text-sev-critical" },
  due_soon: { icon: "◷", tone: "border-sev-minor/50 bg-amber-50 text-sev-minor" },
  current: { icon: "✓", tone: "border-ok/40 bg-green-50 text-ok" },
  unknown: { icon: "?", tone: "border-ink-300 bg-ink-50 text-ink-700" },
};

/** A cylinder's requalification in words and an icon: "Overdue since …", "Due soon: …", "Requalified until …". */
export function RequalificationBadge({ dueOn, state, today }: { dueOn: string | null; state: DueState; today: string }) {
  let words: string;
  if (state === "unknown" || !dueOn) words = "No requalification date on record";
  else if (state === "overdue") words = `Requalification overdue since ${dueOn}`;
  else if (state === "due_soon") {
    const days = daysFrom(today, dueOn);
    words = `Requalification due soon: ${dueOn} (in ${days} day${days === 1 ? "" : "s"})`;
  } else words = `Requalified until ${dueOn}`;
  const d = DUE[state];
  return (
    <span
      className={`inline-flex items-start gap-1.5 rounded-md border px-2 py-0.5 text-sm font-medium ${d.tone}`}
      data-testid="requalification-badge"
      data-state={state}
    >
      <span aria-hidden="true">{d.icon}</span>
      <span>{words}</span>
    </span>
  );
}

/** A deadline's state in words and an icon. */
export function DueBadge({ dueOn, state, today }: { dueOn: string; state: Exclude<DueState, "unknown">; today: string }) {
  const days = daysFrom(today, dueOn);
  const words =
    state === "overdue"
      ? days === 0
        ? `Due today, ${dueOn}`
        : `Overdue since ${dueOn} (${-days} day${-days === 1 ? "" : "s"})`
      : `Due by ${dueOn} (in ${days} day${days === 1 ? "" : "s"})`;
  const d = DUE[state];
  return (
    <span className={`inline-flex items-start gap-1.5 rounded-md border px-2 py-0.5 text-sm font-medium ${d.tone}`}>
      <span aria-hidden="true">{d.icon}</span>
      <span>{words}</span>
    </span>
  );
}

const STATUS_ICON: Record<string, string> = { in_service: "●", retired: "◌", disposed: "✕", at_reclaimer: "⇢" };

export function StatusBadge({
  kind,
  status,
}:
  | { kind: "appliance"; status: ApplianceStatus }
  | { kind: "cylinder"; status: CylinderStatus }
  | { kind: "equipment"; status: EquipmentStatus }) {
  const label =
    kind === "appliance"
      ? REGISTER_LABELS.applianceStatus[status]
      : kind === "cylinder"
        ? REGISTER_LABELS.cylinderStatus[status]
        : REGISTER_LABELS.equipmentStatus[status];
  const active = status === "in_service";
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap text-sm ${active ? "text-ink-900" : "text-ink-600"}`}>
      <span aria-hidden="true">{STATUS_ICON[status] ?? "•"}</span>
      {label}
    </span>
  );
}

const CERT: Record<EquipmentCertificationState, { icon: string; tone: string }> = {
  certified: { icon: "✓", tone: "text-ok" },
  not_certified: { icon: "⚠", tone: "text-sev-critical" },
  unknown: { icon: "?", tone: "text-sev-minor" },
};

export function CertificationBadge({ state }: { state: EquipmentCertificationState }) {
  const c = CERT[state];
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap text-sm font-medium ${c.tone}`}
      data-testid="equipment-certification"
    >
      <span aria-hidden="true">{c.icon}</span>
      {REGISTER_LABELS.equipmentCertification[state]}
    </span>
  );
}
