import { z } from "zod";
import { text } from "./text";
import { amendmentReason } from "./jobs";
import {
  MASS_INPUT_UNITS,
  VOIDED_FILTERS,
  enteredValue,
  idField,
  isoDateField,
  massAmountField,
  optionalTextField,
  refineRecordableMass,
  refuseFutureDate,
  requiredTextField,
} from "./recovery-job";

/**
 * Recovered refrigerant sent to a reclaimer: which cylinders went, to whom, when. Each cylinder
 * ships its whole recorded contents and comes back empty (82.155(c)(3) transfers for reclamation).
 */
export const reclaimShipmentInput = z
  .object({
    branchId: idField("the branch"),
    shippedOn: isoDateField,
    reclaimerName: requiredTextField(200, "Enter the reclaimer's name"),
    reclaimerAddress: optionalTextField(500, "The address"),
    reference: optionalTextField(100, "The reference"),
    notes: optionalTextField(2000, "Notes"),
    cylinderIds: z
      .array(z.coerce.number().int().positive(), { error: "Choose the cylinders shipped" })
      .min(1, "Choose at least one cylinder to ship")
      .max(200, "At most 200 cylinders in one shipment"),
  })
  .superRefine((v, ctx) => {
    refuseFutureDate(ctx, v.shippedOn, "shippedOn", "The shipping date cannot be in the future");
    if (new Set(v.cylinderIds).size !== v.cylinderIds.length)
      ctx.addIssue({ code: "custom", path: ["cylinderIds"], message: "A cylinder is listed twice" });
  });
export type ReclaimShipmentInput = z.infer<typeof reclaimShipmentInput>;

/** Refrigerant bought by a branch. */
export const purchaseInput = z
  .object({
    branchId: idField("the branch"),
    purchasedOn: isoDateField,
    supplierName: requiredTextField(200, "Enter the supplier"),
    refrigerant: requiredTextField(32, "Enter the refrigerant bought"),
    amount: massAmountField("Enter the quantity bought", { positive: true }),
    unit: z.enum(MASS_INPUT_UNITS, { error: "Choose the unit of the quantity" }),
    containerCount: enteredValue(
      z.coerce
        .number({ error: "Enter a whole number of containers" })
        .int("Enter a whole number of containers")
        .min(1, "At least one container")
        .max(10_000)
        .optional(),
    ),
    invoiceReference: optionalTextField(100, "The invoice reference"),
  })
  .superRefine((v, ctx) => {
    refuseFutureDate(ctx, v.purchasedOn, "purchasedOn", "The purchase date cannot be in the future");
    refineRecordableMass(ctx, v.amount, v.unit, "amount");
  });
export type PurchaseInput = z.infer<typeof purchaseInput>;

const listBase = {
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  dir: z.enum(["asc", "desc"]).default("desc"),
  branchId: z.coerce.number().int().positive().optional(),
  from: isoDateField.optional(),
  to: isoDateField.optional(),
  q: text().trim().max(100).optional(),
  voided: z.enum(VOIDED_FILTERS).optional(),
};

export const shipmentListQuery = z.object({ ...listBase, sort: z.enum(["date", "branch", "reclaimer", "amount"]).default("date") });
export type ShipmentListQuery = z.infer<typeof shipmentListQuery>;

export const purchaseListQuery = z.object({
  ...listBase,
  sort: z.enum(["date", "branch", "supplier", "refrigerant", "amount"]).default("date"),
  refrigerant: text().trim().max(32).optional(),
});
export type PurchaseListQuery = z.infer<typeof purchaseListQuery>;

export const shipmentAmendmentInput = z.object({
  reason: amendmentReason,
  changes: z
    .object({
      shippedOn: isoDateField.optional(),
      reclaimerName: optionalTextField(200, "The reclaimer's name"),
      reclaimerAddress: optionalTextField(500, "The address"),
      reference: optionalTextField(100, "The reference"),
      notes: optionalTextField(2000, "Notes"),
    })
    .strict()
    .refine((c) => Object.values(c).some((v) => v !== undefined), "Change at least one field"),
});
export type ShipmentAmendmentInput = z.infer<typeof shipmentAmendmentInput>;

export const purchaseAmendmentInput = z.object({
  reason: amendmentReason,
  changes: z
    .object({
      purchasedOn: isoDateField.optional(),
      supplierName: optionalTextField(200, "The supplier"),
      amount: massAmountField("Enter the quantity bought", { positive: true }).optional(),
      unit: z.enum(MASS_INPUT_UNITS).optional(),
      containerCount: enteredValue(z.coerce.number().int().min(1).max(10_000).optional()),
      invoiceReference: optionalTextField(100, "The invoice reference"),
    })
    .strict()
    .refine((c) => Object.values(c).some((v) => v !== undefined), "Change at least one field")
    .refine((c) => c.amount === undefined || c.unit !== undefined, { path: ["unit"], message: "Choose the unit of the quantity" })
    .superRefine((c, ctx) => refineRecordableMass(ctx, c.amount, c.unit, "amount")),
});
export type PurchaseAmendmentInput = z.infer<typeof purchaseAmendmentInput>;
