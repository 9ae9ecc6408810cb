import { SMALL_APPLIANCE_MAX_CHARGE_G } from "../classification/appliance-classification";
import { getRefrigerant } from "../refrigerants/catalogue";
import { normaliseDesignation } from "../refrigerants/normalise-designation";
import { toGrams, type MassUnit } from "../units/mass";
import { EARLIEST_PLAUSIBLE_DATE } from "../schemas/calendar-date";
import { stripBidiControls, textProblem } from "../schemas/text";
import {
  TEMPORARY_ACCESS_METHODS,
  type AccessMethod,
  type ApplianceCategory,
  type ApplianceStatus,
  type EvacuationUnit,
  type FullChargeMethod,
  type JobKind,
} from "../vocabulary";

/**
 * Turns one spreadsheet row (the text of each mapped cell, by field key) into a record ready for the
 * database, or says what is wrong, field by field. Only what the row itself can tell: whether a tag
 * is already taken, a site exists or a technician works in the branch is checked by the database layer.
 */

export interface ImportRowIssue {
  /** The field key, or null for the row as a whole. */
  field: string | null;
  message: string;
}

/** Cell text by field key; a field that is not mapped or an empty cell is "". */
export type ImportCells = Readonly<Record<string, string | undefined>>;

export interface ImportParseContext {
  /** Today's date in the branch (YYYY-MM-DD): later dates are refused. */
  today: string;
  /** When the company's records begin (YYYY-MM-DD): earlier dates of work are refused. */
  recordsBeginOn?: string;
  /** The unit of amounts without one: the branch's ("lb" for lb/oz branches, "kg"). */
  defaultMassUnit: MassUnit;
}

export interface ImportRowResult<T> {
  record: T | null;
  issues: ImportRowIssue[];
}

// ------------------------------------------------------------------------------------ cell readers

const squash = (s: string) => s.toLowerCase().replace(/[^a-z0-9]+/g, "");

class RowReader {
  readonly issues: ImportRowIssue[] = [];
  constructor(
    private readonly cells: ImportCells,
    readonly ctx: ImportParseContext,
  ) {}

  raw(key: string): string {
    return (this.cells[key] ?? "").trim();
  }

  has(key: string): boolean {
    return this.raw(key) !== "";
  }

  fail(field: string | null, message: string): undefined {
    this.issues.push({ field, message });
    return undefined;
  }

  text(key: string, max: number, opts: { required?: string } = {}): string | undefined {
    const cell = this.cells[key] ?? "";
    const problem = textProblem(cell);
    if (problem) return this.fail(key, problem);
    const v = stripBidiControls(cell).trim().replace(/\s+/g, " ");
    if (v === "") return opts.required ? this.fail(key, opts.required) : undefined;
    if (v.length > max) return this.fail(key, `Longer than ${max.toLocaleString("en-US")} characters`);
    return v;
  }

  choice<K extends string>(
    key: string,
    choices: Record<K, readonly string[]>,
    opts: { required?: string; fallback?: K; what: string },
  ): K | undefined {
    const v = this.raw(key);
    if (v === "") return opts.required ? this.fail(key, opts.required) : opts.fallback;
    const s = squash(v);
    for (const [choice, names] of Object.entries(choices) as Array<[K, readonly string[]]>) {
      if (squash(choice) === s || names.some((n) => squash(n) === s)) return choice;
    }
    const listed = Object.values<readonly string[]>(choices)
      .map((names) => names[0])
      .join(", ");
    return this.fail(key, `“${v}” is not a known ${opts.what}; use one of: ${listed}`);
  }

  yesNo(key: string): boolean | undefined {
    const v = squash(this.raw(key));
    if (v === "") return undefined;
    if (["yes", "y", "true", "1", "x"].includes(v)) return true;
    if (["no", "n", "false", "0"].includes(v)) return false;
    return this.fail(key, `“${this.raw(key)}” is not yes or no`);
  }

