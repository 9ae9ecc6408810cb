import type { Knex } from "knex";
import type {
  AccessMethod,
  ApplianceCategory,
  EvacuationUnit,
  JobKind,
  JobListQuery,
  LeakRateVerdict,
  MassDisplayUnit,
  RecoveryJobInput,
} from "@coldtrail/core";
import { enteredAmount, type MassUnit } from "@coldtrail/core";
import { listAmendments, type AmendmentRecord } from "./amendments";
import { InvalidInputError } from "./errors";
import { leakRateOfJob } from "./jobs/check-draft";
import { createJob } from "./jobs/write-job";
import { orderByNullable, toBoolOrNull, toNumOrNull, type ActorRef, type ScopeFn } from "./types";
import { countRows, whereContains } from "./paging";

export { createJob } from "./jobs/write-job";
export { amendJob, voidJob, JOB_FIELD_WORDS } from "./jobs/amend-job";
export { checkJobDraftForActor, leakRateOfJob, type JobDraftCheck } from "./jobs/check-draft";

export interface JobListRow {
  id: number;
  branchId: number;
  branchName: string;
  /** How the branch shows masses ("lb_oz" or "kg"). */
  branchMassUnit: MassDisplayUnit;
  kind: JobKind;
  performedOn: string;
  applianceId: number;
  applianceTag: string;
  applianceDescription: string;
  applianceCategory: ApplianceCategory;
  technicianId: number;
  technicianName: string;
  refrigerant: string | null;
  recoveredG: number;
  chargedG: number;
  cylinderId: number | null;
  cylinderSerial: string | null;
  equipmentId: number | null;
  equipmentSerial: string | null;
  evacuationValue: number | null;
  evacuationUnit: EvacuationUnit | null;
  accessMethod: AccessMethod | null;
  voidedAt: string | null;
  createdAt: string;
}

export interface JobListResult {
  rows: JobListRow[];
  total: number;
  page: number;
  pageSize: number;
}

const SORT_COLUMNS: Record<JobListQuery["sort"], string | null> = {
  performedOn: "jobs.performed_on",
  kind: "jobs.kind",
  branch: "branch.name",
  technician: "technician.name",
  appliance: "appliance.tag",
  refrigerant: "jobs.refrigerant",
  amount: null, // recovered + charged, an expression
};

/** The jobs table aliased `jobs`, joined with what list rows show. */
function jobsWithJoins(db: Knex): Knex.QueryBuilder {
  return db("jobs as jobs")
    .join("branches as branch", "branch.id", "jobs.branch_id")
    .join("appliances as appliance", "appliance.id", "jobs.appliance_id")
    .join("users as technician", "technician.id", "jobs.technician_id")
    .leftJoin("cylinders as cylinder", "cylinder.id", "jobs.cylinder_id")
    .leftJoin("recovery_equipment as equipment", "equipment.id", "jobs.equipment_id");
}

const LIST_COLUMNS = [
  "jobs.id",
  "jobs.branch_id",
  "branch.name as branch_name",
  "branch.mass_unit as branch_mass_unit",
  "jobs.kind",
  "jobs.performed_on",
  "jobs.appliance_id",
  "appliance.tag as appliance_tag",
  "appliance.description as appliance_description",
  "appliance.category as appliance_category",
  "jobs.technician_id",
  "technician.name as technician_name",
  "jobs.refrigerant",
  "jobs.recovered_g",
  "jobs.charged_g",
  "jobs.cylinder_id",
  "cylinder.serial as cylinder_serial",
  "jobs.equipment_id",
  "equipment.serial as equipment_serial",
  "jobs.evacuation_value",
  "jobs.evacuation_unit",
  "jobs.access_method",
  "jobs.voided_at",
  "jobs.created_at",
];

function toListRow(r: any): JobListRow {
  return {
    id: Number(r.id),
    branchId: Number(r.branch_id),
    branchName: r.branch_name,
    branchMassUnit: r.branch_mass_unit,
    kind: r.kind,
    performedOn: r.performed_on,
    applianceId: Number(r.appliance_id),
    applianceTag: r.appliance_tag,
    applianceDescription: r.appliance_description,
    applianceCategory: r.appliance_category,
    technicianId: Number(r.technician_id),
    technicianName: r.technician_name,
    refrigerant: r.refrigerant ?? null,
    recoveredG: Number(r.recovered_g),
    chargedG: Number(r.charged_g),
    cylinderId: toNumOrNull(r.cylinder_id),
    cylinderSerial: r.cylinder_serial ?? null,
    equipmentId: toNumOrNull(r.equipment_id),
    equipmentSerial: r.equipment_serial ?? null,
    evacuationValue: toNumOrNull(r.evacuation_value),
    evacuationUnit: r.evacuation_unit ?? null,
    accessMethod: r.access_method ?? null,
    voidedAt: r.voided_at ?? null,
    createdAt: r.created_at,
  };
}

function applyScope(qb: Knex.QueryBuilder, scope: ScopeFn): void {
  qb.where(function scoped(this: Knex.QueryBuilder) {
    scope(this);
  });
}

