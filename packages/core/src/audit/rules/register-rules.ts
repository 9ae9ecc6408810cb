import { leakRepairRegime } from "../../leak-rate/leak-repair-regime";
import { getRefrigerant } from "../../refrigerants/catalogue";
import { serviceRecordCompleteness } from "../../record-completeness";
import { branchMassBalance } from "../branch-mass-balance";
import type { AuditRule, RuleHit } from "../finding";
import { movementRefrigerant } from "../record-index";
import { applianceWords, jobWords } from "./rule-helpers";

export const massBalanceUnaccounted: AuditRule = {
  id: "CT-BAL-01",
  title: "Refrigerant not accounted for (mass balance)",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "40 CFR 82.154(a) (no venting); 40 CFR 82.155(c)(3) (transfers for reclamation)",
  explanation:
    "For each refrigerant, purchased + recovered − charged − shipped for reclaim − change in stock should be close to zero; a larger gap means refrigerant left the books unrecorded (vented, lost, or not logged).",
  fix: "Find the missing movements (unlogged charges, shipments, purchases or stock counts) and record them; investigate any loss.",
  check(records, { index, period, settings }) {
    const hits: RuleHit[] = [];
    for (const row of branchMassBalance(records, period, settings)) {
      if (row.withinTolerance) continue;
      // Venting a substitute exempt in every use (carbon dioxide) is not prohibited (82.154(a)(1)).
      if (getRefrigerant(row.refrigerant)?.section608Exemption?.endUses === "any") continue;
      const sign = row.unaccountedG > 0 ? "missing" : "more used or shipped than came in";
      const stock = row.stockCounted
        ? `, stock change ${index.mass(row.stockChangeG)}`
        : ", no stock count on record (stock change taken as zero)";
      hits.push({
        recordType: "branch",
        recordId: records.branch.id,
        qualifier: row.refrigerant,
        detail: `${row.refrigerant} ${period.from} to ${period.to}: purchased ${index.mass(row.purchasedG)} + recovered ${index.mass(row.recoveredG)} − charged ${index.mass(row.chargedG)} − shipped ${index.mass(row.shippedG)}${stock} leaves ${index.mass(Math.abs(row.unaccountedG))} ${sign} (tolerance ${index.mass(row.toleranceG)})`,
      });
    }
    return hits;
  },
};

export const missingRegisterReference: AuditRule = {
  id: "CT-REF-01",
  title: "Job refers to a record missing from the registers",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "40 CFR 82.155(c), 82.157(l) (records identify the appliance and the refrigerant's whereabouts)",
  explanation:
    "Every appliance, recovery cylinder, piece of recovery equipment and technician a job names must exist in the branch's registers, so the record can be traced.",
  fix: "Add the missing appliance, cylinder, equipment or technician to its register, or correct the job.",
  check(_records, { index }) {
    const hits: RuleHit[] = [];
    for (const job of index.jobs) {
      const missing: [string, string][] = [];
      if (job.applianceId !== null && !index.appliances.has(job.applianceId))
        missing.push([`appliance-${job.applianceId}`, `appliance #${job.applianceId}`]);
      if (job.equipmentId !== null && !index.equipment.has(job.equipmentId))
        missing.push([`equipment-${job.equipmentId}`, `recovery equipment #${job.equipmentId}`]);
      if (job.technicianId !== null && !index.technicians.has(job.technicianId))
        missing.push([`technician-${job.technicianId}`, `technician #${job.technicianId}`]);
      const cylinders = new Set<number>();
      let unnamed = 0;
      for (const m of job.movements) {
        if (m.cylinderId !== null && !index.cylinders.has(m.cylinderId)) cylinders.add(m.cylinderId);
        if (m.cylinderId === null && m.direction === "recovered") unnamed += m.amountG;
      }
      for (const id of [...cylinders].sort((a, b) => a - b)) missing.push([`cylinder-${id}`, `cylinder #${id}`]);
      for (const [qualifier, what] of missing) {
        hits.push({
          recordType: "job",
          recordId: job.id,
          qualifier,
          on: job.performedOn,
          detail: `${jobWords(job)} names ${what}, which is not in the register`,
        });
      }
      if (unnamed > 0) {
        const r = movementRefrigerant(job, {}) ?? "refrigerant";
        hits.push({
          recordType: "job",
          recordId: job.id,
          qualifier: "cylinder-none",
          on: job.performedOn,
          detail: `${jobWords(job)} recovered ${index.mass(unnamed)} ${r} without naming a recovery cylinder`,
        });
      }
    }
    return hits;
  },
};

export const serviceRecordIncomplete: AuditRule = {
  id: "CT-REC-01",
  title: "Service record incomplete on a covered appliance",
  severity: "minor",
  pack: "us_federal",
  effectiveFrom: "2019-01-01",
  effectiveUntil: null,
  citation: "40 CFR 82.157(b), (l)(2); 40 CFR 84.106",
  explanation:
    "Service on an appliance covered by leak repair must be documented for the owner: appliance identity and location, date, type of service, amount and type of refrigerant added or removed, and the full charge.",
  fix: "Complete the job and appliance records with the missing fields.",
  check(_records, { index }) {
    const hits: RuleHit[] = [];
    for (const job of index.jobs) {
      if (job.applianceId === null || job.kind === "disposal") continue;
      const appliance = index.appliances.get(job.applianceId);
      if (!appliance) continue;
      const regime = leakRepairRegime({
        refrigerant: appliance.refrigerant,
        fullChargeG: appliance.fullChargeG,
        category: appliance.category,
        on: job.performedOn,
      });
      if (!regime.regime) continue;
      const c = serviceRecordCompleteness(job, appliance);
      if (c.complete) continue;
      hits.push({
        recordType: "job",
        recordId: job.id,
        on: job.performedOn,
        detail: `${jobWords(job)} on ${applianceWords(appliance)} lacks: ${c.missing.join(", ")}`,
      });
    }
    return hits;
  },
};
