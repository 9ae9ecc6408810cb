import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { reconcileFindings, type Finding, type StoredFinding } from "@coldtrail/core";

const finding = (ruleId: string, recordId: number, extra: Partial<Finding> = {}): Finding => ({
  ruleId,
  severity: "major",
  pack: ruleId.startsWith("CT-EU") ? "eu" : "us_federal",
  recordType: "job",
  recordId,
  identityKey: `${ruleId}:job:${recordId}`,
  title: "A rule",
  detail: `Detail of ${recordId}`,
  fix: "Fix it",
  citation: "40 CFR 82",
  ...extra,
});
const stored = (
  id: number,
  ruleId: string,
  recordId: number,
  state: StoredFinding["state"],
  occurredOn: string | null = "2026-05-01",
): StoredFinding => ({
  id,
  identityKey: `${ruleId}:job:${recordId}`,
  ruleId,
  state,
  occurredOn,
  dueOn: "2026-06-01",
});
const scope = { period: { from: "2026-01-01", to: "2026-12-01" }, packs: ["us_federal"] as const };

describe("reconciling a run with the stored findings", () => {
  it("keeps the identity of a finding that still holds, opens new ones, closes gone ones as no longer found", () => {
    const r = reconcileFindings({
      stored: [stored(1, "CT-EVAC-01", 10, "open"), stored(2, "CT-EVAC-01", 11, "fix_proposed"), stored(3, "CT-CERT-01", 12, "open")],
      found: [finding("CT-EVAC-01", 10, { detail: "Updated words" }), finding("CT-ACCESS-01", 13, { severity: "critical" })],
      scope,
      today: "2026-12-01",
    });
    expect(r.update).toEqual([expect.objectContaining({ id: 1, state: "open", foundAgain: false })]);
    expect(r.update[0]!.finding.detail).toBe("Updated words");
    expect(r.create.map((c) => [c.finding.identityKey, c.dueOn])).toEqual([["CT-ACCESS-01:job:13", "2026-12-08"]]);
    expect(r.resolve).toEqual([
      { id: 2, from: "fix_proposed" },
      { id: 3, from: "open" },
    ]);
  });

  it("opens a finding that was no longer found and is found again, with a fresh due date", () => {
    const r = reconcileFindings({
      stored: [stored(7, "CT-EVAC-01", 10, "no_longer_found")],
      found: [finding("CT-EVAC-01", 10)],
      scope,
      today: "2026-12-01",
    });
    expect(r.update).toEqual([expect.objectContaining({ id: 7, state: "open", foundAgain: true, dueOn: "2026-12-31" })]);
  });

  it("leaves closed and waived findings as people decided, found or not", () => {
    const r = reconcileFindings({
      stored: [stored(1, "CT-EVAC-01", 10, "closed"), stored(2, "CT-EVAC-01", 11, "waived"), stored(3, "CT-EVAC-01", 12, "waived")],
      found: [finding("CT-EVAC-01", 10), finding("CT-EVAC-01", 11)],
      scope,
      today: "2026-12-01",
    });
    expect(r.update.map((u) => [u.id, u.state])).toEqual([
      [1, "closed"],
      [2, "waived"],
    ]);
    expect(r.resolve).toEqual([]);
    expect(r.untouched).toEqual([3]);
  });

  it("does not close findings the run could not have seen: events outside the period, or another rule pack", () => {
    const r = reconcileFindings({
      stored: [
        stored(1, "CT-EVAC-01", 10, "open", "2025-06-01"),
        stored(2, "CT-EU-01", 11, "open", null),
        stored(3, "CT-CYL-02", 12, "open", null),
      ],
      found: [],
      scope,
      today: "2026-12-01",
    });
    expect(r.resolve).toEqual([{ id: 3, from: "open" }]); // a standing obligation is always in scope
    expect(r.untouched.sort()).toEqual([1, 2]);
  });

  it("running the same findings twice changes nothing the second time (property)", () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: 1, max: 500 }), { maxLength: 30 }), (ids) => {
        const found = ids.map((id) => finding("CT-EVAC-01", id));
        const first = reconcileFindings({ stored: [], found, scope, today: "2026-12-01" });
        const storedAfter: StoredFinding[] = first.create.map((c, i) => ({
          id: i + 1,
          identityKey: c.finding.identityKey,
          ruleId: c.finding.ruleId,
          state: "open",
          occurredOn: null,
          dueOn: c.dueOn,
        }));
        const second = reconcileFindings({ stored: storedAfter, found, scope, today: "2026-12-02" });
        expect(second.create).toEqual([]);
        expect(second.resolve).toEqual([]);
        expect(second.update.length).toBe(ids.length);
        expect(second.update.every((u) => u.state === "open" && !u.foundAgain)).toBe(true);
      }),
    );
  });
});
