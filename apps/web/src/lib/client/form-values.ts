import { roundTo, type MassDisplayUnit, type MassInputUnit } from "@coldtrail/core";

/** Today's calendar date in an IANA time zone (the branch's, not the server's), for default dates in forms. */
export function todayIn(timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(new Date());
}

/** A stored mass shown in the branch's unit for editing (rounded for reading; untouched values are sent back in grams). */
export function editAmount(grams: number, massUnit: MassDisplayUnit): { amount: string; unit: MassInputUnit } {
  return massUnit === "kg"
    ? { amount: String(roundTo(grams / 1000, 3)), unit: "kg" }
    : { amount: String(roundTo(grams / 453.59237, 2)), unit: "lb" };
}
