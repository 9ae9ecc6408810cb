/**
 * The shared vocabulary of Coldtrail: the closed sets of values that records, rules, the database
 * and the screens all use. Terms kept from the trade or the regulations (recovery, full charge,
 * Type I/II/III …); every other name is our own.
 */

export const ROLES = ["owner", "compliance_officer", "branch_manager", "technician", "inspector"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  owner: "Owner",
  compliance_officer: "Compliance officer",
  branch_manager: "Branch manager",
  technician: "Technician",
  inspector: "Inspector",
};

/** What kind of equipment an appliance is. Drives the leak-rate use class and AIM subsector. */
export const APPLIANCE_CATEGORIES = [
  "small_appliance",
  "residential_split",
  "packaged_rooftop",
  "commercial_refrigeration",
  "industrial_process",
  "chiller",
  "other",
] as const;
export type ApplianceCategory = (typeof APPLIANCE_CATEGORIES)[number];

export const APPLIANCE_CATEGORY_LABELS: Record<ApplianceCategory, string> = {
  small_appliance: "Small appliance",
  residential_split: "Residential split system",
  packaged_rooftop: "Packaged rooftop unit",
  commercial_refrigeration: "Commercial refrigeration",
  industrial_process: "Industrial process refrigeration",
  chiller: "Chiller (comfort cooling)",
  other: "Other",
};

export const APPLIANCE_STATUSES = ["in_service", "retired", "disposed"] as const;
export type ApplianceStatus = (typeof APPLIANCE_STATUSES)[number];

/** How the full charge of an appliance was determined (82.157(f) lists these methods). */
export const FULL_CHARGE_METHODS = ["nameplate", "manufacturer_data", "calculation", "established_range"] as const;
export type FullChargeMethod = (typeof FULL_CHARGE_METHODS)[number];

export const JOB_KINDS = ["recovery", "charge", "leak_repair", "verification_test", "disposal"] as const;
export type JobKind = (typeof JOB_KINDS)[number];

export const JOB_KIND_LABELS: Record<JobKind, string> = {
  recovery: "Recovery",
  charge: "Charge / addition",
  leak_repair: "Leak repair",
  verification_test: "Verification test",
  disposal: "Disposal",
};

/** How the refrigerant circuit was opened for the job. */
export const ACCESS_METHODS = [
  "service_valve",
  "brazed_access_fitting",
  "quick_connect_fitting",
  "piercing_pliers",
  "bolt_on_line_tap",
] as const;
export type AccessMethod = (typeof ACCESS_METHODS)[number];

export const ACCESS_METHOD_LABELS: Record<AccessMethod, string> = {
  service_valve: "Existing service valve",
  brazed_access_fitting: "Brazed access fitting",
  quick_connect_fitting: "Quick-connect access fitting",
  piercing_pliers: "Clamp-on piercing pliers (temporary)",
  bolt_on_line_tap: "Bolt-on line tap (temporary)",
};

/** Access devices that pierce the line and are meant to come off when the job ends. */
export const TEMPORARY_ACCESS_METHODS: readonly AccessMethod[] = ["piercing_pliers", "bolt_on_line_tap"];

/** Section 608 technician certification types (40 CFR 82.161). */
export const CERTIFICATION_TYPES = ["type_i", "type_ii", "type_iii", "universal"] as const;
export type CertificationType = (typeof CERTIFICATION_TYPES)[number];

export const CERTIFICATION_TYPE_LABELS: Record<CertificationType, string> = {
  type_i: "Type I",
  type_ii: "Type II",
  type_iii: "Type III",
  universal: "Universal",
};

export const CERTIFICATION_STATES = ["pending", "verified", "rejected"] as const;
export type CertificationState = (typeof CERTIFICATION_STATES)[number];

/** Section 608 pressure classes by the 2004 definitions (40 CFR 82.152). */
export const PRESSURE_CLASSES = ["low", "medium", "high", "very_high"] as const;
export type PressureClass = (typeof PRESSURE_CLASSES)[number];

/** Units a technician may read an evacuation level in. */
export const EVACUATION_UNITS = ["in_hg_vacuum", "psig", "mm_hg_abs", "microns", "kpa_abs"] as const;
export type EvacuationUnit = (typeof EVACUATION_UNITS)[number];

export const EVACUATION_UNIT_LABELS: Record<EvacuationUnit, string> = {
  in_hg_vacuum: "in Hg vacuum",
  psig: "psig",
  mm_hg_abs: "mm Hg absolute",
  microns: "microns (µm Hg absolute)",
  kpa_abs: "kPa absolute",
};

/** A branch shows masses in one of these. Storage is always integer grams. */
export const MASS_DISPLAY_UNITS = ["lb_oz", "kg"] as const;
export type MassDisplayUnit = (typeof MASS_DISPLAY_UNITS)[number];

export const RULE_PACKS = ["us_federal", "eu"] as const;
export type RulePack = (typeof RULE_PACKS)[number];

export const SEVERITIES = ["critical", "major", "minor"] as const;
export type Severity = (typeof SEVERITIES)[number];

/** Our own names for a finding's lifecycle. */
export const FINDING_STATES = ["open", "fix_proposed", "closed", "waived", "no_longer_found"] as const;
export type FindingState = (typeof FINDING_STATES)[number];

export const EQUIPMENT_CERTIFICATION_STATES = ["certified", "not_certified", "unknown"] as const;
export type EquipmentCertificationState = (typeof EQUIPMENT_CERTIFICATION_STATES)[number];
