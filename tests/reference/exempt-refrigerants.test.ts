import { describe, expect, it } from "vitest";
import {
  checkJobDraft,
  getRefrigerant,
  runAudit,
  section608Scope,
  toGrams,
  type Appliance,
  type BranchRecords,
  type Job,
  type Technician,
} from "@coldtrail/core";
import { appliance, job } from "../../packages/core/test/fixtures/sample-branch";
import { emptyBranch, typeIITech, uncertifiedTech } from "../fixtures/rule-records";

const lb = (v: number) => toGrams(v, "lb");
const period = { from: "2026-01-01", to: "2026-12-31" };

function audit(a: Appliance, jobs: Job[], tech: Technician, extra: Partial<BranchRecords> = {}) {
  const records: BranchRecords = {
    ...emptyBranch([tech]),
    recoveryEquipment: [{ id: 1, serial: "RX-OLD", kind: "self_contained", manufacturedOn: "2012-01-01", certification: "not_certified" }],
    appliances: [a],
    jobs,
    ...extra,
  };
  return runAudit(records, { packs: ["us_federal"], period, asOf: "2026-06-30" });
}

/** A recovery with no evacuation level, with uncertified equipment, by the given technician. */
const recovery = (a: Appliance, tech: Technician, kind: Job["kind"] = "recovery") =>
  job({
    id: 10,
    kind,
    performedOn: "2026-05-04",
    applianceId: a.id,
    technicianId: tech.id,
    refrigerant: a.refrigerant,
    evacuation: null,
    movements: [{ direction: "recovered", amountG: lb(0.1), cylinderId: null }],
  });

const ruleIds = (findings: ReturnType<typeof runAudit>) => [...new Set(findings.map((f) => f.ruleId))].sort();

describe("exempt substitutes in the catalogue (40 CFR 82.154(a)(1))", () => {
  it("carbon dioxide is exempt in any application", () => {
    expect(getRefrigerant("R-744")?.section608Exemption?.endUses).toBe("any"); // Source: 82.154(a)(1) (REFERENCE.md §6.1 [S30]) "CO2 … in any application"
    expect(section608Scope("R-744", "commercial_refrigeration").covered).toBe(false); // Source: [S30]
    expect(section608Scope("R-744", "chiller").citation).toContain("82.154(a)(1)");
  });
  it("ammonia is exempt in commercial and industrial process refrigeration, not in comfort cooling", () => {
    expect(section608Scope("R-717", "industrial_process").covered).toBe(false); // Source: [S30] "ammonia in commercial/industrial process refrigeration or absorption units"
    expect(section608Scope("R-717", "commercial_refrigeration").covered).toBe(false); // Source: [S30]
    expect(section608Scope("R-717", "chiller").covered).toBe(true); // Source: [S30] (exemption limited to those end uses)
  });
  it("propane is exempt only in the small-appliance end uses", () => {
    expect(section608Scope("R-290", "small_appliance").covered).toBe(false); // from memory: 2016 rule added propane in household and stand-alone units (REFERENCE.md §6.1, M)
    expect(section608Scope("R-290", "industrial_process").covered).toBe(true); // hydrocarbons in IPR are exempt only when it processes hydrocarbons [S30]: not known here, so covered
  });
  it("class I/II refrigerants and HFCs are never exempt", () => {
    for (const r of ["R-22", "R-12", "R-123", "R-410A", "R-404A", "R-134a", "R-1234yf"]) {
      expect(getRefrigerant(r)?.section608Exemption, r).toBeNull(); // Source: 82.152 "refrigerant" (class I/II or non-exempt substitute)
      expect(section608Scope(r, "commercial_refrigeration").covered, r).toBe(true);
    }
  });
});

