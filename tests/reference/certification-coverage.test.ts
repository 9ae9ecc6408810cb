import { describe, expect, it } from "vitest";
import { checkCertificationCoverage, toGrams } from "@coldtrail/core";

const rooftop = { refrigerant: "R-410A", factorySealed: false, fullChargeG: toGrams(40, "lb") };
const chiller = { refrigerant: "R-123", factorySealed: false, fullChargeG: toGrams(800, "lb") };

describe("certification coverage (40 CFR 82.161; REFERENCE.md §1.1)", () => {
  it("a Type I technician may not work on a 40-lb R-410A rooftop unit", () => {
    const r = checkCertificationCoverage([{ type: "type_i", state: "verified" }], rooftop);
    expect(r.allowed).toBe(false); // Source: REFERENCE.md §1.1 test idea [S6]
    expect(r.reason).toBe("Type II or Universal is needed for a high-pressure appliance (R-410A); the technician holds Type I (verified)");
  });

  it("a Type II technician may not work on an R-123 chiller; Type III or Universal may", () => {
    expect(checkCertificationCoverage([{ type: "type_ii", state: "verified" }], chiller).allowed).toBe(false); // Source: REFERENCE.md §1.1 test idea [S6]
    expect(checkCertificationCoverage([{ type: "type_iii", state: "verified" }], chiller).allowed).toBe(true); // Source: REFERENCE.md §1.1 [S6]
    expect(checkCertificationCoverage([{ type: "universal", state: "verified" }], chiller).coveredBy).toBe("universal"); // Source: REFERENCE.md §1.1 (Universal = I + II + III)
  });

  it("Type II covers medium-pressure appliances since 2004", () => {
    expect(
      checkCertificationCoverage([{ type: "type_ii", state: "verified" }], {
        refrigerant: "R-134a",
        factorySealed: false,
        fullChargeG: toGrams(60, "lb"),
      }).allowed,
    ).toBe(true); // Source: REFERENCE.md §1.1 (Type II includes medium since 2004)
  });

  it("Type I covers small appliances, Type II does not", () => {
    const fridge = { refrigerant: "R-134a", factorySealed: true, fullChargeG: toGrams(0.3, "lb") };
    expect(checkCertificationCoverage([{ type: "type_i", state: "verified" }], fridge).allowed).toBe(true); // Source: REFERENCE.md §1.1 [S6]
    expect(checkCertificationCoverage([{ type: "type_ii", state: "verified" }], fridge).allowed).toBe(false); // Source: REFERENCE.md §1.1 (Type II excepts small appliances)
  });

  it("only verified cards count; a pending card is reported, a rejected one ignored", () => {
    const r = checkCertificationCoverage(
      [
        { type: "type_ii", state: "pending" },
        { type: "universal", state: "rejected" },
      ],
      rooftop,
    );
    expect(r.allowed).toBe(false); // product rule: unverified cards do not authorise
    expect(r.pendingCovering).toEqual(["type_ii"]);
    expect(r.reason).toContain("Type II is awaiting verification");
  });
});