  date(key: string, opts: { required?: string; notFuture?: boolean; event?: boolean } = {}): string | undefined {
    const v = this.raw(key);
    if (v === "") return opts.required ? this.fail(key, opts.required) : undefined;
    const iso = parseImportDate(v);
    if (!iso) return this.fail(key, `“${v}” is not a date; use a date like 2026-03-14`);
    if (opts.notFuture !== false && iso > this.ctx.today) return this.fail(key, `${iso} is in the future`);
    if (iso < EARLIEST_PLAUSIBLE_DATE) return this.fail(key, `${iso} is too far in the past; check the year`);
    if (opts.event && this.ctx.recordsBeginOn && iso < this.ctx.recordsBeginOn)
      return this.fail(key, `${iso} is before your company's records begin (${this.ctx.recordsBeginOn}); check the year`);
    return iso;
  }

  unit(key: string): MassUnit | undefined {
    const v = this.raw(key);
    if (v === "") return this.ctx.defaultMassUnit;
    const unit = parseMassUnit(v);
    if (!unit) return this.fail(key, `“${v}” is not a unit of mass; use lb, oz, kg or g`);
    return unit;
  }

  /** A mass in grams; the cell may carry its own unit ("12.5 lb", "3 lb 4 oz"). */
  mass(key: string, unit: MassUnit | undefined, opts: { required?: string; positive?: boolean; max?: number } = {}): number | undefined {
    const v = this.raw(key);
    if (v === "") return opts.required ? this.fail(key, opts.required) : undefined;
    const parsed = parseMassText(v, unit);
    if (parsed === "no_unit") return undefined; // the unit column already reported its problem
    if (parsed === null) return this.fail(key, `“${v}” is not an amount; use a number like 12.5, optionally with lb, oz, kg or g`);
    if (parsed < 0) return this.fail(key, "An amount cannot be negative");
    if (parsed === 0 && /[1-9]/.test(v.replace(/e[+-]?\d+/gi, "")))
      return this.fail(key, `“${v}” is less than half a gram: too small to record; check the amount and unit`);
    if (opts.positive && parsed === 0) return this.fail(key, "The amount must be more than zero");
    if (parsed > (opts.max ?? toGrams(1_000_000, "lb"))) return this.fail(key, "That amount is larger than any real one; check the unit");
    return parsed;
  }

  number(key: string, what: string): number | undefined {
    const v = this.raw(key);
    if (v === "") return undefined;
    const n = parsePlainNumber(v);
    if (n === null) return this.fail(key, `“${v}” is not a number (${what})`);
    return n;
  }

  refrigerant(key: string, opts: { required?: string } = {}): string | undefined {
    const v = this.raw(key);
    if (v === "") return opts.required ? this.fail(key, opts.required) : undefined;
    const designation = normaliseDesignation(v);
    if (!getRefrigerant(designation))
      return this.fail(key, `“${v}” is not in the refrigerant catalogue; use its ASHRAE designation, e.g. R-410A`);
    return designation;
  }

  /** A filled cell that this kind of record does not use: reported, never dropped silently. */
  unused(keys: readonly string[], why: string): void {
    for (const key of keys) if (this.has(key)) this.fail(key, why);
  }
}

/** ISO date from "2026-03-14", "2026/3/14", "3/14/2026" (month first), an ISO timestamp or a spreadsheet day number. */
export function parseImportDate(text: string): string | null {
  const v = text.trim();
  let y: number, m: number, d: number;
  let match = /^(\d{4})[-/.](\d{1,2})[-/.](\d{1,2})(?:[T ]\d{2}:\d{2}(?::\d{2}(?:\.\d+)?)?(?:Z|[+-]\d{2}:?\d{2})?)?$/.exec(v);
  if (match) {
    [y, m, d] = [Number(match[1]), Number(match[2]), Number(match[3])];
  } else if ((match = /^(\d{1,2})\/(\d{1,2})\/(\d{4})$/.exec(v))) {
    [m, d, y] = [Number(match[1]), Number(match[2]), Number(match[3])];
  } else if (/^\d{5}$/.test(v)) {
    // A date cell read without its format: days since 1899-12-30 (the spreadsheet epoch).
    const date = new Date(Date.UTC(1899, 11, 30) + Number(v) * 86_400_000);
    return date.toISOString().slice(0, 10);
  } else {
    return null;
  }
  const date = new Date(Date.UTC(y, m - 1, d));
  if (date.getUTCFullYear() !== y || date.getUTCMonth() !== m - 1 || date.getUTCDate() !== d) return null;
  return date.toISOString().slice(0, 10);
}

