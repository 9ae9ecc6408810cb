import { z } from "zod";
import { text } from "./text";
import { calendarDate } from "./calendar-date";
import { refineRecordableMass } from "./recovery-job";
import { getRefrigerant } from "../refrigerants/catalogue";
import { normaliseDesignation } from "../refrigerants/normalise-designation";
import { SMALL_APPLIANCE_MAX_CHARGE_G } from "../classification/appliance-classification";
import { toGrams } from "../units/mass";
import {
  APPLIANCE_CATEGORIES,
  APPLIANCE_STATUSES,
  EQUIPMENT_CERTIFICATION_STATES,
  FULL_CHARGE_METHODS,
  type ApplianceStatus,
  type EquipmentCertificationState,
  type FullChargeMethod,
} from "../vocabulary";
import { MASS_INPUT_UNITS } from "./recovery-job";

/**
 * Input schemas of the registers: appliances (with their site and customer), recovery equipment,
 * recovery cylinders and cylinder weighings. Shared by the API routes and the forms; the database
 * layer converts amounts to integer grams and checks what needs the stored record.
 */

/** Cylinder register states: a cylinder is never deleted, it changes state. */
export const CYLINDER_STATUSES = ["in_service", "at_reclaimer", "retired"] as const;
export type CylinderStatus = (typeof CYLINDER_STATUSES)[number];

export const CYLINDER_PURPOSES = ["recovery", "charging"] as const;
export type CylinderPurpose = (typeof CYLINDER_PURPOSES)[number];

export const EQUIPMENT_STATUSES = ["in_service", "retired"] as const;
export type EquipmentStatus = (typeof EQUIPMENT_STATUSES)[number];

export const TEMPERATURE_INPUT_UNITS = ["F", "C"] as const;
export type TemperatureInputUnit = (typeof TEMPERATURE_INPUT_UNITS)[number];

/** Plain words for the register states, in one place for tables, badges and forms. */
export const REGISTER_LABELS = {
  applianceStatus: { in_service: "In service", retired: "Retired", disposed: "Disposed of" } satisfies Record<ApplianceStatus, string>,
  fullChargeMethod: {
    nameplate: "Nameplate",
    manufacturer_data: "Manufacturer's data",
    calculation: "Calculated from the components and line sets",
    established_range: "Established range (best judgement)",
  } satisfies Record<FullChargeMethod, string>,
  equipmentCertification: {
    certified: "Certified",
    not_certified: "Not certified",
    unknown: "Certification unknown",
  } satisfies Record<EquipmentCertificationState, string>,
  equipmentStatus: { in_service: "In service", retired: "Retired" } satisfies Record<EquipmentStatus, string>,
  cylinderStatus: { in_service: "In service", at_reclaimer: "At the reclaimer", retired: "Retired" } satisfies Record<
    CylinderStatus,
    string
  >,
  cylinderPurpose: { recovery: "Recovery", charging: "Charging" } satisfies Record<CylinderPurpose, string>,
} as const;

/** Cylinder specifications people commonly type (49 CFR 178 markings); the field stays free text. */
export const COMMON_CYLINDER_SPECIFICATIONS = ["DOT-4BA", "DOT-4BA400", "DOT-4BW", "DOT-4BW400", "DOT-4BA350", "DOT-4BW350"] as const;

const isoDate = calendarDate("Use a date like 2026-03-14");
/** A box left empty means "not entered". */
const blankToUndefined = (v: unknown) => (v === "" || v === null || (typeof v === "string" && v.trim() === "") ? undefined : v);
const entered = <T extends z.ZodType>(schema: T) => z.preprocess(blankToUndefined, schema);
const optionalDate = entered(isoDate.optional());
const optionalText = (max: number, what: string) =>
  entered(
    text()
      .trim()
      .max(max, `${what} is limited to ${max.toLocaleString("en-US")} characters`)
      .optional(),
  );
