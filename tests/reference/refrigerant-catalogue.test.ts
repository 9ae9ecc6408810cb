import { describe, expect, it } from "vitest";
import { blendGwp, getRefrigerant, mixtureGwp, normaliseDesignation, REFRIGERANTS } from "@coldtrail/core";

const must = (d: string) => {
  const r = getRefrigerant(d);
  if (!r) throw new Error(`missing ${d}`);
  return r;
};

describe("catalogue covers REFERENCE.md §6", () => {
  const listed = [
    "R-22",
    "R-410A",
    "R-32",
    "R-134a",
    "R-404A",
    "R-407C",
    "R-454B",
    "R-452A",
    "R-448A",
    "R-449A",
    "R-123",
    "R-1233zd(E)",
    "R-290",
    "R-744",
    "R-717",
    "R-12",
    "R-502",
    "R-514A",
    "R-1234yf",
    "R-1234ze(E)",
    "R-507A",
  ];
  it.each(listed)("has %s", (d) => {
    expect(getRefrigerant(d)?.designation).toBe(d); // Source: REFERENCE.md §6.1 / §6.2 tables
  });
  it("stores GWP per basis, never as one number", () => {
    for (const r of REFRIGERANTS) expect(Object.keys(r.gwp).sort()).toEqual(["ar4", "ar5", "eu", "usExchange"]); // Source: REFERENCE.md §6.1 ("Store GWP per (refrigerant, basis) pair")
  });
});

describe("designations are normalised", () => {
  it.each([
    ["R410A", "R-410A"],
    ["r-410a", "R-410A"],
    ["R 410 A", "R-410A"],
    ["HFC-134A", "R-134a"],
    ["r1234ze(e)", "R-1234ze(E)"],
    ["R-1233ZD(E)", "R-1233zd(E)"],
    ["CO2", "R-744"],
  ])("%s → %s", (input, out) => {
    expect(normaliseDesignation(input)).toBe(out); // ASHRAE 34 designation style (common practice)
  });
});

describe("identity, safety group and composition (REFERENCE.md §6.1)", () => {
  const rows: [string, string[], string, string | null, [string, number][] | null][] = [
    ["R-22", ["HCFC"], "A1", "class_ii", null], // Source: REFERENCE.md §6.1 [S16]; A1 ✓ [S31]
    [
      "R-410A",
      ["HFC"],
      "A1",
      null,
      [
        ["R-32", 50],
        ["R-125", 50],
      ],
    ], // Source: REFERENCE.md §6.1 [S17]
    ["R-32", ["HFC"], "A2L", null, null], // Source: REFERENCE.md §6.1 ✓ [S31]
    ["R-134a", ["HFC"], "A1", null, null], // Source: REFERENCE.md §6.1
    [
      "R-404A",
      ["HFC"],
      "A1",
      null,
      [
        ["R-125", 44],
        ["R-143a", 52],
        ["R-134a", 4],
      ],
    ], // Source: REFERENCE.md §6.1 [S17]
    [
      "R-407C",
      ["HFC"],
      "A1",
      null,
      [
        ["R-32", 23],
        ["R-125", 25],
        ["R-134a", 52],
      ],
    ], // Source: REFERENCE.md §6.1 [S17]
    [
      "R-454B",
      ["HFC", "HFO"],
      "A2L",
      null,
      [
        ["R-32", 68.9],
        ["R-1234yf", 31.1],
      ],
    ], // Source: REFERENCE.md §6.1 [S17]
    [
      "R-452A",
      ["HFC", "HFO"],
      "A1",
      null,
      [
        ["R-32", 11],
        ["R-125", 59],
        ["R-1234yf", 30],
      ],
    ], // Source: REFERENCE.md §6.1 [S17]
    [
      "R-448A",
      ["HFC", "HFO"],
      "A1",
      null,
      [
        ["R-32", 26],
        ["R-125", 26],
        ["R-1234yf", 20],
        ["R-134a", 21],
        ["R-1234ze(E)", 7],
      ],
    ], // Source: REFERENCE.md §6.1 [S17]
    [
      "R-449A",
      ["HFC", "HFO"],
      "A1",
      null,
      [
        ["R-32", 24.3],
        ["R-125", 24.7],
        ["R-1234yf", 25.3],
        ["R-134a", 25.7],
      ],
    ], // Source: REFERENCE.md §6.1 [S17]
    ["R-123", ["HCFC"], "B1", "class_ii", null], // Source: REFERENCE.md §6.1 ✓
    ["R-1233zd(E)", ["HCFO"], "A1", null, null], // Source: REFERENCE.md §6.1 ✓ [S32]
    ["R-290", ["HC"], "A3", null, null], // Source: REFERENCE.md §6.1 ✓
    ["R-744", ["natural"], "A1", null, null], // Source: REFERENCE.md §6.1
    ["R-717", ["natural"], "B2L", null, null], // Source: REFERENCE.md §6.1 ✓
    ["R-12", ["CFC"], "A1", "class_i", null], // Source: REFERENCE.md §6.1 ✓
    [
      "R-502",
      ["CFC", "HCFC"],
      "A1",
      "class_i",
      [
        ["R-22", 48.8],
        ["R-115", 51.2],
      ],
    ], // Source: REFERENCE.md §6.1 (composition from memory)
    [
      "R-514A",
      ["HFO"],
      "B1",
      null,
      [
        ["R-1336mzz(Z)", 74.7],
        ["R-1130(E)", 25.3],
      ],
    ], // from memory (REFERENCE.md §6.1: composition, B1)
    ["R-1234yf", ["HFO"], "A2L", null, null], // Source: REFERENCE.md §6.1 ✓ [S31]
    ["R-1234ze(E)", ["HFO"], "A2L", null, null], // Source: REFERENCE.md §6.1 ✓ [S31]
  ];
  it.each(rows)("%s", (d, classes, safety, ods, comp) => {
    const r = must(d);
    expect(r.classes).toEqual(classes);
    expect(r.safetyGroup).toBe(safety);
    expect(r.odsClass).toBe(ods);
    expect(r.composition?.map((c) => [c.designation, c.massPercent]) ?? null).toEqual(comp);
  });
});

