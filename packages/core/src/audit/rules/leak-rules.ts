import { chronicLeakTest, nextInspectionDueOn, periodicInspectionPlan } from "../../leak-rate/leak-deadlines";
import { leakRateThreshold, leakRepairRegime, type LeakRegime } from "../../leak-rate/leak-repair-regime";
import { addDays, addMonths, yearOf } from "../../dates/local-date";
import type { AuditContext, AuditRule, RuleHit } from "../finding";
import type { LeakEpisode } from "../leak-analysis";
import { firstOnOrAfter } from "../record-index";
import type { Appliance } from "../records";
import { applianceWords } from "./rule-helpers";

const CITATION: Record<LeakRegime, string> = {
  us_608_ods: "40 CFR 82.157",
  us_608_substitute: "40 CFR 82.157 (2016 text)",
  us_aim_hfc: "40 CFR 84.106",
};

function* episodes(
  records: { appliances: Appliance[] },
  index: AuditContext["index"],
): Generator<{ appliance: Appliance; episode: LeakEpisode }> {
  for (const appliance of records.appliances) {
    const analysis = index.leaks(appliance);
    if (!analysis) continue;
    for (const episode of analysis.episodes) yield { appliance, episode };
  }
}

const rate = (e: LeakEpisode) => `leak rate ${e.percent.toFixed(1)} % on ${e.startOn} (threshold ${e.threshold} %)`;

export const leakAwaitingRepair: AuditRule = {
  id: "CT-LEAK-01",
  title: "Leak rate over threshold awaiting repair",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "40 CFR 82.157(d); 40 CFR 84.106",
  explanation:
    "When an addition shows a leak rate over the threshold for the appliance's use (10 % comfort cooling, 20 % commercial refrigeration, 30 % industrial process since 2019), the leak must be repaired within 30 days (120 with an industrial shutdown).",
  fix: "Repair the leak and log a leak-repair job before the due date, or write a retrofit/retirement plan.",
  check(records, { index, asOf }) {
    const hits: RuleHit[] = [];
    for (const { appliance, episode } of episodes(records, index)) {
      if (episode.repair || episode.retiredOn || asOf > episode.deadlines.repairDueOn) continue;
      hits.push({
        recordType: "appliance",
        recordId: appliance.id,
        qualifier: episode.startOn,
        citation: CITATION[episode.regime],
        dueOn: episode.deadlines.repairDueOn,
        detail: `${applianceWords(appliance)}: ${rate(episode)}; no repair recorded yet, due by ${episode.deadlines.repairDueOn}`,
      });
    }
    return hits;
  },
};

export const leakRepairOverdue: AuditRule = {
  id: "CT-LEAK-02",
  title: "Leak repair overdue",
  severity: "critical",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "40 CFR 82.157(d); 40 CFR 84.106",
  explanation:
    "The repair of a leak over the threshold was not done within 30 days (120 days where an industrial-process shutdown is needed).",
  fix: "Repair the leak now and log it; if it cannot be repaired, write a retrofit or retirement plan and record it.",
  check(records, { index, asOf }) {
    const hits: RuleHit[] = [];
    for (const { appliance, episode } of episodes(records, index)) {
      if (episode.retiredOn) continue;
      const due = episode.deadlines.repairDueOn;
      const base = {
        recordType: "appliance" as const,
        recordId: appliance.id,
        qualifier: episode.startOn,
        citation: CITATION[episode.regime],
        dueOn: due,
      };
      if (!episode.repair && asOf > due) {
        hits.push({ ...base, detail: `${applianceWords(appliance)}: ${rate(episode)}; no repair recorded, due by ${due}` });
      } else if (episode.repair && episode.repair.performedOn > due) {
        hits.push({
          ...base,
          on: episode.repair.performedOn,
          detail: `${applianceWords(appliance)}: ${rate(episode)}; repaired on ${episode.repair.performedOn}, after the ${due} deadline`,
        });
      }
    }
    return hits;
  },
};

