import { evacuationSatisfied, requiredEvacuation } from "../../evacuation/required-evacuation";
import { toGrams } from "../../units/mass";
import { ACCESS_METHOD_LABELS, EVACUATION_UNIT_LABELS, TEMPORARY_ACCESS_METHODS } from "../../vocabulary";
import type { AuditContext, AuditRule, RuleHit } from "../finding";
import type { Appliance, Job } from "../records";
import { applianceWords, jobWords, PRESSURE_WORDS, recoveredG, safePressureClass, small, under608 } from "./rule-helpers";

const RECOVERY_KINDS: readonly Job["kind"][] = ["recovery", "disposal"];

function* recoveryJobs(index: AuditContext["index"]): Generator<{ job: Job; appliance: Appliance }> {
  for (const job of index.jobs) {
    if (!RECOVERY_KINDS.includes(job.kind) || job.applianceId === null) continue;
    const appliance = index.appliances.get(job.applianceId);
    // 82.154(a)(1): no evacuation level applies to an exempt substitute (CO2, ammonia in refrigeration).
    if (appliance && under608(appliance)) yield { job, appliance };
  }
}

const reading = (job: Job) => (job.evacuation ? `${job.evacuation.value} ${EVACUATION_UNIT_LABELS[job.evacuation.unit]}` : "");

export const evacuationNotReached: AuditRule = {
  id: "CT-EVAC-01",
  title: "Required evacuation level not reached",
  severity: "critical",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "40 CFR 82.156(a)(3) Table 1",
  explanation:
    "Before an appliance is opened or disposed of, its refrigerant must be recovered down to the level Table 1 sets for its pressure class, its charge (under or at least 200 lb) and the age of the recovery equipment.",
  fix: "Record the level actually reached; if it was short, evacuate the appliance again to the required level and log it, or record why the leaking part could not reach it.",
  check(_records, { index }) {
    const hits: RuleHit[] = [];
    for (const { job, appliance } of recoveryJobs(index)) {
      if (small(appliance) || !job.evacuation) continue;
      const pressureClass = safePressureClass(appliance);
      if (!pressureClass) continue;
      const equipment = job.equipmentId !== null ? index.equipment.get(job.equipmentId) : undefined;
      const req = requiredEvacuation({
        pressureClass,
        fullChargeG: appliance.fullChargeG,
        equipmentManufacturedOn: equipment?.manufacturedOn ?? null,
        smallAppliance: false,
      });
      const verdict = evacuationSatisfied(req, { reading: job.evacuation });
      if (verdict.satisfied) continue;
      const charge = appliance.fullChargeG === null ? "charge unknown" : index.mass(appliance.fullChargeG);
      hits.push({
        recordType: "job",
        recordId: job.id,
        on: job.performedOn,
        detail: `${jobWords(job)} on ${applianceWords(appliance)}, ${PRESSURE_WORDS[pressureClass]}, ${charge}: reached ${reading(job)}; ${req.description} is required`,
      });
    }
    return hits;
  },
};

export const evacuationNotRecorded: AuditRule = {
  id: "CT-EVAC-02",
  title: "Evacuation level not recorded",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "40 CFR 82.156(a)",
  explanation:
    "The technician must verify the evacuation level before opening or disposing of an appliance; without a recorded level the job cannot show compliance.",
  fix: "Add the evacuation level reached (any unit) to the job.",
  check(_records, { index }) {
    const hits: RuleHit[] = [];
    for (const { job, appliance } of recoveryJobs(index)) {
      if (small(appliance) || job.evacuation || !safePressureClass(appliance)) continue;
      hits.push({
        recordType: "job",
        recordId: job.id,
        on: job.performedOn,
        detail: `${jobWords(job)} on ${applianceWords(appliance)} has no evacuation level`,
      });
    }
    return hits;
  },
};

export const smallApplianceRecoveryShort: AuditRule = {
  id: "CT-EVAC-03",
  title: "Small-appliance recovery short of the required share",
  severity: "critical",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "40 CFR 82.156(b)",
  explanation:
    "From a small appliance the technician must recover 90 % of the charge (80 % if the compressor is not operating, or with pre-15 Nov 1993 equipment), or reach 4 in Hg vacuum.",
  fix: "Record the amount recovered and the vacuum reached; if short, finish the recovery and log it.",
  check(_records, { index }) {
    const hits: RuleHit[] = [];
    for (const { job, appliance } of recoveryJobs(index)) {
      if (!small(appliance)) continue;
      const equipment = job.equipmentId !== null ? index.equipment.get(job.equipmentId) : undefined;
      const req = requiredEvacuation({
        pressureClass: "high",
        fullChargeG: appliance.fullChargeG,
        equipmentManufacturedOn: equipment?.manufacturedOn ?? null,
        smallAppliance: true,
        compressorOperating: job.compressorOperating,
      });
      const got = recoveredG(job);
      const terms = job.movements.filter((m) => m.direction === "recovered").length;
      const verdict = evacuationSatisfied(req, {
        reading: job.evacuation,
        recoveredG: got,
        fullChargeG: appliance.fullChargeG,
        recoveredTerms: terms,
      });
      if (verdict.satisfied) continue;
      const share = verdict.recoveredPercent === null ? "" : ` (${verdict.recoveredPercent.toFixed(0)} %)`;
      hits.push({
        recordType: "job",
        recordId: job.id,
        on: job.performedOn,
        detail: `Recovered ${index.mass(got)} of a ${index.mass(appliance.fullChargeG ?? 0)} charge${share} from ${applianceWords(appliance)}${job.evacuation ? `, reaching ${reading(job)}` : ""}; ${req.description} is required`,
      });
    }
    return hits;
  },
};

