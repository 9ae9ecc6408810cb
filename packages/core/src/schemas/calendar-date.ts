import { z } from "zod";
import { addDays, isIsoDate, toLocalDate, type IsoDate } from "../dates/local-date";

/**
 * Calendar dates typed into forms and spreadsheets. A date must exist on the calendar (no
 * 2025-13-45, no 2026-02-30) and be plausible for a record: not before 1900 (no refrigeration record,
 * appliance or cylinder in service predates it; it catches 0001-01-01 and two-digit-year slips).
 * Whether a dated event is after the company's records begin and not after today in the branch's
 * time zone needs stored data; `recordDateProblem` says it and the database layer applies it.
 */
export const EARLIEST_PLAUSIBLE_DATE: IsoDate = "1900-01-01";

export const NOT_A_CALENDAR_DATE = "That date does not exist: check the month (01–12) and the day of the month";

export const calendarDate = (format = "Use a date like 2026-03-14", params?: Parameters<typeof z.string>[0]) =>
  z
    .string(params)
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, format)
    .refine((v) => !/^\d{4}-\d{2}-\d{2}$/.test(v) || isIsoDate(v), NOT_A_CALENDAR_DATE)
    .refine(
      (v) => !isIsoDate(v) || v >= EARLIEST_PLAUSIBLE_DATE,
      `Dates before ${EARLIEST_PLAUSIBLE_DATE.slice(0, 4)} are not plausible: check the year`,
    );

/**
 * When a company's records begin if nobody said otherwise: 1 January three years before it started
 * using Coldtrail. Section 608 records are kept for three years (40 CFR 82.156(a)(3), 82.157(l)), so
 * that covers every record a company must still hold when it joins; an owner who imports older
 * records sets an earlier start on the organisation's settings.
 */
export function defaultRecordsBeginOn(organisationCreatedAt: string): IsoDate {
  const year = Number(organisationCreatedAt.slice(0, 4));
  return `${String(year - 3).padStart(4, "0")}-01-01`;
}

/** The date of an event (job, purchase, shipment, weighing, disposal): after the records begin and not after today where the branch is. */
export function recordDateProblem(
  date: IsoDate,
  opts: { recordsBeginOn: IsoDate; timeZone: string; now?: Date; what?: string },
): string | null {
  if (!isIsoDate(date)) return NOT_A_CALENDAR_DATE;
  const today = toLocalDate(opts.now ?? new Date(), opts.timeZone);
  const what = opts.what ?? "The date";
  if (date > today) return `${what} cannot be after today (${today} where the branch is)`;
  if (date < opts.recordsBeginOn) return `${what} is before your company's records begin (${opts.recordsBeginOn}): check the year`;
  return null;
}

/** Today in `timeZone`, and the day after (used by tests and forms that preset a date). */
export function todayIn(timeZone: string, now: Date = new Date()): { today: IsoDate; tomorrow: IsoDate } {
  const today = toLocalDate(now, timeZone);
  return { today, tomorrow: addDays(today, 1) };
}