/**
 * One page of jobs the scope allows, filtered and sorted on the server.
 * The scope callback sees the jobs table as `jobs` (e.g. `jobs.branch_id`, `jobs.technician_id`).
 * Voided jobs are left out unless `includeVoided` or the query's `voided` filter asks for them.
 */
export async function listJobs(db: Knex, opts: { scope: ScopeFn; query: JobListQuery; includeVoided?: boolean }): Promise<JobListResult> {
  const { query } = opts;
  const page = query.page ?? 1;
  const pageSize = query.pageSize ?? 25;

  const filtered = (qb: Knex.QueryBuilder, withAppliance: boolean) => {
    applyScope(qb, opts.scope);
    const voided = opts.includeVoided ? "include" : (query.voided ?? "exclude");
    if (voided === "exclude") qb.whereNull("jobs.voided_at");
    else if (voided === "only") qb.whereNotNull("jobs.voided_at");
    if (query.applianceId) qb.where("jobs.appliance_id", query.applianceId);
    if (query.kind) qb.where("jobs.kind", query.kind);
    if (query.branchId) qb.where("jobs.branch_id", query.branchId);
    if (query.technicianId) qb.where("jobs.technician_id", query.technicianId);
    if (query.from) qb.where("jobs.performed_on", ">=", query.from);
    if (query.to) qb.where("jobs.performed_on", "<=", query.to);
    if (query.q && withAppliance) whereContains(qb, query.q, ["appliance.tag", "appliance.description"]);
    return qb;
  };

  // The count only joins the appliance when the text filter needs it.
  const countBase = db("jobs as jobs");
  if (query.q) countBase.join("appliances as appliance", "appliance.id", "jobs.appliance_id");
  const total = await countRows(filtered(countBase, Boolean(query.q)));

  const dir = query.dir === "asc" ? "asc" : "desc";
  const rowsQuery = filtered(jobsWithJoins(db), true).select(LIST_COLUMNS);
  const column = SORT_COLUMNS[query.sort ?? "performedOn"];
  // A job's refrigerant may be NULL; it sorts as in SQLite in both dialects.
  if (column === "jobs.refrigerant") orderByNullable(rowsQuery, column, dir);
  else if (column) rowsQuery.orderBy(column, dir);
  else rowsQuery.orderByRaw(`(jobs.recovered_g + jobs.charged_g) ${dir}`);
  rowsQuery.orderBy("jobs.id", dir);
  const rows = await rowsQuery.limit(pageSize).offset((page - 1) * pageSize);

  return { rows: rows.map(toListRow), total, page, pageSize };
}

export interface JobMovement {
  id: number;
  direction: string;
  refrigerant: string;
  massG: number;
  cylinderId: number | null;
  cylinderSerial: string | null;
  movedOn: string;
}

export interface JobDetail extends JobListRow {
  organisationId: number;
  siteName: string;
  siteAddress: string | null;
  customerName: string | null;
  applianceRefrigerant: string;
  applianceFullChargeG: number;
  temporaryAccessRemoved: boolean | null;
  compressorOperating: boolean | null;
  verificationStage: string | null;
  verificationPassed: boolean | null;
  verificationMethod: string | null;
  relatedJobId: number | null;
  leakLocation: string | null;
  repairDescription: string | null;
  additionExclusion: string | null;
  /** Charge: the earlier charge for the same leak (summed into one leak rate). */
  sameLeakAsJobId: number | null;
  shutdownNeeded: boolean | null;
  notes: string | null;
  source: string;
  voidReason: string | null;
  createdBy: number;
  createdByName: string;
  updatedAt: string;
  voidedByName: string | null;
  branchTimeZone: string;
  applianceStatus: string;
  /** Charges: where the refrigerant came from. */
  chargeSource: "stock" | "cylinder" | null;
  movements: JobMovement[];
  /** Charges: the leak rate this addition gave, calculated by the rules core. */
  leakRate: LeakRateVerdict | null;
  /** Corrections, oldest first, with the previous values. */
  amendments: AmendmentRecord[];
  /** Disposals: the record or signed statement kept for it, if any. */
  disposalRecordId: number | null;
  disposalStatementId: number | null;
  /** Recovery, disposal and charge jobs: the amount as it was typed, while it still matches the grams. */
  enteredAmount: { amount: number; unit: MassUnit } | null;
}