const requiredText = (max: number, missing: string, what: string) =>
  text({ error: missing })
    .trim()
    .min(1, missing)
    .max(max, `${what} is limited to ${max.toLocaleString("en-US")} characters`);
const id = (what: string) =>
  entered(
    z.coerce
      .number({ error: `Choose ${what}` })
      .int(`Choose ${what}`)
      .positive(`Choose ${what}`),
  );
const optionalId = (what: string) => entered(z.coerce.number().int(`Choose ${what}`).positive(`Choose ${what}`).optional());
/** A positive amount typed into a form; its upper bound is checked in grams (see `withinGrams`). */
const amount = (missing: string, what: string) =>
  entered(
    z.coerce
      .number({ error: missing })
      .refine((n) => Number.isFinite(n), missing)
      .refine((n) => n > 0, `${what} must be more than zero`)
      .refine((n) => n <= 1e9, `${what} is larger than any real one; check the unit`),
  );
/** Refuses an amount above `maxG` once converted, naming the field. */
function withinGrams(
  ctx: z.RefinementCtx,
  path: string,
  value: number | undefined,
  unit: (typeof MASS_INPUT_UNITS)[number] | undefined,
  maxG: number,
  what: string,
): void {
  if (value === undefined || unit === undefined || !Number.isFinite(value)) return;
  refineRecordableMass(ctx, value, unit, path);
  if (toGrams(value, unit) > maxG)
    ctx.addIssue({ code: "custom", path: [path], message: `${what} is larger than any real one; check the unit` });
}
/** Upper bounds, generous: the largest industrial systems hold tens of tonnes; ton containers about 1 t of water. */
const MAX_FULL_CHARGE_G = 100_000_000;
const MAX_WATER_CAPACITY_G = 2_000_000;
const MAX_TARE_G = 1_000_000;
const MAX_GROSS_G = 3_000_000;
const checkbox = z.preprocess((v) => (v === "true" || v === "on" ? true : v === "false" || v === undefined ? false : v), z.boolean());

/** One day of slack: a person's calendar date may be ahead of UTC. */
function latestAllowedDate(): string {
  return new Date(Date.now() + 24 * 3600 * 1000).toISOString().slice(0, 10);
}
const notFuture = (ctx: z.RefinementCtx, value: string | undefined, path: string, message: string) => {
  if (value && value > latestAllowedDate()) ctx.addIssue({ code: "custom", path: [path], message });
};

/** A refrigerant designation in any spelling ("r410a"), normalised ("R-410A") and known to the catalogue. */
export const refrigerantDesignation = text({ error: "Enter the refrigerant" })
  .trim()
  .min(1, "Enter the refrigerant")
  .max(32, "A refrigerant designation is at most 32 characters")
  .transform((v) => normaliseDesignation(v))
  .refine((v) => getRefrigerant(v) !== undefined, {
    message: "That refrigerant is not in the catalogue; use its ASHRAE designation, e.g. R-410A",
  });

// ---------------------------------------------------------------------------------------------
// Appliances
// ---------------------------------------------------------------------------------------------

export const SITE_CHOICES = ["existing", "new"] as const;
export const CUSTOMER_CHOICES = ["none", "existing", "new"] as const;

