import { describe, expect, it } from "vitest";
import {
  classifyPressure,
  classifyPressure1993,
  classifyPressureFromProperties,
  getRefrigerant,
  isSmallAppliance,
  leakRepairRegime,
  requiredCertificationTypes,
  toGrams,
} from "@coldtrail/core";

describe("pressure classes by the 2004 definitions (REFERENCE.md §6.2 table)", () => {
  // Source: REFERENCE.md §6.2, COMPUTED p_sat(104 °F) with the thresholds of 40 CFR 82.152 (§1.3 [S7])
  const rows: [string, string, string][] = [
    ["R-22", "high", "high"],
    ["R-410A", "high", "very_high"],
    ["R-32", "very_high", "very_high"],
    ["R-134a", "medium", "high"],
    ["R-404A", "high", "high"],
    ["R-407C", "high", "high"],
    ["R-507A", "high", "high"],
    ["R-12", "medium", "high"],
    ["R-123", "low", "low"],
    ["R-1233zd(E)", "low", "low"],
    ["R-1234yf", "medium", "high"],
    ["R-1234ze(E)", "medium", "high"],
    ["R-290", "high", "high"],
    ["R-717", "high", "high"],
    ["R-744", "very_high", "very_high"],
    ["R-454B", "high", "very_high"],
    ["R-452A", "high", "high"],
    ["R-448A", "high", "high"],
    ["R-449A", "high", "high"],
    ["R-502", "high", "high"],
    ["R-514A", "low", "low"],
  ];
  it.each(rows)("%s is %s (2004) and %s (1993 wording)", (d, cls2004, cls1993) => {
    expect(classifyPressure(d)).toBe(cls2004); // Source: REFERENCE.md §6.2 "608 class (2004 def.)"
    expect(classifyPressure1993(d)).toBe(cls1993); // Source: REFERENCE.md §6.2 "1993 BP class" (§1.4 [S8])
  });

  it("R-410A is high and R-32 very high under 2004; both very high under the 1993 wording", () => {
    expect(classifyPressure("R-410A")).toBe("high"); // Source: REFERENCE.md §1.4 / §6.2 (351.8 psia, 3.2 psi under 355)
    expect(classifyPressure("R-32")).toBe("very_high"); // Source: REFERENCE.md §6.2 (359.4 psia > 355; derived, not stated by EPA)
    expect(classifyPressure1993("R-410A")).toBe("very_high"); // Source: REFERENCE.md §1.4 (NBP −51.4 °C < −50 °C)
    expect(classifyPressure1993("R-32")).toBe("very_high"); // Source: REFERENCE.md §1.4 (NBP −51.7 °C)
    expect(355 - getRefrigerant("R-410A")!.pSat104Psia!.bubble).toBeCloseTo(3.2, 6); // Source: REFERENCE.md §6.2
  });

  it("CFR examples fall in their named classes", () => {
    expect(classifyPressure("R-123")).toBe("low"); // Source: 40 CFR 82.152 low-pressure examples [S7]
    expect(classifyPressure("R-134a")).toBe("medium"); // from memory: CFR medium examples (REFERENCE.md §1.3)
    expect(classifyPressure("R-12")).toBe("medium"); // from memory: CFR medium examples
    expect(classifyPressure("R-22")).toBe("high"); // from memory: CFR high examples
    expect(classifyPressure("R-502")).toBe("high"); // from memory: CFR high examples
    expect(classifyPressure("R-23")).toBe("very_high"); // from memory: CFR very-high examples
  });

  it("documented boundary convention: lower bound inclusive, very high strictly above 355 psia", () => {
    const at = (p: number) => classifyPressureFromProperties({ pSat104Psia: p, criticalTempC: 100 });
    // Source: REFERENCE.md §1.3 ("Pick one convention, for example lower bound inclusive, and document it")
    expect(at(44.99)).toBe("low");
    expect(at(45)).toBe("medium");
    expect(at(169.99)).toBe("medium");
    expect(at(170)).toBe("high");
    expect(at(355)).toBe("high");
    expect(at(355.01)).toBe("very_high");
    // Source: 40 CFR 82.152 very-high: critical temperature below 104 °F (examzify [S7])
    expect(classifyPressureFromProperties({ pSat104Psia: 100, criticalTempC: 39.9 })).toBe("very_high");
  });
});

describe("small appliance (40 CFR 82.152; REFERENCE.md §1.2)", () => {
  it("is factory sealed with 5 lb or less", () => {
    expect(isSmallAppliance({ factorySealed: true, fullChargeG: toGrams(5, "lb") })).toBe(true); // Source: REFERENCE.md §1.2 [S7] ("5 lb or less")
    expect(isSmallAppliance({ factorySealed: true, fullChargeG: toGrams(5.01, "lb") })).toBe(false); // Source: REFERENCE.md §1.2
    expect(isSmallAppliance({ factorySealed: false, fullChargeG: toGrams(4, "lb") })).toBe(false); // Source: REFERENCE.md §1.2 edge case (field-charged 4-lb unit)
  });
  it("maps to the certification types that cover it", () => {
    expect(requiredCertificationTypes({ refrigerant: "R-134a", factorySealed: true, fullChargeG: toGrams(0.5, "lb") })).toEqual([
      "type_i",
      "universal",
    ]); // Source: REFERENCE.md §1.1 [S6]
    expect(requiredCertificationTypes({ refrigerant: "R-123", factorySealed: false, fullChargeG: toGrams(900, "lb") })).toEqual([
      "type_iii",
      "universal",
    ]); // Source: REFERENCE.md §1.1 [S6]
    expect(requiredCertificationTypes({ refrigerant: "R-134a", factorySealed: false, fullChargeG: toGrams(90, "lb") })).toEqual([
      "type_ii",
      "universal",
    ]); // Source: REFERENCE.md §1.1 (Type II includes medium since 2004)
  });
});

describe("AIM coverage: HFC-containing with GWP > 53 (REFERENCE.md §6.1)", () => {
  const on = "2026-03-01";
  const regime = (d: string) =>
    leakRepairRegime({ refrigerant: d, fullChargeG: toGrams(100, "lb"), category: "commercial_refrigeration", on }).regime;
  it.each(["R-410A", "R-32", "R-134a", "R-404A", "R-407C", "R-454B", "R-452A", "R-448A", "R-449A"])("%s is covered by 84.106", (d) => {
    expect(regime(d)).toBe("us_aim_hfc"); // Source: REFERENCE.md §6.1 AIM coverage test (derived, H); §1.5 [S9]
  });
  it.each(["R-290", "R-744", "R-717", "R-1234yf", "R-1234ze(E)", "R-1233zd(E)", "R-514A"])("%s is not covered by 84.106", (d) => {
    expect(regime(d)).toBeNull(); // Source: REFERENCE.md §6.1 AIM coverage test
  });
  it.each(["R-22", "R-123", "R-12", "R-502"])("%s falls under Part 82 instead", (d) => {
    expect(regime(d)).toBe("us_608_ods"); // Source: REFERENCE.md §6.1 ("fall under Part 82 (ODS) instead")
  });
});
