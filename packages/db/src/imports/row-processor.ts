import type { Knex } from "knex";
import {
  APPLIANCE_CATEGORY_LABELS,
  JOB_KIND_LABELS,
  normaliseDesignation,
  parseApplianceImportRow,
  parseCylinderImportRow,
  parseJobImportRow,
  type ApplianceImportRecord,
  type CylinderImportRecord,
  type ImportKind,
  type ImportRowIssue,
  type JobImportRecord,
  type MassDisplayUnit,
} from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { describeMass } from "../mass";
import type { ActorRef } from "../types";

/**
 * Checks a batch of parsed spreadsheet rows against the stored records (tags and serials already
 * taken, sites, appliances, technicians, cylinders and equipment of the branch, earlier rows of the
 * same file) and, when asked, writes the valid ones. One processor serves one pass over one file:
 * it remembers what earlier rows claimed or created.
 */

export interface ImportBranch {
  id: number;
  name: string;
  massUnit: MassDisplayUnit;
  timeZone: string;
  /** Today in the branch's time zone. */
  today: string;
  /** When the company's records begin: earlier dates of work are refused. */
  recordsBeginOn?: string;
}

export interface RowOutcome {
  rowNumber: number;
  issues: ImportRowIssue[];
  /** Plain words: what the row is (or would become). */
  summary: string;
}

export interface RowItem {
  rowNumber: number;
  cells: Record<string, string>;
}

export interface RowProcessor {
  process(items: RowItem[], opts: { write: boolean }): Promise<RowOutcome[]>;
}

interface ProcessorEnv {
  organisationId: number;
  branch: ImportBranch;
  actor: ActorRef;
  at: string;
  importId: number;
}

type Q = Knex | Knex.Transaction;

const lower = (s: string) => s.trim().toLowerCase();

function parseContext(env: ProcessorEnv) {
  return {
    today: env.branch.today,
    recordsBeginOn: env.branch.recordsBeginOn,
    defaultMassUnit: env.branch.massUnit === "kg" ? ("kg" as const) : ("lb" as const),
  };
}

/** Rows keyed by lower-case value; `column` must be a plain column of `table`. */
async function findByLower(
  q: Q,
  table: string,
  column: string,
  organisationId: number,
  values: string[],
  select: string[],
): Promise<Map<string, Array<Record<string, unknown>>>> {
  const out = new Map<string, Array<Record<string, unknown>>>();
  const unique = [...new Set(values.map(lower))];
  for (let i = 0; i < unique.length; i += 400) {
    const chunk = unique.slice(i, i + 400);
    const rows = await q(table)
      .where({ organisation_id: organisationId })
      .whereIn(q.raw(`lower(${column})`) as unknown as string, chunk)
      .select(select);
    for (const r of rows) {
      const key = lower(String(r[column]));
      out.set(key, [...(out.get(key) ?? []), r]);
    }
  }
  return out;
}

/** The row with exactly this spelling if there is one, else the only case-insensitive match. */
function pick<T extends Record<string, unknown>>(rows: T[] | undefined, column: string, value: string): T | undefined {
  if (!rows || rows.length === 0) return undefined;
  return rows.find((r) => r[column] === value.trim()) ?? (rows.length === 1 ? rows[0] : undefined);
}

export function createRowProcessor(kind: ImportKind, q: Q, env: ProcessorEnv): RowProcessor {
  switch (kind) {
    case "appliances":
      return new ApplianceRows(q, env);
    case "cylinders":
      return new CylinderRows(q, env);
    case "jobs":
      return new JobRows(q, env);
  }
}

// ------------------------------------------------------------------------------------- appliances

interface SiteEntry {
  id: number | null; // null: to be created by this import
  name: string;
  customerId: number | null;
  customerName: string | null;
  firstRow: number;
}

class ApplianceRows implements RowProcessor {
  private seen = new Map<string, number>();
  private sites: Map<string, SiteEntry> | null = null;
  private customers = new Map<string, { id: number | null; name: string }>();

  constructor(
    private readonly q: Q,
    private readonly env: ProcessorEnv,
  ) {}

