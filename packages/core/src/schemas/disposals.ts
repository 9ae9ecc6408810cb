import { z } from "zod";
import { text } from "./text";
import { ACCESS_METHODS, EVACUATION_UNITS } from "../vocabulary";
import { amendmentReason, DISPOSAL_PATHS } from "./jobs";
import {
  MASS_INPUT_UNITS,
  VOIDED_FILTERS,
  enteredValue,
  idField,
  isoDateField,
  massAmountField,
  optionalIdField,
  optionalTextField,
  refineEvacuationReading,
  refineTemporaryAccess,
  confirmOverFillField,
  refineRecordableMass,
  refuseFutureDate,
  requiredTextField,
} from "./recovery-job";

/**
 * The disposal record for an appliance of more than 5 and less than 50 lb (40 CFR 82.155(c)):
 * company name, location of the appliance, date of recovery, type and quantity of refrigerant.
 */
export const disposalRecordInput = z
  .object({
    applianceId: idField("the appliance"),
    /** The disposal job that recovered the refrigerant, when there is one. */
    jobId: optionalIdField("the disposal job"),
    disposedOn: isoDateField,
    disposalPath: z.enum(DISPOSAL_PATHS).default("on_site"),
    companyName: requiredTextField(200, "Enter the company name"),
    applianceLocation: requiredTextField(500, "Enter where the appliance was"),
    recoveredOn: isoDateField,
    refrigerant: requiredTextField(32, "Enter the refrigerant recovered"),
    recoveredAmount: massAmountField("Enter the quantity recovered"),
    recoveredUnit: z.enum(MASS_INPUT_UNITS, { error: "Choose the unit of the quantity" }),
    sentTo: optionalTextField(200, "Where it went"),
  })
  .superRefine((v, ctx) => {
    refuseFutureDate(ctx, v.disposedOn, "disposedOn", "The disposal date cannot be in the future");
    refuseFutureDate(ctx, v.recoveredOn, "recoveredOn", "The date of recovery cannot be in the future");
    refineRecordableMass(ctx, v.recoveredAmount, v.recoveredUnit, "recoveredAmount");
  });
export type DisposalRecordInput = z.infer<typeof disposalRecordInput>;

/**
 * The signed statement for a small appliance (40 CFR 82.155(b)): name and address of the person who
 * recovered the refrigerant, the date of recovery, and who signed it when. Sent as form fields
 * (multipart when a signed document is attached).
 */
export const disposalStatementInput = z
  .object({
    applianceId: idField("the appliance"),
    jobId: optionalIdField("the disposal job"),
    recoveredByName: requiredTextField(200, "Enter the name of the person who recovered the refrigerant"),
    recoveredByAddress: requiredTextField(500, "Enter the address of the person who recovered the refrigerant"),
    recoveredOn: isoDateField,
    signedByName: requiredTextField(200, "Enter the name of the person who signed"),
    signedOn: isoDateField,
    contractReference: optionalTextField(200, "The contract reference"),
  })
  .superRefine((v, ctx) => {
    refuseFutureDate(ctx, v.recoveredOn, "recoveredOn", "The date of recovery cannot be in the future");
    refuseFutureDate(ctx, v.signedOn, "signedOn", "The date signed cannot be in the future");
    if (v.signedOn < v.recoveredOn)
      ctx.addIssue({ code: "custom", path: ["signedOn"], message: "The statement is signed on or after the date of recovery" });
  });
export type DisposalStatementInput = z.infer<typeof disposalStatementInput>;

/** One retired unit in the shop's scrap run: how much came out of it and how deep it was pulled down. */
export const shopDisposalItem = z
  .object({
    applianceId: idField("the appliance"),
    recoveredAmount: massAmountField("Enter the amount recovered"),
    recoveredUnit: z.enum(MASS_INPUT_UNITS, { error: "Choose the unit of the amount" }),
    evacuationValue: enteredValue(z.coerce.number({ error: "Enter the evacuation level reached" }).min(-100_000).max(1_000_000)),
    evacuationUnit: z.enum(EVACUATION_UNITS, { error: "Choose the unit of the evacuation level" }),
    compressorOperating: z.boolean().nullable().optional(),
  })
  .superRefine((v, ctx) => {
    refineRecordableMass(ctx, v.recoveredAmount, v.recoveredUnit, "recoveredAmount");
    refineEvacuationReading(ctx, v.evacuationValue, v.evacuationUnit);
  });

