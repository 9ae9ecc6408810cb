import { z } from "zod";
import { text } from "./text";
import { ACCESS_METHODS, EVACUATION_UNITS, JOB_KINDS } from "../vocabulary";
import {
  MASS_INPUT_UNITS,
  confirmOverFillField,
  enteredValue,
  idField,
  isoDateField,
  massAmountField,
  optionalIdField,
  optionalTextField,
  recoveryJobInput,
  recoveryShape,
  refineEvacuationReading,
  refineRecordableMass,
  refineRecovery,
  refineTemporaryAccess,
  refuseFutureDate,
  requiredTextField,
} from "./recovery-job";

/**
 * Charges not counted in the leak rate (40 CFR 82.152 "leak rate"): an addition right after a
 * retrofit, at the installation of a new appliance, or returning refrigerant removed for a seasonal
 * variance. Stored as these words; the rules core calls the last one "seasonal_variance".
 */
export const ADDITION_EXCLUSIONS = ["retrofit", "installation", "seasonal"] as const;
export type AdditionExclusionChoice = (typeof ADDITION_EXCLUSIONS)[number];
export const ADDITION_EXCLUSION_LABELS: Record<AdditionExclusionChoice, string> = {
  retrofit: "Right after a retrofit",
  installation: "At installation of a new appliance",
  seasonal: "Seasonal variance (returning refrigerant removed this season)",
};

/** Where the refrigerant added came from. */
export const CHARGE_SOURCES = ["stock", "cylinder"] as const;
export type ChargeSource = (typeof CHARGE_SOURCES)[number];
export const CHARGE_SOURCE_LABELS: Record<ChargeSource, string> = {
  stock: "New refrigerant from the branch's stock",
  cylinder: "Recovered refrigerant from a recovery cylinder (same owner)",
};

export const VERIFICATION_STAGES = ["initial", "follow_up"] as const;
export type VerificationStage = (typeof VERIFICATION_STAGES)[number];
export const VERIFICATION_STAGE_LABELS: Record<VerificationStage, string> = {
  initial: "Initial test (right after the repair)",
  follow_up: "Follow-up test (after normal operation resumed)",
};

/** Where an appliance is taken apart: at the customer's site, or at the branch's shop after retirement. */
export const DISPOSAL_PATHS = ["on_site", "shop"] as const;
export type DisposalPath = (typeof DISPOSAL_PATHS)[number];
export const DISPOSAL_PATH_LABELS: Record<DisposalPath, string> = {
  on_site: "At the customer's site",
  shop: "At our shop (retired unit waiting to be scrapped)",
};

const notes = text().trim().max(2000, "Notes are limited to 2,000 characters").optional();
const optionalAccess = {
  accessMethod: enteredValue(z.enum(ACCESS_METHODS, { error: "Choose how the circuit was accessed" }).nullable().optional()),
  temporaryAccessRemoved: z.boolean().nullable().optional(),
};

/** Refrigerant added to an appliance; the leak rate is calculated from these (82.157(c)). */
export const chargeJobInput = z
  .object({
    kind: z.literal("charge"),
    applianceId: idField("the appliance"),
    performedOn: isoDateField,
    refrigerant: text().trim().min(1, "Refrigerant is required").max(32),
    chargedAmount: massAmountField("Enter the amount added", { positive: true }),
    chargedUnit: z.enum(MASS_INPUT_UNITS, { error: "Choose the unit of the amount" }),
    chargeSource: z.enum(CHARGE_SOURCES, { error: "Say where the refrigerant came from" }),
    cylinderId: optionalIdField("the cylinder it came from"),
    additionExclusion: enteredValue(z.enum(ADDITION_EXCLUSIONS).nullable().optional()),
    /** An earlier charge on the same appliance whose leak this addition also tops up (82.152). */
    sameLeakAsJobId: optionalIdField("the earlier job for the same leak"),
    ...optionalAccess,
    notes,
  })
  .superRefine((value, ctx) => {
    refuseFutureDate(ctx, value.performedOn, "performedOn");
    refineRecordableMass(ctx, value.chargedAmount, value.chargedUnit, "chargedAmount");
    refineTemporaryAccess(ctx, value.accessMethod, value.temporaryAccessRemoved);
    if (value.chargeSource === "cylinder" && value.cylinderId === undefined) {
      ctx.addIssue({ code: "custom", path: ["cylinderId"], message: "Choose the cylinder it came from" });
    }
  });