  private async load(): Promise<Map<string, SiteEntry>> {
    if (this.sites) return this.sites;
    const sites = new Map<string, SiteEntry>();
    const rows = await this.q("sites as s")
      .leftJoin("customers as c", "c.id", "s.customer_id")
      .where({ "s.branch_id": this.env.branch.id, "s.organisation_id": this.env.organisationId })
      .whereNull("s.archived_at")
      .orderBy("s.id")
      .select("s.id", "s.name", "s.customer_id", "c.name as customer_name");
    for (const r of rows) {
      const key = lower(r.name);
      if (!sites.has(key))
        sites.set(key, {
          id: Number(r.id),
          name: r.name,
          customerId: r.customer_id === null ? null : Number(r.customer_id),
          customerName: r.customer_name ?? null,
          firstRow: 0,
        });
    }
    const customers = await this.q("customers")
      .where({ branch_id: this.env.branch.id, organisation_id: this.env.organisationId })
      .whereNull("archived_at")
      .orderBy("id")
      .select("id", "name");
    for (const c of customers)
      if (!this.customers.has(lower(c.name))) this.customers.set(lower(c.name), { id: Number(c.id), name: c.name });
    this.sites = sites;
    return sites;
  }

  async process(items: RowItem[], opts: { write: boolean }): Promise<RowOutcome[]> {
    const sites = await this.load();
    const parsed = items.map((item) => ({ item, ...parseApplianceImportRow(item.cells, parseContext(this.env)) }));
    const tags = parsed.filter((p) => p.record).map((p) => p.record!.tag);
    const existing = await findByLower(this.q, "appliances", "tag", this.env.organisationId, tags, ["id", "tag", "branch_id"]);
    const out: RowOutcome[] = [];
    for (const p of parsed) {
      const issues = [...p.issues];
      const r = p.record;
      if (!r) {
        out.push({ rowNumber: p.item.rowNumber, issues, summary: p.item.cells.tag || "(no tag)" });
        continue;
      }
      const key = lower(r.tag);
      const earlier = this.seen.get(key);
      if (earlier !== undefined) issues.push({ field: "tag", message: `The tag ${r.tag} is already used on row ${earlier} of this file` });
      else if (existing.get(key)?.length)
        issues.push({
          field: "tag",
          message: `An appliance with the tag ${String(existing.get(key)![0]!.tag)} is already in the register`,
        });

      let site = sites.get(lower(r.site));
      if (site && r.customer && site.customerName && lower(site.customerName) !== lower(r.customer)) {
        issues.push({
          field: "customer",
          message: `The site ${site.name} belongs to the customer ${site.customerName}, not ${r.customer}`,
        });
      }
      const newSite = !site || site.id === null;
      const summary = this.describe(r, newSite);
      if (issues.length > 0) {
        out.push({ rowNumber: p.item.rowNumber, issues, summary });
        continue;
      }
      this.seen.set(key, p.item.rowNumber);
      if (!site) {
        site = { id: null, name: r.site, customerId: null, customerName: r.customer, firstRow: p.item.rowNumber };
        sites.set(lower(r.site), site);
      }
      if (opts.write) await this.write(r, site);
      out.push({ rowNumber: p.item.rowNumber, issues, summary });
    }
    return out;
  }

  private describe(r: ApplianceImportRecord, newSite: boolean): string {
    return `${r.tag} · ${APPLIANCE_CATEGORY_LABELS[r.category]} · ${r.refrigerant}, full charge ${describeMass(r.fullChargeG, this.env.branch.massUnit)} · at ${r.site}${newSite ? " (new site)" : ""}`;
  }