const applianceFields = {
  /** Pick an existing site of the branch, or create one (with an existing, a new or no customer). */
  siteChoice: z.enum(SITE_CHOICES, { error: "Choose an existing site or add a new one" }),
  siteId: optionalId("the site"),
  newSiteName: optionalText(200, "The site name"),
  newSiteAddress: optionalText(500, "The address"),
  customerChoice: z.enum(CUSTOMER_CHOICES).default("none"),
  customerId: optionalId("the customer"),
  newCustomerName: optionalText(200, "The customer name"),

  tag: requiredText(64, "Give the appliance a tag people will recognise, e.g. RTU-07", "The tag"),
  description: requiredText(300, "Describe the appliance, e.g. Rooftop unit over the bakery", "The description"),
  category: z.enum(APPLIANCE_CATEGORIES, { error: "Choose the kind of appliance" }),
  refrigerant: refrigerantDesignation,
  fullChargeAmount: amount("Enter the full charge", "The full charge"),
  fullChargeUnit: z.enum(MASS_INPUT_UNITS, { error: "Choose the unit of the full charge" }),
  fullChargeMethod: z.enum(FULL_CHARGE_METHODS, { error: "Say how the full charge was determined" }),
  factorySealed: checkbox,
  hasLeakDetection: checkbox,
  industrialShutdownNeeded: checkbox,
  makeModel: optionalText(200, "Make and model"),
  serialNumber: optionalText(100, "The serial number"),
  manufacturedOn: optionalDate,
  installedOn: optionalDate,
};

type ApplianceFieldsOut = {
  siteChoice: (typeof SITE_CHOICES)[number];
  siteId?: number | undefined;
  newSiteName?: string | undefined;
  customerChoice: (typeof CUSTOMER_CHOICES)[number];
  customerId?: number | undefined;
  newCustomerName?: string | undefined;
  category: (typeof APPLIANCE_CATEGORIES)[number];
  fullChargeAmount: number;
  fullChargeUnit: (typeof MASS_INPUT_UNITS)[number];
  factorySealed: boolean;
  manufacturedOn?: string | undefined;
  installedOn?: string | undefined;
};

function checkApplianceFields(value: ApplianceFieldsOut, ctx: z.RefinementCtx): void {
  if (value.siteChoice === "existing" && value.siteId === undefined) {
    ctx.addIssue({ code: "custom", path: ["siteId"], message: "Choose the site" });
  }
  if (value.siteChoice === "new") {
    if (!value.newSiteName) ctx.addIssue({ code: "custom", path: ["newSiteName"], message: "Name the new site" });
    if (value.customerChoice === "existing" && value.customerId === undefined) {
      ctx.addIssue({ code: "custom", path: ["customerId"], message: "Choose the customer" });
    }
    if (value.customerChoice === "new" && !value.newCustomerName) {
      ctx.addIssue({ code: "custom", path: ["newCustomerName"], message: "Name the new customer" });
    }
  }
  withinGrams(ctx, "fullChargeAmount", value.fullChargeAmount, value.fullChargeUnit, MAX_FULL_CHARGE_G, "The full charge");
  // 40 CFR 82.152: a small appliance is fully manufactured, charged and hermetically sealed in a factory with 5 lb or less.
  if (value.category === "small_appliance") {
    if (Number.isFinite(value.fullChargeAmount) && toGrams(value.fullChargeAmount, value.fullChargeUnit) > SMALL_APPLIANCE_MAX_CHARGE_G) {
      ctx.addIssue({
        code: "custom",
        path: ["fullChargeAmount"],
        message: "A small appliance holds 5 lb (2.268 kg) or less; choose another kind of appliance",
      });
    }
    if (!value.factorySealed) {
      ctx.addIssue({
        code: "custom",
        path: ["factorySealed"],
        message: "A small appliance is charged and sealed in the factory; tick this or choose another kind",
      });
    }
  }
  notFuture(ctx, value.manufacturedOn, "manufacturedOn", "The manufacture date cannot be in the future");
  notFuture(ctx, value.installedOn, "installedOn", "The installation date cannot be in the future");
  if (value.manufacturedOn && value.installedOn && value.installedOn < value.manufacturedOn) {
    ctx.addIssue({ code: "custom", path: ["installedOn"], message: "Installed before it was made? Check both dates" });
  }
}

