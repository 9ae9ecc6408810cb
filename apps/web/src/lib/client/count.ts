const numbers = new Intl.NumberFormat("en-US");
const plurals = new Intl.PluralRules("en-US");

/** "1 row", "2 rows", "1,204 rows": a number with its noun, in the right grammatical number. */
export function count(value: number, singular: string, plural = `${singular}s`): string {
  return `${numbers.format(value)} ${plurals.select(value) === "one" ? singular : plural}`;
}

/** "has" / "have" to agree with a count. */
export function hasHave(value: number): string {
  return plurals.select(value) === "one" ? "has" : "have";
}