  private async write(r: ApplianceImportRecord, site: SiteEntry): Promise<void> {
    const { env } = this;
    const activity = (action: string, subjectType: string, subjectId: number, summary: string, data?: unknown) =>
      appendActivity(this.q, {
        organisationId: env.organisationId,
        actorId: env.actor.userId,
        branchId: env.branch.id,
        action,
        subjectType,
        subjectId,
        summary,
        data,
        at: env.at,
      });
    if (site.id === null) {
      let customerId: number | null = null;
      if (site.customerName) {
        const known = this.customers.get(lower(site.customerName));
        if (known?.id) customerId = known.id;
        else {
          const [c] = await this.q("customers")
            .insert({ organisation_id: env.organisationId, branch_id: env.branch.id, name: site.customerName, created_at: env.at })
            .returning("id");
          customerId = rowId(c);
          this.customers.set(lower(site.customerName), { id: customerId, name: site.customerName });
          await activity(
            "customer.created",
            "Customer",
            customerId,
            `Added customer ${site.customerName} to ${env.branch.name} (spreadsheet import)`,
            { importId: env.importId },
          );
        }
      }
      const [s] = await this.q("sites")
        .insert({
          organisation_id: env.organisationId,
          branch_id: env.branch.id,
          customer_id: customerId,
          name: site.name,
          address: r.siteAddress,
          created_at: env.at,
        })
        .returning("id");
      site.id = rowId(s);
      site.customerId = customerId;
      await activity("site.created", "Site", site.id, `Added site ${site.name} to ${env.branch.name} (spreadsheet import)`, {
        importId: env.importId,
      });
    }
    const [row] = await this.q("appliances")
      .insert({
        organisation_id: env.organisationId,
        branch_id: env.branch.id,
        site_id: site.id,
        tag: r.tag,
        description: r.description,
        category: r.category,
        refrigerant: r.refrigerant,
        full_charge_g: r.fullChargeG,
        full_charge_method: r.fullChargeMethod,
        make_model: r.makeModel,
        serial_number: r.serialNumber,
        manufactured_on: r.manufacturedOn,
        factory_sealed: r.factorySealed,
        hermetically_sealed: false,
        has_leak_detection: r.hasLeakDetection,
        industrial_shutdown_needed: false,
        awaiting_disposal_at_shop: false,
        status: r.status,
        installed_on: r.installedOn,
        retired_on: r.retiredOn,
        disposed_on: r.disposedOn,
        created_at: env.at,
        updated_at: env.at,
      })
      .returning("id");
    const id = rowId(row);
    await activity("appliance.imported", "Appliance", id, `Imported appliance ${this.describe(r, false)}`, {
      importId: env.importId,
      fullChargeG: r.fullChargeG,
    });
  }
}

// -------------------------------------------------------------------------------------- cylinders

class CylinderRows implements RowProcessor {
  private seen = new Map<string, number>();

  constructor(
    private readonly q: Q,
    private readonly env: ProcessorEnv,
  ) {}

  async process(items: RowItem[], opts: { write: boolean }): Promise<RowOutcome[]> {
    const parsed = items.map((item) => ({ item, ...parseCylinderImportRow(item.cells, parseContext(this.env)) }));
    const serials = parsed.filter((p) => p.record).map((p) => p.record!.serial);
    const existing = await findByLower(this.q, "cylinders", "serial", this.env.organisationId, serials, ["id", "serial", "branch_id"]);
    const out: RowOutcome[] = [];
    for (const p of parsed) {
      const issues = [...p.issues];
      const r = p.record;
      if (!r) {
        out.push({ rowNumber: p.item.rowNumber, issues, summary: p.item.cells.serial || "(no serial)" });
        continue;
      }
      const key = lower(r.serial);
      const earlier = this.seen.get(key);
      if (earlier !== undefined)
        issues.push({ field: "serial", message: `The serial ${r.serial} is already used on row ${earlier} of this file` });
      else if (existing.get(key)?.length)
        issues.push({
          field: "serial",
          message: `A cylinder with the serial ${String(existing.get(key)![0]!.serial)} is already in the register`,
        });
      const summary = this.describe(r);
      if (issues.length === 0) {
        this.seen.set(key, p.item.rowNumber);
        if (opts.write) await this.write(r);
      }
      out.push({ rowNumber: p.item.rowNumber, issues, summary });
    }
    return out;
  }

  private describe(r: CylinderImportRecord): string {
    const unit = this.env.branch.massUnit;
    const held = r.contentsG > 0 && r.refrigerant ? `holds ${describeMass(r.contentsG, unit)} ${r.refrigerant}` : "empty";
    return `${r.serial}${r.specification ? ` (${r.specification})` : ""} · ${describeMass(r.waterCapacityG, unit)} water capacity · ${held}`;
  }