/** A new appliance in a branch's register (POST /api/appliances). */
export const applianceInput = z
  .object({
    branchId: id("the branch"),
    ...applianceFields,
    status: z.enum(["in_service", "retired"], { error: "Choose the status" }).default("in_service"),
    /** Date it was retired, when registered as retired (e.g. a unit waiting at the shop for scrap). */
    retiredOn: optionalDate,
  })
  .superRefine((value, ctx) => {
    checkApplianceFields(value, ctx);
    if (value.status === "retired" && !value.retiredOn) {
      ctx.addIssue({ code: "custom", path: ["retiredOn"], message: "Enter the date it was taken out of service" });
    }
    notFuture(ctx, value.retiredOn, "retiredOn", "The date cannot be in the future");
  });
export type ApplianceInput = z.output<typeof applianceInput>;

/**
 * An edit of an appliance (PATCH /api/appliances/:id). Changing the refrigerant, full charge or
 * category corrects a regulated record: the server then requires `reason` and keeps an amendment.
 */
export const applianceUpdateInput = z
  .object({ ...applianceFields, reason: optionalText(1000, "The reason") })
  .superRefine((value, ctx) => checkApplianceFields(value, ctx));
export type ApplianceUpdateInput = z.output<typeof applianceUpdateInput>;

/** A change of an appliance's status, with the date and why (POST /api/appliances/:id/status). */
export const applianceStatusInput = z
  .object({
    status: z.enum(APPLIANCE_STATUSES, { error: "Choose the new status" }),
    on: isoDate,
    reason: text({ error: "Say why the status changes" })
      .trim()
      .min(3, "Say why the status changes")
      .max(1000, "The reason is limited to 1,000 characters"),
  })
  .superRefine((value, ctx) => notFuture(ctx, value.on, "on", "The date cannot be in the future"));
export type ApplianceStatusInput = z.output<typeof applianceStatusInput>;

export const APPLIANCE_SORT_FIELDS = ["tag", "branch", "category", "refrigerant", "fullCharge", "status", "site", "installedOn"] as const;
/** Query string of GET /api/appliances. */
export const applianceListQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(APPLIANCE_SORT_FIELDS).default("tag"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  branchId: z.coerce.number().int().positive().optional(),
  category: z.enum(APPLIANCE_CATEGORIES).optional(),
  status: z.enum(APPLIANCE_STATUSES).optional(),
  refrigerant: text()
    .trim()
    .max(32)
    .transform((v) => (v ? normaliseDesignation(v) : undefined))
    .optional(),
  q: text().trim().max(100).optional(),
});
export type ApplianceListQuery = z.output<typeof applianceListQuery>;

/** Query string of the appliance's refrigerant history (GET /api/appliances/:id/history). */
export const registerHistoryQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(10),
  dir: z.enum(["asc", "desc"]).default("desc"),
});
export type RegisterHistoryQuery = z.output<typeof registerHistoryQuery>;

/** Sites or customers of a branch for the appliance form's pickers. */
export const registerPickerQuery = z.object({
  branchId: z.coerce.number({ error: "Choose a branch" }).int().positive(),
  q: text().trim().max(100).optional(),
  limit: z.coerce.number().int().min(1).max(50).default(20),
});
export type RegisterPickerQuery = z.output<typeof registerPickerQuery>;

// ---------------------------------------------------------------------------------------------
// Recovery equipment
// ---------------------------------------------------------------------------------------------

const equipmentFields = {
  serial: requiredText(64, "Enter the serial number from the unit's label", "The serial number"),
  makeModel: optionalText(200, "Make and model"),
  manufacturedOn: optionalDate,
  certificationState: z.enum(EQUIPMENT_CERTIFICATION_STATES, { error: "Choose the certification status" }),
  certifiedBy: optionalText(200, "The testing organisation"),
  smallApplianceOnly: checkbox,
  systemDependent: checkbox,
  status: z.enum(EQUIPMENT_STATUSES, { error: "Choose the status" }).default("in_service"),
};

function checkEquipmentFields(value: { manufacturedOn?: string | undefined }, ctx: z.RefinementCtx): void {
  notFuture(ctx, value.manufacturedOn, "manufacturedOn", "The manufacture date cannot be in the future");
}

