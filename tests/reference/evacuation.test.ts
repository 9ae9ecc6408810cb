import { describe, expect, it } from "vitest";
import { EVACUATION_TABLE_1, evacuationSatisfied, requiredEvacuation, toGrams, type PressureClass } from "@coldtrail/core";

const req = (pressureClass: PressureClass, lb: number, madeOn: string | null) =>
  requiredEvacuation({ pressureClass, fullChargeG: toGrams(lb, "lb"), equipmentManufacturedOn: madeOn, smallAppliance: false });
const PRE = "1990-06-01";
const POST = "2010-06-01";

describe("40 CFR 82.156 Table 1 (REFERENCE.md §2.1)", () => {
  // Source: 40 CFR 82.156 Table 1 [S1]
  const rows: [PressureClass, number, string, number, string][] = [
    ["very_high", 100, "in_hg_vacuum", 0, "in_hg_vacuum"],
    ["very_high", 300, "in_hg_vacuum", 0, "in_hg_vacuum"],
    ["high", 199, "in_hg_vacuum", 0, "in_hg_vacuum"],
    ["high", 200, "in_hg_vacuum", 4, "in_hg_vacuum"],
    ["medium", 199, "in_hg_vacuum", 4, "in_hg_vacuum"],
    ["medium", 200, "in_hg_vacuum", 4, "in_hg_vacuum"],
  ];
  const post: Record<string, number> = {
    "very_high:100": 0,
    "very_high:300": 0,
    "high:199": 0,
    "high:200": 10,
    "medium:199": 10,
    "medium:200": 15,
  };
  it.each(rows)("%s, %s lb", (cls, lb, _u, preValue) => {
    const pre = req(cls, lb, PRE);
    const after = req(cls, lb, POST);
    expect(pre.kind === "table_1" && pre.level).toEqual({ value: preValue, unit: "in_hg_vacuum" }); // Source: 40 CFR 82.156 Table 1, before 15 Nov 1993 column [S1]
    expect(after.kind === "table_1" && after.level).toEqual({ value: post[`${cls}:${lb}`], unit: "in_hg_vacuum" }); // Source: 40 CFR 82.156 Table 1, on/after 15 Nov 1993 column [S1]
  });

  it("low-pressure appliances need 25 mm Hg absolute with any equipment", () => {
    for (const madeOn of [PRE, POST]) {
      const r = req("low", 500, madeOn);
      expect(r.kind === "table_1" && r.level).toEqual({ value: 25, unit: "mm_hg_abs" }); // Source: 40 CFR 82.156 Table 1 [S1]
    }
  });

  it("medium-pressure, ≥ 200 lb, post-1993 equipment is 15 in Hg — not the 10 of EPA's 2017 web table", () => {
    const r = req("medium", 250, POST);
    expect(r.kind === "table_1" && r.level.value).toBe(15); // Source: 40 CFR 82.156 Table 1 [S1] (REFERENCE.md §2.2)
    expect(r.kind === "table_1" && r.level.value).not.toBe(10); // negative test: EPA web page snapshot 19 Jan 2017 [S2] shows 10, which is wrong
    expect(EVACUATION_TABLE_1.medium.at_least_200_lb.on_or_after_1993_11_15.value).toBe(15); // Source: 40 CFR 82.156 Table 1 [S1]
  });

  it("the equipment date splits on 15 Nov 1993 and unknown dates take the stricter column", () => {
    expect(req("medium", 50, "1993-11-14").kind === "table_1" && req("medium", 50, "1993-11-14").description).toBe("4 in Hg vacuum"); // Source: 40 CFR 82.156 Table 1 ("before November 15, 1993")
    expect(req("medium", 50, "1993-11-15").kind === "table_1" && req("medium", 50, "1993-11-15").description).toBe("10 in Hg vacuum"); // Source: 40 CFR 82.156 Table 1 ("on or after")
    expect(req("medium", 50, null).description).toBe("10 in Hg vacuum"); // product choice: unknown → stricter
  });
});