  private async write(r: CylinderImportRecord): Promise<void> {
    const { env } = this;
    // Contents at import are the cylinder's opening balance: what the register holds beyond its recorded movements.
    const [row] = await this.q("cylinders")
      .insert({
        organisation_id: env.organisationId,
        branch_id: env.branch.id,
        serial: r.serial,
        specification: r.specification,
        purpose: r.purpose,
        water_capacity_g: r.waterCapacityG,
        tare_g: r.tareG,
        manufactured_on: r.manufacturedOn,
        last_requalified_on: r.lastRequalifiedOn,
        refrigerant: r.refrigerant,
        contents_g: r.contentsG,
        status: r.status,
        unregistered: false,
        created_at: env.at,
        updated_at: env.at,
      })
      .returning("id");
    const id = rowId(row);
    await appendActivity(this.q, {
      organisationId: env.organisationId,
      actorId: env.actor.userId,
      branchId: env.branch.id,
      action: "cylinder.imported",
      subjectType: "Cylinder",
      subjectId: id,
      summary: `Imported cylinder ${this.describe(r)}`,
      data: { importId: env.importId, openingContentsG: r.contentsG },
      at: env.at,
    });
  }
}

// ------------------------------------------------------------------------------------------- jobs

interface CylinderState {
  id: number;
  serial: string;
  branchId: number;
  refrigerant: string | null;
  contentsG: number;
}

interface Technician {
  id: number;
  name: string;
}

class JobRows implements RowProcessor {
  private technicians: { byEmail: Map<string, Technician>; byName: Map<string, Technician[]> } | null = null;
  private cylinders = new Map<string, CylinderState | null>();
  private seen = new Map<string, number>();

  constructor(
    private readonly q: Q,
    private readonly env: ProcessorEnv,
  ) {}

  private async loadTechnicians() {
    if (this.technicians) return this.technicians;
    const rows = await this.q("memberships as m")
      .join("users as u", "u.id", "m.user_id")
      .where({ "m.organisation_id": this.env.organisationId, "m.branch_id": this.env.branch.id, "m.role": "technician" })
      .distinct("u.id", "u.name", "u.email")
      .orderBy("u.id"); // ordered: DISTINCT rows come back in the planner's order, which differs between SQLite and PostgreSQL
    const byEmail = new Map<string, Technician>();
    const byName = new Map<string, Technician[]>();
    for (const r of rows) {
      const t = { id: Number(r.id), name: r.name as string };
      byEmail.set(lower(r.email), t);
      byName.set(lower(r.name), [...(byName.get(lower(r.name)) ?? []), t]);
    }
    this.technicians = { byEmail, byName };
    return this.technicians;
  }

  private async loadCylinders(serials: string[]): Promise<void> {
    const missing = [...new Set(serials.map(lower))].filter((s) => !this.cylinders.has(s));
    if (missing.length === 0) return;
    const found = await findByLower(this.q, "cylinders", "serial", this.env.organisationId, missing, [
      "id",
      "serial",
      "branch_id",
      "refrigerant",
      "contents_g",
    ]);
    for (const key of missing) {
      const r = found.get(key)?.[0];
      this.cylinders.set(
        key,
        r
          ? {
              id: Number(r.id),
              serial: String(r.serial),
              branchId: Number(r.branch_id),
              refrigerant: (r.refrigerant as string | null) ?? null,
              contentsG: Number(r.contents_g),
            }
          : null,
      );
    }
  }

