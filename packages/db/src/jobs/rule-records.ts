import type { Knex } from "knex";
import type { AdditionExclusion, Appliance, Branch, Certification, Cylinder, Job, RecoveryEquipment, Technician } from "@coldtrail/core";
import { toBool, toBoolOrNull, toNumOrNull } from "../types";

/**
 * Rows as the rules core reads them (`@coldtrail/core` audit records), for the instant feedback on a
 * job being entered and the leak rate shown on a saved charge.
 */

type Db = Knex | Knex.Transaction;

/** The database keeps "seasonal"; the rules core names it "seasonal_variance". */
export function toCoreExclusion(value: string | null | undefined): AdditionExclusion | null {
  if (!value) return null;
  if (value === "seasonal" || value === "seasonal_variance") return "seasonal_variance";
  if (value === "retrofit" || value === "installation") return value;
  return null;
}

export async function ruleBranch(db: Db, organisationId: number, branchId: number): Promise<Branch | undefined> {
  const r = await db("branches").where({ id: branchId, organisation_id: organisationId }).first("id", "name", "time_zone", "mass_unit");
  return r ? { id: Number(r.id), name: r.name, timeZone: r.time_zone, massUnit: r.mass_unit } : undefined;
}

export async function ruleAppliance(
  db: Db,
  organisationId: number,
  applianceId: number,
): Promise<{ appliance: Appliance; branchId: number } | undefined> {
  const r = await db("appliances as a")
    .join("sites as s", "s.id", "a.site_id")
    .where({ "a.id": applianceId, "a.organisation_id": organisationId })
    .first("a.*", "s.name as site_name", "s.address as site_address");
  if (!r) return undefined;
  return {
    branchId: Number(r.branch_id),
    appliance: {
      id: Number(r.id),
      label: r.tag,
      category: r.category,
      refrigerant: r.refrigerant,
      fullChargeG: toNumOrNull(r.full_charge_g),
      fullChargeMethod: r.full_charge_method ?? null,
      factorySealed: toBool(r.factory_sealed),
      status: r.status,
      statusChangedOn: r.disposed_on ?? r.retired_on ?? null,
      location: r.site_address ?? r.site_name ?? null,
      installedOn: r.installed_on ?? null,
      needsIndustrialShutdownForRepair: toBool(r.industrial_shutdown_needed),
      hasLeakDetectionSystem: toBool(r.has_leak_detection),
      hermeticallySealedLabelled: toBool(r.hermetically_sealed),
    },
  };
}

/** A technician with every certification type they hold and its state (voided cards left out). */
export async function ruleTechnician(db: Db, organisationId: number, userId: number): Promise<Technician | undefined> {
  const user = await db("users").where({ id: userId, organisation_id: organisationId }).first("id", "name");
  if (!user) return undefined;
  const rows = await db("certifications as c")
    .join("certification_types as t", "t.certification_id", "c.id")
    .where({ "c.user_id": userId, "c.organisation_id": organisationId })
    .whereNull("c.voided_at")
    .orderBy("c.id")
    .select("c.id", "c.state", "t.type");
  const certifications: Certification[] = rows.map((r) => ({ id: Number(r.id), type: r.type, state: r.state }));
  return { id: Number(user.id), name: user.name, certifications };
}

export async function ruleEquipment(
  db: Db,
  organisationId: number,
  equipmentId: number,
): Promise<(RecoveryEquipment & { branchId: number }) | undefined> {
  const r = await db("recovery_equipment").where({ id: equipmentId, organisation_id: organisationId }).first();
  if (!r) return undefined;
  return {
    id: Number(r.id),
    branchId: Number(r.branch_id),
    serial: r.serial,
    kind: toBool(r.small_appliance_only) ? "small_appliance" : toBool(r.system_dependent) ? "system_dependent" : "self_contained",
    manufacturedOn: r.manufactured_on ?? null,
    certification: r.certification_state,
  };
}

