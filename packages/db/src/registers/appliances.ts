import type { Knex } from "knex";
import {
  APPLIANCE_CATEGORY_LABELS,
  REGISTER_LABELS,
  classifyPressure,
  formatMass,
  isSmallAppliance,
  requiredCertificationTypes,
  toGrams,
  type ApplianceCategory,
  type ApplianceInput,
  type ApplianceListQuery,
  type ApplianceStatus,
  type ApplianceStatusInput,
  type ApplianceUpdateInput,
  type CertificationType,
  type FullChargeMethod,
  type MassDisplayUnit,
  type PressureClass,
  type RegisterHistoryQuery,
} from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { amendRecord } from "../amendments";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import { toBool, toNumOrNull, type ActorRef, type ScopeFn } from "../types";
import {
  applyScope,
  changedColumns,
  describeColumns,
  isUniqueViolation,
  loadWritableBranch,
  updateWithActivity,
  type RegisterBranch,
  type RegisterPage,
} from "./common";
import { countRows, sortedPage, whereContains } from "../paging";

/** What the rules derive from an appliance's register entry (core classification). */
export interface ApplianceDerived {
  /** 40 CFR 82.152 pressure class of the refrigerant; null when the catalogue has no pressure data. */
  pressureClass: PressureClass | null;
  /** Factory-sealed with 5 lb or less (40 CFR 82.152). */
  smallAppliance: boolean;
  /** Technician certification types that cover work on it (40 CFR 82.161); any one is enough. */
  certificationTypes: CertificationType[];
}

export interface ApplianceRow extends ApplianceDerived {
  id: number;
  organisationId: number;
  branchId: number;
  branchName: string;
  branchCode: string;
  massUnit: MassDisplayUnit;
  timeZone: string;
  siteId: number;
  siteName: string;
  siteAddress: string | null;
  customerId: number | null;
  customerName: string | null;
  tag: string;
  description: string;
  category: ApplianceCategory;
  refrigerant: string;
  fullChargeG: number;
  fullChargeMethod: FullChargeMethod;
  makeModel: string | null;
  serialNumber: string | null;
  manufacturedOn: string | null;
  factorySealed: boolean;
  hasLeakDetection: boolean;
  industrialShutdownNeeded: boolean;
  awaitingDisposalAtShop: boolean;
  status: ApplianceStatus;
  installedOn: string | null;
  retiredOn: string | null;
  disposedOn: string | null;
  createdAt: string;
  updatedAt: string;
}

/** Classification of an appliance by the rules core; unknown refrigerants give no class rather than an error. */
export function deriveApplianceClass(a: { refrigerant: string; fullChargeG: number | null; factorySealed: boolean }): ApplianceDerived {
  let pressureClass: PressureClass | null;
  let certificationTypes: CertificationType[];
  try {
    pressureClass = classifyPressure(a.refrigerant);
  } catch {
    pressureClass = null;
  }
  const smallAppliance = isSmallAppliance(a);
  try {
    certificationTypes = [...requiredCertificationTypes(a)];
  } catch {
    certificationTypes = [];
  }
  return { pressureClass, smallAppliance, certificationTypes };
}

/** Appliances aliased `appliances` (the scope's table name) with their branch, site and customer. */
function appliancesWithJoins(db: Knex): Knex.QueryBuilder {
  return db("appliances as appliances")
    .join("branches as branch", "branch.id", "appliances.branch_id")
    .join("sites as site", "site.id", "appliances.site_id")
    .leftJoin("customers as customer", "customer.id", "site.customer_id");
}

const COLUMNS = [
  "appliances.*",
  "branch.name as branch_name",
  "branch.code as branch_code",
  "branch.mass_unit as branch_mass_unit",
  "branch.time_zone as branch_time_zone",
  "site.name as site_name",
  "site.address as site_address",
  "site.customer_id as customer_id",
  "customer.name as customer_name",
];