  async process(items: RowItem[], opts: { write: boolean }): Promise<RowOutcome[]> {
    const { env } = this;
    const techs = await this.loadTechnicians();
    const parsed = items.map((item) => ({ item, ...parseJobImportRow(item.cells, parseContext(env)) }));
    const records = parsed.filter((p) => p.record).map((p) => p.record!);
    const appliances = await findByLower(
      this.q,
      "appliances",
      "tag",
      env.organisationId,
      records.map((r) => r.applianceTag),
      ["id", "tag", "branch_id", "refrigerant", "status", "retired_on"],
    );
    const equipment = await findByLower(
      this.q,
      "recovery_equipment",
      "serial",
      env.organisationId,
      records.filter((r) => r.equipmentSerial).map((r) => r.equipmentSerial!),
      ["id", "serial", "branch_id"],
    );
    await this.loadCylinders(records.filter((r) => r.cylinderSerial).map((r) => r.cylinderSerial!));
    const branchNames = new Map<number, string>(
      (await this.q("branches").where({ organisation_id: env.organisationId }).select("id", "name")).map((b) => [
        Number(b.id),
        b.name as string,
      ]),
    );
    const elsewhere = (branchId: number) => `the ${branchNames.get(branchId) ?? "another"} branch`;

    // Jobs already on record for these appliances and dates: a file imported twice is not doubled.
    const applianceIds = [...new Set([...appliances.values()].flat().map((a) => Number(a.id)))];
    const dates = [...new Set(records.map((r) => r.performedOn))];
    const onRecord = new Set<string>();
    if (applianceIds.length && dates.length) {
      for (let i = 0; i < applianceIds.length; i += 400) {
        const rows = await this.q("jobs")
          .whereIn("appliance_id", applianceIds.slice(i, i + 400))
          .whereIn("performed_on", dates)
          .whereNull("voided_at")
          .select("appliance_id", "performed_on", "kind", "technician_id", "recovered_g", "charged_g");
        for (const j of rows) onRecord.add([j.appliance_id, j.performed_on, j.kind, j.technician_id, j.recovered_g, j.charged_g].join("|"));
      }
    }

    const out: RowOutcome[] = [];
    for (const p of parsed) {
      const issues = [...p.issues];
      const r = p.record;
      if (!r) {
        out.push({
          rowNumber: p.item.rowNumber,
          issues,
          summary: [p.item.cells.performedOn, p.item.cells.kind, p.item.cells.applianceTag].filter(Boolean).join(" · ") || "(empty)",
        });
        continue;
      }
      const appliance = pick(appliances.get(lower(r.applianceTag)), "tag", r.applianceTag);
      if (!appliance) issues.push({ field: "applianceTag", message: `No appliance with the tag ${r.applianceTag} is in the register` });
      else if (Number(appliance.branch_id) !== env.branch.id)
        issues.push({
          field: "applianceTag",
          message: `The appliance ${String(appliance.tag)} belongs to ${elsewhere(Number(appliance.branch_id))}`,
        });

      let technician: Technician | undefined;
      if (r.technician.includes("@")) technician = techs.byEmail.get(lower(r.technician));
      else {
        const named = techs.byName.get(lower(r.technician)) ?? [];
        if (named.length > 1)
          issues.push({ field: "technician", message: `More than one technician is called ${r.technician}; use the e-mail address` });
        technician = named.length === 1 ? named[0] : undefined;
      }
      if (!technician && !issues.some((i) => i.field === "technician")) {
        issues.push({ field: "technician", message: `${r.technician} is not a technician of the ${env.branch.name} branch` });
      }

      let cylinder: CylinderState | null = null;
      if (r.cylinderSerial) {
        cylinder = this.cylinders.get(lower(r.cylinderSerial)) ?? null;
        if (!cylinder)
          issues.push({ field: "cylinderSerial", message: `No cylinder with the serial ${r.cylinderSerial} is in the register` });
        else if (cylinder.branchId !== env.branch.id) {
          issues.push({ field: "cylinderSerial", message: `The cylinder ${cylinder.serial} belongs to ${elsewhere(cylinder.branchId)}` });
          cylinder = null;
        }
      }
      let equipmentId: number | null = null;
      if (r.equipmentSerial) {
        const e = pick(equipment.get(lower(r.equipmentSerial)), "serial", r.equipmentSerial);
        if (!e)
          issues.push({
            field: "equipmentSerial",
            message: `No recovery equipment with the serial ${r.equipmentSerial} is in the register`,
          });
        else if (Number(e.branch_id) !== env.branch.id)
          issues.push({
            field: "equipmentSerial",
            message: `The recovery equipment ${String(e.serial)} belongs to ${elsewhere(Number(e.branch_id))}`,
          });
        else equipmentId = Number(e.id);
      }

      const refrigerant = r.refrigerant ?? (appliance ? String(appliance.refrigerant) : null);
      const mass = (g: number) => describeMass(g, env.branch.massUnit);
      if (cylinder && refrigerant && r.kind === "charge" && r.chargedG > 0) {
        if (!cylinder.refrigerant || cylinder.contentsG <= 0)
          issues.push({ field: "cylinderSerial", message: `Cylinder ${cylinder.serial} is empty on record` });
        else if (normaliseDesignation(cylinder.refrigerant) !== normaliseDesignation(refrigerant)) {
          issues.push({
            field: "cylinderSerial",
            message: `Cylinder ${cylinder.serial} holds ${cylinder.refrigerant}, not ${refrigerant}`,
          });
        } else if (cylinder.contentsG < r.chargedG) {
          issues.push({ field: "charged", message: `Cylinder ${cylinder.serial} holds only ${mass(cylinder.contentsG)} on record` });
        }
      }

      if (appliance && technician) {
        const key = [appliance.id, r.performedOn, r.kind, technician.id, r.recoveredG, r.chargedG].join("|");
        const earlier = this.seen.get(key);
        if (onRecord.has(key))
          issues.push({ field: null, message: "This job is already on record (same appliance, date, kind, technician and amount)" });
        else if (earlier !== undefined) issues.push({ field: null, message: `Same job as row ${earlier} of this file` });
        else if (issues.length === 0) this.seen.set(key, p.item.rowNumber);
      }

      const summary = this.describe(r, refrigerant, technician?.name ?? r.technician, cylinder?.serial ?? r.cylinderSerial);
      if (issues.length === 0 && appliance && technician) {
        // Cylinder contents follow the rows, so a later row sees what an earlier one put in or took out.
        if (cylinder && refrigerant) {
          if ((r.kind === "recovery" || r.kind === "disposal") && r.recoveredG > 0) {
            if (!cylinder.refrigerant || cylinder.contentsG <= 0) cylinder.refrigerant = refrigerant;
            cylinder.contentsG += r.recoveredG;
          } else if (r.kind === "charge" && r.chargedG > 0) {
            cylinder.contentsG -= r.chargedG;
          }
        }
        if (opts.write)
          await this.write(
            r,
            {
              applianceId: Number(appliance.id),
              applianceTag: String(appliance.tag),
              technicianId: technician.id,
              refrigerant: refrigerant!,
              cylinder,
              equipmentId,
            },
            summary,
          );
      }
      out.push({ rowNumber: p.item.rowNumber, issues, summary });
    }
    return out;
  }

