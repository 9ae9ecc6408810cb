import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { buildDigests, findingRefResolver, healthTrend, recordHealth, type BranchRecords, type DigestFinding } from "@coldtrail/core";

describe("record health", () => {
  it("is 100 with nothing open and says how it was computed", () => {
    expect(recordHealth({ open: { critical: 0, major: 0, minor: 0 }, recordsAudited: 540 })).toMatchObject({
      score: 100,
      points: 0,
      basis: 540,
    });
  });

  it("takes 10, 4 and 1 points per open critical, major and minor finding per 100 records", () => {
    const h = recordHealth({ open: { critical: 2, major: 3, minor: 1 }, recordsAudited: 600 });
    expect(h.points).toBe(33);
    expect(h.score).toBe(94.5); // 100 − 33 × 100 / 600
    expect(h.formula).toBe("100 − (10 × 2 + 4 × 3 + 1 × 1) × 100 ÷ 600 = 94.5");
  });

  it("counts at least 100 records so a tiny branch does not swing on one finding, and never goes below 0", () => {
    expect(recordHealth({ open: { critical: 1, major: 0, minor: 0 }, recordsAudited: 12 }).score).toBe(90);
    expect(recordHealth({ open: { critical: 30, major: 0, minor: 0 }, recordsAudited: 100 }).score).toBe(0);
  });

  it("never rises when another finding opens (property)", () => {
    fc.assert(
      fc.property(
        fc.nat(50),
        fc.nat(50),
        fc.nat(50),
        fc.integer({ min: 0, max: 5000 }),
        fc.constantFrom("critical", "major", "minor" as const),
        (c, M, m, n, extra) => {
          const before = recordHealth({ open: { critical: c, major: M, minor: m }, recordsAudited: n });
          const open = { critical: c, major: M, minor: m };
          open[extra] += 1;
          expect(recordHealth({ open, recordsAudited: n }).score).toBeLessThanOrEqual(before.score);
        },
      ),
    );
  });

  it("describes the trend since the last audit", () => {
    expect(healthTrend({ score: 90, open: 6 }, { score: 94.5, open: 3 })).toMatchObject({
      direction: "better",
      scoreChange: 4.5,
      openChange: -3,
    });
    expect(healthTrend({ score: 90, open: 6 }, { score: 88, open: 7 }).words).toBe("Worse: health -2, open findings +1");
    expect(healthTrend({ score: 90, open: 6 }, { score: 90, open: 6 }).words).toBe("No change");
  });
});

describe("daily digest", () => {
  const f = (id: number, dueOn: string | null, extra: Partial<DigestFinding> = {}): DigestFinding => ({
    id,
    branchId: 1,
    branchName: "Columbus",
    ruleId: "CT-EVAC-01",
    title: "Required evacuation level not reached",
    severity: "critical",
    state: "open",
    dueOn,
    assigneeId: null,
    ...extra,
  });

  it("lists findings due within 7 days or overdue, overdue first, to the people they belong to", () => {
    const digests = buildDigests(
      [
        f(1, "2026-12-20"),
        f(2, "2026-12-05", { assigneeId: 9 }),
        f(3, "2026-11-20"),
        f(4, "2026-12-03", { branchId: 2 }),
        f(5, "2026-11-01", { state: "closed" }),
        f(6, null),
      ],
      [
        { userId: 9, wholeOrganisation: false, managedBranchIds: [2] },
        { userId: 8, wholeOrganisation: false, managedBranchIds: [1] },
        { userId: 7, wholeOrganisation: true, managedBranchIds: [] },
        { userId: 6, wholeOrganisation: false, managedBranchIds: [3] },
      ],
      "2026-12-01",
    );
    expect(digests.get(9)?.map((l) => l.id)).toEqual([4, 2]); // unassigned in their branch + assigned to them
    expect(digests.get(8)?.map((l) => l.id)).toEqual([3]); // #2 is assigned to someone else
    expect(digests.get(7)?.map((l) => [l.id, l.overdue, l.daysLeft])).toEqual([
      [3, true, -11],
      [4, false, 2],
      [2, false, 4],
    ]);
    expect(digests.has(6)).toBe(false);
  });
});

describe("who a finding names", () => {
  const records: BranchRecords = {
    branch: { id: 1, name: "Columbus", timeZone: "America/New_York", massUnit: "lb_oz" },
    appliances: [],
    recoveryEquipment: [],
    cylinders: [],
    jobs: [
      {
        id: 10,
        kind: "charge",
        performedOn: "2026-09-12",
        technicianId: 5,
        applianceId: 3,
        equipmentId: null,
        refrigerant: "R-22",
        movements: [],
        evacuation: null,
        accessMethod: null,
        temporaryAccessRemoved: null,
        compressorOperating: null,
        additionExclusion: null,
        verification: null,
      },
      {
        id: 11,
        kind: "disposal",
        performedOn: "2026-04-22",
        technicianId: 6,
        applianceId: 4,
        equipmentId: null,
        refrigerant: "R-134a",
        movements: [],
        evacuation: null,
        accessMethod: null,
        temporaryAccessRemoved: null,
        compressorOperating: null,
        additionExclusion: null,
        verification: null,
      },
    ],
    technicians: [{ id: 7, name: "T", certifications: [{ id: 40, type: "universal", state: "pending" }] }],
    disposalRecords: [],
    disposalStatements: [],
    reclaimShipments: [],
    purchases: [],
    stockCounts: [],
    leakInspections: [],
    chronicLeakReports: [],
  };
  const refs = findingRefResolver(records);

  it("names the technician of a job, of a certification, and of the addition that started a leak", () => {
    expect(refs({ recordType: "job", recordId: 10, identityKey: "CT-REC-01:job:10", ruleId: "CT-REC-01" })).toEqual({
      technicianId: 5,
      applianceId: 3,
    });
    expect(refs({ recordType: "certification", recordId: 40, identityKey: "CT-CERT-02:certification:40", ruleId: "CT-CERT-02" })).toEqual({
      technicianId: 7,
      applianceId: null,
    });
    expect(refs({ recordType: "appliance", recordId: 3, identityKey: "CT-LEAK-02:appliance:3:2026-09-12", ruleId: "CT-LEAK-02" })).toEqual({
      technicianId: 5,
      applianceId: 3,
    });
  });

  it("names the technician of the disposal for disposal findings without a date", () => {
    expect(refs({ recordType: "appliance", recordId: 4, identityKey: "CT-DISP-02:appliance:4", ruleId: "CT-DISP-02" })).toEqual({
      technicianId: 6,
      applianceId: 4,
    });
    expect(refs({ recordType: "branch", recordId: 1, identityKey: "CT-BAL-01:branch:1:R-22", ruleId: "CT-BAL-01" })).toEqual({
      technicianId: null,
      applianceId: null,
    });
  });
});