export const temporaryAccessLeftInPlace: AuditRule = {
  id: "CT-ACCESS-01",
  title: "Temporary piercing access left in place",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "Common practice (EPA Section 608 technician training); local codes",
  explanation: "Clamp-on piercing pliers and bolt-on line taps are temporary; left on the line they become a leak point.",
  fix: "Remove the temporary device (fit a brazed or permanent access fitting if access is still needed) and record that it was removed.",
  check(_records, { index }) {
    const hits: RuleHit[] = [];
    for (const job of index.jobs) {
      if (!job.accessMethod || !TEMPORARY_ACCESS_METHODS.includes(job.accessMethod) || job.temporaryAccessRemoved === true) continue;
      const appliance = job.applianceId !== null ? index.appliances.get(job.applianceId) : undefined;
      const where = appliance ? ` on ${applianceWords(appliance)}` : "";
      const state = job.temporaryAccessRemoved === false ? "was left in place" : "is not recorded as removed";
      hits.push({
        recordType: "job",
        recordId: job.id,
        on: job.performedOn,
        detail: `${ACCESS_METHOD_LABELS[job.accessMethod]} used in ${jobWords(job)}${where} ${state}`,
      });
    }
    return hits;
  },
};

export const equipmentNotCertified: AuditRule = {
  id: "CT-EQUIP-01",
  title: "Recovery equipment not certified",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-11-15",
  effectiveUntil: null,
  citation: "40 CFR 82.158; 82.156(a)",
  explanation:
    "Recovery and recycling equipment must be certified by an EPA-approved testing organization (to AHRI 740) before it is used.",
  fix: "Record the equipment's certification (label or certificate) or take it out of service and redo the work with certified equipment.",
  check(_records, { index }) {
    const hits: RuleHit[] = [];
    for (const job of index.jobs) {
      if (job.equipmentId === null) continue;
      const equipment = index.equipment.get(job.equipmentId);
      if (!equipment || equipment.certification === "certified") continue;
      const served = job.applianceId !== null ? index.appliances.get(job.applianceId) : undefined;
      if (served && !under608(served)) continue; // 82.154(a)(1) exempt substitute
      const state = equipment.certification === "unknown" ? "has no recorded certification" : "is not certified";
      hits.push({
        recordType: "job",
        recordId: job.id,
        on: job.performedOn,
        detail: `Recovery equipment ${equipment.serial} used in ${jobWords(job)} ${state}`,
      });
    }
    return hits;
  },
};

const SYSTEM_DEPENDENT_MAX_G = toGrams(15, "lb");

export const systemDependentOnLargeAppliance: AuditRule = {
  id: "CT-EQUIP-02",
  title: "System-dependent recovery on an appliance over 15 lb",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-11-15",
  effectiveUntil: null,
  citation: "40 CFR 82.156 (system-dependent equipment; from memory)",
  explanation: "System-dependent (passive) recovery equipment may be used only on appliances holding 15 lb of refrigerant or less.",
  fix: "Recover the appliance again with self-contained recovery equipment and record the level reached.",
  check(_records, { index }) {
    const hits: RuleHit[] = [];
    for (const job of index.jobs) {
      if (job.equipmentId === null || job.applianceId === null) continue;
      const equipment = index.equipment.get(job.equipmentId);
      const appliance = index.appliances.get(job.applianceId);
      if (!equipment || !appliance || equipment.kind !== "system_dependent" || !under608(appliance)) continue;
      if (appliance.fullChargeG !== null && appliance.fullChargeG <= SYSTEM_DEPENDENT_MAX_G) continue;
      // An unknown charge cannot be shown to be 15 lb or less: the stricter side.
      const holds =
        appliance.fullChargeG === null
          ? "whose full charge is not recorded, so it cannot be shown to hold 15 lb or less"
          : `which holds ${index.mass(appliance.fullChargeG)}`;
      hits.push({
        recordType: "job",
        recordId: job.id,
        on: job.performedOn,
        detail: `System-dependent equipment ${equipment.serial} was used on ${applianceWords(appliance)}, ${holds}`,
      });
    }
    return hits;
  },
};