  private describe(r: JobImportRecord, refrigerant: string | null, technician: string, cylinder: string | null): string {
    const mass = (g: number) => describeMass(g, this.env.branch.massUnit);
    const gas = refrigerant ?? "";
    let what: string;
    switch (r.kind) {
      case "recovery":
        what = `Recovered ${mass(r.recoveredG)} ${gas} from ${r.applianceTag}${cylinder ? ` into cylinder ${cylinder}` : ""}`;
        break;
      case "disposal":
        what = `Disposal of ${r.applianceTag}${r.recoveredG > 0 ? `, ${mass(r.recoveredG)} ${gas} recovered${cylinder ? ` into cylinder ${cylinder}` : ""}` : ""}`;
        break;
      case "charge":
        what = `Added ${mass(r.chargedG)} ${gas} to ${r.applianceTag}${cylinder ? ` from cylinder ${cylinder}` : ""}`;
        break;
      case "leak_repair":
        what = `Leak repair on ${r.applianceTag}${r.leakLocation ? `: ${r.leakLocation}` : ""}`;
        break;
      case "verification_test":
        what = `${r.verificationStage === "follow_up" ? "Follow-up" : "Initial"} verification test ${r.verificationPassed ? "passed" : "failed"} on ${r.applianceTag}`;
        break;
    }
    return `${r.performedOn} · ${what.replace(/\s+/g, " ").trim()} · ${technician}`;
  }