/** New recovery equipment in a branch's register (POST /api/equipment). */
export const equipmentInput = z.object({ branchId: id("the branch"), ...equipmentFields }).superRefine(checkEquipmentFields);
export type EquipmentInput = z.output<typeof equipmentInput>;

/** An edit (PATCH /api/equipment/:id); a new manufacture date or certification status needs a reason. */
export const equipmentUpdateInput = z
  .object({ ...equipmentFields, reason: optionalText(1000, "The reason") })
  .superRefine(checkEquipmentFields);
export type EquipmentUpdateInput = z.output<typeof equipmentUpdateInput>;

export const EQUIPMENT_SORT_FIELDS = ["serial", "branch", "makeModel", "manufacturedOn", "certificationState", "status"] as const;
export const equipmentListQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(EQUIPMENT_SORT_FIELDS).default("serial"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  branchId: z.coerce.number().int().positive().optional(),
  certificationState: z.enum(EQUIPMENT_CERTIFICATION_STATES).optional(),
  status: z.enum(EQUIPMENT_STATUSES).optional(),
  q: text().trim().max(100).optional(),
});
export type EquipmentListQuery = z.output<typeof equipmentListQuery>;

// ---------------------------------------------------------------------------------------------
// Cylinders
// ---------------------------------------------------------------------------------------------

const cylinderFields = {
  serial: requiredText(64, "Enter the serial number stamped on the cylinder", "The serial number"),
  specification: entered(
    text()
      .trim()
      .max(64, "The specification is limited to 64 characters")
      .transform((v) => v.toUpperCase().replace(/\s+/g, "-"))
      .optional(),
  ),
  purpose: z.enum(CYLINDER_PURPOSES).default("recovery"),
  waterCapacityAmount: amount("Enter the water capacity stamped on the cylinder (WC)", "The water capacity"),
  waterCapacityUnit: z.enum(MASS_INPUT_UNITS, { error: "Choose the unit of the water capacity" }),
  tareAmount: amount("Enter the tare weight stamped on the cylinder (TW)", "The tare weight"),
  tareUnit: z.enum(MASS_INPUT_UNITS, { error: "Choose the unit of the tare weight" }),
  manufacturedOn: optionalDate,
  lastRequalifiedOn: optionalDate,
  status: z.enum(CYLINDER_STATUSES, { error: "Choose the status" }).default("in_service"),
};

function checkCylinderFields(
  value: {
    manufacturedOn?: string | undefined;
    lastRequalifiedOn?: string | undefined;
    waterCapacityAmount: number;
    waterCapacityUnit: (typeof MASS_INPUT_UNITS)[number];
    tareAmount: number;
    tareUnit: (typeof MASS_INPUT_UNITS)[number];
  },
  ctx: z.RefinementCtx,
): void {
  withinGrams(ctx, "waterCapacityAmount", value.waterCapacityAmount, value.waterCapacityUnit, MAX_WATER_CAPACITY_G, "The water capacity");
  withinGrams(ctx, "tareAmount", value.tareAmount, value.tareUnit, MAX_TARE_G, "The tare weight");
  notFuture(ctx, value.manufacturedOn, "manufacturedOn", "The manufacture date cannot be in the future");
  notFuture(ctx, value.lastRequalifiedOn, "lastRequalifiedOn", "The requalification date cannot be in the future");
  if (value.manufacturedOn && value.lastRequalifiedOn && value.lastRequalifiedOn < value.manufacturedOn) {
    ctx.addIssue({ code: "custom", path: ["lastRequalifiedOn"], message: "Requalified before it was made? Check both dates" });
  }
}

/** A new cylinder in a branch's register (POST /api/cylinders). It starts empty; jobs and weighings fill in its contents. */
export const cylinderInput = z.object({ branchId: id("the branch"), ...cylinderFields }).superRefine(checkCylinderFields);
export type CylinderInput = z.output<typeof cylinderInput>;