function toRow(r: any): ApplianceRow {
  const fullChargeG = Number(r.full_charge_g);
  const factorySealed = toBool(r.factory_sealed);
  return {
    id: Number(r.id),
    organisationId: Number(r.organisation_id),
    branchId: Number(r.branch_id),
    branchName: r.branch_name,
    branchCode: r.branch_code,
    massUnit: r.branch_mass_unit,
    timeZone: r.branch_time_zone,
    siteId: Number(r.site_id),
    siteName: r.site_name,
    siteAddress: r.site_address ?? null,
    customerId: toNumOrNull(r.customer_id),
    customerName: r.customer_name ?? null,
    tag: r.tag,
    description: r.description,
    category: r.category,
    refrigerant: r.refrigerant,
    fullChargeG,
    fullChargeMethod: r.full_charge_method,
    makeModel: r.make_model ?? null,
    serialNumber: r.serial_number ?? null,
    manufacturedOn: r.manufactured_on ?? null,
    factorySealed,
    hasLeakDetection: toBool(r.has_leak_detection),
    industrialShutdownNeeded: toBool(r.industrial_shutdown_needed),
    awaitingDisposalAtShop: toBool(r.awaiting_disposal_at_shop),
    status: r.status,
    installedOn: r.installed_on ?? null,
    retiredOn: r.retired_on ?? null,
    disposedOn: r.disposed_on ?? null,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
    ...deriveApplianceClass({ refrigerant: r.refrigerant, fullChargeG, factorySealed }),
  };
}

const SORT_COLUMNS: Record<ApplianceListQuery["sort"], string> = {
  tag: "appliances.tag",
  branch: "branch.name",
  category: "appliances.category",
  refrigerant: "appliances.refrigerant",
  fullCharge: "appliances.full_charge_g",
  status: "appliances.status",
  site: "site.name",
  installedOn: "appliances.installed_on",
};
/** Sort columns that may hold NULL (ordered as SQLite does in both dialects). */
const NULLABLE_SORTS = new Set(["appliances.installed_on"]);

/**
 * One page of the appliance register, filtered and sorted on the server. The scope sees the table
 * as `appliances` (e.g. `appliances.branch_id`).
 */
export async function listAppliances(db: Knex, opts: { scope: ScopeFn; query: ApplianceListQuery }): Promise<RegisterPage<ApplianceRow>> {
  const { query } = opts;
  const page = query.page ?? 1;
  const pageSize = query.pageSize ?? 25;
  const filtered = (qb: Knex.QueryBuilder) => {
    applyScope(qb, opts.scope);
    if (query.branchId) qb.where("appliances.branch_id", query.branchId);
    if (query.category) qb.where("appliances.category", query.category);
    if (query.status) qb.where("appliances.status", query.status);
    if (query.refrigerant) qb.where("appliances.refrigerant", query.refrigerant);
    if (query.q)
      whereContains(qb, query.q, [
        "appliances.tag",
        "appliances.description",
        "site.name",
        "coalesce(customer.name, '')",
        "coalesce(appliances.serial_number, '')",
      ]);
    return qb;
  };
  const total = await countRows(filtered(appliancesWithJoins(db)));
  const dir = query.dir === "desc" ? "desc" : "asc";
  const rows = await sortedPage(filtered(appliancesWithJoins(db)).select(COLUMNS), {
    column: SORT_COLUMNS[query.sort ?? "tag"],
    dir,
    nullable: NULLABLE_SORTS,
    id: "appliances.id",
    page,
    pageSize,
  });
  return { rows: rows.map(toRow), total, page, pageSize };
}

/** One appliance the scope allows, or undefined (another organisation's appliance is never found). */
export async function getAppliance(db: Knex, opts: { scope: ScopeFn; id: number }): Promise<ApplianceRow | undefined> {
  const qb = appliancesWithJoins(db).where("appliances.id", opts.id);
  applyScope(qb, opts.scope);
  const r = await qb.first(COLUMNS);
  return r ? toRow(r) : undefined;
}

// ---------------------------------------------------------------------------------------------
// Sites and customers
// ---------------------------------------------------------------------------------------------

export interface SiteOption {
  id: number;
  branchId: number;
  name: string;
  address: string | null;
  customerId: number | null;
  customerName: string | null;
}

/** Sites of one branch for the appliance form, by name. The scope sees the table as `sites`. */
export async function listSiteOptions(
  db: Knex,
  opts: { scope: ScopeFn; branchId: number; q?: string; limit: number },
): Promise<SiteOption[]> {
  const qb = db("sites as sites")
    .leftJoin("customers as customer", "customer.id", "sites.customer_id")
    .where("sites.branch_id", opts.branchId)
    .whereNull("sites.archived_at");
  applyScope(qb, opts.scope);
  if (opts.q) whereContains(qb, opts.q, ["sites.name", "coalesce(sites.address, '')", "coalesce(customer.name, '')"]);
  const rows = await qb
    .orderBy([{ column: "sites.name" }, { column: "sites.id" }])
    .limit(opts.limit)
    .select("sites.id", "sites.branch_id", "sites.name", "sites.address", "sites.customer_id", "customer.name as customer_name");
  return rows.map((r) => ({
    id: Number(r.id),
    branchId: Number(r.branch_id),
    name: r.name,
    address: r.address ?? null,
    customerId: toNumOrNull(r.customer_id),
    customerName: r.customer_name ?? null,
  }));
}

