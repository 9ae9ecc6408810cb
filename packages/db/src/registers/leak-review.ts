import type { Knex } from "knex";
import {
  analyseLeaks,
  chronicLeakTest,
  leakRateHistory,
  leakRepairRegime,
  type AdditionExclusion,
  type Appliance,
  type Job,
  type LeakRegime,
  type LeakRegimeResult,
  type RefrigerantAddition,
} from "@coldtrail/core";
import { RecordNotFoundError } from "../errors";
import { toBool, toNumOrNull } from "../types";
import { branchToday, dueState, loadOrganisationSettings, type DueState } from "./common";

/** One addition event on the leak-rate chart. */
export interface LeakChartEvent {
  on: string;
  addedG: number;
  excludedG: number;
  /** Leak rate in % (null when everything added that day was excluded). */
  percent: number | null;
  daysSinceLastAddition: number | null;
  /** What the interval runs from: the previous addition or the installation (null: none, 365 days used). */
  intervalStartsFrom: "addition" | "installation" | null;
  intervalStartOn: string | null;
  /** First addition of the event (earlier than `on` when additions for one leak were summed). */
  firstOn: string;
  /** The trigger rate in force that day, when a leak-repair rule covers the appliance then. */
  threshold: number | null;
  regime: LeakRegime | null;
  exceeds: boolean;
  jobIds: number[];
}

export type LeakDeadlineKind = "repair" | "initial_verification" | "follow_up_verification" | "chronic_report";

/** A duty that follows a leak rate over the threshold and is not yet met. */
export interface OpenLeakDeadline {
  kind: LeakDeadlineKind;
  dueOn: string;
  state: Exclude<DueState, "unknown">;
  /** Plain words: what to do and why. */
  text: string;
  citation: string;
}

export interface ApplianceLeakReview {
  today: string;
  method: "annualizing" | "rolling_average";
  /** Whether a leak-repair rule covers the appliance today, and why (not). */
  coverage: LeakRegimeResult;
  events: LeakChartEvent[];
  deadlines: OpenLeakDeadline[];
}

const EXCLUSION: Record<string, AdditionExclusion> = {
  retrofit: "retrofit",
  installation: "installation",
  seasonal: "seasonal_variance",
  seasonal_variance: "seasonal_variance",
};
const CHARGED = new Set(["charged_from_cylinder", "charged_from_stock"]);
const CITATION: Record<LeakRegime, string> = {
  us_608_ods: "40 CFR 82.157",
  us_608_substitute: "40 CFR 82.157 (2016 text)",
  us_aim_hfc: "40 CFR 84.106",
};

const pct = (n: number) => `${n.toFixed(1)} %`;

/**
 * The leak-rate history of one appliance, computed by the rules core from every charge added to it
 * (exclusions, verification tests and repairs included), and the leak-repair deadlines still open.
 * `visibleOn` hides events and deadlines dated where the reader may not read records (an
 * inspector's window). The caller has checked the reader may read the appliance.
 */