/** An edit (PATCH /api/cylinders/:id); new tare, water capacity or requalification date needs a reason. */
export const cylinderUpdateInput = z
  .object({ ...cylinderFields, reason: optionalText(1000, "The reason") })
  .superRefine(checkCylinderFields);
export type CylinderUpdateInput = z.output<typeof cylinderUpdateInput>;

export const CYLINDER_SORT_FIELDS = ["serial", "branch", "refrigerant", "contents", "lastRequalifiedOn", "status"] as const;
export const REQUALIFICATION_FILTERS = ["overdue", "due_soon", "current", "unknown"] as const;
export type RequalificationFilter = (typeof REQUALIFICATION_FILTERS)[number];
export const cylinderListQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(CYLINDER_SORT_FIELDS).default("serial"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  branchId: z.coerce.number().int().positive().optional(),
  status: z.enum(CYLINDER_STATUSES).optional(),
  refrigerant: text()
    .trim()
    .max(32)
    .transform((v) => (v ? normaliseDesignation(v) : undefined))
    .optional(),
  requalification: z.enum(REQUALIFICATION_FILTERS).optional(),
  q: text().trim().max(100).optional(),
});
export type CylinderListQuery = z.output<typeof cylinderListQuery>;

const weighingFields = {
  weighedOn: isoDate,
  grossAmount: amount("Enter the scale reading (cylinder and contents)", "The scale reading"),
  grossUnit: z.enum(MASS_INPUT_UNITS, { error: "Choose the unit of the scale reading" }),
  /** Defaults to what the cylinder holds. */
  refrigerant: entered(refrigerantDesignation.optional()),
  pressurePsig: entered(
    z.coerce
      .number({ error: "Enter the gauge pressure as a number" })
      .min(-14.7, "A gauge cannot read below -14.7 psig")
      .max(1000, "That pressure is beyond any recovery cylinder's rating")
      .optional(),
  ),
  temperatureValue: entered(
    z.coerce
      .number({ error: "Enter the temperature as a number" })
      .min(-60, "Temperature out of range")
      .max(160, "Temperature out of range")
      .optional(),
  ),
  temperatureUnit: z.enum(TEMPERATURE_INPUT_UNITS).default("F"),
  notes: optionalText(2000, "Notes"),
};

function checkWeighingFields(
  value: { weighedOn: string; grossAmount: number; grossUnit: (typeof MASS_INPUT_UNITS)[number] },
  ctx: z.RefinementCtx,
): void {
  withinGrams(ctx, "grossAmount", value.grossAmount, value.grossUnit, MAX_GROSS_G, "The scale reading");
  notFuture(ctx, value.weighedOn, "weighedOn", "The date of the weighing cannot be in the future");
}

/** A scale reading of a cylinder (POST /api/cylinders/:id/weighings): net contents = reading − tare. */
export const cylinderWeighingInput = z.object(weighingFields).superRefine(checkWeighingFields);
export type CylinderWeighingInput = z.output<typeof cylinderWeighingInput>;

/** A correction of a weighing (PATCH /api/cylinders/:id/weighings/:weighingId): always with a reason. */
export const cylinderWeighingAmendInput = z
  .object({
    ...weighingFields,
    reason: text({ error: "Say why the weighing is corrected" })
      .trim()
      .min(3, "Say why the weighing is corrected")
      .max(1000, "The reason is limited to 1,000 characters"),
  })
  .superRefine(checkWeighingFields);
export type CylinderWeighingAmendInput = z.output<typeof cylinderWeighingAmendInput>;

/** Voiding a record entered in error. */
export const registerVoidInput = z.object({
  reason: text({ error: "Say why the record is voided" })
    .trim()
    .min(3, "Say why the record is voided")
    .max(1000, "The reason is limited to 1,000 characters"),
});
export type RegisterVoidInput = z.output<typeof registerVoidInput>;