export function parseMassUnit(text: string): MassUnit | null {
  const s = squash(text);
  if (["lb", "lbs", "pound", "pounds"].includes(s)) return "lb";
  if (["oz", "ounce", "ounces"].includes(s)) return "oz";
  if (["kg", "kgs", "kilogram", "kilograms", "kilo", "kilos"].includes(s)) return "kg";
  if (["g", "gram", "grams", "gr"].includes(s)) return "g";
  return null;
}

/** "1,234.5" and "12.5" (a comma only as a thousands separator); null otherwise. */
export function parsePlainNumber(text: string): number | null {
  const v = text.trim();
  if (/^[+-]?(\d{1,3}(,\d{3})+|\d+)?(\.\d+)?$/.test(v) && /\d/.test(v)) return Number(v.replace(/,/g, ""));
  if (/^[+-]?\d+(\.\d+)?e[+-]?\d+$/i.test(v)) return Number(v);
  return null;
}

/** Grams from a mass cell: "12.5" (in `unit`), "12.5 lb", "3 lb 4 oz". "no_unit" when a unit was needed but missing. */
export function parseMassText(text: string, unit: MassUnit | undefined): number | null | "no_unit" {
  const v = text.trim().toLowerCase();
  const lbOz = /^(\d+(?:\.\d+)?)\s*(?:lb|lbs)\s*,?\s*(\d+(?:\.\d+)?)\s*oz$/.exec(v);
  if (lbOz) return toGrams(Number(lbOz[1]), "lb") + toGrams(Number(lbOz[2]), "oz");
  const withUnit = /^(.*?)\s*(lbs?|pounds?|oz|ounces?|kgs?|kilograms?|g|grams?)$/.exec(v);
  if (withUnit && withUnit[1] !== "") {
    const n = parsePlainNumber(withUnit[1]!);
    const u = parseMassUnit(withUnit[2]!);
    if (n === null || u === null) return null;
    return toGrams(n, u);
  }
  const n = parsePlainNumber(v);
  if (n === null) return null;
  if (!unit) return "no_unit";
  return toGrams(n, unit);
}

// ------------------------------------------------------------------------------------- appliances

const CATEGORY_NAMES: Record<ApplianceCategory, readonly string[]> = {
  small_appliance: ["Small appliance", "small"],
  residential_split: ["Residential split", "residential split system", "split system", "split", "residential"],
  packaged_rooftop: ["Packaged rooftop", "packaged rooftop unit", "rooftop", "rooftop unit", "rtu"],
  commercial_refrigeration: ["Commercial refrigeration", "walk-in", "walk in", "supermarket rack", "rack", "display case"],
  industrial_process: ["Industrial process", "industrial process refrigeration", "industrial"],
  chiller: ["Chiller", "comfort cooling chiller"],
  other: ["Other"],
};

const FULL_CHARGE_METHOD_NAMES: Record<FullChargeMethod, readonly string[]> = {
  nameplate: ["Nameplate", "name plate", "label"],
  manufacturer_data: ["Manufacturer's data", "manufacturer data", "manufacturer", "oem data"],
  calculation: ["Calculation", "calculated", "calc"],
  established_range: ["Established range", "range", "best judgement", "best judgment"],
};

