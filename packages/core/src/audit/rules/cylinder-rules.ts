import { exceedsMaxFill, requalificationDueOn } from "../../cylinders/cylinder-fill";
import type { AuditRule, RuleHit } from "../finding";

export const cylinderOverfilled: AuditRule = {
  id: "CT-CYL-01",
  title: "Recovery cylinder overfilled",
  severity: "critical",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "AHRI Guideline K (80 % of water capacity × specific gravity); 49 CFR 173.304a",
  explanation:
    "A recovery cylinder may hold at most 80 % of its water capacity times the liquid's specific gravity; beyond that it can become liquid-full and burst when warm.",
  fix: "Transfer the excess into another empty recovery cylinder of the same refrigerant and weigh both.",
  check(records, { index }) {
    const hits: RuleHit[] = [];
    for (const cylinder of records.cylinders) {
      for (const step of index.cylinderLedgers.get(cylinder.id) ?? []) {
        const max = step.maxFill;
        if (!max || !exceedsMaxFill(step.netAfterG, max)) continue;
        const over = index.mass(step.netAfterG - max.maxNetG);
        const e = step.entry;
        if (e.kind === "in") {
          hits.push({
            recordType: "job",
            recordId: e.jobId,
            qualifier: `cylinder-${cylinder.id}`,
            on: e.on,
            detail: `Recovered ${index.mass(e.amountG)} ${e.refrigerant ?? "refrigerant"} into cylinder ${cylinder.serial}, which now holds ${over} over its maximum of ${index.mass(max.maxNetG)}`,
          });
        } else if (e.kind === "weighing") {
          hits.push({
            recordType: "cylinder",
            recordId: cylinder.id,
            qualifier: `weighing-${e.weighingId}`,
            on: e.on,
            detail: `Cylinder ${cylinder.serial} weighed ${index.mass(e.grossG ?? 0)} gross on ${e.on}: ${index.mass(step.netAfterG)} of ${step.refrigerant}, ${over} over its maximum of ${index.mass(max.maxNetG)}`,
          });
        }
      }
    }
    return hits;
  },
};

export const cylinderPastRequalification: AuditRule = {
  id: "CT-CYL-02",
  title: "Recovery cylinder past its requalification date",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "49 CFR 180.209",
  explanation:
    "A refillable recovery cylinder must not be filled after its requalification (hydrostatic retest) date has passed; the period is a setting (5 years by default).",
  fix: "Empty the cylinder and send it for requalification, then record the new test date; until then do not fill it.",
  check(records, { index, asOf, settings }) {
    const hits: RuleHit[] = [];
    for (const cylinder of records.cylinders) {
      if (cylinder.status !== "in_service") continue;
      if (!cylinder.lastRequalifiedOn) {
        hits.push({
          recordType: "cylinder",
          recordId: cylinder.id,
          detail: `Cylinder ${cylinder.serial} has no requalification date on record`,
        });
        continue;
      }
      const due = requalificationDueOn(cylinder.lastRequalifiedOn, cylinder.requalificationYears ?? settings.requalificationYears);
      if (asOf < due) continue;
      const fillsAfter = (index.cylinderLedgers.get(cylinder.id) ?? []).filter((s) => s.entry.kind === "in" && s.entry.on >= due).length;
      const filled = fillsAfter ? `; filled ${fillsAfter} time${fillsAfter > 1 ? "s" : ""} since` : "";
      hits.push({
        recordType: "cylinder",
        recordId: cylinder.id,
        dueOn: due,
        detail: `Cylinder ${cylinder.serial} was due for requalification on ${due} (last tested ${cylinder.lastRequalifiedOn})${filled}`,
      });
    }
    return hits;
  },
};

export const cylinderMixedRefrigerants: AuditRule = {
  id: "CT-CYL-03",
  title: "Mixed refrigerants in a recovery cylinder",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "Common practice: one refrigerant per recovery cylinder (a mixture cannot be reclaimed to AHRI 700)",
  explanation: "Each recovery cylinder holds one refrigerant; a mixture has to be destroyed instead of reclaimed.",
  fix: "Label the cylinder as mixed refrigerant, ship it for destruction or separation, and keep refrigerants apart from now on.",
  check(records, { index }) {
    const hits: RuleHit[] = [];
    for (const cylinder of records.cylinders) {
      for (const step of index.cylinderLedgers.get(cylinder.id) ?? []) {
        const e = step.entry;
        if (!step.mixedInto || e.kind !== "in") continue;
        hits.push({
          recordType: "job",
          recordId: e.jobId,
          qualifier: `cylinder-${cylinder.id}`,
          on: e.on,
          detail: `Recovered ${index.mass(e.amountG)} ${e.refrigerant} into cylinder ${cylinder.serial}, which already held ${index.mass(step.mixedInto.netG)} ${step.mixedInto.refrigerant}`,
        });
      }
    }
    return hits;
  },
};

export const cylinderNonCondensables: AuditRule = {
  id: "CT-CYL-04",
  title: "Suspected non-condensables in a recovery cylinder",
  severity: "minor",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "Common practice: pressure–temperature check (EPA Section 608 training); AHRI 700 non-condensables limit",
  explanation:
    "A settled cylinder reading clearly above the refrigerant's saturation pressure at its temperature suggests air or other non-condensables; the tolerance is a setting.",
  fix: "Let the cylinder settle to room temperature and read again; if still high, purge non-condensables with recovery-grade equipment or tell the reclaimer.",
  check(records, { index }) {
    const hits: RuleHit[] = [];
    for (const cylinder of records.cylinders) {
      for (const step of index.cylinderLedgers.get(cylinder.id) ?? []) {
        const e = step.entry;
        if (e.kind !== "weighing" || step.pressureCheck?.status !== "non_condensables_suspected") continue;
        hits.push({
          recordType: "cylinder",
          recordId: cylinder.id,
          qualifier: `weighing-${e.weighingId}`,
          on: e.on,
          detail: `Cylinder ${cylinder.serial} on ${e.on}: ${step.pressureCheck.reason}`,
        });
      }
    }
    return hits;
  },
};
