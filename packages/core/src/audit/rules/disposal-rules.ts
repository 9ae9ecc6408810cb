import { disposalRecordCompleteness, smallApplianceStatementCompleteness } from "../../record-completeness";
import { addDays } from "../../dates/local-date";
import { toGrams } from "../../units/mass";
import type { AuditContext, AuditRule, RuleHit } from "../finding";
import type { Appliance, BranchRecords } from "../records";
import { applianceWords, recoveredG, small, under608 } from "./rule-helpers";

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
    // 82.154(a)(1): exempt substitutes are not refrigerants for subpart F, so 82.155 does not apply.
    if (!under608(appliance)) continue;
    yield { appliance, on: disposalJob?.performedOn ?? appliance.statusChangedOn ?? undefined };
  }
}

/**
 * The paperwork of a disposal may follow it by the grace period of the organisation's settings
 * (82.155 sets no deadline for it): until then a missing or incomplete record is not yet a gap.
 */
function withinGrace(on: string | undefined, context: Pick<AuditContext, "asOf" | "settings">): boolean {
  return on !== undefined && context.asOf <= addDays(on, context.settings.disposalRecordGraceDays);
}

const graceWords = (context: Pick<AuditContext, "settings">) =>
  ` (more than ${context.settings.disposalRecordGraceDays} days after the disposal, the organisation's grace period)`;

export const disposalRecordMissing: AuditRule = {
  id: "CT-DISP-01",
  title: "Disposal without a complete disposal record",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "2018-01-01",
  effectiveUntil: null,
  citation: "40 CFR 82.155(c)",
  explanation:
    "A technician who recovers refrigerant from an appliance holding more than 5 and less than 50 lb for disposal keeps a record of the company, the appliance's location, the date, and the type and quantity of refrigerant recovered, for 3 years. An appliance whose full charge is not recorded is held to it too. The record may follow the disposal by the grace period in the organisation's settings.",
  fix: "Create or complete the disposal record with the missing fields.",
  check(records, context) {
    const { index } = context;
    const hits: RuleHit[] = [];
    for (const { appliance, on } of disposedAppliances(records, index)) {
      const g = appliance.fullChargeG;
      // An unknown charge cannot be shown to be outside the band: the stricter side.
      if (g !== null && (g <= BAND_LOW_G || g >= BAND_HIGH_G)) continue;
      if (g === null && small({ ...appliance, fullChargeG: 0 })) continue; // factory-sealed: 82.155(b) statement instead
      if (withinGrace(on, context)) continue;
      const charge = g === null ? "full charge not recorded" : index.mass(g);
      const disposal = index.disposalRecordsByAppliance.get(appliance.id)?.[0];
      if (!disposal) {
        hits.push({
          recordType: "appliance",
          recordId: appliance.id,
          on,
          detail: `${applianceWords(appliance)}, ${charge}, was disposed of${on ? ` on ${on}` : ""} without a disposal record${on ? graceWords(context) : ""}`,
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
    "A small appliance goes to final disposal with a signed statement that its refrigerant was recovered, giving the name and address of the person who recovered it and the date (or under a contract saying so). The statement may follow the disposal by the grace period in the organisation's settings.",
  fix: "Obtain the signed statement (or record the contract) and attach it to the appliance.",
  check(records, context) {
    const { index } = context;
    const hits: RuleHit[] = [];
    for (const { appliance, on } of disposedAppliances(records, index)) {
      if (!small(appliance)) continue;
      if (withinGrace(on, context)) continue;
      const statements = index.statementsByAppliance.get(appliance.id) ?? [];
      if (statements.length === 0) {
        hits.push({
          recordType: "appliance",
          recordId: appliance.id,
          on,
          detail: `Small appliance ${applianceWords(appliance)} was disposed of${on ? ` on ${on}` : ""} without a signed recovery statement${on ? graceWords(context) : ""}`,
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
      if (appliance.status === "in_service" || appliance.fullChargeG === 0 || !under608(appliance)) continue;
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
