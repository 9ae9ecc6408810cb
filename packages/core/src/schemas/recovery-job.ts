import { z } from "zod";
import { ACCESS_METHODS, EVACUATION_UNITS, TEMPORARY_ACCESS_METHODS } from "../vocabulary";

/** Units a mass may be entered in on a form; stored as integer grams. */
export const MASS_INPUT_UNITS = ["lb", "oz", "kg", "g"] as const;
export type MassInputUnit = (typeof MASS_INPUT_UNITS)[number];

const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date like 2026-03-14");
/** A number typed into a form: an empty box means "not entered", never zero. */
const entered = <T extends z.ZodType>(schema: T) =>
  z.preprocess((v) => (v === "" || v === null || (typeof v === "string" && v.trim() === "") ? undefined : v), schema);
const id = (what: string) =>
  entered(z.coerce.number({ error: `Choose ${what}` }).int(`Choose ${what}`).positive(`Choose ${what}`));

/**
 * A recovery job as a technician enters it in the field. Shared by the job form (react-hook-form)
 * and POST /api/jobs; the database layer converts the amount to grams.
 */
export const recoveryJobInput = z
  .object({
    kind: z.literal("recovery"),
    applianceId: id("the appliance"),
    performedOn: isoDate,
    refrigerant: z.string().trim().min(1, "Refrigerant is required").max(32),
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
    notes: z.string().trim().max(2000, "Notes are limited to 2,000 characters").optional(),
  })
  .superRefine((value, ctx) => {
    // One day of slack: the technician's calendar date may be ahead of UTC.
    const latest = new Date(Date.now() + 24 * 3600 * 1000).toISOString().slice(0, 10);
    if (value.performedOn > latest) {
      ctx.addIssue({ code: "custom", path: ["performedOn"], message: "The date of the work cannot be in the future" });
    }
    const temporary = TEMPORARY_ACCESS_METHODS.includes(value.accessMethod);
    if (temporary && (value.temporaryAccessRemoved === undefined || value.temporaryAccessRemoved === null)) {
      ctx.addIssue({
        code: "custom",
        path: ["temporaryAccessRemoved"],
        message: "Say whether the temporary piercing device was removed",
      });
    }
    if (value.evacuationUnit !== "psig" && value.evacuationValue < 0) {
      ctx.addIssue({ code: "custom", path: ["evacuationValue"], message: "This unit cannot be negative" });
    }
    if (value.evacuationUnit === "in_hg_vacuum" && value.evacuationValue > 29.92) {
      ctx.addIssue({
        code: "custom",
        path: ["evacuationValue"],
        message: "A vacuum cannot be deeper than 29.92 in Hg",
      });
    }
  });
export type RecoveryJobInput = z.infer<typeof recoveryJobInput>;

/** Query string of GET /api/jobs. */
export const JOB_SORT_FIELDS = ["performedOn", "kind", "branch", "technician", "appliance", "refrigerant", "amount"] as const;
export const jobListQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(JOB_SORT_FIELDS).default("performedOn"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  kind: z.enum(["recovery", "charge", "leak_repair", "verification_test", "disposal"]).optional(),
  branchId: z.coerce.number().int().positive().optional(),
  technicianId: z.coerce.number().int().positive().optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
  q: z.string().trim().max(100).optional(),
});
export type JobListQuery = z.infer<typeof jobListQuery>;
