import type { Knex } from "knex";
import {
  addDays,
  analyseLeaks,
  fillPercent,
  maxCylinderFill,
  requalificationDueOn,
  type AuditSettings,
  type MassDisplayUnit,
  type Severity,
} from "@coldtrail/core";
import { toBoolOrNull, toNumOrNull, type ScopeFn } from "../types";
import { findingRecordLabel } from "./findings";
import { loadBranchRecords } from "./load-branch-records";

/**
 * Rows of an audit's spreadsheet, read in batches (keyset by id) so a large audit streams out without
 * holding everything in memory. Every reader takes the scope of what the person may read.
 */

const BATCH = 1000;

const scoped = (qb: Knex.QueryBuilder, scope: ScopeFn, columns?: Partial<Record<string, string>>) =>
  qb.where(function inScope(this: Knex.QueryBuilder) {
    scope(this, columns);
  });

export interface FindingExportRow {
  id: number;
  branchName: string;
  ruleId: string;
  title: string;
  severity: Severity;
  state: string;
  recordType: string;
  recordId: number | null;
  applianceTag: string | null;
  /** Plain words for the record, as the findings table shows it. */
  recordLabel: string;
  detail: string;
  fix: string;
  citation: string;
  dueOn: string | null;
  occurredOn: string | null;
  assigneeName: string | null;
  technicianName: string | null;
  updatedAt: string;
}

/** The findings an audit saw (one row each, in finding id order) that the scope allows. */
export async function* auditFindingExportRows(
  db: Knex,
  opts: { organisationId: number; auditId: number; scope: ScopeFn },
): AsyncGenerator<FindingExportRow> {
  let after = 0;
  for (;;) {
    const rows = await scoped(
      db("audit_findings as af")
        .join("findings as findings", "findings.id", "af.finding_id")
        .join("branches as branch", "branch.id", "findings.branch_id")
        .leftJoin("users as assignee", "assignee.id", "findings.assignee_id")
        .leftJoin("users as technician", "technician.id", "findings.technician_id")
        .leftJoin("appliances as appliance", "appliance.id", "findings.appliance_id")
        .leftJoin("cylinders as record_cylinder", function cylinderRecord(this: Knex.JoinClause) {
          this.on("record_cylinder.id", "=", "findings.record_id").andOnVal("findings.record_type", "=", "cylinder");
        })
        .leftJoin("recovery_equipment as record_equipment", function equipmentRecord(this: Knex.JoinClause) {
          this.on("record_equipment.id", "=", "findings.record_id").andOnVal("findings.record_type", "=", "equipment");
        })
        .where({ "af.audit_id": opts.auditId, "findings.organisation_id": opts.organisationId })
        .where("af.finding_id", ">", after),
      opts.scope,
    )
      // Keyset on the link table's primary key (audit, finding): each batch reads on from the last one.
      .orderBy("af.finding_id")
      .limit(BATCH)
      .select(
        "findings.id",
        "branch.name as branch_name",
        "findings.rule_id",
        "findings.title",
        "findings.severity",
        "findings.state",
        "findings.record_type",
        "findings.record_id",
        "appliance.tag as appliance_tag",
        "findings.detail",
        "findings.fix",
        "findings.citation",
        "findings.due_on",
        "findings.occurred_on",
        "assignee.name as assignee_name",
        "technician.name as technician_name",
        "findings.updated_at",
        "record_cylinder.serial as record_cylinder_serial",
        "record_equipment.serial as record_equipment_serial",
      );
    if (rows.length === 0) return;
    for (const r of rows) {
      yield {
        id: Number(r.id),
        branchName: r.branch_name,
        ruleId: r.rule_id,
        title: r.title,
        severity: r.severity,
        state: r.state,
        recordType: r.record_type,
        recordId: toNumOrNull(r.record_id),
        applianceTag: r.appliance_tag ?? null,
        recordLabel: findingRecordLabel(r),
        detail: r.detail,
        fix: r.fix,
        citation: r.citation,
        dueOn: r.due_on ?? null,
        occurredOn: r.occurred_on ?? null,
        assigneeName: r.assignee_name ?? null,
        technicianName: r.technician_name ?? null,
        updatedAt: r.updated_at,
      };
    }
    after = Number(rows[rows.length - 1]!.id);
    if (rows.length < BATCH) return;
  }
}

