import { shortestAmountFor, type MassDisplayUnit, type MassInputUnit } from "@coldtrail/core";

/** Today's calendar date in an IANA time zone (the branch's, not the server's), for default dates in forms. */
export function todayIn(timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(new Date());
}

/** A stored mass shown in the branch's unit for editing: the shortest figure that converts back to the same grams. */
export function editAmount(grams: number, massUnit: MassDisplayUnit): { amount: string; unit: MassInputUnit } {
  const unit: MassInputUnit = massUnit === "kg" ? "kg" : "lb";
  return { amount: String(shortestAmountFor(grams, unit)), unit };
}
