import { describe, expect, it } from "vitest";
import { chargeKgForCo2e, co2eTonnes, euLeakCheckInterval, getRefrigerant, gramsToKg, mixtureGwp, toGrams } from "@coldtrail/core";

const gwp = (d: string) => getRefrigerant(d)!.gwp.eu!;

describe("CO2e and EU leak checks (REFERENCE.md §7.1)", () => {
  it("EU1: charges that make 5 t CO2e", () => {
    expect(chargeKgForCo2e(5, gwp("R-410A"))).toBeCloseTo(2.39, 2); // Source: gov.uk "Checking F gas equipment for leaks" [S21]
    expect(chargeKgForCo2e(5, gwp("R-404A"))).toBeCloseTo(1.27, 2); // Source: [S21] (gov.uk rounds to 1.3); COMPUTED 1.27
    expect(chargeKgForCo2e(5, gwp("R-134a"))).toBeCloseTo(3.5, 2); // Source: [S21]
    expect(chargeKgForCo2e(5, gwp("R-23"))).toBeCloseTo(0.3, 1); // Source: [S21] (HFC-23 0.3)
    expect(chargeKgForCo2e(5, gwp("R-227ea"))).toBeCloseTo(1.6, 1); // Source: [S21] (HFC-227ea 1.6)
  });
  it("EU2: charges that make 50 t and 500 t", () => {
    expect(chargeKgForCo2e(50, gwp("R-410A"))).toBeCloseTo(23.95, 2); // Source: [S21] (24), COMPUTED 23.95
    expect(chargeKgForCo2e(500, gwp("R-410A"))).toBeCloseTo(239.5, 1); // Source: [S21] (240), COMPUTED 239.5
    expect(chargeKgForCo2e(50, gwp("R-404A"))).toBeCloseTo(12.75, 2); // Source: [S21] (13), COMPUTED
    expect(chargeKgForCo2e(500, gwp("R-404A"))).toBeCloseTo(127.5, 1); // Source: [S21] (127), COMPUTED
    expect(chargeKgForCo2e(50, gwp("R-134a"))).toBeCloseTo(34.97, 2); // Source: [S21] (35), COMPUTED
    expect(chargeKgForCo2e(500, gwp("R-134a"))).toBeCloseTo(349.7, 1); // Source: [S21] (350), COMPUTED
  });
  it("EU3: 2.39 kg R-410A is 4.990 t, below 5 t: no mandatory check (unrounded comparison)", () => {
    const r = euLeakCheckInterval({ refrigerant: "R-410A", chargeKg: 2.39 });
    expect(r.co2eTonnes).toBeCloseTo(4.99, 3); // Source: REFERENCE.md §7.1 EU3, COMPUTED
    expect(r.required).toBe(false);
  });
  it("EU4: 2.40 kg R-410A is 5.011 t: every 12 months", () => {
    const r = euLeakCheckInterval({ refrigerant: "R-410A", chargeKg: 2.4 });
    expect(r.co2eTonnes).toBeCloseTo(5.011, 3); // Source: REFERENCE.md §7.1 EU4, COMPUTED
    expect(r.intervalMonths).toBe(12); // Source: 517/2014 Art. 4 bands [S21]
  });
  it("EU5: 10 kg R-404A is 39.22 t: 12 months, 24 with a leak-detection system", () => {
    expect(co2eTonnes(10, gwp("R-404A"))).toBeCloseTo(39.22, 2); // Source: REFERENCE.md §7.1 EU5
    expect(euLeakCheckInterval({ refrigerant: "R-404A", chargeKg: 10 }).intervalMonths).toBe(12); // Source: [S21]
    expect(euLeakCheckInterval({ refrigerant: "R-404A", chargeKg: 10, hasLeakDetectionSystem: true }).intervalMonths).toBe(24); // Source: [S21] (halved rule)
  });
  it("EU6: 80 kg R-32 is 54.0 t: every 6 months", () => {
    const r = euLeakCheckInterval({ refrigerant: "R-32", chargeKg: 80 });
    expect(r.co2eTonnes).toBeCloseTo(54.0, 1); // Source: REFERENCE.md §7.1 EU6
    expect(r.intervalMonths).toBe(6); // Source: [S21]
  });
  it("EU7: 3 kg R-410A hermetically sealed and labelled is 6.26 t < 10 t: exempt", () => {
    const r = euLeakCheckInterval({ refrigerant: "R-410A", chargeKg: 3, hermeticallySealed: true });
    expect(r.co2eTonnes).toBeCloseTo(6.26, 2); // Source: REFERENCE.md §7.1 EU7
    expect(r.required).toBe(false); // Source: gov.uk [S21] (hermetic below 10 t exempt)
    expect(euLeakCheckInterval({ refrigerant: "R-410A", chargeKg: 3 }).required).toBe(true);
  });
  it("EU8: the 842/2006 example blend gives 1,652.5; with AR4 values R-407C gives 1,773.85", () => {
    expect(
      mixtureGwp([
        { massPercent: 23, gwp: 550 },
        { massPercent: 25, gwp: 3400 },
        { massPercent: 52, gwp: 1300 },
      ]),
    ).toBeCloseTo(1652.5, 6); // Source: legislation.gov.uk 842/2006 Annex I Part 2 [S26]
    expect(
      mixtureGwp([
        { massPercent: 23, gwp: 675 },
        { massPercent: 25, gwp: 3500 },
        { massPercent: 52, gwp: 1430 },
      ]),
    ).toBeCloseTo(1773.85, 6); // Source: REFERENCE.md §7.1 EU8, COMPUTED
  });
  it("EU9: 50 lb R-410A is 22.68 kg, 47.36 t: 12-month band", () => {
    const kg = gramsToKg(toGrams(50, "lb"));
    expect(kg).toBeCloseTo(22.68, 2); // Source: REFERENCE.md §7.1 EU9
    const r = euLeakCheckInterval({ refrigerant: "R-410A", chargeKg: kg });
    expect(r.co2eTonnes).toBeCloseTo(47.36, 2); // Source: REFERENCE.md §7.1 EU9
    expect(r.intervalMonths).toBe(12); // Source: [S21]
  });
  it("requires a leak-detection system from 500 t CO2e and counts HFOs by kg", () => {
    expect(euLeakCheckInterval({ refrigerant: "R-410A", chargeKg: 240 }).leakDetectionSystemRequired).toBe(true); // Source: legalregister synopsis of 2024/573 [S24] (≥ 500 t)
    expect(euLeakCheckInterval({ refrigerant: "R-1234ze(E)", chargeKg: 12 }).intervalMonths).toBe(6); // from memory (REFERENCE.md §7: Annex II 10–100 kg every 6 months, M)
    expect(euLeakCheckInterval({ refrigerant: "R-1234ze(E)", chargeKg: 120 }).leakDetectionSystemRequired).toBe(true); // Source: [S24] (≥ 100 kg HFO)
    expect(euLeakCheckInterval({ refrigerant: "R-290", chargeKg: 50 }).required).toBe(false); // not an Annex I/II gas
  });
});
