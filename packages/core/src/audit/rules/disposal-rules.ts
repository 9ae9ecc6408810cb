import { disposalRecordCompleteness, smallApplianceStatementCompleteness } from "../../record-completeness";
import { toGrams } from "../../units/mass";
import type { AuditContext, AuditRule, RuleHit } from "../finding";
import type { Appliance, BranchRecords } from "../records";
import { applianceWords, recoveredG, small } from "./rule-helpers";

const BAND_LOW_G = toGrams(5, "lb");
const BAND_HIGH_G = toGrams(50, "lb");

/** Appliances sent for disposal, with the date: a disposal job, or the status "disposed". */
function* disposedAppliances(
  records: BranchRecords,
  index: AuditContext["index"],
): Generator<{ appliance: Appliance; on: string | undefined }> {
  for (const appliance of records.appliances) {
    const disposalJob = (index.jobsByAppliance.get(appliance.id) ?? []).find((j) => j.kind === "disposal");
    if (!disposalJob && appliance.status !== "disposed") continue;
    yield { appliance, on: disposalJob?.performedOn ?? appliance.statusChangedOn ?? undefined };
  }
}

export const disposalRecordMissing: AuditRule = {
  id: "CT-DISP-01",
  title: "Disposal without a complete disposal record",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "2018-01-01",
  effectiveUntil: null,
  citation: "40 CFR 82.155(c)",
  explanation:
    "A technician who recovers refrigerant from an appliance holding more than 5 and less than 50 lb for disposal keeps a record of the company, the appliance's location, the date, and the type and quantity of refrigerant recovered, for 3 years.",
  fix: "Create or complete the disposal record with the missing fields.",
  check(records, { index }) {
    const hits: RuleHit[] = [];
    for (const { appliance, on } of disposedAppliances(records, index)) {
      const g = appliance.fullChargeG;
      if (g === null || g <= BAND_LOW_G || g >= BAND_HIGH_G) continue;
      const disposal = index.disposalRecordsByAppliance.get(appliance.id)?.[0];
      if (!disposal) {
        hits.push({
          recordType: "appliance",
          recordId: appliance.id,
          on,
          detail: `${applianceWords(appliance)}, ${index.mass(g)}, was disposed of without a disposal record`,
        });
        continue;
      }
      const c = disposalRecordCompleteness(disposal);
      if (!c.complete) {
        hits.push({
          recordType: "appliance",
          recordId: appliance.id,
          on,
          detail: `The disposal record of ${applianceWords(appliance)} lacks: ${c.missing.join(", ")}`,
        });
      }
    }
    return hits;
  },
};

export const smallApplianceStatementMissing: AuditRule = {
  id: "CT-DISP-02",
  title: "Small-appliance disposal without a signed statement",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "40 CFR 82.155(b)",
  explanation:
    "A small appliance goes to final disposal with a signed statement that its refrigerant was recovered, giving the name and address of the person who recovered it and the date (or under a contract saying so).",
  fix: "Obtain the signed statement (or record the contract) and attach it to the appliance.",
  check(records, { index }) {
    const hits: RuleHit[] = [];
    for (const { appliance, on } of disposedAppliances(records, index)) {
      if (!small(appliance)) continue;
      const statements = index.statementsByAppliance.get(appliance.id) ?? [];
      if (statements.length === 0) {
        hits.push({
          recordType: "appliance",
          recordId: appliance.id,
          on,
          detail: `Small appliance ${applianceWords(appliance)} was disposed of without a signed recovery statement`,
        });
        continue;
      }
      const results = statements.map(smallApplianceStatementCompleteness);
      if (results.some((r) => r.complete)) continue;
      hits.push({
        recordType: "appliance",
        recordId: appliance.id,
        on,
        detail: `The disposal statement of ${applianceWords(appliance)} lacks: ${results[0]!.missing.join(", ")}`,
      });
    }
    return hits;
  },
};

export const disposalWithoutRecovery: AuditRule = {
  id: "CT-DISP-03",
  title: "Appliance retired or disposed without recorded recovery",
  severity: "critical",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "40 CFR 82.155(a)",
  explanation: "The refrigerant of an appliance sent for disposal, including a retired unit waiting at the shop, must be recovered first.",
  fix: "Recover the refrigerant and log a recovery or disposal job with the amount and the cylinder used.",
  check(records, { index }) {
    const hits: RuleHit[] = [];
    for (const appliance of records.appliances) {
      if (appliance.status === "in_service" || appliance.fullChargeG === 0) continue;
      const jobs = index.jobsByAppliance.get(appliance.id) ?? [];
      const recovered =
        jobs.some((j) => recoveredG(j) > 0) ||
        (index.disposalRecordsByAppliance.get(appliance.id) ?? []).some((d) => (d.recoveredG ?? 0) > 0) ||
        (index.statementsByAppliance.get(appliance.id) ?? []).length > 0;
      if (recovered) continue;
      hits.push({
        recordType: "appliance",
        recordId: appliance.id,
        detail: `${applianceWords(appliance)} is ${appliance.status} but no recovery of its refrigerant is recorded`,
      });
    }
    return hits;
  },
};