/** Findings of an audit by branch, rule and severity (for the summary sheet), within the scope. */
export async function auditFindingCounts(
  db: Knex,
  opts: { organisationId: number; auditId: number; scope: ScopeFn },
): Promise<{ branchName: string; ruleId: string; title: string; severity: Severity; n: number }[]> {
  const rows = await scoped(
    db("audit_findings as af")
      .join("findings as findings", "findings.id", "af.finding_id")
      .join("branches as branch", "branch.id", "findings.branch_id")
      .where({ "af.audit_id": opts.auditId, "findings.organisation_id": opts.organisationId }),
    opts.scope,
  )
    .groupBy("branch.name", "findings.rule_id", "findings.title", "findings.severity")
    .select("branch.name as branch_name", "findings.rule_id", "findings.title", "findings.severity")
    .count({ n: "*" });
  return rows.map((r) => ({ branchName: r.branch_name, ruleId: r.rule_id, title: r.title, severity: r.severity, n: Number(r.n) }));
}

export interface JobExportRow {
  id: number;
  performedOn: string;
  branchName: string;
  massUnit: MassDisplayUnit;
  kind: string;
  applianceTag: string;
  applianceDescription: string;
  category: string;
  technicianName: string;
  refrigerant: string | null;
  recoveredG: number;
  chargedG: number;
  cylinderSerial: string | null;
  equipmentSerial: string | null;
  evacuationValue: number | null;
  evacuationUnit: string | null;
  accessMethod: string | null;
  temporaryAccessRemoved: boolean | null;
  notes: string | null;
}

/**
 * Jobs of the branches in the period (not voided), within the scope (table `jobs`): branch by branch,
 * by date then id. Each batch continues from the last (date, id) along the (branch, date, id) index.
 */
export async function* jobExportRows(
  db: Knex,
  opts: { organisationId: number; branchIds: number[]; from: string; to: string; scope: ScopeFn },
): AsyncGenerator<JobExportRow> {
  for (const branchId of opts.branchIds) {
    let after: { on: string; id: number } | null = null;
    for (;;) {
      const q = db("jobs as jobs")
        .join("branches as branch", "branch.id", "jobs.branch_id")
        .join("appliances as appliance", "appliance.id", "jobs.appliance_id")
        .join("users as technician", "technician.id", "jobs.technician_id")
        .leftJoin("cylinders as cylinder", "cylinder.id", "jobs.cylinder_id")
        .leftJoin("recovery_equipment as equipment", "equipment.id", "jobs.equipment_id")
        // The organisation is pinned through the branch so the planner walks the (branch, date, id) index.
        .where({ "branch.organisation_id": opts.organisationId, "jobs.branch_id": branchId })
        .whereNull("jobs.voided_at")
        .where("jobs.performed_on", "<=", opts.to);
      if (after) {
        const last = after;
        q.where("jobs.performed_on", ">=", last.on).where((w) =>
          w.where("jobs.performed_on", ">", last.on).orWhere("jobs.id", ">", last.id),
        );
      } else {
        q.where("jobs.performed_on", ">=", opts.from);
      }
      const rows = await scoped(q, opts.scope)
        .orderBy([{ column: "jobs.performed_on" }, { column: "jobs.id" }])
        .limit(BATCH)
        .select(
          "jobs.id",
          "jobs.performed_on",
          "branch.name as branch_name",
          "branch.mass_unit",
          "jobs.kind",
          "appliance.tag",
          "appliance.description",
          "appliance.category",
          "technician.name as technician_name",
          "jobs.refrigerant",
          "jobs.recovered_g",
          "jobs.charged_g",
          "cylinder.serial as cylinder_serial",
          "equipment.serial as equipment_serial",
          "jobs.evacuation_value",
          "jobs.evacuation_unit",
          "jobs.access_method",
          "jobs.temporary_access_removed",
          "jobs.notes",
        );
      if (rows.length === 0) break;
      for (const r of rows) {
        yield {
          id: Number(r.id),
          performedOn: r.performed_on,
          branchName: r.branch_name,
          massUnit: r.mass_unit,
          kind: r.kind,
          applianceTag: r.tag,
          applianceDescription: r.description,
          category: r.category,
          technicianName: r.technician_name,
          refrigerant: r.refrigerant ?? null,
          recoveredG: Number(r.recovered_g),
          chargedG: Number(r.charged_g),
          cylinderSerial: r.cylinder_serial ?? null,
          equipmentSerial: r.equipment_serial ?? null,
          evacuationValue: toNumOrNull(r.evacuation_value),
          evacuationUnit: r.evacuation_unit ?? null,
          accessMethod: r.access_method ?? null,
          temporaryAccessRemoved: toBoolOrNull(r.temporary_access_removed),
          notes: r.notes ?? null,
        };
      }
      const last = rows[rows.length - 1]!;
      after = { on: last.performed_on, id: Number(last.id) };
      if (rows.length < BATCH) break;
    }
  }
}

