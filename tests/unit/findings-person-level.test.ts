import { describe, expect, it } from "vitest";
import {
  EU_MEMBER_STATES,
  buildDigests,
  isPersonLevelRecordType,
  packsForBranchAudit,
  packsForPlace,
  type DigestFinding,
} from "@coldtrail/core";

describe("rule packs by place", () => {
  it("applies the US federal rules in the United States and its territories, and only there", () => {
    // Source: 42 U.S.C. 7602(d) ("State" includes Puerto Rico, the Virgin Islands, Guam, American Samoa and the Northern Mariana Islands)
    for (const country of ["US", "PR", "GU", "VI", "AS", "MP"])
      expect(packsForPlace({ country, region: null }), country).toEqual(["us_federal"]);
    expect(packsForPlace({ country: "CA", region: "ON" })).toEqual([]);
    expect(packsForPlace({ country: "MX", region: null })).toEqual([]);
  });

  it("applies the EU regulation in the 27 member states, not in other European countries", () => {
    // Source: europa.eu, "EU countries" (27 member states since 2020-02-01)
    expect(EU_MEMBER_STATES).toHaveLength(27);
    for (const country of ["NL", "DE", "FR", "IE", "CY", "HR"]) expect(packsForPlace({ country, region: null }), country).toEqual(["eu"]);
    for (const country of ["GB", "CH", "NO", "IS"]) expect(packsForPlace({ country, region: null }), country).toEqual([]);
  });

  it("reads the country code in either case and never adds a pack that does not cover the place", () => {
    expect(packsForPlace({ country: "nl", region: "South Holland" })).toEqual(["eu"]);
    expect(packsForPlace({ country: "NL", region: null }, ["us_federal"])).toEqual(["eu"]);
  });

  it("gives an audit's branch the chosen packs that cover it, and nothing when none does", () => {
    expect(packsForBranchAudit({ country: "US", region: "TX" }, ["us_federal", "eu"])).toEqual(["us_federal"]);
    expect(packsForBranchAudit({ country: "DE", region: null }, ["us_federal", "eu"])).toEqual(["eu"]);
    expect(packsForBranchAudit({ country: "DE", region: null }, ["us_federal"])).toEqual([]);
  });
});

describe("person-level findings", () => {
  it("are the findings about a technician or their card, not about one branch's records", () => {
    expect(isPersonLevelRecordType("certification")).toBe(true);
    expect(isPersonLevelRecordType("technician")).toBe(true);
    for (const t of ["job", "appliance", "cylinder", "equipment", "branch"]) expect(isPersonLevelRecordType(t), t).toBe(false);
  });

  it("reach the digest of the manager of every branch they show in", () => {
    const card: DigestFinding = {
      id: 7,
      branchId: 2,
      branchIds: [2, 4],
      branchName: "Tucson",
      ruleId: "CT-CERT-02",
      title: "Certification card awaiting verification",
      severity: "minor",
      state: "open",
      dueOn: "2026-12-03",
      assigneeId: null,
    };
    const managers = [2, 3, 4].map((b) => ({ userId: 100 + b, wholeOrganisation: false, managedBranchIds: [b] }));
    const digests = buildDigests([card], managers, "2026-12-01");
    expect([...digests.keys()].sort()).toEqual([102, 104]);
    const branchOnly = buildDigests([{ ...card, branchIds: undefined }], managers, "2026-12-01");
    expect([...branchOnly.keys()]).toEqual([102]);
  });
});