export async function ruleCylinder(
  db: Db,
  organisationId: number,
  cylinderId: number,
): Promise<(Cylinder & { branchId: number; contents: { refrigerant: string | null; netG: number } }) | undefined> {
  const r = await db("cylinders").where({ id: cylinderId, organisation_id: organisationId }).first();
  if (!r) return undefined;
  const netG = Number(r.contents_g);
  return {
    id: Number(r.id),
    branchId: Number(r.branch_id),
    serial: r.serial,
    waterCapacityG: Number(r.water_capacity_g),
    tareG: Number(r.tare_g),
    lastRequalifiedOn: r.last_requalified_on ?? null,
    requalificationYears: null,
    status: r.status === "retired" ? "retired" : "in_service",
    openingContents: { refrigerant: r.refrigerant ?? null, netG },
    weighings: [],
    contents: { refrigerant: r.refrigerant ?? null, netG },
  };
}

const MOVEMENT_DIRECTIONS: Record<string, "recovered" | "charged" | undefined> = {
  recovered_into_cylinder: "recovered",
  charged_from_cylinder: "charged",
  charged_from_stock: "charged",
};

/** Jobs as the rules read them, with their (not voided) movements. */
export async function ruleJobs(db: Db, where: (qb: Knex.QueryBuilder) => void): Promise<Job[]> {
  const q = db("jobs as jobs").whereNull("jobs.voided_at");
  where(q);
  const rows = await q.orderBy([{ column: "jobs.performed_on" }, { column: "jobs.id" }]).select("jobs.*");
  if (!rows.length) return [];
  const ids = rows.map((r) => Number(r.id));
  const movements: Array<{ job_id: number; direction: string; mass_g: number; cylinder_id: number | null; refrigerant: string }> = [];
  // Chunked so a long history never exceeds the driver's bound-parameter limit.
  for (let i = 0; i < ids.length; i += 500) {
    movements.push(
      ...(await db("refrigerant_movements")
        .whereIn("job_id", ids.slice(i, i + 500))
        .whereNull("voided_at")
        .orderBy("id")
        .select("job_id", "direction", "mass_g", "cylinder_id", "refrigerant")),
    );
  }
  const byJob = new Map<number, Job["movements"]>();
  for (const m of movements) {
    const direction = MOVEMENT_DIRECTIONS[m.direction];
    if (!direction) continue;
    const list = byJob.get(Number(m.job_id)) ?? [];
    list.push({ direction, amountG: Number(m.mass_g), cylinderId: toNumOrNull(m.cylinder_id), refrigerant: m.refrigerant });
    byJob.set(Number(m.job_id), list);
  }
  return rows.map((r) => {
    const stage = r.verification_stage as "initial" | "follow_up" | null;
    const passed = toBoolOrNull(r.verification_passed);
    return {
      id: Number(r.id),
      kind: r.kind,
      performedOn: r.performed_on,
      technicianId: toNumOrNull(r.technician_id),
      applianceId: toNumOrNull(r.appliance_id),
      equipmentId: toNumOrNull(r.equipment_id),
      refrigerant: r.refrigerant ?? null,
      movements: byJob.get(Number(r.id)) ?? [],
      evacuation:
        r.evacuation_value === null || r.evacuation_value === undefined || !r.evacuation_unit
          ? null
          : { value: Number(r.evacuation_value), unit: r.evacuation_unit },
      accessMethod: r.access_method ?? null,
      temporaryAccessRemoved: toBoolOrNull(r.temporary_access_removed),
      compressorOperating: toBoolOrNull(r.compressor_operating),
      additionExclusion: toCoreExclusion(r.addition_exclusion),
      sameLeakAsJobId: toNumOrNull(r.same_leak_as_job_id),
      verification: stage && passed !== null ? { stage, passed } : null,
    };
  });
}

/** Every recorded job on one appliance, oldest first. */
export function ruleApplianceJobs(db: Db, organisationId: number, applianceId: number): Promise<Job[]> {
  return ruleJobs(db, (q) => q.where({ "jobs.organisation_id": organisationId, "jobs.appliance_id": applianceId }));
}
