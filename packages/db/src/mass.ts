const GRAMS_PER_LB = 453.59237; // exact: 1 lb = 0.45359237 kg

/** Plain-words mass in a branch's unit, for activity summaries: "12.40 lb" or "5.62 kg". */
export function describeMass(grams: number, massUnit: string): string {
  if (massUnit === "kg") return `${(grams / 1000).toFixed(2)} kg`;
  return `${(grams / GRAMS_PER_LB).toFixed(2)} lb`;
}