export type ChargeJobInput = z.infer<typeof chargeJobInput>;

/** A leak found and repaired (82.157(d)). */
export const leakRepairJobInput = z
  .object({
    kind: z.literal("leak_repair"),
    applianceId: idField("the appliance"),
    performedOn: isoDateField,
    leakLocation: requiredTextField(500, "Say where the leak was"),
    repairDescription: requiredTextField(2000, "Say what was repaired"),
    shutdownNeeded: z.boolean().nullable().optional(),
    ...optionalAccess,
    notes,
  })
  .superRefine((value, ctx) => {
    refuseFutureDate(ctx, value.performedOn, "performedOn");
    refineTemporaryAccess(ctx, value.accessMethod, value.temporaryAccessRemoved);
  });
export type LeakRepairJobInput = z.infer<typeof leakRepairJobInput>;

/** Initial or follow-up verification test of a leak repair (82.157(e)). */
export const verificationTestJobInput = z
  .object({
    kind: z.literal("verification_test"),
    applianceId: idField("the appliance"),
    performedOn: isoDateField,
    verificationStage: z.enum(VERIFICATION_STAGES, { error: "Choose initial or follow-up" }),
    verificationPassed: z.boolean({ error: "Say whether the test passed" }),
    verificationMethod: requiredTextField(200, "Say how the repair was tested"),
    relatedJobId: optionalIdField("the repair this test checks"),
    notes,
  })
  .superRefine((value, ctx) => refuseFutureDate(ctx, value.performedOn, "performedOn"));
export type VerificationTestJobInput = z.infer<typeof verificationTestJobInput>;

/** Disposal of an appliance, with the recovery of its refrigerant (82.155). */
export const disposalJobInput = z
  .object({
    kind: z.literal("disposal"),
    ...recoveryShape,
    disposalPath: z.enum(DISPOSAL_PATHS, { error: "Say where the appliance is disposed of" }).default("on_site"),
  })
  .superRefine(refineRecovery);
export type DisposalJobInput = z.infer<typeof disposalJobInput>;

/** Every kind of job, told apart by `kind`. POST /api/jobs and the job form share it. */
export const jobInput = z.discriminatedUnion(
  "kind",
  [recoveryJobInput, chargeJobInput, leakRepairJobInput, verificationTestJobInput, disposalJobInput],
  { error: "Choose the kind of job" },
);
export type JobInput = z.infer<typeof jobInput>;

/** Lenient number for a draft: what cannot be read yet is simply not entered. */
const draftNumber = z
  .preprocess((v) => (v === "" || v === null || v === undefined ? undefined : Number(v)), z.number().finite().optional())
  .catch(undefined);
const draftId = z
  .preprocess((v) => (v === "" || v === null || v === undefined ? undefined : Number(v)), z.number().int().positive().optional())
  .catch(undefined);
const draftEnum = <T extends readonly [string, ...string[]]>(values: T) => z.enum(values).nullable().optional().catch(undefined);

/**
 * A job still being typed, for POST /api/jobs/check. Everything is optional and a half-typed value
 * counts as not entered: the check says what would become a finding, the form says what is missing.
 */