export const verificationTestMissing: AuditRule = {
  id: "CT-LEAK-03",
  title: "Verification test missing or late",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "2019-01-01",
  effectiveUntil: null,
  citation: "40 CFR 82.157(e); 40 CFR 84.106",
  explanation:
    "A leak repair needs an initial verification test within the repair window and a follow-up verification test within 10 days of a successful initial test.",
  fix: "Perform the missing verification test and log it as a verification-test job (initial or follow-up, passed or not).",
  check(records, { index, asOf }) {
    const hits: RuleHit[] = [];
    for (const { appliance, episode } of episodes(records, index)) {
      if (!episode.repair) continue;
      const base = { recordType: "appliance" as const, recordId: appliance.id, citation: CITATION[episode.regime] };
      const initialDue = episode.deadlines.initialVerificationDueOn;
      if (!episode.initialTest) {
        if (asOf > initialDue)
          hits.push({
            ...base,
            qualifier: `${episode.startOn}:initial`,
            dueOn: initialDue,
            detail: `${applianceWords(appliance)}: no passed initial verification test after the repair of ${episode.repair.performedOn}; due by ${initialDue}`,
          });
        continue;
      }
      if (episode.initialTest.performedOn > initialDue) {
        hits.push({
          ...base,
          qualifier: `${episode.startOn}:initial`,
          dueOn: initialDue,
          on: episode.initialTest.performedOn,
          detail: `${applianceWords(appliance)}: initial verification test on ${episode.initialTest.performedOn}, after the ${initialDue} deadline`,
        });
      }
      const followDue = episode.followUpDueOn as string;
      if (!episode.followUpTest) {
        if (asOf > followDue)
          hits.push({
            ...base,
            qualifier: `${episode.startOn}:follow-up`,
            dueOn: followDue,
            detail: `${applianceWords(appliance)}: no passed follow-up verification test after the initial test of ${episode.initialTest.performedOn}; due by ${followDue}`,
          });
      } else if (episode.followUpTest.performedOn > followDue) {
        hits.push({
          ...base,
          qualifier: `${episode.startOn}:follow-up`,
          dueOn: followDue,
          on: episode.followUpTest.performedOn,
          detail: `${applianceWords(appliance)}: follow-up verification test on ${episode.followUpTest.performedOn}, after the ${followDue} deadline`,
        });
      }
    }
    return hits;
  },
};

export const chronicLeakerNotReported: AuditRule = {
  id: "CT-LEAK-04",
  title: "Chronic leaker not reported",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "2019-01-01",
  effectiveUntil: null,
  citation: "40 CFR 82.157(j); 40 CFR 84.106",
  explanation:
    "An appliance that leaks 125 % or more of its full charge in one calendar year must be reported to EPA by 1 March of the following year.",
  fix: "Submit the chronic-leak report to EPA and record the submission date.",
  check(records, { index }) {
    const hits: RuleHit[] = [];
    for (const appliance of records.appliances) {
      const analysis = index.leaks(appliance);
      if (!analysis || appliance.fullChargeG === null) continue;
      const lastAdditionInYear = new Map<number, string>();
      for (const a of analysis.additions) {
        const y = yearOf(a.on);
        const prev = lastAdditionInYear.get(y);
        if (!prev || a.on > prev) lastAdditionInYear.set(y, a.on);
      }
      for (const [year, lastOn] of [...lastAdditionInYear].sort((a, b) => a[0] - b[0])) {
        const regime = leakRepairRegime({
          refrigerant: appliance.refrigerant,
          fullChargeG: appliance.fullChargeG,
          category: appliance.category,
          on: lastOn,
        }).regime;
        if (!regime) continue;
        const test = chronicLeakTest(appliance.fullChargeG, analysis.additions, year);
        if (!test.chronic || index.chronicReports.has(`${appliance.id}:${year}`)) continue;
        hits.push({
          recordType: "appliance",
          recordId: appliance.id,
          qualifier: String(year),
          citation: CITATION[regime],
          dueOn: test.reportDueOn,
          detail: `${applianceWords(appliance)}: ${index.mass(test.totalAddedG)} added in ${year}, ${test.percentOfCharge.toFixed(0)} % of its ${index.mass(appliance.fullChargeG)} charge; no report recorded (due by ${test.reportDueOn})`,
        });
      }
    }
    return hits;
  },
};

