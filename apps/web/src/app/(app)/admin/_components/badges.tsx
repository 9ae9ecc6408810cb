import { GRANT_STATE_LABELS, PERSON_STATUS_LABELS, type CertificationState, type GrantState, type PersonStatus } from "@coldtrail/core";

/** Every state has a word and an icon; colour only repeats what they say. */
function Badge({ icon, label, tone }: { icon: string; label: string; tone: string }) {
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold ${tone}`}>
      <span aria-hidden="true">{icon}</span>
      {label}
    </span>
  );
}

const PERSON: Record<PersonStatus, { icon: string; tone: string }> = {
  active: { icon: "●", tone: "border-ok/40 bg-green-50 text-ok" },
  invited: { icon: "✉", tone: "border-fjord-200 bg-fjord-50 text-fjord-800" },
  deactivated: { icon: "⊘", tone: "border-ink-300 bg-ink-100 text-ink-700" },
};

export function PersonStatusBadge({ status }: { status: PersonStatus }) {
  return <Badge {...PERSON[status]} label={PERSON_STATUS_LABELS[status]} />;
}

const GRANT: Record<GrantState, { icon: string; tone: string }> = {
  active: { icon: "●", tone: "border-ok/40 bg-green-50 text-ok" },
  expired: { icon: "◷", tone: "border-ink-300 bg-ink-100 text-ink-700" },
  revoked: { icon: "⊘", tone: "border-ink-300 bg-ink-100 text-ink-700" },
};

export function GrantStateBadge({ state }: { state: GrantState }) {
  return <Badge {...GRANT[state]} label={GRANT_STATE_LABELS[state]} />;
}

const CERT: Record<CertificationState, { icon: string; label: string; tone: string }> = {
  verified: { icon: "✓", label: "Verified", tone: "border-ok/40 bg-green-50 text-ok" },
  pending: { icon: "◷", label: "Waiting for verification", tone: "border-sev-minor/40 bg-amber-50 text-sev-minor" },
  rejected: { icon: "✕", label: "Rejected", tone: "border-sev-critical/40 bg-red-50 text-sev-critical" },
};

export function CertificationStateBadge({ state }: { state: CertificationState }) {
  return <Badge {...CERT[state]} />;
}

export function ArchivedBadge() {
  return <Badge icon="▣" label="Archived" tone="border-ink-300 bg-ink-100 text-ink-700" />;
}
