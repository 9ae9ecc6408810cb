import { maxCylinderFill, type MaxFill } from "../cylinders/cylinder-fill";
import { checkCylinderPressure, type CylinderPressureCheck } from "../cylinders/check-cylinder-pressure";
import { normaliseDesignation } from "../refrigerants/normalise-designation";
import type { AuditSettings } from "../settings";
import { movementRefrigerant } from "./record-index";
import type { BranchRecords, Cylinder } from "./records";

/** What happened to a cylinder, in date order: fills, draws, shipments and weighings. */
export type LedgerEntry =
  | { kind: "in"; on: string; jobId: number; amountG: number; refrigerant: string | null }
  | { kind: "out"; on: string; jobId: number | null; shipmentId: number | null; amountG: number; refrigerant: string | null }
  | { kind: "weighing"; on: string; weighingId: number; grossG: number | null; temperatureF: number | null; pressurePsig: number | null };

export interface LedgerStep {
  entry: LedgerEntry;
  /** Net contents after the entry. */
  netAfterG: number;
  /** Refrigerant held after the entry (the first one, if mixed). */
  refrigerant: string | null;
  maxFill: MaxFill | null;
  /** Set on an "in" entry that put a second refrigerant in: what the cylinder held before. */
  mixedInto: { refrigerant: string; netG: number } | null;
  /** Set on a weighing with temperature and pressure. */
  pressureCheck: CylinderPressureCheck | null;
}

const ORDER = { in: 0, out: 1, weighing: 2 } as const;
const entryId = (e: LedgerEntry) => (e.kind === "in" ? e.jobId : e.kind === "out" ? (e.jobId ?? e.shipmentId ?? 0) : e.weighingId);

function safeMaxFill(cylinder: Cylinder, refrigerant: string | null, strict: boolean): MaxFill | null {
  if (!refrigerant || !(cylinder.waterCapacityG > 0)) return null;
  try {
    return maxCylinderFill({ waterCapacityG: cylinder.waterCapacityG, tareG: cylinder.tareG, refrigerant, strict130F: strict });
  } catch {
    return maxCylinderFill({ waterCapacityG: cylinder.waterCapacityG, tareG: cylinder.tareG, refrigerant, specificGravity: 1 });
  }
}

/**
 * Replays every cylinder's contents from its opening balance (linear in the number of movements after
 * one sort per cylinder). Same-day order: fills, then draws, then weighings; ties by record id.
 */
export function buildCylinderLedgers(records: BranchRecords, settings: AuditSettings): Map<number, LedgerStep[]> {
  const entries = new Map<number, LedgerEntry[]>();
  const push = (cylinderId: number, e: LedgerEntry) => {
    const list = entries.get(cylinderId);
    if (list) list.push(e);
    else entries.set(cylinderId, [e]);
  };
  for (const job of records.jobs) {
    // One entry per job, cylinder and direction: several movements of one job are summed.
    const sums = new Map<string, { cylinderId: number; direction: "recovered" | "charged"; amountG: number; refrigerant: string | null }>();
    for (const m of job.movements) {
      if (m.cylinderId === null) continue;
      const key = `${m.cylinderId}:${m.direction}`;
      const s = sums.get(key);
      if (s) s.amountG += m.amountG;
      else
        sums.set(key, { cylinderId: m.cylinderId, direction: m.direction, amountG: m.amountG, refrigerant: movementRefrigerant(job, m) });
    }
    for (const s of sums.values()) {
      if (s.direction === "recovered")
        push(s.cylinderId, { kind: "in", on: job.performedOn, jobId: job.id, amountG: s.amountG, refrigerant: s.refrigerant });
      else
        push(s.cylinderId, {
          kind: "out",
          on: job.performedOn,
          jobId: job.id,
          shipmentId: null,
          amountG: s.amountG,
          refrigerant: s.refrigerant,
        });
    }
  }
  for (const shipment of records.reclaimShipments) {
    const sums = new Map<number, { amountG: number; refrigerant: string }>();
    for (const line of shipment.lines) {
      if (line.cylinderId === null) continue;
      const s = sums.get(line.cylinderId);
      if (s) s.amountG += line.amountG;
      else sums.set(line.cylinderId, { amountG: line.amountG, refrigerant: normaliseDesignation(line.refrigerant) });
    }
    for (const [cylinderId, s] of sums) {
      push(cylinderId, {
        kind: "out",
        on: shipment.shippedOn,
        jobId: null,
        shipmentId: shipment.id,
        amountG: s.amountG,
        refrigerant: s.refrigerant,
      });
    }
  }
  for (const c of records.cylinders) {
    for (const w of c.weighings) {
      push(c.id, {
        kind: "weighing",
        on: w.on,
        weighingId: w.id,
        grossG: w.grossG,
        temperatureF: w.temperatureF,
        pressurePsig: w.pressurePsig,
      });
    }
  }
  const ledgers = new Map<number, LedgerStep[]>();
  for (const cylinder of records.cylinders) {
    const list = (entries.get(cylinder.id) ?? []).sort((a, b) => {
      if (a.on !== b.on) return a.on < b.on ? -1 : 1;
      if (a.kind !== b.kind) return ORDER[a.kind] - ORDER[b.kind];
      if (a.kind === "out" && b.kind === "out" && (a.jobId === null) !== (b.jobId === null)) return a.jobId === null ? 1 : -1;
      return entryId(a) - entryId(b);
    });
    let net = Math.max(0, cylinder.openingContents?.netG ?? 0);
    let refrigerant = net > 0 && cylinder.openingContents?.refrigerant ? normaliseDesignation(cylinder.openingContents.refrigerant) : null;
    let mixed = false;
    const steps: LedgerStep[] = [];
    for (const entry of list) {
      let mixedInto: LedgerStep["mixedInto"] = null;
      let pressureCheck: CylinderPressureCheck | null = null;
      if (entry.kind === "in") {
        if (net > 0 && refrigerant && entry.refrigerant && entry.refrigerant !== refrigerant) {
          mixedInto = { refrigerant, netG: net };
          mixed = true;
        }
        refrigerant = refrigerant ?? entry.refrigerant;
        net += entry.amountG;
      } else if (entry.kind === "out") {
        net -= entry.amountG;
      } else if (entry.grossG !== null) {
        net = entry.grossG - cylinder.tareG;
      }
      if (net <= 0) {
        net = Math.max(0, net);
        refrigerant = null;
        mixed = false;
      }
      if (entry.kind === "weighing" && entry.temperatureF !== null && entry.pressurePsig !== null && refrigerant && !mixed) {
        pressureCheck = checkCylinderPressure({
          refrigerant,
          temperatureF: entry.temperatureF,
          pressurePsig: entry.pressurePsig,
          tolerancePsi: settings.ptTolerancePsi,
        });
      }
      steps.push({
        entry,
        netAfterG: net,
        refrigerant,
        maxFill: safeMaxFill(cylinder, refrigerant, settings.strictFill130F),
        mixedInto,
        pressureCheck,
      });
    }
    ledgers.set(cylinder.id, steps);
  }
  return ledgers;
}