describe("GWP values (REFERENCE.md §6.1)", () => {
  const rows: [string, number | null, number | null][] = [
    ["R-22", 1810, 1760], // Source: REFERENCE.md §6.1, PUBLISHED [S16]
    ["R-410A", 2088, 1924], // Source: REFERENCE.md §6.1, COMPUTED from [S16]
    ["R-32", 675, 677], // Source: REFERENCE.md §6.1, PUBLISHED [S16]
    ["R-134a", 1430, 1300], // Source: REFERENCE.md §6.1, PUBLISHED [S16]
    ["R-404A", 3922, 3943], // Source: REFERENCE.md §6.1, COMPUTED
    ["R-407C", 1774, 1624], // Source: REFERENCE.md §6.1, COMPUTED
    ["R-452A", 2140, 1945], // Source: REFERENCE.md §6.1, COMPUTED
    ["R-448A", 1387, 1273], // Source: REFERENCE.md §6.1, COMPUTED
    ["R-449A", 1397, 1282], // Source: REFERENCE.md §6.1, COMPUTED; 1,397 also PUBLISHED (vdh-online)
    ["R-123", 77, 79], // Source: REFERENCE.md §6.1, PUBLISHED [S16]
    ["R-12", 10900, 10200], // Source: REFERENCE.md §6.1, PUBLISHED [S16]
    ["R-502", 4657, 4786], // Source: REFERENCE.md §6.1, COMPUTED from [S16]
    ["R-507A", 3985, 3985], // Source: REFERENCE.md §6.1 ("Also COMPUTED: R-507A")
    ["R-744", 1, 1], // by definition (REFERENCE.md §6.1)
  ];
  it.each(rows)("%s AR4 %s, AR5 %s", (d, ar4, ar5) => {
    expect(must(d).gwp.ar4).toBe(ar4);
    expect(must(d).gwp.ar5).toBe(ar5);
  });

  it("keeps the EU and US figures beside the IPCC ones", () => {
    expect(must("R-410A").gwp.eu).toBe(2088); // Source: REFERENCE.md §6.1 ("the EU regulation lists 2,088")
    expect(must("R-454B").gwp.usExchange).toBe(466); // Source: REFERENCE.md §6.1 ("R-454B is about 466"), from memory
    expect(must("R-1234yf").gwp.eu).toBe(4); // Source: REFERENCE.md §6.1 (EU 517/2014 Annex II 4), from memory
    expect(must("R-1234ze(E)").gwp.eu).toBe(7); // from memory (REFERENCE.md §6.1)
    expect(must("R-1233zd(E)").gwp.eu).toBe(4.5); // from memory (REFERENCE.md §6.1)
    expect(must("R-290").gwp.eu).toBe(3); // Source: 517/2014 Annex IV [S20]
    expect(must("R-717").gwp.eu).toBe(0); // Source: 517/2014 Annex IV [S20]
    expect(must("R-1233zd(E)").gwp.ar5).toBe(1); // Source: REFERENCE.md §6.1 ✓ [S32]
  });

  it("blend GWPs equal the mass-weighted sums of their components", () => {
    expect(blendGwp("R-410A", ["ar4"])).toBeCloseTo(2087.5, 6); // Source: REFERENCE.md §6.1 (2,087.5)
    expect(blendGwp("R-410A", ["ar5"])).toBeCloseTo(1923.5, 6); // Source: REFERENCE.md §6.1 (1,923.5)
    expect(blendGwp("R-404A", ["ar4"])).toBeCloseTo(3921.6, 6); // Source: REFERENCE.md §6.1 (3,921.6)
    expect(blendGwp("R-404A", ["ar5"])).toBeCloseTo(3942.8, 6); // Source: REFERENCE.md §6.1 (3,942.8)
    expect(blendGwp("R-407C", ["ar4"])).toBeCloseTo(1773.85, 6); // Source: REFERENCE.md §6.1 / §7.1 EU8 (1,773.85)
    expect(blendGwp("R-407C", ["ar5"])).toBeCloseTo(1624.2, 1); // Source: REFERENCE.md §6.1 (1,624.2, given to one decimal)
    expect(blendGwp("R-452A", ["ar4", "eu"])).toBeCloseTo(2140.45, 6); // Source: REFERENCE.md §6.1 (2,140.45)
    expect(blendGwp("R-502", ["ar4"])).toBeCloseTo(4656.7, 1); // Source: REFERENCE.md §6.1 (4,656.7)
    expect(Math.round(blendGwp("R-454B", ["ar4", "eu"]))).toBe(466); // Source: REFERENCE.md §6.1 (466)
    expect(Math.round(blendGwp("R-448A", ["ar4", "eu"]))).toBe(1387); // Source: REFERENCE.md §6.1
    expect(Math.round(blendGwp("R-449A", ["ar4", "eu"]))).toBe(1397); // Source: REFERENCE.md §6.1
    for (const r of REFRIGERANTS.filter((x) => ["R-410A", "R-404A", "R-407C", "R-507A", "R-502"].includes(x.designation))) {
      expect(Math.round(blendGwp(r.designation, ["ar4"]))).toBe(r.gwp.ar4);
      expect(Math.round(blendGwp(r.designation, ["ar5"]))).toBe(r.gwp.ar5);
    }
  });

  it("R-454B AR5 lies between 466.45 and 466.76 depending on the HFO value (< 1)", () => {
    const low = mixtureGwp([
      { massPercent: 68.9, gwp: 677 },
      { massPercent: 31.1, gwp: 0 },
    ]);
    const high = mixtureGwp([
      { massPercent: 68.9, gwp: 677 },
      { massPercent: 31.1, gwp: 1 },
    ]);
    expect(low).toBeCloseTo(466.45, 2); // Source: REFERENCE.md §6.1 (466.45–466.76)
    expect(high).toBeCloseTo(466.76, 2); // Source: REFERENCE.md §6.1
  });
});

describe("physical data (REFERENCE.md §6.2, §6.4)", () => {
  it("keeps bubble and dew pressures at 104 °F for blends", () => {
    expect(must("R-410A").pSat104Psia).toEqual({ bubble: 351.8, dew: 350.8 }); // Source: REFERENCE.md §6.2, COMPUTED [S17]
    expect(must("R-407C").pSat104Psia).toEqual({ bubble: 253.7, dew: 223.5 }); // Source: REFERENCE.md §6.2
    expect(must("R-22").criticalTempC).toBe(96.2); // Source: REFERENCE.md §6.2
  });
  it("uses the Guideline K specific gravity of R-22 where one is published", () => {
    expect(must("R-22").sg77F).toBe(1.197); // Source: AHRI Guideline K example [S11] (computed 1.194)
    expect(must("R-410A").sg77F).toBe(1.062); // Source: REFERENCE.md §6.4, COMPUTED
    expect(must("R-410A").sg130F).toBe(0.871); // Source: REFERENCE.md §6.4, COMPUTED
  });
});