export interface CustomerOption {
  id: number;
  branchId: number;
  name: string;
}

/** Customers of one branch for the appliance form, by name. The scope sees the table as `customers`. */
export async function listCustomerOptions(
  db: Knex,
  opts: { scope: ScopeFn; branchId: number; q?: string; limit: number },
): Promise<CustomerOption[]> {
  const qb = db("customers as customers").where("customers.branch_id", opts.branchId).whereNull("customers.archived_at");
  applyScope(qb, opts.scope);
  if (opts.q) whereContains(qb, opts.q, ["customers.name"]);
  const rows = await qb
    .orderBy([{ column: "customers.name" }, { column: "customers.id" }])
    .limit(opts.limit)
    .select("customers.id", "customers.branch_id", "customers.name");
  return rows.map((r) => ({ id: Number(r.id), branchId: Number(r.branch_id), name: r.name }));
}

type SiteFields = Pick<
  ApplianceInput,
  "siteChoice" | "siteId" | "newSiteName" | "newSiteAddress" | "customerChoice" | "customerId" | "newCustomerName"
>;

/** What an appliance form will add besides the appliance, for the caller's permission checks. */
export function plannedSiteRecords(input: SiteFields): { site: boolean; customer: boolean } {
  const site = input.siteChoice === "new";
  return { site, customer: site && input.customerChoice === "new" };
}

/** The existing site of the branch, or a new one (with an existing, a new or no customer). */
async function resolveSite(
  trx: Knex.Transaction,
  opts: { actor: ActorRef; branch: RegisterBranch; input: SiteFields; at: string },
): Promise<{ id: number; name: string }> {
  const { actor, branch, input, at } = opts;
  if (input.siteChoice === "existing") {
    const site = await trx("sites")
      .where({ id: input.siteId, organisation_id: actor.organisationId })
      .first("id", "branch_id", "name", "archived_at");
    if (!site) throw new RecordNotFoundError("That site does not exist", "siteId");
    if (Number(site.branch_id) !== branch.id) throw new RecordConflictError("That site belongs to another branch", "siteId");
    if (site.archived_at) throw new RecordConflictError("That site is archived", "siteId");
    return { id: Number(site.id), name: site.name };
  }
  let customerId: number | null = null;
  if (input.customerChoice === "existing") {
    const customer = await trx("customers").where({ id: input.customerId, organisation_id: actor.organisationId }).first("id", "branch_id");
    if (!customer) throw new RecordNotFoundError("That customer does not exist", "customerId");
    if (Number(customer.branch_id) !== branch.id) throw new RecordConflictError("That customer belongs to another branch", "customerId");
    customerId = Number(customer.id);
  } else if (input.customerChoice === "new") {
    const name = (input.newCustomerName ?? "").trim();
    if (!name) throw new InvalidInputError("Name the new customer", "newCustomerName");
    const [c] = await trx("customers")
      .insert({ organisation_id: actor.organisationId, branch_id: branch.id, name, created_at: at })
      .returning("id");
    customerId = rowId(c);
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: branch.id,
      action: "customer.created",
      subjectType: "Customer",
      subjectId: customerId,
      summary: `Added customer ${name} to ${branch.name}`,
      at,
    });
  }
  const name = (input.newSiteName ?? "").trim();
  if (!name) throw new InvalidInputError("Name the new site", "newSiteName");
  const [s] = await trx("sites")
    .insert({
      organisation_id: actor.organisationId,
      branch_id: branch.id,
      customer_id: customerId,
      name,
      address: input.newSiteAddress ?? null,
      created_at: at,
    })
    .returning("id");
  const siteId = rowId(s);
  await appendActivity(trx, {
    organisationId: actor.organisationId,
    actorId: actor.userId,
    branchId: branch.id,
    action: "site.created",
    subjectType: "Site",
    subjectId: siteId,
    summary: `Added site ${name} to ${branch.name}`,
    at,
  });
  return { id: siteId, name };
}

