import { normaliseDesignation } from "../refrigerants/normalise-designation";
import type { AuditSettings } from "../settings";
import { buildCylinderLedgers, type LedgerStep } from "./cylinder-ledger";
import { analyseLeaks, type ApplianceLeakAnalysis } from "./leak-analysis";
import { formatMass } from "../units/mass";
import type {
  Appliance,
  BranchRecords,
  Cylinder,
  DisposalRecord,
  DisposalStatement,
  Job,
  LeakInspection,
  RecoveryEquipment,
  Technician,
} from "./records";

/** Everything the rules look up, built once per audit so no rule scans a list inside a loop. */
export interface RecordIndex {
  appliances: Map<number, Appliance>;
  equipment: Map<number, RecoveryEquipment>;
  cylinders: Map<number, Cylinder>;
  technicians: Map<number, Technician>;
  /** All jobs sorted by date then id. */
  jobs: Job[];
  jobsByAppliance: Map<number, Job[]>;
  disposalRecordsByAppliance: Map<number, DisposalRecord[]>;
  statementsByAppliance: Map<number, DisposalStatement[]>;
  inspectionsByAppliance: Map<number, LeakInspection[]>;
  chronicReports: Set<string>;
  cylinderLedgers: Map<number, LedgerStep[]>;
  /** Leak-rate history and exceedance episodes per appliance (computed on first use, then kept). */
  leaks(appliance: Appliance): ApplianceLeakAnalysis | null;
  /** Formats grams in the branch's display unit. */
  mass(grams: number): string;
}

export const byDateThenId =
  <T extends { id: number }>(date: (x: T) => string) =>
  (a: T, b: T) => {
    const da = date(a);
    const db = date(b);
    return da < db ? -1 : da > db ? 1 : a.id - b.id;
  };

function group<T, K>(items: readonly T[], key: (x: T) => K): Map<K, T[]> {
  const m = new Map<K, T[]>();
  for (const item of items) {
    const k = key(item);
    const list = m.get(k);
    if (list) list.push(item);
    else m.set(k, [item]);
  }
  return m;
}

/** Index of the first element whose date is ≥ `date` in a list sorted by date (binary search). */
export function firstOnOrAfter<T>(sorted: readonly T[], date: string, dateOf: (x: T) => string): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (dateOf(sorted[mid] as T) < date) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export function buildRecordIndex(records: BranchRecords, settings: AuditSettings): RecordIndex {
  const jobs = [...records.jobs].sort(byDateThenId((j) => j.performedOn));
  const jobsByAppliance = group(
    jobs.filter((j) => j.applianceId !== null),
    (j) => j.applianceId as number,
  );
  const sortedInspections = [...records.leakInspections].sort(byDateThenId((x) => x.on));
  const leakCache = new Map<number, ApplianceLeakAnalysis | null>();
  const index: RecordIndex = {
    appliances: new Map(records.appliances.map((a) => [a.id, a])),
    equipment: new Map(records.recoveryEquipment.map((e) => [e.id, e])),
    cylinders: new Map(records.cylinders.map((c) => [c.id, c])),
    technicians: new Map(records.technicians.map((t) => [t.id, t])),
    jobs,
    jobsByAppliance,
    disposalRecordsByAppliance: group(
      [...records.disposalRecords].sort((a, b) => a.id - b.id),
      (d) => d.applianceId,
    ),
    statementsByAppliance: group(
      [...records.disposalStatements].sort((a, b) => a.id - b.id),
      (d) => d.applianceId,
    ),
    inspectionsByAppliance: group(sortedInspections, (x) => x.applianceId),
    chronicReports: new Set(records.chronicLeakReports.map((r) => `${r.applianceId}:${r.calendarYear}`)),
    cylinderLedgers: buildCylinderLedgers(records, settings),
    leaks: (appliance) => {
      if (!leakCache.has(appliance.id)) {
        leakCache.set(appliance.id, analyseLeaks(appliance, jobsByAppliance.get(appliance.id) ?? [], settings, records.branch.timeZone));
      }
      return leakCache.get(appliance.id) ?? null;
    },
    mass: (g) => formatMass(g, records.branch.massUnit, records.branch.massUnit === "kg" ? {} : { decimals: 1 }),
  };
  return index;
}

/** The refrigerant a movement carries, normalised ("r410a" → "R-410A"). */
export function movementRefrigerant(job: Job, movement: { refrigerant?: string | null }): string | null {
  const r = movement.refrigerant ?? job.refrigerant;
  return r ? normaliseDesignation(r) : null;
}
