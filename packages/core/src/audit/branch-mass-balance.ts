import { massBalance, type MassBalanceResult } from "../mass-balance";
import { normaliseDesignation } from "../refrigerants/normalise-designation";
import type { AuditSettings } from "../settings";
import type { AuditPeriod } from "./finding";
import { movementRefrigerant } from "./record-index";
import type { BranchRecords } from "./records";

export interface RefrigerantBalanceRow extends MassBalanceResult {
  refrigerant: string;
  purchasedG: number;
  recoveredG: number;
  chargedG: number;
  shippedG: number;
  openingStockG: number | null;
  closingStockG: number | null;
}

/**
 * Mass balance per refrigerant for a branch over a period (dates inclusive). Opening stock is the
 * latest count on or before `from`; closing stock the latest count on or before `to` (if later than
 * the opening count). Rows sorted by refrigerant.
 */
export function branchMassBalance(records: BranchRecords, period: AuditPeriod, settings: AuditSettings): RefrigerantBalanceRow[] {
  const rows = new Map<string, { purchasedG: number; recoveredG: number; chargedG: number; shippedG: number }>();
  const row = (r: string) => {
    const key = normaliseDesignation(r);
    let x = rows.get(key);
    if (!x) rows.set(key, (x = { purchasedG: 0, recoveredG: 0, chargedG: 0, shippedG: 0 }));
    return x;
  };
  const inPeriod = (d: string) => d >= period.from && d <= period.to;
  for (const p of records.purchases) if (inPeriod(p.on)) row(p.refrigerant).purchasedG += p.amountG;
  for (const job of records.jobs) {
    if (!inPeriod(job.performedOn)) continue;
    for (const m of job.movements) {
      const r = movementRefrigerant(job, m);
      if (!r) continue;
      if (m.direction === "recovered") row(r).recoveredG += m.amountG;
      else row(r).chargedG += m.amountG;
    }
  }
  for (const s of records.reclaimShipments) {
    if (!inPeriod(s.shippedOn)) continue;
    for (const line of s.lines) row(line.refrigerant).shippedG += line.amountG;
  }
  const opening = new Map<string, { on: string; id: number; netG: number }>();
  const closing = new Map<string, { on: string; id: number; netG: number }>();
  const later = (a: { on: string; id: number } | undefined, b: { on: string; id: number }) =>
    !a || b.on > a.on || (b.on === a.on && b.id > a.id);
  for (const c of records.stockCounts) {
    const key = normaliseDesignation(c.refrigerant);
    if (c.on <= period.from && later(opening.get(key), c)) opening.set(key, c);
    if (c.on <= period.to && later(closing.get(key), c)) closing.set(key, c);
  }
  return [...rows.keys()].sort().map((refrigerant) => {
    const x = rows.get(refrigerant)!;
    const open = opening.get(refrigerant);
    const close = closing.get(refrigerant);
    const openingStockG = open?.netG ?? (close ? 0 : null);
    const closingStockG = close ? close.netG : null;
    const result = massBalance(
      { ...x, openingStockG, closingStockG },
      { percent: settings.massBalanceTolerancePercent, minimumG: settings.massBalanceToleranceG },
    );
    return { refrigerant, ...x, openingStockG, closingStockG, ...result };
  });
}