export const periodicInspectionOverdue: AuditRule = {
  id: "CT-LEAK-05",
  title: "Periodic leak inspection overdue",
  severity: "minor",
  pack: "us_federal",
  effectiveFrom: "2019-01-01",
  effectiveUntil: null,
  citation: "40 CFR 82.157(g); 40 CFR 84.106",
  explanation:
    "After an exceedance, appliances without automatic leak detection need periodic leak inspections: quarterly for commercial or industrial refrigeration of 500 lb or more, otherwise once a year, until the leak rate stays below the threshold (four quarters or one year).",
  fix: "Inspect the appliance for leaks and record the inspection.",
  check(records, { index, asOf }) {
    const hits: RuleHit[] = [];
    for (const appliance of records.appliances) {
      const analysis = index.leaks(appliance);
      const last = analysis?.episodes[analysis.episodes.length - 1];
      if (!analysis || !last || appliance.status !== "in_service" || appliance.fullChargeG === null) continue;
      const plan = periodicInspectionPlan({
        useClass: analysis.useClass,
        fullChargeG: appliance.fullChargeG,
        regime: last.regime,
        hasAutomaticLeakDetection: appliance.hasLeakDetectionSystem ?? false,
      });
      if (!plan.interval) continue;
      // Inspections are owed for the 12 months after the exceedance (assumes the rate then stays below).
      const windowEnd = addMonths(last.startOn, 12);
      const inspections = index.inspectionsByAppliance.get(appliance.id) ?? [];
      let base = last.startOn;
      for (let guard = 0; guard < 4; guard++) {
        const due = nextInspectionDueOn(base, plan.interval);
        if (due > windowEnd || due >= asOf) break;
        const next = inspections[firstOnOrAfter(inspections, addDays(base, 1), (x) => x.on)];
        if (!next || next.on > due) {
          hits.push({
            recordType: "appliance",
            recordId: appliance.id,
            qualifier: `${last.startOn}:${due}`,
            citation: CITATION[last.regime],
            dueOn: due,
            detail: `${applianceWords(appliance)}: ${plan.interval} leak inspection due by ${due} (after the exceedance of ${last.startOn}) is not recorded`,
          });
          break;
        }
        base = next.on;
      }
    }
    return hits;
  },
};

export const leakRateChargeUnknown: AuditRule = {
  id: "CT-LEAK-06",
  title: "Leak rate cannot be calculated: full charge not recorded",
  severity: "major",
  pack: "us_federal",
  effectiveFrom: "1993-07-13",
  effectiveUntil: null,
  citation: "40 CFR 82.152 (full charge; leak rate); 40 CFR 82.157(c); 40 CFR 84.106",
  explanation:
    "The leak rate is calculated every time refrigerant is added, as a share of the appliance's full charge. Without a recorded full charge the rate cannot be shown to be under the threshold, so the repair, verification, chronic-leak and inspection duties cannot be checked; the appliance is treated as covered until the charge is recorded.",
  fix: "Determine the full charge (nameplate, manufacturer data, calculation or measurement), record it and its method on the appliance; the leak rates are then calculated.",
  check(records, { index }) {
    const hits: RuleHit[] = [];
    for (const appliance of records.appliances) {
      const analysis = index.leaks(appliance);
      if (!analysis?.chargeUnknown) continue;
      const byDate = new Map<string, number>();
      for (const a of analysis.additions) if (!a.excluded) byDate.set(a.on, (byDate.get(a.on) ?? 0) + a.amountG);
      for (const [on, addedG] of [...byDate].sort((x, y) => (x[0] < y[0] ? -1 : 1))) {
        const r = leakRepairRegime({ refrigerant: appliance.refrigerant, fullChargeG: null, category: appliance.category, on });
        if (!r.regime) continue;
        hits.push({
          recordType: "appliance",
          recordId: appliance.id,
          qualifier: on,
          on,
          citation: CITATION[r.regime],
          detail: `${applianceWords(appliance)}: ${index.mass(addedG)} added on ${on}, but no full charge is recorded, so the leak rate cannot be calculated and a rate over the ${leakRateThreshold(analysis.useClass, on)} % threshold cannot be ruled out`,
        });
      }
    }
    return hits;
  },
};