async function refuseDuplicateTag(trx: Knex.Transaction, organisationId: number, tag: string, exceptId?: number): Promise<void> {
  const qb = trx("appliances").where({ organisation_id: organisationId }).whereRaw("lower(tag) = ?", [tag.toLowerCase()]);
  if (exceptId !== undefined) qb.whereNot("id", exceptId);
  const clash = await qb.first("id");
  if (clash) throw new RecordConflictError(`Another appliance already has the tag ${tag}`, "tag");
}

/** Register columns from the form's fields (site excluded). */
function applianceColumns(input: ApplianceUpdateInput | ApplianceInput) {
  return {
    tag: input.tag,
    description: input.description,
    category: input.category,
    refrigerant: input.refrigerant,
    full_charge_g: toGrams(input.fullChargeAmount, input.fullChargeUnit),
    full_charge_method: input.fullChargeMethod,
    factory_sealed: input.factorySealed,
    has_leak_detection: input.hasLeakDetection ?? false,
    industrial_shutdown_needed: input.category === "industrial_process" ? (input.industrialShutdownNeeded ?? false) : false,
    make_model: input.makeModel ?? null,
    serial_number: input.serialNumber ?? null,
    manufactured_on: input.manufacturedOn ?? null,
    installed_on: input.installedOn ?? null,
  };
}

/**
 * Adds an appliance to a branch's register, with a new site (and customer) when asked, in one
 * transaction with its activity rows. The caller has checked the actor may create in that branch.
 */