describe("whether a reading satisfies the level, in any unit", () => {
  const ten = req("high", 250, POST); // 10 in Hg vacuum = 19.9 in Hg abs = 9.77 psia = 67.4 kPa (REFERENCE.md §2.3)
  it.each([
    [10, "in_hg_vacuum", true],
    [9.9, "in_hg_vacuum", false],
    [-4.92, "psig", true], // 10 in Hg × 0.49115 = 4.9115 psi below the 29.9 in Hg atmosphere, COMPUTED
    [-4.8, "psig", false],
    [505, "mm_hg_abs", true], // 19.9 in Hg × 25.4 = 505.46 mm Hg, COMPUTED
    [510, "mm_hg_abs", false],
    [67.3, "kpa_abs", true], // Source: REFERENCE.md §2.3 (67.4 kPa, rounded)
    [68, "kpa_abs", false],
    [500, "microns", true],
  ] as const)("%s %s → %s", (value, unit, ok) => {
    expect(evacuationSatisfied(ten, { reading: { value, unit } }).satisfied).toBe(ok);
  });

  it("25 mm Hg absolute is met by 500 microns but not by 26 mm Hg or 28 in Hg vacuum", () => {
    const low = req("low", 500, POST);
    expect(evacuationSatisfied(low, { reading: { value: 500, unit: "microns" } }).satisfied).toBe(true); // Source: REFERENCE.md §2.3 (25 mm Hg = 25,000 microns)
    expect(evacuationSatisfied(low, { reading: { value: 26, unit: "mm_hg_abs" } }).satisfied).toBe(false);
    expect(evacuationSatisfied(low, { reading: { value: 28, unit: "in_hg_vacuum" } }).satisfied).toBe(false); // Source: REFERENCE.md §2.3 (25 mm Hg ≈ 28.9 in Hg vacuum)
    expect(evacuationSatisfied(low, { reading: { value: 28.95, unit: "in_hg_vacuum" } }).satisfied).toBe(true);
  });

  it("0 psig meets a 0 in Hg requirement (same atmosphere)", () => {
    expect(evacuationSatisfied(req("high", 50, POST), { reading: { value: 0, unit: "psig" } }).satisfied).toBe(true); // Source: 40 CFR 82.156 Table 1 (0 in Hg vacuum)
    expect(evacuationSatisfied(req("high", 50, POST), { reading: { value: 0.5, unit: "psig" } }).satisfied).toBe(false);
  });
});

describe("small appliances (40 CFR 82.156(b); REFERENCE.md §2.5)", () => {
  const small = (madeOn: string, compressorOperating: boolean | null) =>
    requiredEvacuation({
      pressureClass: "high",
      fullChargeG: 500,
      equipmentManufacturedOn: madeOn,
      smallAppliance: true,
      compressorOperating,
    });
  it("post-1993 equipment: 90 % with the compressor operating, 80 % without, or 4 in Hg", () => {
    const op = small(POST, true);
    const off = small(POST, false);
    expect(op.kind === "small_appliance" && op.percentOfCharge).toBe(90); // Source: REFERENCE.md §2.5 [S37]
    expect(off.kind === "small_appliance" && off.percentOfCharge).toBe(80); // Source: REFERENCE.md §2.5 [S37]
    expect(op.kind === "small_appliance" && op.alternative).toEqual({ value: 4, unit: "in_hg_vacuum" }); // Source: REFERENCE.md §2.5
  });
  it("pre-1993 equipment: 80 % or 4 in Hg", () => {
    const r = small(PRE, true);
    expect(r.kind === "small_appliance" && r.percentOfCharge).toBe(80); // Source: REFERENCE.md §2.5 [S29]
  });
  it("judges the share recovered or the vacuum reached", () => {
    const r = small(POST, true);
    expect(evacuationSatisfied(r, { recoveredG: 450, fullChargeG: 500 }).satisfied).toBe(true); // 90 %, Source: REFERENCE.md §2.5
    expect(evacuationSatisfied(r, { recoveredG: 440, fullChargeG: 500 }).satisfied).toBe(false); // 88 %
    expect(evacuationSatisfied(r, { recoveredG: 440, fullChargeG: 500, reading: { value: 4, unit: "in_hg_vacuum" } }).satisfied).toBe(true); // Source: REFERENCE.md §2.5 (or 4 in Hg)
  });
});
