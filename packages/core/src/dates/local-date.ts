import { CoreInputError } from "../errors";

/**
 * Calendar dates are ISO strings "YYYY-MM-DD" in the branch's own time zone. Instants are full
 * ISO timestamps. Day arithmetic is done on the calendar date (UTC noon-free integer days), so it
 * never shifts with daylight-saving changes.
 */
export type IsoDate = string;

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

export function isIsoDate(value: string): boolean {
  const m = ISO_DATE.exec(value);
  if (!m) return false;
  const d = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  return d.toISOString().slice(0, 10) === value;
}

function parts(date: IsoDate): [number, number, number] {
  const m = ISO_DATE.exec(date);
  if (!m || !isIsoDate(date)) throw new CoreInputError(`Not a calendar date: ${date}`, "date");
  return [Number(m[1]), Number(m[2]), Number(m[3])];
}

function fromUtc(ms: number): IsoDate {
  return new Date(ms).toISOString().slice(0, 10);
}

/**
 * The calendar date of `value` in `timeZone` (IANA name, e.g. "America/Chicago").
 * A value that is already a calendar date is returned unchanged.
 */
export function toLocalDate(value: string | Date, timeZone: string): IsoDate {
  if (typeof value === "string" && ISO_DATE.test(value)) {
    parts(value);
    return value;
  }
  const instant = typeof value === "string" ? new Date(value) : value;
  if (Number.isNaN(instant.getTime())) throw new CoreInputError(`Not a date or timestamp: ${String(value)}`, "date");
  const fmt = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" });
  const p = Object.fromEntries(fmt.formatToParts(instant).map((x) => [x.type, x.value]));
  return `${p.year}-${p.month}-${p.day}`;
}

export function addDays(date: IsoDate, days: number): IsoDate {
  const [y, m, d] = parts(date);
  return fromUtc(Date.UTC(y, m - 1, d + days));
}

/** Adds calendar months; the day is clamped to the end of a shorter month (31 Jan + 1 → 28/29 Feb). */
export function addMonths(date: IsoDate, months: number): IsoDate {
  const [y, m, d] = parts(date);
  const targetMonthIndex = m - 1 + months;
  const lastDay = new Date(Date.UTC(y, targetMonthIndex + 1, 0)).getUTCDate();
  return fromUtc(Date.UTC(y, targetMonthIndex, Math.min(d, lastDay)));
}

export function addYears(date: IsoDate, years: number): IsoDate {
  return addMonths(date, years * 12);
}

/** Whole days from `from` to `to` (positive when `to` is later). */
export function daysBetween(from: IsoDate, to: IsoDate): number {
  const [y1, m1, d1] = parts(from);
  const [y2, m2, d2] = parts(to);
  return Math.round((Date.UTC(y2, m2 - 1, d2) - Date.UTC(y1, m1 - 1, d1)) / 86_400_000);
}

export function yearOf(date: IsoDate): number {
  return parts(date)[0];
}

/** ISO dates compare correctly as strings; these helpers say so at the call site. */
export function isBefore(a: IsoDate, b: IsoDate): boolean {
  return a < b;
}

export function maxDate(a: IsoDate, b: IsoDate): IsoDate {
  return a > b ? a : b;
}