export interface LeakRateExportRow {
  branchName: string;
  applianceId: number;
  applianceTag: string;
  category: string;
  refrigerant: string;
  fullChargeG: number;
  on: string;
  addedG: number;
  excludedG: number;
  daysSinceLastAddition: number | null;
  method: string;
  percent: number;
  threshold: number;
  exceeds: boolean;
  regime: string;
  jobIds: number[];
}

/**
 * Every leak-rate calculation in the period with its inputs: one row per addition date of every
 * appliance under leak-repair rules. Records are read once per branch; `jobVisible` leaves out
 * calculations the person may not read (an inspector's date window).
 */
export async function* leakRateExportRows(
  db: Knex,
  opts: {
    organisationId: number;
    branchIds: number[];
    from: string;
    to: string;
    settings: AuditSettings;
    jobVisible: (job: { branchId: number; performedOn: string; technicianId: number | null }) => boolean;
  },
): AsyncGenerator<LeakRateExportRow> {
  for (const branchId of opts.branchIds) {
    const loaded = await loadBranchRecords(db, {
      organisationId: opts.organisationId,
      branchId,
      period: { from: opts.from, to: opts.to },
      asOf: `${addDays(opts.to, 1)}T00:00:00Z`,
    });
    const byAppliance = new Map<number, typeof loaded.records.jobs>();
    const sorted = [...loaded.records.jobs].sort((a, b) =>
      a.performedOn < b.performedOn ? -1 : a.performedOn > b.performedOn ? 1 : a.id - b.id,
    );
    const jobsById = new Map(sorted.map((j) => [j.id, j]));
    for (const j of sorted) {
      if (j.applianceId === null) continue;
      const list = byAppliance.get(j.applianceId) ?? [];
      list.push(j);
      byAppliance.set(j.applianceId, list);
    }
    for (const appliance of loaded.records.appliances) {
      const analysis = analyseLeaks(appliance, byAppliance.get(appliance.id) ?? [], opts.settings, loaded.branch.timeZone);
      if (!analysis) continue;
      for (const c of analysis.events) {
        const e = c.event;
        if (e.on < opts.from || e.on > opts.to || e.percent === null) continue;
        const visible = e.sourceIds.every((id) => {
          const job = jobsById.get(id);
          return job ? opts.jobVisible({ branchId, performedOn: job.performedOn, technicianId: job.technicianId }) : false;
        });
        if (!visible) continue;
        yield {
          branchName: loaded.branch.name,
          applianceId: appliance.id,
          applianceTag: appliance.label,
          category: appliance.category,
          refrigerant: appliance.refrigerant,
          fullChargeG: appliance.fullChargeG ?? 0,
          on: e.on,
          addedG: e.addedG,
          excludedG: e.excludedG,
          daysSinceLastAddition: e.daysSinceLastAddition,
          method: opts.settings.leakRateMethod,
          percent: Math.round(e.percent * 100) / 100,
          threshold: c.threshold,
          exceeds: c.exceeds,
          regime: c.regime,
          jobIds: e.sourceIds,
        };
      }
    }
  }
}

export interface CylinderExportRow {
  id: number;
  /** The calendar date the contents and fill are as of (the end of the audit period). */
  asOf: string;
  branchName: string;
  serial: string;
  specification: string | null;
  waterCapacityG: number;
  tareG: number;
  refrigerant: string | null;
  contentsG: number;
  maxNetG: number | null;
  fillPercent: number | null;
  lastRequalifiedOn: string | null;
  requalificationDueOn: string | null;
  status: string;
}

/** Which way a movement changes its cylinder's contents (adjustments are not written by any flow). */
const CONTENTS_SIGN: Record<string, number> = { recovered_into_cylinder: 1, charged_from_cylinder: -1, shipped_for_reclaim: -1 };