/**
 * The quick path for retired units waiting at the shop: several appliances recovered into one
 * cylinder with one machine on one day; each gets its disposal job and its record or statement.
 */
export const shopDisposalBatchInput = z
  .object({
    performedOn: isoDateField,
    cylinderId: idField("the recovery cylinder"),
    equipmentId: idField("the recovery equipment"),
    accessMethod: z.enum(ACCESS_METHODS, { error: "Choose how the circuits were accessed" }),
    temporaryAccessRemoved: z.boolean().nullable().optional(),
    sentTo: optionalTextField(200, "Where they go"),
    confirmStatement: z.literal(true, { error: "Confirm that you recovered the refrigerant before saving" }),
    confirmOverFill: confirmOverFillField,
    items: z.array(shopDisposalItem).min(1, "Pick at least one appliance").max(50, "At most 50 appliances at a time"),
  })
  .superRefine((v, ctx) => {
    refuseFutureDate(ctx, v.performedOn, "performedOn");
    refineTemporaryAccess(ctx, v.accessMethod, v.temporaryAccessRemoved);
    const seen = new Set<number>();
    v.items.forEach((item, i) => {
      if (seen.has(item.applianceId))
        ctx.addIssue({ code: "custom", path: ["items", i, "applianceId"], message: "This appliance is picked twice" });
      seen.add(item.applianceId);
    });
  });
export type ShopDisposalBatchInput = z.infer<typeof shopDisposalBatchInput>;

export const DISPOSAL_TYPES = ["record", "statement"] as const;
export type DisposalType = (typeof DISPOSAL_TYPES)[number];

/** Query string of GET /api/disposals. */
export const disposalListQuery = z.object({
  type: z.enum(DISPOSAL_TYPES).default("record"),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(["date", "appliance", "branch", "refrigerant", "amount"]).default("date"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  branchId: z.coerce.number().int().positive().optional(),
  from: isoDateField.optional(),
  to: isoDateField.optional(),
  q: text().trim().max(100).optional(),
  voided: z.enum(VOIDED_FILTERS).optional(),
});
export type DisposalListQuery = z.infer<typeof disposalListQuery>;

/** Query string of the monthly disposal quantities (82.155(c)(2)–(3)). */
export const disposalMonthlyQuery = z.object({
  branchId: z.coerce.number({ error: "Choose a branch" }).int().positive(),
  year: z.coerce.number().int().min(1990).max(2200),
});
export type DisposalMonthlyQuery = z.infer<typeof disposalMonthlyQuery>;

export const disposalRecordAmendmentInput = z.object({
  reason: amendmentReason,
  changes: z
    .object({
      disposedOn: isoDateField.optional(),
      companyName: optionalTextField(200, "The company name"),
      applianceLocation: optionalTextField(500, "The location"),
      recoveredOn: isoDateField.optional(),
      refrigerant: optionalTextField(32, "The refrigerant"),
      recoveredAmount: massAmountField("Enter the quantity recovered").optional(),
      recoveredUnit: z.enum(MASS_INPUT_UNITS).optional(),
      sentTo: optionalTextField(200, "Where it went"),
    })
    .strict()
    .refine((c) => Object.values(c).some((v) => v !== undefined), "Change at least one field")
    .refine((c) => c.recoveredAmount === undefined || c.recoveredUnit !== undefined, {
      path: ["recoveredUnit"],
      message: "Choose the unit of the quantity",
    })
    .superRefine((c, ctx) => refineRecordableMass(ctx, c.recoveredAmount, c.recoveredUnit, "recoveredAmount")),
});
export type DisposalRecordAmendmentInput = z.infer<typeof disposalRecordAmendmentInput>;

export const disposalStatementAmendmentInput = z.object({
  reason: amendmentReason,
  changes: z
    .object({
      recoveredByName: optionalTextField(200, "The name"),
      recoveredByAddress: optionalTextField(500, "The address"),
      recoveredOn: isoDateField.optional(),
      signedByName: optionalTextField(200, "The name"),
      signedOn: isoDateField.optional(),
      contractReference: optionalTextField(200, "The contract reference"),
    })
    .strict()
    .refine((c) => Object.values(c).some((v) => v !== undefined), "Change at least one field"),
});
export type DisposalStatementAmendmentInput = z.infer<typeof disposalStatementAmendmentInput>;

/** Attaching the signed document to a statement already on record is a correction with a reason. */
export const statementDocumentInput = z.object({ reason: amendmentReason });
export type StatementDocumentInput = z.infer<typeof statementDocumentInput>;
