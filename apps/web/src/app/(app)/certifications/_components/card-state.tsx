import { CERTIFICATION_STATE_ICONS, CERTIFICATION_STATE_LABELS, type CertificationState } from "@coldtrail/core";

const TONE: Record<CertificationState, string> = {
  pending: "border-sev-minor/50 bg-amber-50 text-sev-minor",
  verified: "border-ok/50 bg-green-50 text-ok",
  rejected: "border-sev-critical/50 bg-red-50 text-sev-critical",
};

/** A card's state in words with an icon (never colour alone). */
export function CardState({ state, size = "sm" }: { state: CertificationState; size?: "sm" | "lg" }) {
  return (
    <span
      data-testid="card-state"
      className={`inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border font-semibold ${TONE[state]} ${size === "lg" ? "px-3 py-1 text-base" : "px-2 py-0.5 text-xs"}`}
    >
      <span aria-hidden="true">{CERTIFICATION_STATE_ICONS[state]}</span>
      {CERTIFICATION_STATE_LABELS[state]}
    </span>
  );
}