export async function createAppliance(db: Knex, opts: { actor: ActorRef; input: ApplianceInput; now?: Date }): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  try {
    return await db.transaction(async (trx) => {
      const branch = await loadWritableBranch(trx, actor.organisationId, input.branchId);
      await refuseDuplicateTag(trx, actor.organisationId, input.tag);
      const site = await resolveSite(trx, { actor, branch, input, at });
      const columns = applianceColumns(input);
      const [row] = await trx("appliances")
        .insert({
          organisation_id: actor.organisationId,
          branch_id: branch.id,
          site_id: site.id,
          ...columns,
          status: input.status ?? "in_service",
          retired_on: input.status === "retired" ? (input.retiredOn ?? null) : null,
          created_at: at,
          updated_at: at,
        })
        .returning("id");
      const id = rowId(row);
      await appendActivity(trx, {
        organisationId: actor.organisationId,
        actorId: actor.userId,
        branchId: branch.id,
        action: "appliance.created",
        subjectType: "Appliance",
        subjectId: id,
        summary: `Added appliance ${input.tag} (${APPLIANCE_CATEGORY_LABELS[input.category]}, ${input.refrigerant}, full charge ${formatMass(columns.full_charge_g, branch.massUnit)}) at ${site.name}`,
        data: { siteId: site.id, fullChargeG: columns.full_charge_g },
        at,
      });
      return id;
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw new RecordConflictError(`Another appliance already has the tag ${input.tag}`, "tag");
    throw err;
  }
}

/** Corrections of these columns change what the rules conclude: they are amendments with a reason. */
export const APPLIANCE_REGULATED_COLUMNS = ["category", "refrigerant", "full_charge_g", "full_charge_method", "factory_sealed"] as const;

const APPLIANCE_COLUMN_WORDS: Record<string, string> = {
  tag: "tag",
  description: "description",
  category: "kind of appliance",
  refrigerant: "refrigerant",
  full_charge_g: "full charge",
  full_charge_method: "how the full charge was determined",
  factory_sealed: "factory sealed",
  has_leak_detection: "leak detection",
  industrial_shutdown_needed: "shutdown needed for repair",
  make_model: "make and model",
  serial_number: "serial number",
  manufactured_on: "manufacture date",
  installed_on: "installation date",
  site_id: "site",
  status: "status",
  retired_on: "retirement date",
  disposed_on: "disposal date",
};

export interface ApplianceUpdateResult {
  /** The amendment written, when a regulated field changed. */
  amendmentId: number | null;
  changed: string[];
}

/**
 * Edits an appliance. Changes to the refrigerant, full charge (and how it was determined), category
 * or factory sealing are corrections of a regulated record: they need a reason and are kept as an
 * amendment with the previous values. Other changes are written with an activity row listing them.
 */
export async function updateAppliance(
  db: Knex,
  opts: { actor: ActorRef; id: number; input: ApplianceUpdateInput; now?: Date },
): Promise<ApplianceUpdateResult> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  try {
    return await db.transaction(async (trx) => {
      const row = await trx("appliances").where({ id: opts.id, organisation_id: actor.organisationId }).first();
      if (!row) throw new RecordNotFoundError("No such appliance");
      const branch = await loadWritableBranch(trx, actor.organisationId, Number(row.branch_id));
      if (input.tag.toLowerCase() !== String(row.tag).toLowerCase())
        await refuseDuplicateTag(trx, actor.organisationId, input.tag, opts.id);
      const site = await resolveSite(trx, { actor, branch, input, at });
      const { previous, next } = changedColumns(row, { ...applianceColumns(input), site_id: site.id });
      const changed = Object.keys(next);
      if (changed.length === 0) throw new InvalidInputError("Nothing was changed", "tag");
      const regulated = changed.filter((c) => (APPLIANCE_REGULATED_COLUMNS as readonly string[]).includes(c));
      const tag = input.tag;
      if (regulated.length > 0) {
        if (!input.reason || input.reason.trim().length < 3) {
          throw new InvalidInputError(
            `Say why the ${describeColumns(regulated, APPLIANCE_COLUMN_WORDS)} ${regulated.length > 1 ? "are" : "is"} corrected; the previous values are kept`,
            "reason",
          );
        }
        const amendmentId = await amendRecord(trx, {
          table: "appliances",
          subjectType: "Appliance",
          id: opts.id,
          organisationId: actor.organisationId,
          actorId: actor.userId,
          reason: input.reason,
          changes: next,
          summary: `Corrected the ${describeColumns(changed, APPLIANCE_COLUMN_WORDS)} of appliance ${tag}`,
          at,
        });
        return { amendmentId, changed };
      }
      await updateWithActivity(trx, {
        table: "appliances",
        id: opts.id,
        organisationId: actor.organisationId,
        branchId: branch.id,
        actorId: actor.userId,
        subjectType: "Appliance",
        action: "appliance.updated",
        previous,
        next,
        summary: `Updated the ${describeColumns(changed, APPLIANCE_COLUMN_WORDS)} of appliance ${tag}`,
        at,
      });
      return { amendmentId: null, changed };
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw new RecordConflictError(`Another appliance already has the tag ${input.tag}`, "tag");
    throw err;
  }
}

/**
 * Puts an appliance in service, retires it or records it as disposed of, with the date and the
 * reason kept in its history (an amendment). Registers are never deleted; a status is changed.
 */
export async function changeApplianceStatus(
  db: Knex,
  opts: { actor: ActorRef; id: number; input: ApplianceStatusInput; now?: Date },
): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const row = await trx("appliances").where({ id: opts.id, organisation_id: actor.organisationId }).first();
    if (!row) throw new RecordNotFoundError("No such appliance");
    await loadWritableBranch(trx, actor.organisationId, Number(row.branch_id));
    if (row.status === input.status)
      throw new InvalidInputError(`The appliance is already ${REGISTER_LABELS.applianceStatus[input.status].toLowerCase()}`, "status");
    if (row.installed_on && input.on < row.installed_on)
      throw new InvalidInputError(`The date is before the installation (${row.installed_on})`, "on");
    const changes: Record<string, unknown> = { status: input.status };
    if (input.status === "in_service") {
      changes.retired_on = null;
      changes.disposed_on = null;
    } else if (input.status === "retired") {
      changes.retired_on = input.on;
      changes.disposed_on = null;
    } else {
      changes.disposed_on = input.on;
    }
    const { next } = changedColumns(row, changes);
    const verb = input.status === "in_service" ? "Put back in service" : input.status === "retired" ? "Retired" : "Recorded as disposed of";
    return amendRecord(trx, {
      table: "appliances",
      subjectType: "Appliance",
      id: opts.id,
      organisationId: actor.organisationId,
      actorId: actor.userId,
      reason: input.reason,
      changes: next,
      summary: `${verb}: appliance ${row.tag} on ${input.on}`,
      at,
    });
  });
}

// ---------------------------------------------------------------------------------------------
// Refrigerant history of one appliance
// ---------------------------------------------------------------------------------------------