export const jobDraftInput = z.object({
  kind: z.enum(JOB_KINDS, { error: "Choose the kind of job" }),
  applianceId: draftId,
  performedOn: isoDateField.optional().catch(undefined),
  refrigerant: text().trim().max(32).optional().catch(undefined),
  recoveredAmount: draftNumber,
  recoveredUnit: draftEnum(MASS_INPUT_UNITS),
  chargedAmount: draftNumber,
  chargedUnit: draftEnum(MASS_INPUT_UNITS),
  chargeSource: draftEnum(CHARGE_SOURCES),
  cylinderId: draftId,
  equipmentId: draftId,
  evacuationValue: draftNumber,
  evacuationUnit: draftEnum(EVACUATION_UNITS),
  accessMethod: draftEnum(ACCESS_METHODS),
  temporaryAccessRemoved: z.boolean().nullable().optional().catch(undefined),
  compressorOperating: z.boolean().nullable().optional().catch(undefined),
  additionExclusion: draftEnum(ADDITION_EXCLUSIONS),
  sameLeakAsJobId: draftId,
  verificationStage: draftEnum(VERIFICATION_STAGES),
  verificationPassed: z.boolean().nullable().optional().catch(undefined),
});
export type JobDraftInput = z.infer<typeof jobDraftInput>;

/** Why a regulated record is voided (entered in error). Shared by every record type. */
export const voidRecordInput = z.object({
  reason: text({ error: "Say why the record is being voided" })
    .trim()
    .min(3, "Say why the record is being voided")
    .max(1000, "Limited to 1,000 characters"),
});
export type VoidRecordInput = z.infer<typeof voidRecordInput>;

/** Why a regulated record is corrected; every amendment carries one. */
export const amendmentReason = text({ error: "Say why the record is being corrected" })
  .trim()
  .min(3, "Say why the record is being corrected")
  .max(1000, "Limited to 1,000 characters");

/**
 * A correction of a job: only the fields that change, and why. The database keeps the previous
 * values; an amount change moves the cylinder contents with it.
 */
export const jobAmendmentInput = z
  .object({
    reason: amendmentReason,
    confirmOverFill: confirmOverFillField,
    changes: z
      .object({
        performedOn: isoDateField.optional(),
        amount: massAmountField("Enter the amount").optional(),
        amountUnit: z.enum(MASS_INPUT_UNITS).optional(),
        cylinderId: optionalIdField("the cylinder"),
        equipmentId: optionalIdField("the recovery equipment"),
        evacuationValue: enteredValue(
          z.coerce.number({ error: "Enter the evacuation level reached" }).min(-100_000).max(1_000_000).optional(),
        ),
        evacuationUnit: z.enum(EVACUATION_UNITS).optional(),
        accessMethod: enteredValue(z.enum(ACCESS_METHODS).nullable().optional()),
        temporaryAccessRemoved: z.boolean().nullable().optional(),
        compressorOperating: z.boolean().nullable().optional(),
        additionExclusion: z.preprocess((v) => (v === "" ? null : v), z.enum(ADDITION_EXCLUSIONS).nullable().optional()),
        leakLocation: optionalTextField(500, "The leak location"),
        repairDescription: optionalTextField(2000, "The repair description"),
        shutdownNeeded: z.boolean().nullable().optional(),
        verificationStage: z.enum(VERIFICATION_STAGES).optional(),
        verificationPassed: z.boolean().optional(),
        verificationMethod: optionalTextField(200, "The test method"),
        notes: text().trim().max(2000, "Notes are limited to 2,000 characters").optional(),
      })
      .strict(),
  })
  .superRefine((value, ctx) => {
    const c = value.changes;
    if (Object.values(c).every((v) => v === undefined)) {
      ctx.addIssue({ code: "custom", path: ["changes"], message: "Change at least one field" });
    }
    if (c.amount !== undefined && c.amountUnit === undefined) {
      ctx.addIssue({ code: "custom", path: ["changes", "amountUnit"], message: "Choose the unit of the amount" });
    }
    refuseFutureDate(ctx, c.performedOn, "changes.performedOn");
    refineRecordableMass(ctx, c.amount, c.amountUnit, "changes.amount");
    refineEvacuationReading(ctx, c.evacuationValue, c.evacuationUnit, "changes.evacuationValue");
  });
export type JobAmendmentInput = z.infer<typeof jobAmendmentInput>;
