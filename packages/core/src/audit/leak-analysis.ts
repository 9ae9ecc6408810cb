import type { IsoDate } from "../dates/local-date";
import { leakDeadlines, followUpVerificationDueOn, type LeakDeadlines } from "../leak-rate/leak-deadlines";
import { leakRateHistory, type LeakRateEvent, type RefrigerantAddition } from "../leak-rate/leak-rate";
import {
  CATEGORY_LEAK_RULES,
  eventExceedsThreshold,
  LEAK_REGIME_THRESHOLDS,
  leakRateThreshold,
  leakRepairRegime,
  type LeakRegime,
  type LeakUseClass,
} from "../leak-rate/leak-repair-regime";
import type { AuditSettings } from "../settings";
import { firstOnOrAfter } from "./record-index";
import type { Appliance, Job } from "./records";

export interface LeakEpisode {
  startOn: IsoDate;
  percent: number;
  threshold: number;
  regime: LeakRegime;
  deadlines: LeakDeadlines;
  repair: Job | null;
  initialTest: Job | null;
  followUpTest: Job | null;
  /** 10 days after a passed initial test. */
  followUpDueOn: IsoDate | null;
  /** Appliance retired or disposed before the repair was due (retirement ends the repair duty). */
  retiredOn: IsoDate | null;
}

export interface CoveredEvent {
  event: LeakRateEvent;
  regime: LeakRegime;
  threshold: number;
  exceeds: boolean;
}

export interface ApplianceLeakAnalysis {
  useClass: LeakUseClass;
  /** No full charge is recorded: no rate can be calculated, so `events` and `episodes` are empty. */
  chargeUnknown: boolean;
  events: CoveredEvent[];
  episodes: LeakEpisode[];
  additions: RefrigerantAddition[];
}

const onOf = (j: Job) => j.performedOn;

/**
 * Leak-rate events, exceedance episodes and their repair / verification jobs for one appliance.
 * Jobs arrive sorted by date then id. An episode opens at the first addition over the threshold and
 * is closed by the first leak-repair job on or after that date; later exceedances open a new one.
 */
export function analyseLeaks(
  appliance: Appliance,
  jobs: readonly Job[],
  settings: AuditSettings,
  timeZone: string,
): ApplianceLeakAnalysis | null {
  const useClass = CATEGORY_LEAK_RULES[appliance.category].useClass;
  if (!useClass) return null;
  const additions: RefrigerantAddition[] = [];
  const repairs: Job[] = [];
  const initialTests: Job[] = [];
  const followUps: Job[] = [];
  for (const job of jobs) {
    for (const m of job.movements) {
      if (m.direction === "charged")
        additions.push({
          on: job.performedOn,
          amountG: m.amountG,
          excluded: job.additionExclusion,
          sourceId: job.id,
          sameLeakAsJobId: job.sameLeakAsJobId ?? null,
        });
    }
    if (job.kind === "leak_repair") repairs.push(job);
    if (job.kind === "verification_test" && job.verification?.passed) {
      (job.verification.stage === "initial" ? initialTests : followUps).push(job);
    }
  }
  if (!appliance.fullChargeG || appliance.fullChargeG <= 0) {
    return { useClass, chargeUnknown: true, events: [], episodes: [], additions };
  }
  const resets = followUps.map(onOf);
  const base = {
    fullChargeG: appliance.fullChargeG,
    additions,
    method: settings.leakRateMethod,
    followUpVerificationsPassedOn: resets,
    installedOn: appliance.installedOn,
  };
  const all = leakRateHistory(base);
  // Events are matched by their date and the additions made on that date: two leak events can end on
  // one day (a new leak beside an addition marked as the same leak as an earlier one).
  const dateOfSource = new Map(additions.map((a) => [a.sourceId, a.on]));
  const keyOf = (e: { on: string; sourceIds: readonly number[] }) =>
    `${e.on}|${e.sourceIds
      .filter((id) => dateOfSource.get(id) === e.on)
      .sort((x, y) => x - y)
      .join(",")}`;
  const aim = new Map(leakRateHistory({ ...base, countFrom: LEAK_REGIME_THRESHOLDS.aimFrom }).map((e) => [keyOf(e), e]));
  const events: CoveredEvent[] = [];
  for (const e of all) {
    const r = leakRepairRegime({
      refrigerant: appliance.refrigerant,
      fullChargeG: appliance.fullChargeG,
      category: appliance.category,
      on: e.on,
    });
    if (!r.regime) continue;
    const event = r.regime === "us_aim_hfc" ? (aim.get(keyOf(e)) ?? e) : e;
    if (event.percent === null) continue;
    const threshold = leakRateThreshold(useClass, e.on);
    events.push({ event, regime: r.regime, threshold, exceeds: eventExceedsThreshold(event, threshold) });
  }
  const episodes: LeakEpisode[] = [];
  let openUntil: IsoDate | null = null; // exceedances up to this date belong to the current episode
  let open = false;
  for (const c of events) {
    if (!c.exceeds) continue;
    if (open && (openUntil === null || c.event.on <= openUntil)) continue;
    const startOn = c.event.on;
    const deadlines = leakDeadlines({
      exceededOn: startOn,
      timeZone,
      useClass,
      needsIndustrialShutdown: appliance.needsIndustrialShutdownForRepair ?? false,
    });
    const repair = repairs[firstOnOrAfter(repairs, startOn, onOf)] ?? null;
    const after = repair ? repair.performedOn : null;
    const initialTest = after ? (initialTests[firstOnOrAfter(initialTests, after, onOf)] ?? null) : null;
    const followUpTest = initialTest ? (followUps[firstOnOrAfter(followUps, initialTest.performedOn, onOf)] ?? null) : null;
    const retiredOn =
      appliance.status !== "in_service" &&
      appliance.statusChangedOn &&
      appliance.statusChangedOn >= startOn &&
      appliance.statusChangedOn <= deadlines.repairDueOn
        ? appliance.statusChangedOn
        : null;
    episodes.push({
      startOn,
      percent: c.event.percent as number,
      threshold: c.threshold,
      regime: c.regime,
      deadlines,
      repair,
      initialTest,
      followUpTest,
      followUpDueOn: initialTest ? followUpVerificationDueOn(initialTest.performedOn, timeZone) : null,
      retiredOn,
    });
    open = true;
    openUntil = repair ? repair.performedOn : null;
  }
  return { useClass, chargeUnknown: false, events, episodes, additions };
}
