import type { FindingState, Severity } from "../vocabulary";

/** Our own words for a finding's state, shown beside an icon (never colour alone). */
export const FINDING_STATE_LABELS: Readonly<Record<FindingState, string>> = {
  open: "Open",
  fix_proposed: "Fix proposed",
  closed: "Closed",
  waived: "Waived",
  no_longer_found: "No longer found",
};

/** One sentence per state, for tooltips, legends and the help text of the findings table. */
export const FINDING_STATE_EXPLANATIONS: Readonly<Record<FindingState, string>> = {
  open: "The rules found this gap and nobody has proposed a fix yet.",
  fix_proposed: "The branch says it is fixed; the compliance officer still has to accept it.",
  closed: "The compliance officer accepted the fix.",
  waived: "The compliance officer decided, with a written reason, that no fix is needed.",
  no_longer_found: "A later audit of the same records no longer finds this gap, so it closed by itself.",
};

export const SEVERITY_LABELS: Readonly<Record<Severity, string>> = {
  critical: "Critical",
  major: "Major",
  minor: "Minor",
};

/** States in which somebody still has to act. */
export const ACTIVE_FINDING_STATES: readonly FindingState[] = ["open", "fix_proposed"];

export function isActiveFindingState(state: FindingState): boolean {
  return ACTIVE_FINDING_STATES.includes(state);
}

/** What people do to a finding. The permission for each is checked separately (ability). */
export const FINDING_ACTIONS = ["assign", "propose_fix", "accept", "reopen", "waive"] as const;
export type FindingAction = (typeof FINDING_ACTIONS)[number];

/** The lifecycle: from which states each action may be taken, and the state it leads to. */
export const FINDING_TRANSITIONS: Readonly<Record<FindingAction, { from: readonly FindingState[]; to: FindingState | null }>> = {
  // Assigning does not change the state.
  assign: { from: ["open", "fix_proposed"], to: null },
  propose_fix: { from: ["open"], to: "fix_proposed" },
  accept: { from: ["fix_proposed"], to: "closed" },
  reopen: { from: ["fix_proposed", "closed", "waived"], to: "open" },
  waive: { from: ["open", "fix_proposed"], to: "waived" },
};

/** Plain words for why an action cannot be taken now, or null when it can. */
export function transitionRefusal(action: FindingAction, state: FindingState): string | null {
  const t = FINDING_TRANSITIONS[action];
  if (t.from.includes(state)) return null;
  const now = FINDING_STATE_LABELS[state].toLowerCase();
  switch (action) {
    case "assign":
      return `A finding that is ${now} cannot be assigned`;
    case "propose_fix":
      return `Only an open finding can be proposed as fixed; this one is ${now}`;
    case "accept":
      return `Only a finding with a proposed fix can be accepted; this one is ${now}`;
    case "reopen":
      return `This finding is ${now}; only a proposed fix, a closed or a waived finding can be reopened`;
    case "waive":
      return `This finding is ${now}; only open findings or proposed fixes can be waived`;
  }
}

/** The state a finding is in after `action`, or throws when the lifecycle does not allow it. */
export function nextFindingState(action: FindingAction, state: FindingState): FindingState {
  const refusal = transitionRefusal(action, state);
  if (refusal) throw new Error(refusal);
  return FINDING_TRANSITIONS[action].to ?? state;
}
