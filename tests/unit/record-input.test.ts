import { describe, expect, it } from "vitest";
import {
  calendarDate,
  checkCylinderFill,
  enteredAmount,
  purchaseInput,
  recordDateProblem,
  shortestAmountFor,
  stripBidiControls,
  text,
  toGrams,
  type MassUnit,
} from "@coldtrail/core";

describe("the shared text helper", () => {
  const field = text({ error: "Enter it" }).trim().min(1, "Enter it").max(20, "Too long");
  const issue = (v: unknown) => {
    const r = field.safeParse(v);
    return r.success ? null : r.error.issues[0]!.message;
  };

  it("removes every bidirectional control character and keeps the visible text in stored order", () => {
    // U+202E (right-to-left override) makes "invoice‮fdp.exe" display as "invoiceexe.pdf".
    expect(field.parse("invoice\u202Efdp.exe")).toBe("invoicefdp.exe");
    const controls = [
      "\u202A",
      "\u202B",
      "\u202C",
      "\u202D",
      "\u202E",
      "\u2066",
      "\u2067",
      "\u2068",
      "\u2069",
      "\u200E",
      "\u200F",
      "\u061C",
    ];
    for (const c of controls) expect(field.parse(`a${c}b`)).toBe("ab");
    expect(stripBidiControls(controls.join(""))).toBe("");
  });

  it("refuses a NUL byte anywhere in the text", () => {
    expect(issue("ab\u0000c")).toMatch(/NUL/);
    expect(issue("\u0000")).toMatch(/NUL/);
  });

  it("refuses values made only of invisible characters, and calls plain spaces missing", () => {
    for (const v of ["\u200B", " \u200B\u200C ", "\u2060\u200D", "\u00AD", "\u3164", "\u202E\u200B"])
      expect(issue(v)).toMatch(/visible text/);
    expect(issue("   ")).toBe("Enter it");
    expect(issue("")).toBe("Enter it");
    // Visible text with a zero-width joiner inside (emoji sequences, some scripts) is kept as it is.
    expect(field.parse("a\u200Db")).toBe("a\u200Db");
  });

  it("counts the length after the controls are removed", () => {
    expect(field.parse(`${"x".repeat(20)}\u202E`)).toBe("x".repeat(20));
    expect(issue("x".repeat(21))).toBe("Too long");
  });

  it("is what the record schemas use: a purchase's supplier is cleaned and an invisible one refused", () => {
    const base = { branchId: 1, purchasedOn: "2026-01-05", refrigerant: "R-410A", amount: 25, unit: "lb" };
    expect(purchaseInput.parse({ ...base, supplierName: "Cold\u202ESupply" }).supplierName).toBe("ColdSupply");
    const r = purchaseInput.safeParse({ ...base, supplierName: "\u200B\u200B" });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => i.path.join("."))).toContain("supplierName");
  });
});

describe("calendar dates", () => {
  const d = calendarDate();
  it("refuses dates that do not exist and implausibly old ones", () => {
    for (const v of ["2025-13-45", "2026-02-30", "2025-02-29", "2026-04-31", "2026-00-10"]) expect(d.safeParse(v).success, v).toBe(false);
    expect(d.safeParse("0001-01-01").success).toBe(false);
    expect(d.safeParse("1899-12-31").success).toBe(false);
    for (const v of ["2024-02-29", "2026-12-31", "1900-01-01"]) expect(d.safeParse(v).success, v).toBe(true);
  });

  it("a record's date must be after the records begin and not after today where the branch is", () => {
    // 2026-12-03 05:30 UTC is still 2026-12-02 in Chicago (UTC−6) and already 2026-12-03 in Berlin.
    const now = new Date("2026-12-03T05:30:00Z");
    const opts = { recordsBeginOn: "2023-01-01", now };
    expect(recordDateProblem("2026-12-02", { ...opts, timeZone: "America/Chicago" })).toBeNull();
    expect(recordDateProblem("2026-12-03", { ...opts, timeZone: "America/Chicago" })).toMatch(/after today \(2026-12-02/);
    expect(recordDateProblem("2026-12-03", { ...opts, timeZone: "Europe/Berlin" })).toBeNull();
    expect(recordDateProblem("2022-12-31", { ...opts, timeZone: "America/Chicago" })).toMatch(/records begin \(2023-01-01\)/);
    expect(recordDateProblem("2023-01-01", { ...opts, timeZone: "America/Chicago" })).toBeNull();
  });
});

describe("entered amounts", () => {
  it("95 lb is not a whole number of grams: the grams read back as 94.9994 lb, the entered figure as 95 lb", () => {
    const g = toGrams(95, "lb"); // 95 × 453.59237 = 43,091.275 g → 43,091 g
    expect(g).toBe(43091);
    expect(g / 453.59237).toBeCloseTo(94.9994, 4);
    expect(enteredAmount(g, 95, "lb")).toEqual({ amount: 95, unit: "lb" });
  });

  it("a typed figure that no longer matches the grams is not shown (the grams changed elsewhere)", () => {
    expect(enteredAmount(43092, 95, "lb")).toBeNull();
    expect(enteredAmount(43091, null, null)).toBeNull();
  });

  it("without a typed figure, the shortest figure that converts back to the same grams is offered", () => {
    for (const [g, unit] of [
      [43091, "lb"],
      [349, "oz"],
      [43091, "kg"],
      [1, "lb"],
      [123457, "oz"],
    ] as [number, MassUnit][]) {
      const v = shortestAmountFor(g, unit);
      expect(toGrams(v, unit), `${g} g in ${unit}`).toBe(g);
    }
    expect(shortestAmountFor(43091, "kg")).toBe(43.091);
    expect(shortestAmountFor(4536, "lb")).toBe(10);
  });
});

describe("cylinder fill", () => {
  // A 50 lb water-capacity cylinder (22,680 g) of R-410A.
  // Source: AHRI Guideline K (80 % of WC × SG; REFERENCE.md §5.2); SG 1.062 at 77 °F from the catalogue.
  const cyl = { waterCapacityG: 22680, tareG: 7938, refrigerant: "R-410A" };
  it("up to the safe fill is fine, above it needs a confirmation, above liquid-full is impossible", () => {
    expect(checkCylinderFill({ ...cyl, contentsG: 19268 })).toMatchObject({ kind: "ok", maxNetG: 19268 }); // floor(22,680 × 0.8 × 1.062) = floor(19,268.9)
    expect(checkCylinderFill({ ...cyl, contentsG: 19269 })).toMatchObject({ kind: "over_safe_fill" });
    expect(checkCylinderFill({ ...cyl, contentsG: 24086 })).toMatchObject({ kind: "over_safe_fill", liquidFullG: 24086 }); // floor(22,680 × 1.062) = floor(24,086.2)
    expect(checkCylinderFill({ ...cyl, contentsG: 24087 })).toMatchObject({ kind: "impossible" });
    // 95 lb into a cylinder whose safe fill is about 42.5 lb.
    expect(checkCylinderFill({ ...cyl, contentsG: toGrams(95, "lb") }).kind).toBe("impossible");
  });

  it("a light refrigerant is bounded by its own density, not by the water capacity", () => {
    // R-290 liquid is about half as dense as water: 20 kg cannot fit in a 22.68 kg-WC cylinder.
    // from memory: propane liquid SG about 0.49 at 77 °F; the catalogue's figure is used.
    expect(checkCylinderFill({ ...cyl, refrigerant: "R-290", contentsG: 20000 }).kind).toBe("impossible");
  });
});
