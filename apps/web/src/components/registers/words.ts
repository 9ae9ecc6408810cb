import type { PressureClass } from "@coldtrail/core";

/** 40 CFR 82.152 pressure classes in words. */
export const PRESSURE_CLASS_WORDS: Record<PressureClass, string> = {
  low: "Low pressure",
  medium: "Medium pressure",
  high: "High pressure",
  very_high: "Very high pressure",
};

export { todayIn } from "@/lib/client/form-values";

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