export interface ApplianceJobMovement {
  direction: string;
  refrigerant: string;
  massG: number;
  cylinderId: number | null;
  cylinderSerial: string | null;
}

export interface ApplianceJobRow {
  id: number;
  kind: string;
  performedOn: string;
  technicianName: string;
  refrigerant: string | null;
  recoveredG: number;
  chargedG: number;
  equipmentSerial: string | null;
  additionExclusion: string | null;
  verificationStage: string | null;
  verificationPassed: boolean | null;
  movements: ApplianceJobMovement[];
}

/**
 * The jobs on one appliance that the Job scope allows (voided ones left out), newest first by
 * default, with the refrigerant each moved. The scope sees the jobs table as `jobs`.
 */
export async function listApplianceJobs(
  db: Knex,
  opts: { scope: ScopeFn; applianceId: number; query: RegisterHistoryQuery },
): Promise<RegisterPage<ApplianceJobRow>> {
  const page = opts.query.page ?? 1;
  const pageSize = opts.query.pageSize ?? 10;
  const dir = opts.query.dir === "asc" ? "asc" : "desc";
  const base = () => {
    const qb = db("jobs as jobs").where("jobs.appliance_id", opts.applianceId).whereNull("jobs.voided_at");
    applyScope(qb, opts.scope);
    return qb;
  };
  const countRow = await base().count({ n: "*" }).first();
  const total = Number(countRow?.n ?? 0);
  const rows = await base()
    .join("users as technician", "technician.id", "jobs.technician_id")
    .leftJoin("recovery_equipment as equipment", "equipment.id", "jobs.equipment_id")
    .orderBy("jobs.performed_on", dir)
    .orderBy("jobs.id", dir)
    .limit(pageSize)
    .offset((page - 1) * pageSize)
    .select(
      "jobs.id",
      "jobs.kind",
      "jobs.performed_on",
      "technician.name as technician_name",
      "jobs.refrigerant",
      "jobs.recovered_g",
      "jobs.charged_g",
      "equipment.serial as equipment_serial",
      "jobs.addition_exclusion",
      "jobs.verification_stage",
      "jobs.verification_passed",
    );
  const ids = rows.map((r) => Number(r.id));
  const movements = ids.length
    ? await db("refrigerant_movements as mv")
        .leftJoin("cylinders as c", "c.id", "mv.cylinder_id")
        .whereIn("mv.job_id", ids)
        .whereNull("mv.voided_at")
        .orderBy("mv.id")
        .select("mv.job_id", "mv.direction", "mv.refrigerant", "mv.mass_g", "mv.cylinder_id", "c.serial as cylinder_serial")
    : [];
  const byJob = new Map<number, ApplianceJobMovement[]>();
  for (const m of movements) {
    const list = byJob.get(Number(m.job_id)) ?? [];
    list.push({
      direction: m.direction,
      refrigerant: m.refrigerant,
      massG: Number(m.mass_g),
      cylinderId: toNumOrNull(m.cylinder_id),
      cylinderSerial: m.cylinder_serial ?? null,
    });
    byJob.set(Number(m.job_id), list);
  }
  return {
    rows: rows.map((r) => ({
      id: Number(r.id),
      kind: r.kind,
      performedOn: r.performed_on,
      technicianName: r.technician_name,
      refrigerant: r.refrigerant ?? null,
      recoveredG: Number(r.recovered_g),
      chargedG: Number(r.charged_g),
      equipmentSerial: r.equipment_serial ?? null,
      additionExclusion: r.addition_exclusion ?? null,
      verificationStage: r.verification_stage ?? null,
      verificationPassed: r.verification_passed === null || r.verification_passed === undefined ? null : toBool(r.verification_passed),
      movements: byJob.get(Number(r.id)) ?? [],
    })),
    total,
    page,
    pageSize,
  };
}

/** Where an appliance, cylinder or unit of equipment belongs, for permission checks before a write. */
export async function getRegisterRef(
  db: Knex,
  opts: { table: "appliances" | "cylinders" | "recovery_equipment"; organisationId: number; id: number },
): Promise<{ id: number; organisationId: number; branchId: number } | undefined> {
  const row = await db(opts.table).where({ id: opts.id, organisation_id: opts.organisationId }).first("id", "organisation_id", "branch_id");
  if (!row) return undefined;
  return { id: Number(row.id), organisationId: Number(row.organisation_id), branchId: Number(row.branch_id) };
}
