import { describe, expect, it } from "vitest";
import { count, hasHave } from "../../apps/web/src/lib/client/count";

describe("counted nouns in the app's sentences", () => {
  it("says one row, not one rows", () => {
    expect(count(1, "row")).toBe("1 row");
    expect(`${count(1, "row")} ${hasHave(1)} problems`).toBe("1 row has problems");
  });

  it("uses the plural for zero and for more than one, with thousands grouped", () => {
    expect(count(0, "row")).toBe("0 rows");
    expect(count(1204, "valid row")).toBe("1,204 valid rows");
    expect(hasHave(3)).toBe("have");
  });

  it("takes an irregular plural", () => {
    expect(count(2, "branch", "branches")).toBe("2 branches");
  });
});
