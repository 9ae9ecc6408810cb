import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  DAYS_TO_FIX_BY_SEVERITY,
  dueStatus,
  FINDING_STATES,
  FINDING_STATE_LABELS,
  FINDING_TRANSITIONS,
  findingDueOn,
  nextFindingState,
  transitionRefusal,
  type FindingAction,
  type FindingState,
} from "@coldtrail/core";

describe("finding lifecycle", () => {
  it("goes open → fix proposed → closed, and back to open when reopened", () => {
    let state: FindingState = "open";
    state = nextFindingState("propose_fix", state);
    expect(state).toBe("fix_proposed");
    state = nextFindingState("accept", state);
    expect(state).toBe("closed");
    state = nextFindingState("reopen", state);
    expect(state).toBe("open");
  });

  it("waives open findings and proposed fixes only", () => {
    expect(nextFindingState("waive", "open")).toBe("waived");
    expect(nextFindingState("waive", "fix_proposed")).toBe("waived");
    expect(transitionRefusal("waive", "closed")).toMatch(/only open findings or proposed fixes can be waived/);
    expect(transitionRefusal("waive", "no_longer_found")).not.toBeNull();
  });

  it("refuses to accept a finding nobody proposed as fixed, in plain words", () => {
    expect(transitionRefusal("accept", "open")).toBe("Only a finding with a proposed fix can be accepted; this one is open");
    expect(() => nextFindingState("accept", "open")).toThrow(/proposed fix/);
  });

  it("never reopens a finding the records no longer show (only a new audit can)", () => {
    expect(transitionRefusal("reopen", "no_longer_found")).not.toBeNull();
  });

  it("assigning keeps the state", () => {
    expect(nextFindingState("assign", "open")).toBe("open");
    expect(nextFindingState("assign", "fix_proposed")).toBe("fix_proposed");
    expect(transitionRefusal("assign", "closed")).not.toBeNull();
  });

  it("has a word for every state", () => {
    for (const s of FINDING_STATES) expect(FINDING_STATE_LABELS[s].length).toBeGreaterThan(2);
  });

  it("every allowed transition leads to a known state, every refused one says why (property)", () => {
    const actions = Object.keys(FINDING_TRANSITIONS) as FindingAction[];
    fc.assert(
      fc.property(fc.constantFrom(...actions), fc.constantFrom(...FINDING_STATES), (action, state) => {
        const refusal = transitionRefusal(action, state);
        if (refusal === null) expect(FINDING_STATES).toContain(nextFindingState(action, state));
        else expect(() => nextFindingState(action, state)).toThrow(refusal);
      }),
    );
  });
});

describe("due dates", () => {
  it("uses the rule's own deadline where it sets one", () => {
    expect(findingDueOn({ severity: "critical", dueOn: "2026-10-12" }, "2026-12-01")).toBe("2026-10-12");
  });

  it("otherwise counts days by severity from the day the finding is raised", () => {
    expect(DAYS_TO_FIX_BY_SEVERITY).toEqual({ critical: 7, major: 30, minor: 60 });
    expect(findingDueOn({ severity: "critical" }, "2026-12-01")).toBe("2026-12-08");
    expect(findingDueOn({ severity: "major", dueOn: null }, "2026-12-01")).toBe("2026-12-31");
    expect(findingDueOn({ severity: "minor" }, "2026-12-31")).toBe("2027-03-01");
  });

  it("buckets due dates: overdue before today, due soon within 7 days", () => {
    expect(dueStatus("2026-11-30", "2026-12-01")).toBe("overdue");
    expect(dueStatus("2026-12-01", "2026-12-01")).toBe("due_soon");
    expect(dueStatus("2026-12-08", "2026-12-01")).toBe("due_soon");
    expect(dueStatus("2026-12-09", "2026-12-01")).toBe("later");
    expect(dueStatus(null, "2026-12-01")).toBe("none");
  });
});
