/**
 * What a spreadsheet import can bring into Coldtrail, field by field: the record kinds, each field's
 * label (the template's column heading), whether it is required, the other headings people use for
 * it (for suggesting the column mapping), a hint and an example value for the template.
 */

export const IMPORT_KINDS = ["appliances", "cylinders", "jobs"] as const;
export type ImportKind = (typeof IMPORT_KINDS)[number];

export const IMPORT_KIND_LABELS: Record<ImportKind, string> = {
  appliances: "Appliances",
  cylinders: "Recovery cylinders",
  jobs: "Past jobs",
};

export interface ImportField {
  key: string;
  label: string;
  required: boolean;
  /** Other column headings that mean this field (compared without case, spaces or punctuation). */
  aliases: readonly string[];
  hint: string;
  example: string;
}

const f = (key: string, label: string, required: boolean, aliases: string[], hint: string, example: string): ImportField => ({
  key,
  label,
  required,
  aliases,
  hint,
  example,
});

const DATE_HINT = "A date like 2026-03-14 (3/14/2026 is read month first)";
const YES_NO = "yes or no";

export const IMPORT_FIELDS: Record<ImportKind, readonly ImportField[]> = {
  appliances: [
    f(
      "tag",
      "Tag",
      true,
      ["appliance tag", "asset tag", "unit tag", "unit id", "equipment id", "asset"],
      "The name people know the appliance by; unique in the organisation",
      "RTU-07",
    ),
    f(
      "description",
      "Description",
      true,
      ["appliance", "unit description", "name"],
      "What and where it is",
      "Rooftop unit over the bakery",
    ),
    f(
      "category",
      "Category",
      true,
      ["appliance category", "appliance type", "type", "kind"],
      "Small appliance, residential split, packaged rooftop, commercial refrigeration, industrial process, chiller or other",
      "Packaged rooftop",
    ),
    f("refrigerant", "Refrigerant", true, ["gas", "refrigerant type"], "The ASHRAE designation", "R-410A"),
    f(
      "fullCharge",
      "Full charge",
      true,
      ["charge", "full charge amount", "nameplate charge", "system charge"],
      "A number; add a unit (lb, oz, kg, g) here or in the unit column",
      "12.5",
    ),
    f("fullChargeUnit", "Full charge unit", false, ["charge unit", "unit"], "lb, oz, kg or g; empty means the branch's unit", "lb"),
    f(
      "fullChargeMethod",
      "How the full charge was determined",
      false,
      ["charge method", "full charge method", "charge source"],
      "Nameplate, manufacturer's data, calculation or established range; empty means nameplate",
      "Nameplate",
    ),
    f(
      "site",
      "Site",
      true,
      ["site name", "location", "building"],
      "An existing site of the branch, or a new one to add",
      "Maple Street Bakery",
    ),
    f("siteAddress", "Site address", false, ["address", "street address"], "Used when the site is new", "118 Maple Street"),
    f(
      "customer",
      "Customer",
      false,
      ["customer name", "client", "owner"],
      "Used when the site is new; an existing customer of the branch, or a new one",
      "Maple Street Bakery LLC",
    ),
    f("makeModel", "Make and model", false, ["make model", "make/model", "model", "manufacturer"], "Free text", "Kelvandor RT-150"),
    f("serialNumber", "Serial number", false, ["serial", "serial no", "appliance serial"], "Free text", "KV150-22-0187"),
    f("manufacturedOn", "Manufactured on", false, ["manufacture date", "date of manufacture", "manufactured"], DATE_HINT, "2019-05-02"),
    f("installedOn", "Installed on", false, ["installation date", "install date", "installed"], DATE_HINT, "2019-08-20"),
    f("status", "Status", false, ["appliance status", "state"], "In service, retired or disposed; empty means in service", "In service"),
    f(
      "retiredOn",
      "Retired on",
      false,
      ["retirement date", "date retired", "taken out of service"],
      `Required when the status is retired or disposed. ${DATE_HINT}`,
      "",
    ),
    f("hasLeakDetection", "Leak detection fitted", false, ["leak detection", "leak detector"], YES_NO, "no"),
  ],
  cylinders: [
    f(
      "serial",
      "Serial number",
      true,
      ["serial", "cylinder serial", "cylinder", "cylinder number", "cylinder id"],
      "The serial stamped on the cylinder; unique in the organisation",
      "C-0142",
    ),
    f("specification", "Specification", false, ["spec", "dot spec", "dot specification"], "e.g. DOT-4BA400", "DOT-4BA400"),
    f("purpose", "Purpose", false, ["use", "cylinder type"], "Recovery or charging; empty means recovery", "Recovery"),
    f(
      "waterCapacity",
      "Water capacity",
      true,
      ["wc", "water capacity wc", "capacity"],
      "WC stamped on the cylinder; a number, unit here or in the unit column",
      "50",
    ),
    f("tare", "Tare weight", true, ["tare", "tw", "tare weight tw", "empty weight"], "TW stamped on the cylinder", "17.5"),
    f("massUnit", "Unit of the weights", false, ["unit", "weight unit", "units"], "lb, oz, kg or g; empty means the branch's unit", "lb"),
    f("manufacturedOn", "Manufactured on", false, ["manufacture date", "date of manufacture"], DATE_HINT, "2021-02-01"),
    f(
      "lastRequalifiedOn",
      "Last requalified on",
      false,
      ["requalification date", "last requalification", "hydro test date", "last hydro", "retest date", "hydrostatic test date"],
      DATE_HINT,
      "2021-02-01",
    ),
    f(
      "refrigerant",
      "Refrigerant held",
      false,
      ["refrigerant", "contents refrigerant", "gas"],
      "What it holds now; empty when empty",
      "R-410A",
    ),
    f(
      "contents",
      "Net contents",
      false,
      ["contents", "net weight", "net", "current contents"],
      "What it holds now (without the tare), in the unit of the weights",
      "8.2",
    ),
    f("status", "Status", false, ["cylinder status", "state"], "In service, at reclaimer or retired; empty means in service", "In service"),
  ],
  jobs: [
    f("performedOn", "Date", true, ["job date", "date of work", "performed on", "service date", "work date"], DATE_HINT, "2025-06-18"),
    f(
      "kind",
      "Job kind",
      true,
      ["kind", "job type", "type", "work type", "service type"],
      "Recovery, charge, leak repair, verification test or disposal",
      "Recovery",
    ),
    f(
      "applianceTag",
      "Appliance tag",
      true,
      ["appliance", "tag", "unit", "asset tag", "unit tag"],
      "The tag of an appliance in the branch's register",
      "RTU-07",
    ),
    f(
      "technician",
      "Technician",
      true,
      ["technician e-mail", "technician email", "tech", "performed by", "technician name"],
      "The technician's e-mail address or full name",
      "pat.example@company.example",
    ),
    f("refrigerant", "Refrigerant", false, ["gas"], "Empty means the appliance's refrigerant", "R-410A"),
    f(
      "recovered",
      "Amount recovered",
      false,
      ["recovered", "recovered amount", "amount removed", "removed"],
      "Recoveries and disposals; a number, unit here or in the unit column",
      "3.25",
    ),
    f(
      "charged",
      "Amount added",
      false,
      ["charged", "amount charged", "added", "charge added", "amount added"],
      "Charges; a number, unit here or in the unit column",
      "",
    ),
    f("massUnit", "Unit of the amounts", false, ["unit", "units", "amount unit"], "lb, oz, kg or g; empty means the branch's unit", "lb"),
    f(
      "cylinderSerial",
      "Cylinder serial",
      false,
      ["cylinder", "recovery cylinder", "cylinder number"],
      "Required for a recovery; a cylinder in the branch's register",
      "C-0142",
    ),
    f(
      "equipmentSerial",
      "Recovery equipment serial",
      false,
      ["recovery equipment", "recovery machine", "equipment", "machine serial"],
      "A unit in the branch's register",
      "RE-0031",
    ),
    f("evacuationValue", "Evacuation level reached", false, ["evacuation", "vacuum", "evacuation level"], "A number", "10"),
    f(
      "evacuationUnit",
      "Unit of the evacuation level",
      false,
      ["evacuation unit", "vacuum unit"],
      "in Hg vacuum, psig, mm Hg absolute, microns or kPa absolute; empty means in Hg vacuum",
      "in Hg vacuum",
    ),
    f(
      "accessMethod",
      "Access method",
      false,
      ["access", "how accessed"],
      "Service valve, brazed access fitting, quick-connect access fitting, piercing pliers or bolt-on line tap",
      "Service valve",
    ),
    f(
      "temporaryAccessRemoved",
      "Temporary device removed",
      false,
      ["piercing device removed", "line tap removed"],
      `${YES_NO}; needed for piercing pliers and line taps`,
      "",
    ),
    f(
      "verificationStage",
      "Verification test stage",
      false,
      ["test stage", "verification stage"],
      "Initial or follow-up; verification tests only",
      "",
    ),
    f("verificationPassed", "Verification test passed", false, ["test passed", "passed"], `${YES_NO}; verification tests only`, ""),
    f("leakLocation", "Leak location", false, ["leak found at", "where the leak was"], "Leak repairs", ""),
    f("repairDescription", "Repair done", false, ["repair", "repair description", "what was repaired"], "Leak repairs", ""),
    f("notes", "Notes", false, ["comments", "remarks", "note"], "Free text", ""),
  ],
};

export function importFieldsOf(kind: ImportKind): readonly ImportField[] {
  return IMPORT_FIELDS[kind];
}

/** The largest spreadsheet accepted for an import. */
export const IMPORT_MAX_BYTES = 50 * 1024 * 1024;