describe("section 608 practices are not audited on exempt refrigerants", () => {
  const co2Rack = appliance({ id: 1, label: "CO2 rack", category: "commercial_refrigeration", refrigerant: "R-744", fullChargeG: lb(300) });
  const r404Rack = appliance({
    id: 1,
    label: "R-404A rack",
    category: "commercial_refrigeration",
    refrigerant: "R-404A",
    fullChargeG: lb(300),
  });

  it("an uncertified technician recovering from a CO2 rack without a recorded level raises no 608 finding", () => {
    const findings = audit(co2Rack, [recovery(co2Rack, uncertifiedTech)], uncertifiedTech);
    expect(ruleIds(findings).filter((id) => /CERT-01|EVAC|EQUIP/.test(id))).toEqual([]); // Source: 82.154(a)(1) CO2 exempt; 82.152 "refrigerant" excludes exempt substitutes
  });
  it("the same work on an R-404A rack raises certification, evacuation and equipment findings", () => {
    const findings = audit(r404Rack, [recovery(r404Rack, uncertifiedTech)], uncertifiedTech);
    expect(ruleIds(findings)).toEqual(expect.arrayContaining(["CT-CERT-01", "CT-EQUIP-01", "CT-EVAC-02"])); // Source: 82.161(a); 82.156(a); 82.158
  });
  it("ammonia in industrial process refrigeration needs no 608 certification; in a chiller it does", () => {
    const ipr = appliance({ id: 1, category: "industrial_process", refrigerant: "R-717", fullChargeG: lb(2000) });
    const chiller = appliance({ id: 1, category: "chiller", refrigerant: "R-717", fullChargeG: lb(2000) });
    expect(ruleIds(audit(ipr, [recovery(ipr, uncertifiedTech)], uncertifiedTech))).not.toContain("CT-CERT-01"); // Source: 82.154(a)(1) [S30]
    expect(ruleIds(audit(chiller, [recovery(chiller, uncertifiedTech)], uncertifiedTech))).toContain("CT-CERT-01"); // Source: 82.161(a); [S30]
  });
  it("the job draft gives no certification, evacuation or equipment warning on a CO2 rack", () => {
    const result = checkJobDraft(
      {
        kind: "recovery",
        performedOn: "2026-05-04",
        refrigerant: "R-744",
        recoveredG: lb(10),
        chargedG: null,
        chargeFromCylinder: false,
        evacuation: { value: 20, unit: "psig" },
        accessMethod: "service_valve",
        temporaryAccessRemoved: null,
        compressorOperating: null,
        additionExclusion: null,
      },
      {
        branch: { id: 1, name: "Test", timeZone: "America/Chicago", massUnit: "lb_oz" },
        appliance: co2Rack,
        technician: uncertifiedTech,
        equipment: { id: 1, serial: "RX-OLD", kind: "self_contained", manufacturedOn: "2012-01-01", certification: "not_certified" },
        cylinder: null,
        applianceJobs: [],
      },
    );
    expect(result.warnings.map((w) => w.ruleId)).toEqual([]); // Source: 82.154(a)(1) (REFERENCE.md §6.1 [S30])
  });
});

describe("disposal of a small appliance needs no Type I (40 CFR 82.161; 82.155)", () => {
  const fridge = appliance({ id: 1, category: "small_appliance", refrigerant: "R-134a", fullChargeG: lb(0.5), factorySealed: true });
  const draft = (kind: "disposal" | "recovery") =>
    checkJobDraft(
      {
        kind,
        performedOn: "2026-05-04",
        refrigerant: "R-134a",
        recoveredG: lb(0.45),
        chargedG: null,
        chargeFromCylinder: false,
        evacuation: null,
        accessMethod: "service_valve",
        temporaryAccessRemoved: null,
        compressorOperating: true,
        additionExclusion: null,
      },
      {
        branch: { id: 1, name: "Test", timeZone: "America/Chicago", massUnit: "lb_oz" },
        appliance: fridge,
        technician: typeIITech,
        equipment: null,
        cylinder: null,
        applianceJobs: [],
      },
    );
  it("a Type II technician disposing of a small appliance raises no certification finding", () => {
    const findings = audit(fridge, [recovery(fridge, typeIITech, "disposal")], typeIITech);
    expect(ruleIds(findings)).not.toContain("CT-CERT-01"); // Source: 82.161 Type I covers "maintain, service or repair" small appliances [S6]; disposal under 82.155 [S27]
    expect(draft("disposal").warnings.map((w) => w.ruleId)).not.toContain("CT-CERT-01");
  });
  it("servicing the same small appliance still needs Type I or Universal", () => {
    const findings = audit(fridge, [recovery(fridge, typeIITech)], typeIITech);
    expect(ruleIds(findings)).toContain("CT-CERT-01"); // Source: 82.161 Type I [S6] (REFERENCE.md §1.1)
    expect(draft("recovery").warnings.map((w) => w.ruleId)).toContain("CT-CERT-01");
  });
  it("the disposal itself is still judged by 82.155(b): a signed statement is required", () => {
    const fridgeDisposed = { ...fridge, status: "disposed" as const, statusChangedOn: "2026-05-04" };
    const findings = audit(fridgeDisposed, [recovery(fridgeDisposed, typeIITech, "disposal")], typeIITech);
    expect(ruleIds(findings)).toContain("CT-DISP-02"); // Source: 82.155(b) signed statement [S27]
  });
});