const APPLIANCE_STATUS_NAMES: Record<ApplianceStatus, readonly string[]> = {
  in_service: ["In service", "active", "in use", "operating"],
  retired: ["Retired", "out of service", "decommissioned"],
  disposed: ["Disposed", "disposed of", "scrapped"],
};

export interface ApplianceImportRecord {
  tag: string;
  description: string;
  category: ApplianceCategory;
  refrigerant: string;
  fullChargeG: number;
  fullChargeMethod: FullChargeMethod;
  site: string;
  siteAddress: string | null;
  customer: string | null;
  makeModel: string | null;
  serialNumber: string | null;
  manufacturedOn: string | null;
  installedOn: string | null;
  status: ApplianceStatus;
  retiredOn: string | null;
  disposedOn: string | null;
  factorySealed: boolean;
  hasLeakDetection: boolean;
}

export function parseApplianceImportRow(cells: ImportCells, ctx: ImportParseContext): ImportRowResult<ApplianceImportRecord> {
  const r = new RowReader(cells, ctx);
  const tag = r.text("tag", 64, { required: "The tag is missing" });
  const description = r.text("description", 300, { required: "The description is missing" });
  const category = r.choice("category", CATEGORY_NAMES, { required: "The category is missing", what: "appliance category" });
  const refrigerant = r.refrigerant("refrigerant", { required: "The refrigerant is missing" });
  const unit = r.unit("fullChargeUnit");
  const fullChargeG = r.mass("fullCharge", unit, { required: "The full charge is missing", positive: true });
  const fullChargeMethod = r.choice<FullChargeMethod>("fullChargeMethod", FULL_CHARGE_METHOD_NAMES, {
    fallback: "nameplate",
    what: "way of determining the full charge",
  });
  const site = r.text("site", 200, { required: "The site is missing" });
  const siteAddress = r.text("siteAddress", 500);
  const customer = r.text("customer", 200);
  const makeModel = r.text("makeModel", 200);
  const serialNumber = r.text("serialNumber", 100);
  const manufacturedOn = r.date("manufacturedOn");
  const installedOn = r.date("installedOn");
  const status = r.choice<ApplianceStatus>("status", APPLIANCE_STATUS_NAMES, { fallback: "in_service", what: "appliance status" });
  const retiredOn = r.date("retiredOn");
  const hasLeakDetection = r.yesNo("hasLeakDetection");

  if (manufacturedOn && installedOn && installedOn < manufacturedOn)
    r.fail("installedOn", "Installed before it was made? Check both dates");
  if ((status === "retired" || status === "disposed") && !retiredOn && !r.has("retiredOn")) {
    r.fail("retiredOn", `Enter the date it was ${status === "retired" ? "retired" : "disposed of"}`);
  }
  if (status === "in_service" && retiredOn) r.fail("retiredOn", "An appliance in service has no retirement date; check the status");
  // 40 CFR 82.152: a small appliance is factory-sealed with 5 lb or less.
  if (category === "small_appliance" && fullChargeG !== undefined && fullChargeG > SMALL_APPLIANCE_MAX_CHARGE_G) {
    r.fail("fullCharge", "A small appliance holds 5 lb (2.268 kg) or less; check the amount or the category");
  }

  if (r.issues.length > 0) return { record: null, issues: r.issues };
  return {
    record: {
      tag: tag!,
      description: description!,
      category: category!,
      refrigerant: refrigerant!,
      fullChargeG: fullChargeG!,
      fullChargeMethod: fullChargeMethod ?? "nameplate",
      site: site!,
      siteAddress: siteAddress ?? null,
      customer: customer ?? null,
      makeModel: makeModel ?? null,
      serialNumber: serialNumber ?? null,
      manufacturedOn: manufacturedOn ?? null,
      installedOn: installedOn ?? null,
      status: status ?? "in_service",
      retiredOn: status === "in_service" ? null : (retiredOn ?? null),
      disposedOn: status === "disposed" ? (retiredOn ?? null) : null,
      factorySealed: category === "small_appliance",
      hasLeakDetection: hasLeakDetection ?? false,
    },
    issues: [],
  };
}

