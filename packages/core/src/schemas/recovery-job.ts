import { z } from "zod";
import { text } from "./text";
import { toGrams } from "../units/mass";
import { calendarDate } from "./calendar-date";
import { ACCESS_METHODS, EVACUATION_UNITS, JOB_KINDS, TEMPORARY_ACCESS_METHODS } from "../vocabulary";

/** Units a mass may be entered in on a form; stored as integer grams. */
export const MASS_INPUT_UNITS = ["lb", "oz", "kg", "g"] as const;
export type MassInputUnit = (typeof MASS_INPUT_UNITS)[number];

// Field builders shared by every record form and route (jobs, disposals, shipments, purchases).

export const isoDateField = calendarDate();
const isoDate = isoDateField;

/** A number typed into a form: an empty box means "not entered", never zero. */
export const enteredValue = <T extends z.ZodType>(schema: T) =>
  z.preprocess((v) => (v === "" || v === null || (typeof v === "string" && v.trim() === "") ? undefined : v), schema);
const entered = enteredValue;

/** A required reference to another record, chosen in a picker. */
export const idField = (what: string) =>
  entered(
    z.coerce
      .number({ error: `Choose ${what}` })
      .int(`Choose ${what}`)
      .positive(`Choose ${what}`),
  );
const id = idField;

/** An optional reference: empty means none. */
export const optionalIdField = (what: string) =>
  entered(
    z.coerce
      .number({ error: `Choose ${what}` })
      .int(`Choose ${what}`)
      .positive(`Choose ${what}`)
      .optional(),
  );

/** A mass typed into a form. */
export const massAmountField = (missing: string, opts: { positive?: boolean } = {}) =>
  entered(
    (opts.positive
      ? z.coerce.number({ error: missing }).gt(0, "The amount must be more than zero")
      : z.coerce.number({ error: missing }).min(0, "The amount cannot be negative")
    ).max(100_000, "That amount is larger than any appliance charge"),
  );

/**
 * Refuses a non-zero amount that is less than half a gram: masses are stored as whole grams, so it
 * would be saved as nothing while the person believes something was recorded.
 */
export function refineRecordableMass(ctx: z.RefinementCtx, amount: number | undefined, unit: string | undefined, path: string): void {
  if (amount === undefined || unit === undefined || !Number.isFinite(amount) || amount === 0) return;
  if (!(MASS_INPUT_UNITS as readonly string[]).includes(unit)) return;
  if (toGrams(amount, unit as MassInputUnit) === 0)
    ctx.addIssue({
      code: "custom",
      path: [path],
      message: `${amount} ${unit} is less than half a gram: too small to record; check the amount and unit`,
    });
}

/** Optional free text: trimmed, empty becomes undefined. */
export const optionalTextField = (max: number, label = "This field") =>
  z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? undefined : v === null ? undefined : v),
    text()
      .trim()
      .max(max, `${label} is limited to ${max.toLocaleString("en-US")} characters`)
      .optional(),
  );

/** Required free text. */
export const requiredTextField = (max: number, missing: string) =>
  text({ error: missing })
    .trim()
    .min(1, missing)
    .max(max, `Limited to ${max.toLocaleString("en-US")} characters`);

/** The latest calendar date a record may carry: one day of slack, the user's date may be ahead of UTC. */
export function latestAllowedRecordDate(now: Date = new Date()): string {
  return new Date(now.getTime() + 24 * 3600 * 1000).toISOString().slice(0, 10);
}

/** Adds an issue when `date` is in the future. */
export function refuseFutureDate(
  ctx: z.RefinementCtx,
  date: string | undefined,
  path: string,
  message = "The date of the work cannot be in the future",
): void {
  if (date && date > latestAllowedRecordDate()) ctx.addIssue({ code: "custom", path: [path], message });
}

/** Checks an evacuation reading for values no gauge can show. */
export function refineEvacuationReading(
  ctx: z.RefinementCtx,
  value: number | undefined,
  unit: string | undefined,
  path = "evacuationValue",
): void {
  if (value === undefined || unit === undefined) return;
  if (unit !== "psig" && value < 0) ctx.addIssue({ code: "custom", path: [path], message: "This unit cannot be negative" });
  if (unit === "in_hg_vacuum" && value > 29.92)
    ctx.addIssue({ code: "custom", path: [path], message: "A vacuum cannot be deeper than 29.92 in Hg" });
}