/**
 * Registered cylinders of the branches, within the scope (table `cylinders`), with their contents as
 * of `asOf` (the end of the audit period): what the register holds now, less every movement recorded
 * after that date. The refrigerant is the one the cylinder held then (its last movement on or before
 * the date, else the register's).
 */
export async function* cylinderExportRows(
  db: Knex,
  opts: { organisationId: number; branchIds: number[]; scope: ScopeFn; settings: AuditSettings; asOf: string },
): AsyncGenerator<CylinderExportRow> {
  let after = 0;
  for (;;) {
    const rows = await scoped(
      db("cylinders as cylinders")
        .join("branches as branch", "branch.id", "cylinders.branch_id")
        .where("cylinders.organisation_id", opts.organisationId)
        .whereIn("cylinders.branch_id", opts.branchIds.length ? opts.branchIds : [-1])
        .where("cylinders.unregistered", false)
        .where("cylinders.id", ">", after),
      opts.scope,
    )
      .orderBy("cylinders.id")
      .limit(BATCH)
      .select("cylinders.*", "branch.name as branch_name");
    if (rows.length === 0) return;
    const ids = rows.map((c: { id: number }) => Number(c.id));
    const later = new Map<number, number>();
    for (const m of await db("refrigerant_movements")
      .whereIn("cylinder_id", ids)
      .whereNull("voided_at")
      .where("moved_on", ">", opts.asOf)
      .select("cylinder_id", "direction", "mass_g"))
      later.set(Number(m.cylinder_id), (later.get(Number(m.cylinder_id)) ?? 0) + (CONTENTS_SIGN[m.direction] ?? 0) * Number(m.mass_g));
    const refrigerantThen = new Map<number, string>();
    for (const m of await db("refrigerant_movements")
      .whereIn("cylinder_id", ids)
      .whereNull("voided_at")
      .where("moved_on", "<=", opts.asOf)
      .orderBy([{ column: "moved_on" }, { column: "id" }])
      .select("cylinder_id", "refrigerant"))
      refrigerantThen.set(Number(m.cylinder_id), m.refrigerant);
    for (const c of rows) {
      const contentsG = Math.max(0, Number(c.contents_g) - (later.get(Number(c.id)) ?? 0));
      const refrigerant = contentsG > 0 ? (refrigerantThen.get(Number(c.id)) ?? c.refrigerant ?? null) : null;
      let maxNetG: number | null = null;
      if (refrigerant) {
        try {
          maxNetG = maxCylinderFill({
            waterCapacityG: Number(c.water_capacity_g),
            tareG: Number(c.tare_g),
            refrigerant,
            strict130F: opts.settings.strictFill130F,
          }).maxNetG;
        } catch {
          maxNetG = null;
        }
      }
      yield {
        id: Number(c.id),
        branchName: c.branch_name,
        serial: c.serial,
        specification: c.specification ?? null,
        waterCapacityG: Number(c.water_capacity_g),
        tareG: Number(c.tare_g),
        asOf: opts.asOf,
        refrigerant,
        contentsG,
        maxNetG,
        fillPercent: maxNetG ? Math.round(fillPercent(contentsG, maxNetG) * 10) / 10 : null,
        lastRequalifiedOn: c.last_requalified_on ?? null,
        requalificationDueOn: c.last_requalified_on
          ? requalificationDueOn(c.last_requalified_on, opts.settings.requalificationYears)
          : null,
        status: c.status,
      };
    }
    after = Number(rows[rows.length - 1]!.id);
    if (rows.length < BATCH) return;
  }
}

export interface CertificationExportRow {
  id: number;
  technicianName: string;
  branchNames: string;
  certifyingOrganisation: string;
  certificateNumber: string;
  types: string[];
  state: string;
  issuedOn: string | null;
  verifiedAt: string | null;
  uploadedAt: string;
}