// -------------------------------------------------------------------------------------- cylinders

export type ImportCylinderPurpose = "recovery" | "charging";
export type ImportCylinderStatus = "in_service" | "at_reclaimer" | "retired";

const PURPOSE_NAMES: Record<ImportCylinderPurpose, readonly string[]> = {
  recovery: ["Recovery", "recovered refrigerant"],
  charging: ["Charging", "charge", "virgin", "new refrigerant"],
};
const CYLINDER_STATUS_NAMES: Record<ImportCylinderStatus, readonly string[]> = {
  in_service: ["In service", "active", "in use"],
  at_reclaimer: ["At reclaimer", "at the reclaimer", "sent for reclaim", "shipped"],
  retired: ["Retired", "out of service", "condemned"],
};

export interface CylinderImportRecord {
  serial: string;
  specification: string | null;
  purpose: ImportCylinderPurpose;
  waterCapacityG: number;
  tareG: number;
  manufacturedOn: string | null;
  lastRequalifiedOn: string | null;
  refrigerant: string | null;
  contentsG: number;
  status: ImportCylinderStatus;
}

export function parseCylinderImportRow(cells: ImportCells, ctx: ImportParseContext): ImportRowResult<CylinderImportRecord> {
  const r = new RowReader(cells, ctx);
  const serial = r.text("serial", 64, { required: "The serial number is missing" });
  const specificationText = r.text("specification", 64);
  const purpose = r.choice<ImportCylinderPurpose>("purpose", PURPOSE_NAMES, { fallback: "recovery", what: "cylinder purpose" });
  const unit = r.unit("massUnit");
  const waterCapacityG = r.mass("waterCapacity", unit, {
    required: "The water capacity is missing",
    positive: true,
    max: toGrams(2000, "lb"),
  });
  const tareG = r.mass("tare", unit, { required: "The tare weight is missing", positive: true, max: toGrams(2000, "lb") });
  const manufacturedOn = r.date("manufacturedOn");
  const lastRequalifiedOn = r.date("lastRequalifiedOn");
  const refrigerant = r.refrigerant("refrigerant");
  const contentsG = r.mass("contents", unit, { max: toGrams(4000, "lb") });
  const status = r.choice<ImportCylinderStatus>("status", CYLINDER_STATUS_NAMES, { fallback: "in_service", what: "cylinder status" });

  if (manufacturedOn && lastRequalifiedOn && lastRequalifiedOn < manufacturedOn)
    r.fail("lastRequalifiedOn", "Requalified before it was made? Check both dates");
  if (contentsG !== undefined && contentsG > 0 && !refrigerant && !r.has("refrigerant"))
    r.fail("refrigerant", "Say which refrigerant the cylinder holds");
  if (refrigerant && (contentsG === undefined || contentsG === 0) && !r.has("contents")) {
    r.fail("contents", "Enter the net contents, or leave the refrigerant empty for an empty cylinder");
  }

  if (r.issues.length > 0) return { record: null, issues: r.issues };
  const held = contentsG ?? 0;
  return {
    record: {
      serial: serial!,
      specification: specificationText ? specificationText.toUpperCase().replace(/\s+/g, "-") : null,
      purpose: purpose ?? "recovery",
      waterCapacityG: waterCapacityG!,
      tareG: tareG!,
      manufacturedOn: manufacturedOn ?? null,
      lastRequalifiedOn: lastRequalifiedOn ?? null,
      refrigerant: held > 0 ? refrigerant! : null,
      contentsG: held,
      status: status ?? "in_service",
    },
    issues: [],
  };
}

// ------------------------------------------------------------------------------------------- jobs

const JOB_KIND_NAMES: Record<JobKind, readonly string[]> = {
  recovery: ["Recovery", "recover", "recovered", "evacuation"],
  charge: ["Charge", "charge / addition", "addition", "add", "top up", "top-up", "recharge", "charged"],
  leak_repair: ["Leak repair", "repair", "leak fix"],
  verification_test: ["Verification test", "verification", "leak test", "verify"],
  disposal: ["Disposal", "dispose", "scrap", "scrapped"],
};

