/** Common names accepted for a few natural refrigerants. */
const COMMON_NAMES: Record<string, string> = {
  CO2: "R-744",
  CARBONDIOXIDE: "R-744",
  NH3: "R-717",
  AMMONIA: "R-717",
  PROPANE: "R-290",
  ISOBUTANE: "R-600a",
};

const DESIGNATION = /^(?:R|HFC|HCFC|CFC|HFO|HCFO|HC|PFC|FC)?-?(\d{1,4})([A-Z]*)(\([EZ]\))?$/;

/**
 * ASHRAE 34 style designation: "R410A", "r-410a", "R 410 A", "HFC-410A" → "R-410A";
 * "r134A" → "R-134a"; "R1234ZE(E)" → "R-1234ze(E)". Zeotropic (400) and azeotropic (500) blend
 * letters are upper case; isomer letters of pure compounds are lower case; (E)/(Z) upper case.
 * Returns the trimmed input unchanged when it does not look like a designation.
 */
export function normaliseDesignation(input: string): string {
  const compact = input.trim().replace(/\s+/g, "").toUpperCase();
  const common = COMMON_NAMES[compact.replace(/[-_]/g, "")];
  if (common) return common;
  const m = DESIGNATION.exec(compact);
  if (!m) return input.trim();
  const number = m[1] ?? "";
  const letters = m[2] ?? "";
  const isomer = m[3] ?? "";
  const isBlend = number.length === 3 && (number.startsWith("4") || number.startsWith("5"));
  return `R-${number}${isBlend ? letters : letters.toLowerCase()}${isomer}`;
}
