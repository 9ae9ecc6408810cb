import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { runAudit, type BranchRecords } from "../src/rules-core";
import { job, lb, sampleBranch } from "./fixtures/sample-branch";

function shuffle<T>(items: readonly T[], rand: () => number): T[] {
  const a = [...items];
  for (let i = a.length - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [a[i], a[j]] = [a[j]!, a[i]!];
  }
  return a;
}

function mulberry32(seed: number): () => number {
  let t = seed >>> 0;
  return () => {
    t = (t + 0x6d2b79f5) >>> 0;
    let r = Math.imul(t ^ (t >>> 15), 1 | t);
    r = (r + Math.imul(r ^ (r >>> 7), 61 | r)) ^ r;
    return ((r ^ (r >>> 14)) >>> 0) / 4294967296;
  };
}

function shuffled(records: BranchRecords, seed: number): BranchRecords {
  const rand = mulberry32(seed);
  return {
    ...records,
    appliances: shuffle(records.appliances, rand),
    recoveryEquipment: shuffle(records.recoveryEquipment, rand),
    cylinders: shuffle(
      records.cylinders.map((c) => ({ ...c, weighings: shuffle(c.weighings, rand) })),
      rand,
    ),
    jobs: shuffle(
      records.jobs.map((j) => ({ ...j, movements: shuffle(j.movements, rand) })),
      rand,
    ),
    technicians: shuffle(
      records.technicians.map((t) => ({ ...t, certifications: shuffle(t.certifications, rand) })),
      rand,
    ),
    disposalRecords: shuffle(records.disposalRecords, rand),
    disposalStatements: shuffle(records.disposalStatements, rand),
    reclaimShipments: shuffle(
      records.reclaimShipments.map((s) => ({ ...s, lines: shuffle(s.lines, rand) })),
      rand,
    ),
    purchases: shuffle(records.purchases, rand),
    stockCounts: shuffle(records.stockCounts, rand),
    leakInspections: shuffle(records.leakInspections, rand),
    chronicLeakReports: shuffle(records.chronicLeakReports, rand),
  };
}

const options = { packs: ["us_federal", "eu"] as const, period: { from: "2025-01-01", to: "2026-12-31" }, asOf: "2026-06-30" };

describe("the audit engine is order-independent in its input", () => {
  it("gives the same findings, in the same order, for shuffled records", () => {
    const extraCharges = fc.array(
      fc.record({
        day: fc.integer({ min: 0, max: 170 }),
        appliance: fc.constantFrom(1, 3, 9),
        amount: fc.integer({ min: 1, max: 40 }),
        cylinder: fc.constantFrom(null, 10, 12),
      }),
      { maxLength: 15 },
    );
    fc.assert(
      fc.property(extraCharges, fc.integer(), (extra, seed) => {
        const records = sampleBranch();
        extra.forEach((e, i) => {
          const on = new Date(Date.UTC(2026, 0, 1 + e.day)).toISOString().slice(0, 10);
          records.jobs.push(
            job({
              id: 1000 + i,
              kind: "charge",
              performedOn: on,
              applianceId: e.appliance,
              refrigerant: e.appliance === 1 ? "R-410A" : "R-404A",
              movements: [{ direction: "charged", amountG: lb(e.amount), cylinderId: e.cylinder }],
            }),
          );
        });
        const base = runAudit(records, { ...options, packs: [...options.packs] });
        expect(runAudit(shuffled(records, seed), { ...options, packs: [...options.packs] })).toEqual(base);
      }),
      { numRuns: 60 },
    );
  });
});