/** One job the scope allows (voided ones included), with its refrigerant movements; undefined otherwise. */
export async function getJob(db: Knex, opts: { scope: ScopeFn; id: number }): Promise<JobDetail | undefined> {
  const q = jobsWithJoins(db)
    .join("sites as site", "site.id", "appliance.site_id")
    .leftJoin("customers as customer", "customer.id", "site.customer_id")
    .join("users as creator", "creator.id", "jobs.created_by")
    .leftJoin("users as voider", "voider.id", "jobs.voided_by")
    .where("jobs.id", opts.id);
  applyScope(q, opts.scope);
  const r = await q.first([
    ...LIST_COLUMNS,
    "jobs.organisation_id",
    "site.name as site_name",
    "site.address as site_address",
    "customer.name as customer_name",
    "appliance.refrigerant as appliance_refrigerant",
    "appliance.full_charge_g as appliance_full_charge_g",
    "jobs.temporary_access_removed",
    "jobs.compressor_operating",
    "jobs.verification_stage",
    "jobs.verification_passed",
    "jobs.verification_method",
    "jobs.related_job_id",
    "jobs.leak_location",
    "jobs.repair_description",
    "jobs.addition_exclusion",
    "jobs.same_leak_as_job_id",
    "jobs.shutdown_needed",
    "jobs.notes",
    "jobs.source",
    "jobs.void_reason",
    "jobs.created_by",
    "creator.name as created_by_name",
    "jobs.updated_at",
    "voider.name as voided_by_name",
    "branch.time_zone as branch_time_zone",
    "appliance.status as appliance_status",
    "jobs.amount_entered",
    "jobs.amount_unit",
  ]);
  if (!r) return undefined;
  const movements = await db("refrigerant_movements as mv")
    .leftJoin("cylinders as c", "c.id", "mv.cylinder_id")
    .where("mv.job_id", opts.id)
    .whereNull("mv.voided_at")
    .orderBy("mv.id")
    .select("mv.id", "mv.direction", "mv.refrigerant", "mv.mass_g", "mv.cylinder_id", "c.serial as cylinder_serial", "mv.moved_on");
  const organisationId = Number(r.organisation_id);
  const kind = r.kind as JobKind;
  const [leakRate, amendments, record, statement] = await Promise.all([
    kind === "charge"
      ? leakRateOfJob(db, { organisationId, jobId: opts.id, applianceId: Number(r.appliance_id), branchId: Number(r.branch_id) })
      : Promise.resolve(null),
    listAmendments(db, { organisationId, subjectType: "Job", subjectId: opts.id }),
    kind === "disposal"
      ? db("disposal_records").where({ job_id: opts.id }).whereNull("voided_at").orderBy("id", "desc").first("id")
      : Promise.resolve(undefined),
    kind === "disposal"
      ? db("disposal_statements").where({ job_id: opts.id }).whereNull("voided_at").orderBy("id", "desc").first("id")
      : Promise.resolve(undefined),
  ]);
  return {
    ...toListRow(r),
    organisationId,
    siteName: r.site_name,
    siteAddress: r.site_address ?? null,
    customerName: r.customer_name ?? null,
    applianceRefrigerant: r.appliance_refrigerant,
    applianceFullChargeG: Number(r.appliance_full_charge_g),
    temporaryAccessRemoved: toBoolOrNull(r.temporary_access_removed),
    compressorOperating: toBoolOrNull(r.compressor_operating),
    verificationStage: r.verification_stage ?? null,
    verificationPassed: toBoolOrNull(r.verification_passed),
    verificationMethod: r.verification_method ?? null,
    relatedJobId: toNumOrNull(r.related_job_id),
    leakLocation: r.leak_location ?? null,
    repairDescription: r.repair_description ?? null,
    additionExclusion: r.addition_exclusion ?? null,
    sameLeakAsJobId: toNumOrNull(r.same_leak_as_job_id),
    shutdownNeeded: toBoolOrNull(r.shutdown_needed),
    notes: r.notes ?? null,
    source: r.source,
    voidReason: r.void_reason ?? null,
    createdBy: Number(r.created_by),
    createdByName: r.created_by_name,
    updatedAt: r.updated_at,
    voidedByName: r.voided_by_name ?? null,
    branchTimeZone: r.branch_time_zone,
    applianceStatus: r.appliance_status,
    chargeSource: kind !== "charge" ? null : movements.some((m) => m.direction === "charged_from_cylinder") ? "cylinder" : "stock",
    leakRate: r.voided_at ? null : leakRate,
    amendments,
    disposalRecordId: record ? Number(record.id) : null,
    disposalStatementId: statement ? Number(statement.id) : null,
    enteredAmount: enteredAmount(
      kind === "charge" ? Number(r.charged_g) : Number(r.recovered_g),
      toNumOrNull(r.amount_entered),
      r.amount_unit,
    ),
    movements: movements.map((m) => ({
      id: Number(m.id),
      direction: m.direction,
      refrigerant: m.refrigerant,
      massG: Number(m.mass_g),
      cylinderId: toNumOrNull(m.cylinder_id),
      cylinderSerial: m.cylinder_serial ?? null,
      movedOn: m.moved_on,
    })),
  };
}

/**
 * Records a recovery job in one transaction: the job, the movement of refrigerant into the cylinder,
 * the cylinder's new contents, and an activity row. The appliance, cylinder and equipment must belong
 * to the same organisation and branch. A refrigerant different from what the cylinder holds is NOT
 * refused here — the audit raises it as a mixed-refrigerant finding.
 */
export async function createRecoveryJob(
  db: Knex,
  opts: { actor: ActorRef; branchId: number; input: RecoveryJobInput; now?: Date },
): Promise<number> {
  if (opts.input.kind !== "recovery") throw new InvalidInputError("Only recovery jobs are recorded here", "kind");
  return createJob(db, opts);
}
