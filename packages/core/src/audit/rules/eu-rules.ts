import { addMonths } from "../../dates/local-date";
import { euLeakCheckInterval, type EuLeakCheckResult } from "../../eu/eu-leak-checks";
import { gramsToKg } from "../../units/mass";
import type { AuditRule, RuleHit } from "../finding";
import type { Appliance } from "../records";
import { applianceWords } from "./rule-helpers";

function interval(a: Appliance): EuLeakCheckResult | null {
  if (a.status !== "in_service" || a.fullChargeG === null) return null;
  try {
    return euLeakCheckInterval({
      refrigerant: a.refrigerant,
      chargeKg: gramsToKg(a.fullChargeG),
      hasLeakDetectionSystem: a.hasLeakDetectionSystem ?? false,
      hermeticallySealed: a.hermeticallySealedLabelled ?? false,
    });
  } catch {
    return null;
  }
}

export const euLeakCheckOverdue: AuditRule = {
  id: "CT-EU-01",
  title: "EU leak check overdue",
  severity: "major",
  pack: "eu",
  effectiveFrom: "2024-03-11",
  effectiveUntil: null,
  citation: "Regulation (EU) 2024/573 Art. 5",
  explanation:
    "Equipment with 5 t CO2e or more of Annex I gases (or 1 kg or more of Annex II gases) is leak-checked every 12, 6 or 3 months by band, twice as long apart with a leak-detection system; hermetically sealed, labelled equipment below 10 t CO2e is exempt.",
  fix: "Carry out the leak check and record it.",
  check(records, { index, asOf }) {
    const hits: RuleHit[] = [];
    for (const appliance of records.appliances) {
      const r = interval(appliance);
      if (!r?.required || r.intervalMonths === null) continue;
      const inspections = index.inspectionsByAppliance.get(appliance.id) ?? [];
      const last = inspections.filter((x) => x.on <= asOf).pop();
      const base = last?.on ?? appliance.installedOn;
      if (!base) {
        hits.push({
          recordType: "appliance",
          recordId: appliance.id,
          detail: `${applianceWords(appliance)} (${r.reason}) has no leak check or installation date on record`,
        });
        continue;
      }
      const due = addMonths(base, r.intervalMonths);
      if (asOf <= due) continue;
      const since = last ? `last checked ${last.on}` : `installed ${base}, never checked`;
      hits.push({
        recordType: "appliance",
        recordId: appliance.id,
        dueOn: due,
        detail: `${applianceWords(appliance)}: ${r.reason}; ${since}, so a check was due by ${due}`,
      });
    }
    return hits;
  },
};

export const euLeakDetectionMissing: AuditRule = {
  id: "CT-EU-02",
  title: "EU leak-detection system required but not fitted",
  severity: "major",
  pack: "eu",
  effectiveFrom: "2024-03-11",
  effectiveUntil: null,
  citation: "Regulation (EU) 2024/573 Art. 6",
  explanation:
    "Equipment with 500 t CO2e or more of Annex I gases (100 kg or more of Annex II gases) must have a leak-detection system, itself checked at least every 12 months.",
  fix: "Fit a leak-detection system that alerts the operator or service company, and record it on the appliance.",
  check(records) {
    const hits: RuleHit[] = [];
    for (const appliance of records.appliances) {
      const r = interval(appliance);
      if (!r?.leakDetectionSystemRequired || appliance.hasLeakDetectionSystem) continue;
      const amount = r.co2eTonnes !== null ? `${r.co2eTonnes.toFixed(0)} t CO2e` : `${gramsToKg(appliance.fullChargeG ?? 0).toFixed(0)} kg`;
      hits.push({
        recordType: "appliance",
        recordId: appliance.id,
        detail: `${applianceWords(appliance)} holds ${amount} and has no leak-detection system recorded`,
      });
    }
    return hits;
  },
};
