import type { Knex } from "knex";
import { normaliseDesignation, toGrams, type JobInput } from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import { describeMass } from "../mass";
import { assertRecordDate, moveCylinderContents, writableBranch, type WritableBranch } from "../records/common";
import { toBool, type ActorRef } from "../types";

/**
 * Writing jobs of every kind. One transaction per job: the job row, its refrigerant movements, the
 * cylinder contents they change, the appliance status a disposal changes, and an activity row.
 * The appliance, cylinder and equipment must belong to the job's organisation and branch.
 */

export interface ApplianceRow {
  id: number;
  branchId: number;
  tag: string;
  status: string;
  refrigerant: string;
  fullChargeG: number;
  category: string;
  factorySealed: boolean;
  awaitingAtShop: boolean;
}

export async function jobAppliance(
  trx: Knex.Transaction,
  organisationId: number,
  branchId: number,
  applianceId: number,
): Promise<ApplianceRow> {
  const a = await trx("appliances")
    .where({ id: applianceId, organisation_id: organisationId })
    .first("id", "branch_id", "tag", "status", "refrigerant", "full_charge_g", "category", "factory_sealed", "awaiting_disposal_at_shop");
  if (!a) throw new RecordNotFoundError("That appliance does not exist", "applianceId");
  if (Number(a.branch_id) !== branchId) throw new RecordConflictError("That appliance belongs to another branch", "applianceId");
  if (a.status === "disposed") throw new RecordConflictError("That appliance has already been disposed of", "applianceId");
  return {
    id: Number(a.id),
    branchId: Number(a.branch_id),
    tag: a.tag,
    status: a.status,
    refrigerant: a.refrigerant,
    fullChargeG: Number(a.full_charge_g),
    category: a.category,
    factorySealed: toBool(a.factory_sealed),
    awaitingAtShop: toBool(a.awaiting_disposal_at_shop),
  };
}

export async function jobCylinder(
  trx: Knex.Transaction,
  organisationId: number,
  branchId: number,
  cylinderId: number,
  field = "cylinderId",
) {
  const c = await trx("cylinders")
    .where({ id: cylinderId, organisation_id: organisationId })
    .first("id", "branch_id", "serial", "status", "unregistered", "refrigerant", "contents_g");
  if (!c) throw new RecordNotFoundError("That cylinder does not exist", field);
  if (Number(c.branch_id) !== branchId) throw new RecordConflictError("That cylinder belongs to another branch", field);
  if (c.status !== "in_service" || toBool(c.unregistered)) throw new RecordConflictError("That cylinder is not in service", field);
  return {
    id: Number(c.id),
    serial: String(c.serial),
    refrigerant: (c.refrigerant as string | null) ?? null,
    contentsG: Number(c.contents_g),
  };
}

export async function jobEquipment(
  trx: Knex.Transaction,
  organisationId: number,
  branchId: number,
  equipmentId: number,
  field = "equipmentId",
) {
  const e = await trx("recovery_equipment")
    .where({ id: equipmentId, organisation_id: organisationId })
    .first("id", "branch_id", "serial", "status", "unregistered");
  if (!e) throw new RecordNotFoundError("That recovery equipment does not exist", field);
  if (Number(e.branch_id) !== branchId) throw new RecordConflictError("That recovery equipment belongs to another branch", field);
  if (e.status !== "in_service" || toBool(e.unregistered))
    throw new RecordConflictError("That recovery equipment is not in service", field);
  return { id: Number(e.id), serial: String(e.serial) };
}

/**
 * The earlier charge a new addition is marked as the same leak as: a charge on the same appliance,
 * not voided, made on or before the new one (82.152 sums additions made for the same leak).
 */
export async function sameLeakJob(
  trx: Knex.Transaction,
  organisationId: number,
  applianceId: number,
  jobId: number,
  performedOn: string,
  field = "sameLeakAsJobId",
): Promise<number> {
  const j = await trx("jobs")
    .where({ id: jobId, organisation_id: organisationId })
    .first("id", "appliance_id", "kind", "performed_on", "voided_at");
  if (!j) throw new RecordNotFoundError("That earlier job does not exist", field);
  if (Number(j.appliance_id) !== applianceId) throw new RecordConflictError("That earlier job is on another appliance", field);
  if (j.kind !== "charge") throw new RecordConflictError("Choose an earlier charge job: only additions are summed for a leak", field);
  if (j.voided_at) throw new RecordConflictError("That earlier job was voided", field);
  if (j.performed_on > performedOn) throw new RecordConflictError("The job for the same leak must be on or before this one", field);
  return Number(j.id);
}

const blankToNull = (v: string | null | undefined) => (v && v.trim().length ? v.trim() : null);

export interface InsertedJob {
  id: number;
  summary: string;
}

/**
 * Inserts one job inside `trx` (already in a transaction) after checking what it refers to.
 * Used by `createJob` and by the shop's scrap run, which records several disposals at once.
 */