/** Temporary piercing devices must be said to be removed or left. */
export function refineTemporaryAccess(
  ctx: z.RefinementCtx,
  accessMethod: string | null | undefined,
  removed: boolean | null | undefined,
): void {
  const temporary = accessMethod ? (TEMPORARY_ACCESS_METHODS as readonly string[]).includes(accessMethod) : false;
  if (temporary && (removed === undefined || removed === null)) {
    ctx.addIssue({ code: "custom", path: ["temporaryAccessRemoved"], message: "Say whether the temporary piercing device was removed" });
  }
}

/**
 * The tick that confirms saving a cylinder above its safe fill. The server asks for it (a field error
 * on `confirmOverFill`) only when the amount would put the cylinder over; the form then shows it.
 */
export const confirmOverFillField = z.preprocess(
  (v) => (v === "true" || v === "on" ? true : v === "false" || v === "" || v === null ? undefined : v),
  z.boolean().optional(),
);

/** What a recovery takes out of an appliance; shared by recovery and disposal jobs. */
export const recoveryShape = {
  applianceId: id("the appliance"),
  performedOn: isoDate,
  refrigerant: text().trim().min(1, "Refrigerant is required").max(32),
  recoveredAmount: entered(
    z.coerce
      .number({ error: "Enter the amount recovered" })
      .min(0, "The amount recovered cannot be negative")
      .max(100_000, "That amount is larger than any appliance charge"),
  ),
  recoveredUnit: z.enum(MASS_INPUT_UNITS, { error: "Choose the unit of the amount" }),
  cylinderId: id("the recovery cylinder"),
  equipmentId: id("the recovery equipment"),
  evacuationValue: entered(
    z.coerce
      .number({ error: "Enter the evacuation level reached" })
      .min(-100_000, "Evacuation level out of range")
      .max(1_000_000, "Evacuation level out of range"),
  ),
  evacuationUnit: z.enum(EVACUATION_UNITS, { error: "Choose the unit of the evacuation level" }),
  accessMethod: z.enum(ACCESS_METHODS, { error: "Choose how the circuit was accessed" }),
  temporaryAccessRemoved: z.boolean().nullable().optional(),
  compressorOperating: z.boolean().nullable().optional(),
  notes: text().trim().max(2000, "Notes are limited to 2,000 characters").optional(),
  confirmOverFill: confirmOverFillField,
};

export function refineRecovery(
  value: {
    performedOn: string;
    recoveredAmount: number;
    recoveredUnit: string;
    accessMethod: string;
    temporaryAccessRemoved?: boolean | null;
    evacuationValue: number;
    evacuationUnit: string;
  },
  ctx: z.RefinementCtx,
): void {
  refuseFutureDate(ctx, value.performedOn, "performedOn");
  refineRecordableMass(ctx, value.recoveredAmount, value.recoveredUnit, "recoveredAmount");
  refineTemporaryAccess(ctx, value.accessMethod, value.temporaryAccessRemoved);
  refineEvacuationReading(ctx, value.evacuationValue, value.evacuationUnit);
}

/**
 * A recovery job as a technician enters it in the field. Shared by the job form (react-hook-form)
 * and POST /api/jobs; the database layer converts the amount to grams.
 */
export const recoveryJobInput = z.object({ kind: z.literal("recovery"), ...recoveryShape }).superRefine(refineRecovery);
export type RecoveryJobInput = z.infer<typeof recoveryJobInput>;

/** Query string of GET /api/jobs. */
export const JOB_SORT_FIELDS = ["performedOn", "kind", "branch", "technician", "appliance", "refrigerant", "amount"] as const;
/** Whether a list shows records voided as entered in error: left out (default), with the others, or only those. */
export const VOIDED_FILTERS = ["exclude", "include", "only"] as const;
export type VoidedFilter = (typeof VOIDED_FILTERS)[number];
export const jobListQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(JOB_SORT_FIELDS).default("performedOn"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  kind: z.enum(JOB_KINDS).optional(),
  branchId: z.coerce.number().int().positive().optional(),
  technicianId: z.coerce.number().int().positive().optional(),
  applianceId: z.coerce.number().int().positive().optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
  q: text().trim().max(100).optional(),
  voided: z.enum(VOIDED_FILTERS).optional(),
});
export type JobListQuery = z.infer<typeof jobListQuery>;