const EVACUATION_UNIT_NAMES: Record<EvacuationUnit, readonly string[]> = {
  in_hg_vacuum: ["in Hg vacuum", "in hg", "inhg", "inches hg", "inches of mercury", "in. hg"],
  psig: ["psig", "psi"],
  mm_hg_abs: ["mm Hg absolute", "mm hg", "mmhg", "torr"],
  microns: ["microns", "micron", "µm hg", "um hg"],
  kpa_abs: ["kPa absolute", "kpa", "kpaa"],
};

const ACCESS_METHOD_NAMES: Record<AccessMethod, readonly string[]> = {
  service_valve: ["Service valve", "existing service valve", "valve", "schrader"],
  brazed_access_fitting: ["Brazed access fitting", "brazed fitting", "brazed"],
  quick_connect_fitting: ["Quick-connect access fitting", "quick connect", "quick-connect"],
  piercing_pliers: ["Piercing pliers", "clamp-on piercing pliers", "piercing"],
  bolt_on_line_tap: ["Bolt-on line tap", "line tap", "saddle valve", "bolt-on"],
};

const VERIFICATION_STAGE_NAMES: Record<"initial" | "follow_up", readonly string[]> = {
  initial: ["Initial", "initial test", "first"],
  follow_up: ["Follow-up", "follow up", "followup", "follow-up test", "second"],
};

export interface JobImportRecord {
  performedOn: string;
  kind: JobKind;
  applianceTag: string;
  /** E-mail address or full name, matched by the database layer. */
  technician: string;
  /** Null: the appliance's refrigerant. */
  refrigerant: string | null;
  recoveredG: number;
  chargedG: number;
  cylinderSerial: string | null;
  equipmentSerial: string | null;
  evacuationValue: number | null;
  evacuationUnit: EvacuationUnit | null;
  accessMethod: AccessMethod | null;
  temporaryAccessRemoved: boolean | null;
  verificationStage: "initial" | "follow_up" | null;
  verificationPassed: boolean | null;
  leakLocation: string | null;
  repairDescription: string | null;
  notes: string | null;
}