export async function insertJob(
  trx: Knex.Transaction,
  opts: { actor: ActorRef; branch: WritableBranch; input: JobInput; at: string; source?: "field" | "office"; now?: Date },
): Promise<InsertedJob> {
  const { actor, branch, input, at } = opts;
  await assertRecordDate(trx, {
    organisationId: actor.organisationId,
    timeZone: branch.timeZone,
    date: input.performedOn,
    field: "performedOn",
    what: "The date of the work",
    now: opts.now ?? new Date(at),
  });
  const appliance = await jobAppliance(trx, actor.organisationId, branch.id, input.applianceId);
  const mass = (g: number) => describeMass(g, branch.massUnit);
  const base = {
    organisation_id: actor.organisationId,
    branch_id: branch.id,
    appliance_id: appliance.id,
    technician_id: actor.userId,
    kind: input.kind,
    performed_on: input.performedOn,
    notes: blankToNull(input.notes),
    source: opts.source ?? "field",
    created_by: actor.userId,
    created_at: at,
    updated_at: at,
  };
  const movement = (jobId: number, direction: string, cylinderId: number | null, refrigerant: string, grams: number) =>
    trx("refrigerant_movements").insert({
      organisation_id: actor.organisationId,
      branch_id: branch.id,
      job_id: jobId,
      cylinder_id: cylinderId,
      direction,
      refrigerant,
      mass_g: grams,
      moved_on: input.performedOn,
      created_at: at,
    });
  const activity = (jobId: number, summary: string, data: unknown) =>
    appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      branchId: branch.id,
      action: `job.${input.kind}.created`,
      subjectType: "job",
      subjectId: jobId,
      at,
      summary,
      data,
    });

  switch (input.kind) {
    case "recovery":
    case "disposal": {
      const cylinder = await jobCylinder(trx, actor.organisationId, branch.id, input.cylinderId);
      const equipment = await jobEquipment(trx, actor.organisationId, branch.id, input.equipmentId);
      const grams = toGrams(input.recoveredAmount, input.recoveredUnit);
      const [row] = await trx("jobs")
        .insert({
          ...base,
          refrigerant: input.refrigerant,
          recovered_g: grams,
          charged_g: 0,
          amount_entered: input.recoveredAmount,
          amount_unit: input.recoveredUnit,
          equipment_id: equipment.id,
          cylinder_id: cylinder.id,
          access_method: input.accessMethod,
          temporary_access_removed: input.temporaryAccessRemoved ?? null,
          evacuation_value: input.evacuationValue,
          evacuation_unit: input.evacuationUnit,
          compressor_operating: input.compressorOperating ?? null,
        })
        .returning("id");
      const jobId = rowId(row);
      // A refrigerant different from what the cylinder holds is not refused: the audit raises it.
      if (grams > 0) {
        await movement(jobId, "recovered_into_cylinder", cylinder.id, input.refrigerant, grams);
        await moveCylinderContents(trx, {
          cylinderId: cylinder.id,
          deltaG: grams,
          refrigerant: input.refrigerant,
          at,
          field: "recoveredAmount",
          describe: mass,
          confirmedOverFill: input.confirmOverFill,
        });
      }
      let previousStatus: string | null = null;
      if (input.kind === "disposal") {
        previousStatus = appliance.status;
        const current = await trx("appliances").where({ id: appliance.id }).first("retired_on");
        await trx("appliances")
          .where({ id: appliance.id })
          .update({
            status: "disposed",
            disposed_on: input.performedOn,
            retired_on: current?.retired_on ?? input.performedOn,
            awaiting_disposal_at_shop: false,
            updated_at: at,
          });
      }
      const summary =
        input.kind === "disposal"
          ? `Recovered ${mass(grams)} ${input.refrigerant} from ${appliance.tag} for disposal into cylinder ${cylinder.serial}`
          : `Recovered ${mass(grams)} ${input.refrigerant} from ${appliance.tag} into cylinder ${cylinder.serial}`;
      await activity(jobId, summary, {
        applianceId: appliance.id,
        cylinderId: cylinder.id,
        equipmentId: equipment.id,
        grams,
        ...(input.kind === "disposal" ? { previousApplianceStatus: previousStatus, disposalPath: input.disposalPath } : {}),
      });
      return { id: jobId, summary };
    }

    case "charge": {
      if (appliance.status !== "in_service")
        throw new RecordConflictError("Refrigerant can only be added to an appliance in service", "applianceId");
      const grams = toGrams(input.chargedAmount, input.chargedUnit);
      let cylinder: Awaited<ReturnType<typeof jobCylinder>> | null = null;
      if (input.chargeSource === "cylinder") {
        if (input.cylinderId === undefined) throw new InvalidInputError("Choose the cylinder it came from", "cylinderId");
        cylinder = await jobCylinder(trx, actor.organisationId, branch.id, input.cylinderId);
        if (!cylinder.refrigerant || cylinder.contentsG <= 0)
          throw new RecordConflictError(`Cylinder ${cylinder.serial} is empty on record`, "cylinderId");
        if (normaliseDesignation(cylinder.refrigerant) !== normaliseDesignation(input.refrigerant)) {
          throw new RecordConflictError(
            `Cylinder ${cylinder.serial} holds ${cylinder.refrigerant}, not ${input.refrigerant}`,
            "cylinderId",
          );
        }
      }
      const sameLeak =
        input.sameLeakAsJobId !== undefined
          ? await sameLeakJob(trx, actor.organisationId, appliance.id, input.sameLeakAsJobId, input.performedOn)
          : null;
      const [row] = await trx("jobs")
        .insert({
          ...base,
          same_leak_as_job_id: sameLeak,
          refrigerant: input.refrigerant,
          recovered_g: 0,
          charged_g: grams,
          amount_entered: input.chargedAmount,
          amount_unit: input.chargedUnit,
          cylinder_id: cylinder?.id ?? null,
          access_method: input.accessMethod ?? null,
          temporary_access_removed: input.temporaryAccessRemoved ?? null,
          addition_exclusion: input.additionExclusion ?? null,
        })
        .returning("id");
      const jobId = rowId(row);
      if (cylinder) {
        await movement(jobId, "charged_from_cylinder", cylinder.id, input.refrigerant, grams);
        await moveCylinderContents(trx, {
          cylinderId: cylinder.id,
          deltaG: -grams,
          refrigerant: input.refrigerant,
          at,
          field: "chargedAmount",
          describe: mass,
        });
      } else {
        await movement(jobId, "charged_from_stock", null, input.refrigerant, grams);
      }
      const summary = `Charged ${mass(grams)} ${input.refrigerant} into ${appliance.tag}${cylinder ? ` from cylinder ${cylinder.serial}` : ""}`;
      await activity(jobId, summary, {
        applianceId: appliance.id,
        cylinderId: cylinder?.id ?? null,
        grams,
        additionExclusion: input.additionExclusion ?? null,
        sameLeakAsJobId: sameLeak,
      });
      return { id: jobId, summary };
    }

    case "leak_repair": {
      if (appliance.status !== "in_service")
        throw new RecordConflictError("Leak repairs are logged on appliances in service", "applianceId");
      const [row] = await trx("jobs")
        .insert({
          ...base,
          refrigerant: appliance.refrigerant,
          leak_location: input.leakLocation,
          repair_description: input.repairDescription,
          shutdown_needed: input.shutdownNeeded ?? null,
          access_method: input.accessMethod ?? null,
          temporary_access_removed: input.temporaryAccessRemoved ?? null,
        })
        .returning("id");
      const jobId = rowId(row);
      const summary = `Repaired a leak on ${appliance.tag}: ${input.leakLocation}`;
      await activity(jobId, summary, { applianceId: appliance.id });
      return { id: jobId, summary };
    }

    case "verification_test": {
      if (appliance.status !== "in_service")
        throw new RecordConflictError("Verification tests are logged on appliances in service", "applianceId");
      let relatedJobId: number | null;
      if (input.relatedJobId !== undefined) {
        const repair = await trx("jobs")
          .where({ id: input.relatedJobId, organisation_id: actor.organisationId, appliance_id: appliance.id, kind: "leak_repair" })
          .whereNull("voided_at")
          .first("id");
        if (!repair) throw new RecordNotFoundError("That leak repair is not on record for this appliance", "relatedJobId");
        relatedJobId = Number(repair.id);
      } else {
        // The test checks the latest repair on or before its date.
        const repair = await trx("jobs")
          .where({ organisation_id: actor.organisationId, appliance_id: appliance.id, kind: "leak_repair" })
          .where("performed_on", "<=", input.performedOn)
          .whereNull("voided_at")
          .orderBy([
            { column: "performed_on", order: "desc" },
            { column: "id", order: "desc" },
          ])
          .first("id");
        relatedJobId = repair ? Number(repair.id) : null;
      }
      const [row] = await trx("jobs")
        .insert({
          ...base,
          refrigerant: appliance.refrigerant,
          verification_stage: input.verificationStage,
          verification_passed: input.verificationPassed,
          verification_method: input.verificationMethod,
          related_job_id: relatedJobId,
        })
        .returning("id");
      const jobId = rowId(row);
      const stage = input.verificationStage === "follow_up" ? "Follow-up" : "Initial";
      const summary = `${stage} verification test ${input.verificationPassed ? "passed" : "failed"} on ${appliance.tag}`;
      await activity(jobId, summary, { applianceId: appliance.id, relatedJobId });
      return { id: jobId, summary };
    }
  }
}

/** Records a job of any kind in one transaction and returns its id. The technician is the actor. */
export async function createJob(db: Knex, opts: { actor: ActorRef; branchId: number; input: JobInput; now?: Date }): Promise<number> {
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const branch = await writableBranch(trx, opts.actor.organisationId, opts.branchId);
    const job = await insertJob(trx, { actor: opts.actor, branch, input: opts.input, at, now: opts.now });
    return job.id;
  });
}
