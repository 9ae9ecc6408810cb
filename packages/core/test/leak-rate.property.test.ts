import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { addDays, leakRateHistory, type LeakRateMethod } from "../src/rules-core";

const additionsArb = fc.array(fc.record({ day: fc.integer({ min: 0, max: 800 }), amountG: fc.integer({ min: 1, max: 50_000 }) }), {
  minLength: 1,
  maxLength: 12,
});

describe("leak rate never falls when more is added on the same day", () => {
  for (const method of ["annualizing", "rolling_average"] as LeakRateMethod[]) {
    it(method, () => {
      fc.assert(
        fc.property(
          additionsArb,
          fc.nat(),
          fc.integer({ min: 1, max: 20_000 }),
          fc.integer({ min: 1_000, max: 500_000 }),
          (adds, pick, extra, charge) => {
            const additions = adds.map((a) => ({ on: addDays("2026-01-01", a.day), amountG: a.amountG }));
            const target = additions[pick % additions.length]!;
            const before = leakRateHistory({ fullChargeG: charge, method, additions });
            const after = leakRateHistory({ fullChargeG: charge, method, additions: [...additions, { on: target.on, amountG: extra }] });
            const b = before.find((e) => e.on === target.on)!.percent!;
            const a = after.find((e) => e.on === target.on)!.percent!;
            expect(a).toBeGreaterThan(b);
            // and no other day's rate falls
            for (const e of after) expect(e.percent!).toBeGreaterThanOrEqual(before.find((x) => x.on === e.on)!.percent! - 1e-9);
          },
        ),
      );
    });
  }
});

describe("additions marked as the same leak", () => {
  it("keep every gram counted once and never raise the rate's lower bound above the rate", () => {
    fc.assert(
      fc.property(additionsArb, fc.array(fc.nat(), { maxLength: 6 }), fc.integer({ min: 1_000, max: 500_000 }), (adds, links, charge) => {
        const additions = adds
          .map((a, i) => ({ on: addDays("2026-01-01", a.day), amountG: a.amountG, sourceId: i + 1 }))
          .sort((x, y) => (x.on < y.on ? -1 : x.on > y.on ? 1 : x.sourceId - y.sourceId));
        // Link some additions to an earlier one (same leak).
        const linked = additions.map((a, i) => {
          const pick = links[i % Math.max(1, links.length)];
          return i > 0 && pick !== undefined && pick % 2 === 0 ? { ...a, sameLeakAsJobId: additions[pick % i]!.sourceId } : a;
        });
        for (const method of ["annualizing", "rolling_average"] as LeakRateMethod[]) {
          const events = leakRateHistory({ fullChargeG: charge, method, additions: linked });
          expect(events.reduce((s, e) => s + e.addedG, 0)).toBe(additions.reduce((s, a) => s + a.amountG, 0));
          expect(new Set(events.flatMap((e) => e.sourceIds)).size).toBe(additions.length);
          for (const e of events) expect(e.percentLow!).toBeLessThanOrEqual(e.percent! + 1e-9);
        }
      }),
    );
  });
});