export function parseJobImportRow(cells: ImportCells, ctx: ImportParseContext): ImportRowResult<JobImportRecord> {
  const r = new RowReader(cells, ctx);
  const performedOn = r.date("performedOn", { required: "The date is missing", event: true });
  const kind = r.choice("kind", JOB_KIND_NAMES, { required: "The job kind is missing", what: "job kind" });
  const applianceTag = r.text("applianceTag", 64, { required: "The appliance tag is missing" });
  const technician = r.text("technician", 320, { required: "The technician is missing" });
  const refrigerant = r.refrigerant("refrigerant");
  const unit = r.unit("massUnit");
  const recoveredG = r.mass("recovered", unit);
  const chargedG = r.mass("charged", unit);
  const cylinderSerial = r.text("cylinderSerial", 64);
  const equipmentSerial = r.text("equipmentSerial", 64);
  const evacuationValue = r.number("evacuationValue", "the evacuation level");
  const evacuationUnit = r.choice<EvacuationUnit>("evacuationUnit", EVACUATION_UNIT_NAMES, {
    fallback: "in_hg_vacuum",
    what: "evacuation unit",
  });
  const accessMethod = r.choice("accessMethod", ACCESS_METHOD_NAMES, { what: "access method" });
  const temporaryAccessRemoved = r.yesNo("temporaryAccessRemoved");
  const verificationStage = r.choice("verificationStage", VERIFICATION_STAGE_NAMES, { what: "verification test stage" });
  const verificationPassed = r.yesNo("verificationPassed");
  const leakLocation = r.text("leakLocation", 500);
  const repairDescription = r.text("repairDescription", 2000);
  const notes = r.text("notes", 2000);

  const recovers = kind === "recovery" || kind === "disposal";
  if (kind) {
    if (!recovers)
      r.unused(
        ["recovered", "equipmentSerial", "evacuationValue"],
        "Only recoveries and disposals use this; put the recovery on its own row",
      );
    if (kind !== "charge") r.unused(["charged"], "Only charges add refrigerant; put the charge on its own row");
    if (kind === "leak_repair" || kind === "verification_test")
      r.unused(["cylinderSerial"], "A leak repair or verification test moves no refrigerant");
    if (kind !== "verification_test") r.unused(["verificationStage", "verificationPassed"], "Only verification tests use this");
    if (kind === "recovery") {
      if (recoveredG === undefined && !r.has("recovered")) r.fail("recovered", "Enter the amount recovered");
      if (!cylinderSerial && !r.has("cylinderSerial")) r.fail("cylinderSerial", "Say which recovery cylinder the refrigerant went into");
    }
    if (kind === "disposal" && recoveredG !== undefined && recoveredG > 0 && !r.has("cylinderSerial")) {
      r.fail("cylinderSerial", "Say which recovery cylinder the refrigerant went into");
    }
    if (kind === "charge" && chargedG === undefined && !r.has("charged")) r.fail("charged", "Enter the amount added");
    if (kind === "charge" && chargedG === 0) r.fail("charged", "The amount added must be more than zero");
    if (kind === "verification_test") {
      if (!verificationStage && !r.has("verificationStage"))
        r.fail("verificationStage", "Say whether this was the initial or the follow-up test");
      if (verificationPassed === undefined && !r.has("verificationPassed"))
        r.fail("verificationPassed", "Say whether the test passed (yes or no)");
    }
  }
  if (evacuationValue !== undefined && evacuationUnit) {
    if (evacuationUnit !== "psig" && evacuationValue < 0) r.fail("evacuationValue", "This unit cannot be negative");
    if (evacuationUnit === "in_hg_vacuum" && evacuationValue > 29.92)
      r.fail("evacuationValue", "A vacuum cannot be deeper than 29.92 in Hg");
  }
  if (r.has("evacuationUnit") && !r.has("evacuationValue")) r.fail("evacuationUnit", "There is a unit but no evacuation level");
  const temporary = accessMethod ? TEMPORARY_ACCESS_METHODS.includes(accessMethod) : false;
  if (temporary && temporaryAccessRemoved === undefined && !r.has("temporaryAccessRemoved")) {
    r.fail("temporaryAccessRemoved", "Say whether the temporary piercing device was removed (yes or no)");
  }
  if (!temporary && r.has("temporaryAccessRemoved"))
    r.unused(["temporaryAccessRemoved"], "Only piercing pliers and line taps are temporary devices");

  if (r.issues.length > 0) return { record: null, issues: r.issues };
  return {
    record: {
      performedOn: performedOn!,
      kind: kind!,
      applianceTag: applianceTag!,
      technician: technician!,
      refrigerant: refrigerant ?? null,
      recoveredG: recoveredG ?? 0,
      chargedG: chargedG ?? 0,
      cylinderSerial: cylinderSerial ?? null,
      equipmentSerial: equipmentSerial ?? null,
      evacuationValue: evacuationValue ?? null,
      evacuationUnit: evacuationValue !== undefined ? (evacuationUnit ?? "in_hg_vacuum") : null,
      accessMethod: accessMethod ?? null,
      temporaryAccessRemoved: temporary ? (temporaryAccessRemoved ?? null) : null,
      verificationStage: verificationStage ?? null,
      verificationPassed: verificationPassed ?? null,
      leakLocation: leakLocation ?? null,
      repairDescription: repairDescription ?? null,
      notes: notes ?? null,
    },
    issues: [],
  };
}

export type ImportRecordOf<K> = K extends "appliances"
  ? ApplianceImportRecord
  : K extends "cylinders"
    ? CylinderImportRecord
    : JobImportRecord;
