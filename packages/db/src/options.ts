import type { Knex } from "knex";
import type { ApplianceCategory, ApplianceStatus, EquipmentCertificationState } from "@coldtrail/core";
import { toBool, type ScopeFn } from "./types";
import { whereContains } from "./paging";

function scoped(qb: Knex.QueryBuilder, scope: ScopeFn): void {
  qb.where(function inner(this: Knex.QueryBuilder) {
    scope(this);
  });
}

export interface ApplianceOption {
  id: number;
  branchId: number;
  tag: string;
  description: string;
  category: ApplianceCategory;
  refrigerant: string;
  fullChargeG: number;
  status: ApplianceStatus;
  siteName: string;
  customerName: string | null;
}

/**
 * Appliances a job form may offer (in service by default), by tag. The scope sees the table as `appliances`.
 * `q` matches tag, description or site name, case-insensitively.
 */
export async function listApplianceOptions(
  db: Knex,
  opts: { scope: ScopeFn; branchIds?: number[]; q?: string; limit: number; statuses?: ApplianceStatus[] },
): Promise<ApplianceOption[]> {
  const qb = db("appliances as appliances")
    .join("sites as site", "site.id", "appliances.site_id")
    .leftJoin("customers as customer", "customer.id", "site.customer_id")
    .whereIn("appliances.status", opts.statuses ?? ["in_service"]);
  scoped(qb, opts.scope);
  if (opts.branchIds) qb.whereIn("appliances.branch_id", opts.branchIds);
  if (opts.q) whereContains(qb, opts.q, ["appliances.tag", "appliances.description", "site.name"]);
  const rows = await qb
    .orderBy([{ column: "appliances.tag" }, { column: "appliances.id" }])
    .limit(opts.limit)
    .select(
      "appliances.id",
      "appliances.branch_id",
      "appliances.tag",
      "appliances.description",
      "appliances.category",
      "appliances.refrigerant",
      "appliances.full_charge_g",
      "appliances.status",
      "site.name as site_name",
      "customer.name as customer_name",
    );
  return rows.map((r) => ({
    id: Number(r.id),
    branchId: Number(r.branch_id),
    tag: r.tag,
    description: r.description,
    category: r.category,
    refrigerant: r.refrigerant,
    fullChargeG: Number(r.full_charge_g),
    status: r.status,
    siteName: r.site_name,
    customerName: r.customer_name ?? null,
  }));
}

export interface CylinderOption {
  id: number;
  branchId: number;
  serial: string;
  specification: string | null;
  refrigerant: string | null;
  contentsG: number;
  waterCapacityG: number;
  tareG: number;
  lastRequalifiedOn: string | null;
}

/** In-service, registered recovery cylinders of a branch, by serial. The scope sees the table as `cylinders`. */
export async function listCylinderOptions(
  db: Knex,
  opts: { scope: ScopeFn; branchId: number; q?: string; limit?: number },
): Promise<CylinderOption[]> {
  const qb = db("cylinders as cylinders")
    .where("cylinders.branch_id", opts.branchId)
    .where("cylinders.status", "in_service")
    .where("cylinders.unregistered", false)
    .where("cylinders.purpose", "recovery");
  scoped(qb, opts.scope);
  if (opts.q) whereContains(qb, opts.q, ["cylinders.serial"]);
  const rows = await qb
    .orderBy([{ column: "cylinders.serial" }, { column: "cylinders.id" }])
    .limit(opts.limit ?? 200)
    .select(
      "cylinders.id",
      "cylinders.branch_id",
      "cylinders.serial",
      "cylinders.specification",
      "cylinders.refrigerant",
      "cylinders.contents_g",
      "cylinders.water_capacity_g",
      "cylinders.tare_g",
      "cylinders.last_requalified_on",
    );
  return rows.map((r) => ({
    id: Number(r.id),
    branchId: Number(r.branch_id),
    serial: r.serial,
    specification: r.specification ?? null,
    refrigerant: r.refrigerant ?? null,
    contentsG: Number(r.contents_g),
    waterCapacityG: Number(r.water_capacity_g),
    tareG: Number(r.tare_g),
    lastRequalifiedOn: r.last_requalified_on ?? null,
  }));
}

export interface EquipmentOption {
  id: number;
  branchId: number;
  serial: string;
  makeModel: string | null;
  manufacturedOn: string | null;
  certificationState: EquipmentCertificationState;
  smallApplianceOnly: boolean;
  systemDependent: boolean;
}

/** In-service, registered recovery equipment of a branch, by serial. The scope sees the table as `recovery_equipment`. */
export async function listEquipmentOptions(
  db: Knex,
  opts: { scope: ScopeFn; branchId: number; limit?: number },
): Promise<EquipmentOption[]> {
  const qb = db("recovery_equipment as recovery_equipment")
    .where("recovery_equipment.branch_id", opts.branchId)
    .where("recovery_equipment.status", "in_service")
    .where("recovery_equipment.unregistered", false);
  scoped(qb, opts.scope);
  const rows = await qb
    .orderBy([{ column: "recovery_equipment.serial" }, { column: "recovery_equipment.id" }])
    .limit(opts.limit ?? 200)
    .select(
      "recovery_equipment.id",
      "recovery_equipment.branch_id",
      "recovery_equipment.serial",
      "recovery_equipment.make_model",
      "recovery_equipment.manufactured_on",
      "recovery_equipment.certification_state",
      "recovery_equipment.small_appliance_only",
      "recovery_equipment.system_dependent",
    );
  return rows.map((r) => ({
    id: Number(r.id),
    branchId: Number(r.branch_id),
    serial: r.serial,
    makeModel: r.make_model ?? null,
    manufacturedOn: r.manufactured_on ?? null,
    certificationState: r.certification_state,
    smallApplianceOnly: toBool(r.small_appliance_only),
    systemDependent: toBool(r.system_dependent),
  }));
}
