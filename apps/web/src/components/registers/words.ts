import type { PressureClass } from "@coldtrail/core";

/** 40 CFR 82.152 pressure classes in words. */
export const PRESSURE_CLASS_WORDS: Record<PressureClass, string> = {
  low: "Low pressure",
  medium: "Medium pressure",
  high: "High pressure",
  very_high: "Very high pressure",
};

/** Today's calendar date in an IANA time zone (the branch's), for default dates in forms. */
export function todayIn(timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(new Date());
}

/** Which column of 40 CFR 82.156 Table 1 a recovery unit's manufacture date puts it in. */
export const ERA_WORDS = {
  before_1993_11_15: "Made before 15 Nov 1993",
  on_or_after_1993_11_15: "Made on or after 15 Nov 1993 (or date unknown)",
} as const;

export function equipmentKind(e: { smallApplianceOnly: boolean; systemDependent: boolean }): string {
  if (e.systemDependent) return "System-dependent (small appliances)";
  if (e.smallApplianceOnly) return "Self-contained, small appliances only";
  return "Self-contained";
}