export async function reviewApplianceLeaks(
  db: Knex,
  opts: { organisationId: number; applianceId: number; now?: Date; visibleOn?: (date: string) => boolean },
): Promise<ApplianceLeakReview> {
  const a = await db("appliances as a")
    .join("branches as b", "b.id", "a.branch_id")
    .join("sites as s", "s.id", "a.site_id")
    .where({ "a.id": opts.applianceId, "a.organisation_id": opts.organisationId })
    .first("a.*", "b.time_zone", "s.name as site_name");
  if (!a) throw new RecordNotFoundError("No such appliance");
  const settings = await loadOrganisationSettings(db, opts.organisationId);
  const today = branchToday(a.time_zone, opts.now);
  const visible = opts.visibleOn ?? (() => true);

  const jobRows = await db("jobs")
    .where({ appliance_id: opts.applianceId, organisation_id: opts.organisationId })
    .whereNull("voided_at")
    .orderBy([{ column: "performed_on" }, { column: "id" }])
    .select(
      "id",
      "kind",
      "performed_on",
      "technician_id",
      "equipment_id",
      "refrigerant",
      "charged_g",
      "recovered_g",
      "addition_exclusion",
      "same_leak_as_job_id",
      "verification_stage",
      "verification_passed",
    );
  const movementRows = jobRows.length
    ? await db("refrigerant_movements")
        .whereIn(
          "job_id",
          jobRows.map((j) => j.id),
        )
        .whereNull("voided_at")
        .select("job_id", "direction", "mass_g", "cylinder_id", "refrigerant")
    : [];
  const movementsByJob = new Map<number, Job["movements"]>();
  for (const m of movementRows) {
    const direction = CHARGED.has(m.direction) ? "charged" : m.direction === "recovered_into_cylinder" ? "recovered" : null;
    if (!direction) continue;
    const list = movementsByJob.get(Number(m.job_id)) ?? [];
    list.push({ direction, amountG: Number(m.mass_g), cylinderId: toNumOrNull(m.cylinder_id), refrigerant: m.refrigerant });
    movementsByJob.set(Number(m.job_id), list);
  }
  const jobs: Job[] = jobRows.map((j) => {
    let movements = movementsByJob.get(Number(j.id)) ?? [];
    // A job whose movements were not itemised still carries its totals.
    if (movements.length === 0 && Number(j.charged_g) > 0)
      movements = [{ direction: "charged", amountG: Number(j.charged_g), cylinderId: null }];
    return {
      id: Number(j.id),
      kind: j.kind,
      performedOn: j.performed_on,
      technicianId: toNumOrNull(j.technician_id),
      applianceId: opts.applianceId,
      equipmentId: toNumOrNull(j.equipment_id),
      refrigerant: j.refrigerant ?? null,
      movements,
      evacuation: null,
      accessMethod: null,
      temporaryAccessRemoved: null,
      compressorOperating: null,
      additionExclusion: j.addition_exclusion ? (EXCLUSION[j.addition_exclusion] ?? null) : null,
      sameLeakAsJobId: toNumOrNull(j.same_leak_as_job_id),
      verification: j.verification_stage ? { stage: j.verification_stage, passed: toBool(j.verification_passed) } : null,
    };
  });

  const appliance: Appliance = {
    id: Number(a.id),
    label: a.tag,
    category: a.category,
    refrigerant: a.refrigerant,
    fullChargeG: Number(a.full_charge_g) || null,
    fullChargeMethod: a.full_charge_method ?? null,
    factorySealed: toBool(a.factory_sealed),
    status: a.status,
    statusChangedOn: a.disposed_on ?? a.retired_on ?? null,
    location: a.site_name ?? null,
    installedOn: a.installed_on ?? null,
    needsIndustrialShutdownForRepair: toBool(a.industrial_shutdown_needed),
    hasLeakDetectionSystem: toBool(a.has_leak_detection),
  };
  const coverage = leakRepairRegime({
    refrigerant: appliance.refrigerant,
    fullChargeG: appliance.fullChargeG,
    category: appliance.category,
    on: today,
  });
  const analysis = analyseLeaks(appliance, jobs, settings, a.time_zone);

  // Every addition, for the chart; covered events carry the threshold in force that day.
  const additions: RefrigerantAddition[] = analysis?.additions ?? [];
  if (!analysis) {
    for (const job of jobs) {
      for (const m of job.movements)
        if (m.direction === "charged")
          additions.push({
            on: job.performedOn,
            amountG: m.amountG,
            excluded: job.additionExclusion,
            sourceId: job.id,
            sameLeakAsJobId: job.sameLeakAsJobId ?? null,
          });
    }
  }
  const resets = jobs.filter((j) => j.verification?.stage === "follow_up" && j.verification.passed).map((j) => j.performedOn);
  const all =
    appliance.fullChargeG && appliance.fullChargeG > 0 && additions.length > 0
      ? leakRateHistory({
          fullChargeG: appliance.fullChargeG,
          additions,
          method: settings.leakRateMethod,
          followUpVerificationsPassedOn: resets,
          installedOn: appliance.installedOn,
        })
      : [];
  // Matched by the jobs an event sums, not by its date: two leak events can end on one day (an
  // addition for a new leak beside one marked as the same leak as an earlier charge).
  const dateOfSource = new Map(additions.map((a) => [a.sourceId, a.on]));
  const eventKey = (e: { on: string; sourceIds: readonly number[] }) =>
    `${e.on}|${e.sourceIds
      .filter((id) => dateOfSource.get(id) === e.on)
      .sort((x, y) => x - y)
      .join(",")}`;
  const covered = new Map((analysis?.events ?? []).map((c) => [eventKey(c.event), c]));
  const events: LeakChartEvent[] = all
    .filter((e) => visible(e.on))
    .map((e) => {
      const c = covered.get(eventKey(e));
      const event = c?.event ?? e;
      return {
        on: e.on,
        addedG: event.addedG,
        excludedG: event.excludedG,
        percent: event.percent,
        daysSinceLastAddition: event.daysSinceLastAddition,
        intervalStartsFrom: event.intervalStartsFrom,
        intervalStartOn: event.intervalStartOn,
        firstOn: event.firstOn,
        threshold: c?.threshold ?? null,
        regime: c?.regime ?? null,
        exceeds: c?.exceeds ?? false,
        jobIds: e.sourceIds,
      };
    });

  const deadlines: OpenLeakDeadline[] = [];
  const add = (kind: LeakDeadlineKind, dueOn: string, text: string, citation: string) => {
    const state = dueState(dueOn, today);
    deadlines.push({ kind, dueOn, state: state === "unknown" ? "current" : state, text, citation });
  };
  for (const ep of analysis?.episodes ?? []) {
    if (!visible(ep.startOn) || ep.retiredOn) continue;
    const found = `leak rate ${pct(ep.percent)} over the ${ep.threshold} % threshold on ${ep.startOn}`;
    const citation = CITATION[ep.regime];
    if (!ep.repair) {
      add(
        "repair",
        ep.deadlines.repairDueOn,
        `Repair the leak (${found}). If it cannot be repaired in time, a retrofit or retirement plan is due by ${ep.deadlines.retrofitPlanDueOn}.`,
        citation,
      );
    } else if (!ep.initialTest) {
      add(
        "initial_verification",
        ep.deadlines.initialVerificationDueOn,
        `Initial verification test of the repair made on ${ep.repair.performedOn} (${found}).`,
        citation,
      );
    } else if (!ep.followUpTest && ep.followUpDueOn) {
      add(
        "follow_up_verification",
        ep.followUpDueOn,
        `Follow-up verification test after the initial test passed on ${ep.initialTest.performedOn}.`,
        citation,
      );
    }
  }
  if (analysis && appliance.fullChargeG) {
    // Chronic leaker (≥ 125 % of the full charge added in a calendar year): reported by 1 March next year.
    const year = Number(today.slice(0, 4));
    for (const y of [year - 1, year]) {
      const coveredThatYear = analysis.events.some((c) => c.event.on.startsWith(`${y}-`));
      if (!coveredThatYear) continue;
      const chronic = chronicLeakTest(appliance.fullChargeG, analysis.additions, y);
      if (chronic.chronic && visible(`${y}-12-31`)) {
        add(
          "chronic_report",
          chronic.reportDueOn,
          `Chronic leaker: ${pct(chronic.percentOfCharge)} of the full charge was added in ${y}. A report is due unless it has already been sent.`,
          "40 CFR 82.157(j); 40 CFR 84.106",
        );
      }
    }
  }
  deadlines.sort((x, y) => (x.dueOn < y.dueOn ? -1 : x.dueOn > y.dueOn ? 1 : 0));
  return { today, method: settings.leakRateMethod, coverage, events, deadlines };
}