/** Certifications (not voided) of the technicians of the branches given. */
export async function* certificationExportRows(
  db: Knex,
  opts: { organisationId: number; branchIds: number[] },
): AsyncGenerator<CertificationExportRow> {
  const members = await db("memberships as m")
    .join("branches as b", "b.id", "m.branch_id")
    .where({ "m.organisation_id": opts.organisationId, "m.role": "technician" })
    .whereIn("m.branch_id", opts.branchIds.length ? opts.branchIds : [-1])
    .select("m.user_id", "b.name");
  const branchesOf = new Map<number, string[]>();
  for (const m of members) branchesOf.set(Number(m.user_id), [...(branchesOf.get(Number(m.user_id)) ?? []), m.name]);
  const userIds = [...branchesOf.keys()];
  for (let i = 0; i < userIds.length; i += 500) {
    const chunk = userIds.slice(i, i + 500);
    const rows = await db("certifications as c")
      .join("users as u", "u.id", "c.user_id")
      .whereIn("c.user_id", chunk)
      .where("c.organisation_id", opts.organisationId)
      .whereNull("c.voided_at")
      .orderBy([{ column: "u.name" }, { column: "c.id" }])
      .select(
        "c.id",
        "c.user_id",
        "u.name",
        "c.certifying_organisation",
        "c.certificate_number",
        "c.state",
        "c.issued_on",
        "c.verified_at",
        "c.uploaded_at",
      );
    const types = await db("certification_types")
      .whereIn("certification_id", rows.map((r) => Number(r.id)).concat(-1))
      .select("certification_id", "type");
    for (const r of rows) {
      yield {
        id: Number(r.id),
        technicianName: r.name,
        branchNames: (branchesOf.get(Number(r.user_id)) ?? []).sort().join(", "),
        certifyingOrganisation: r.certifying_organisation,
        certificateNumber: r.certificate_number,
        types: types
          .filter((t) => Number(t.certification_id) === Number(r.id))
          .map((t) => t.type as string)
          .sort(),
        state: r.state,
        issuedOn: r.issued_on ?? null,
        verifiedAt: r.verified_at ?? null,
        uploadedAt: r.uploaded_at,
      };
    }
  }
}

export interface DisposalExportRow {
  kind: "record" | "statement";
  id: number;
  branchName: string;
  applianceTag: string;
  applianceCategory: string;
  fullChargeG: number;
  /** Disposal date (record) or date of recovery (statement). */
  on: string | null;
  refrigerant: string | null;
  recoveredG: number | null;
  location: string | null;
  recoveredBy: string | null;
  signedBy: string | null;
  signedOn: string | null;
  jobId: number | null;
}

/** Disposal records and signed statements of the branches in the period, within the scope (table `d`). */
export async function* disposalExportRows(
  db: Knex,
  opts: { organisationId: number; branchIds: number[]; from: string; to: string; scope: ScopeFn },
): AsyncGenerator<DisposalExportRow> {
  const base = (table: string, dateColumn: string) =>
    scoped(
      db(`${table} as d`)
        .join("branches as branch", "branch.id", "d.branch_id")
        .join("appliances as appliance", "appliance.id", "d.appliance_id")
        .where("d.organisation_id", opts.organisationId)
        .whereIn("d.branch_id", opts.branchIds.length ? opts.branchIds : [-1])
        .whereNull("d.voided_at")
        .whereBetween(`d.${dateColumn}`, [opts.from, opts.to]),
      opts.scope,
      { recordedOn: `d.${dateColumn}` },
    ).orderBy("d.id");
  for (const r of await base("disposal_records", "disposed_on").select(
    "d.*",
    "branch.name as branch_name",
    "appliance.tag",
    "appliance.category",
    "appliance.full_charge_g",
  )) {
    yield {
      kind: "record",
      id: Number(r.id),
      branchName: r.branch_name,
      applianceTag: r.tag,
      applianceCategory: r.category,
      fullChargeG: Number(r.full_charge_g),
      on: r.disposed_on,
      refrigerant: r.refrigerant ?? null,
      recoveredG: toNumOrNull(r.recovered_g),
      location: r.appliance_location ?? null,
      recoveredBy: r.recovered_by_name ?? null,
      signedBy: null,
      signedOn: null,
      jobId: toNumOrNull(r.job_id),
    };
  }
  for (const r of await base("disposal_statements", "recovered_on").select(
    "d.*",
    "branch.name as branch_name",
    "appliance.tag",
    "appliance.category",
    "appliance.full_charge_g",
  )) {
    yield {
      kind: "statement",
      id: Number(r.id),
      branchName: r.branch_name,
      applianceTag: r.tag,
      applianceCategory: r.category,
      fullChargeG: Number(r.full_charge_g),
      on: r.recovered_on,
      refrigerant: null,
      recoveredG: null,
      location: r.recovered_by_address ?? null,
      recoveredBy: r.recovered_by_name ?? null,
      signedBy: r.signed_by_name ?? null,
      signedOn: r.signed_on ?? null,
      jobId: toNumOrNull(r.job_id),
    };
  }
}