  private async write(
    r: JobImportRecord,
    refs: {
      applianceId: number;
      applianceTag: string;
      technicianId: number;
      refrigerant: string;
      cylinder: CylinderState | null;
      equipmentId: number | null;
    },
    summary: string,
  ): Promise<void> {
    const { env, q } = this;
    let relatedJobId: number | null = null;
    if (r.kind === "verification_test") {
      // The test checks the latest repair on or before its date (as when a test is logged in the field).
      const repair = await q("jobs")
        .where({ organisation_id: env.organisationId, appliance_id: refs.applianceId, kind: "leak_repair" })
        .where("performed_on", "<=", r.performedOn)
        .whereNull("voided_at")
        .orderBy([
          { column: "performed_on", order: "desc" },
          { column: "id", order: "desc" },
        ])
        .first("id");
      relatedJobId = repair ? Number(repair.id) : null;
    }
    const recovers = r.kind === "recovery" || r.kind === "disposal";
    const [row] = await q("jobs")
      .insert({
        organisation_id: env.organisationId,
        branch_id: env.branch.id,
        appliance_id: refs.applianceId,
        technician_id: refs.technicianId,
        kind: r.kind,
        performed_on: r.performedOn,
        refrigerant: refs.refrigerant,
        recovered_g: recovers ? r.recoveredG : 0,
        charged_g: r.kind === "charge" ? r.chargedG : 0,
        equipment_id: refs.equipmentId,
        cylinder_id: refs.cylinder?.id ?? null,
        access_method: r.accessMethod,
        temporary_access_removed: r.temporaryAccessRemoved,
        evacuation_value: r.evacuationValue,
        evacuation_unit: r.evacuationUnit,
        verification_stage: r.verificationStage,
        verification_passed: r.verificationPassed,
        related_job_id: relatedJobId,
        leak_location: r.leakLocation,
        repair_description: r.repairDescription,
        notes: r.notes,
        source: "import",
        created_by: env.actor.userId,
        created_at: env.at,
        updated_at: env.at,
      })
      .returning("id");
    const jobId = rowId(row);

    const movement = (direction: string, cylinderId: number | null, grams: number) =>
      q("refrigerant_movements").insert({
        organisation_id: env.organisationId,
        branch_id: env.branch.id,
        job_id: jobId,
        cylinder_id: cylinderId,
        direction,
        refrigerant: refs.refrigerant,
        mass_g: grams,
        moved_on: r.performedOn,
        created_at: env.at,
      });
    if (recovers && r.recoveredG > 0 && refs.cylinder) {
      await movement("recovered_into_cylinder", refs.cylinder.id, r.recoveredG);
      const current = await q("cylinders").where({ id: refs.cylinder.id }).first("refrigerant", "contents_g");
      const wasEmpty = !current?.refrigerant || Number(current.contents_g) <= 0;
      await q("cylinders")
        .where({ id: refs.cylinder.id })
        .update({
          contents_g: q.raw("contents_g + ?", [r.recoveredG]),
          ...(wasEmpty ? { refrigerant: refs.refrigerant } : {}),
          updated_at: env.at,
        });
    }
    if (r.kind === "charge" && r.chargedG > 0) {
      if (refs.cylinder) {
        await movement("charged_from_cylinder", refs.cylinder.id, r.chargedG);
        await q("cylinders")
          .where({ id: refs.cylinder.id })
          .update({ contents_g: q.raw("contents_g - ?", [r.chargedG]), updated_at: env.at });
      } else {
        await movement("charged_from_stock", null, r.chargedG);
      }
    }
    if (r.kind === "disposal") {
      const current = await q("appliances").where({ id: refs.applianceId }).first("retired_on", "disposed_on");
      if (!current?.disposed_on || current.disposed_on < r.performedOn) {
        await q("appliances")
          .where({ id: refs.applianceId })
          .update({
            status: "disposed",
            disposed_on: r.performedOn,
            retired_on: current?.retired_on ?? r.performedOn,
            awaiting_disposal_at_shop: false,
            updated_at: env.at,
          });
      }
    }
    await appendActivity(q, {
      organisationId: env.organisationId,
      actorId: env.actor.userId,
      branchId: env.branch.id,
      action: `job.${r.kind}.imported`,
      subjectType: "job",
      subjectId: jobId,
      summary: `Imported ${JOB_KIND_LABELS[r.kind].toLowerCase()} job: ${summary}`,
      data: { importId: env.importId, applianceId: refs.applianceId, technicianId: refs.technicianId },
      at: env.at,
    });
  }
}
