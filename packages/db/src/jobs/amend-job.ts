import type { Knex } from "knex";
import {
  normaliseDesignation,
  TEMPORARY_ACCESS_METHODS,
  toGrams,
  type AccessMethod,
  type JobAmendmentInput,
  type JobKind,
  type MassDisplayUnit,
} from "@coldtrail/core";
import { amendRecord, voidRecord } from "../amendments";
import { appendActivity } from "../activity";
import { InvalidInputError, RecordConflictError, RecordNotFoundError } from "../errors";
import { describeMass } from "../mass";
import { assertRecordDate, moveCylinderContents } from "../records/common";
import { storedLike, type ActorRef } from "../types";
import { jobCylinder, jobEquipment } from "./write-job";

/** Which corrections make sense for which kind of job. */
const FIELDS_BY_KIND: Record<JobKind, ReadonlyArray<keyof JobAmendmentInput["changes"]>> = {
  recovery: [
    "performedOn",
    "amount",
    "amountUnit",
    "cylinderId",
    "equipmentId",
    "evacuationValue",
    "evacuationUnit",
    "accessMethod",
    "temporaryAccessRemoved",
    "compressorOperating",
    "notes",
  ],
  disposal: [
    "performedOn",
    "amount",
    "amountUnit",
    "cylinderId",
    "equipmentId",
    "evacuationValue",
    "evacuationUnit",
    "accessMethod",
    "temporaryAccessRemoved",
    "compressorOperating",
    "notes",
  ],
  charge: ["performedOn", "amount", "amountUnit", "cylinderId", "additionExclusion", "accessMethod", "temporaryAccessRemoved", "notes"],
  leak_repair: ["performedOn", "leakLocation", "repairDescription", "shutdownNeeded", "accessMethod", "temporaryAccessRemoved", "notes"],
  verification_test: ["performedOn", "verificationStage", "verificationPassed", "verificationMethod", "notes"],
};

const COLUMN: Partial<Record<keyof JobAmendmentInput["changes"], string>> = {
  performedOn: "performed_on",
  equipmentId: "equipment_id",
  evacuationValue: "evacuation_value",
  evacuationUnit: "evacuation_unit",
  accessMethod: "access_method",
  temporaryAccessRemoved: "temporary_access_removed",
  compressorOperating: "compressor_operating",
  additionExclusion: "addition_exclusion",
  leakLocation: "leak_location",
  repairDescription: "repair_description",
  shutdownNeeded: "shutdown_needed",
  verificationStage: "verification_stage",
  verificationPassed: "verification_passed",
  verificationMethod: "verification_method",
  notes: "notes",
};

/** Plain words for the fields in an amendment's history. */
export const JOB_FIELD_WORDS: Record<string, string> = {
  performed_on: "date of the work",
  recovered_g: "amount recovered",
  charged_g: "amount added",
  amount_entered: "amount as entered",
  amount_unit: "unit entered",
  cylinder_id: "cylinder",
  equipment_id: "recovery equipment",
  evacuation_value: "evacuation level",
  evacuation_unit: "evacuation unit",
  access_method: "access",
  temporary_access_removed: "temporary device removed",
  compressor_operating: "compressor running",
  addition_exclusion: "left out of the leak rate",
  leak_location: "leak location",
  repair_description: "repair",
  shutdown_needed: "industrial shutdown needed",
  verification_stage: "test stage",
  verification_passed: "test passed",
  verification_method: "test method",
  notes: "notes",
};

async function loadJob(trx: Knex.Transaction, organisationId: number, id: number) {
  const job = await trx("jobs as j")
    .join("appliances as a", "a.id", "j.appliance_id")
    .join("branches as b", "b.id", "j.branch_id")
    .where({ "j.id": id, "j.organisation_id": organisationId })
    .first("j.*", "a.tag as appliance_tag", "b.mass_unit as mass_unit", "b.time_zone as time_zone");
  if (!job) throw new RecordNotFoundError("No such job");
  if (job.voided_at) throw new RecordConflictError("A voided job cannot be corrected", "reason");
  return job;
}

type Movement = { id: number; direction: string; cylinder_id: number | null; refrigerant: string; mass_g: number; moved_on: string };

/** Which way a movement changes its cylinder's contents. */
const SIGN: Record<string, number> = { recovered_into_cylinder: 1, charged_from_cylinder: -1 };

/**
 * Corrects a job by amendment: the previous values, who, when and why are kept and shown on the
 * record. A change of amount, cylinder or date replaces the job's movement (the old one is voided,
 * a new one written) and moves the cylinder contents with it, all in one transaction.
 */
export async function amendJob(db: Knex, opts: { actor: ActorRef; id: number; input: JobAmendmentInput; now?: Date }): Promise<number> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  return db.transaction(async (trx) => {
    const job = await loadJob(trx, actor.organisationId, opts.id);
    const kind = job.kind as JobKind;
    const c = input.changes;
    const allowed = FIELDS_BY_KIND[kind];
    for (const [field, value] of Object.entries(c)) {
      if (value !== undefined && !allowed.includes(field as keyof typeof c)) {
        throw new InvalidInputError(
          `A ${kind.replace("_", " ")} job has no ${field.replace(/[A-Z]/g, (x) => ` ${x.toLowerCase()}`)} to correct`,
          `changes.${field}`,
        );
      }
    }
    const mass = (g: number) => describeMass(g, job.mass_unit as MassDisplayUnit);
    const changes: Record<string, unknown> = {};
    for (const [field, column] of Object.entries(COLUMN)) {
      const value = c[field as keyof typeof c];
      if (value !== undefined) changes[column] = typeof value === "string" ? value.trim() : value;
    }
    if (changes.notes === "") changes.notes = null;
    if (c.performedOn !== undefined) {
      await assertRecordDate(trx, {
        organisationId: actor.organisationId,
        timeZone: String(job.time_zone),
        date: c.performedOn,
        field: "changes.performedOn",
        what: "The date of the work",
        now: opts.now,
      });
    }

    // Evacuation: the reading and its unit are judged together.
    const evacValue = c.evacuationValue ?? (job.evacuation_value === null ? undefined : Number(job.evacuation_value));
    const evacUnit = c.evacuationUnit ?? job.evacuation_unit ?? undefined;
    if (evacValue !== undefined && evacUnit !== undefined) {
      if (evacUnit !== "psig" && evacValue < 0) throw new InvalidInputError("This unit cannot be negative", "changes.evacuationValue");
      if (evacUnit === "in_hg_vacuum" && evacValue > 29.92)
        throw new InvalidInputError("A vacuum cannot be deeper than 29.92 in Hg", "changes.evacuationValue");
    }
    // A temporary piercing device must be said to be removed or left.
    const access = (c.accessMethod !== undefined ? c.accessMethod : job.access_method) as AccessMethod | null;
    const removed = c.temporaryAccessRemoved !== undefined ? c.temporaryAccessRemoved : job.temporary_access_removed;
    if (access && TEMPORARY_ACCESS_METHODS.includes(access) && (removed === null || removed === undefined)) {
      throw new InvalidInputError("Say whether the temporary piercing device was removed", "changes.temporaryAccessRemoved");
    }

    // Amount and cylinder.
    const amountColumn = kind === "charge" ? "charged_g" : "recovered_g";
    if (c.amount !== undefined && c.amountUnit !== undefined) {
      const grams = toGrams(c.amount, c.amountUnit);
      if (kind === "charge" && grams <= 0) throw new InvalidInputError("The amount added must be more than zero", "changes.amount");
      changes[amountColumn] = grams;
      // Kept as typed, so the record re-opens with the figure and unit the person entered.
      changes.amount_entered = c.amount;
      changes.amount_unit = c.amountUnit;
    }
    const movements: Movement[] = await trx("refrigerant_movements").where({ job_id: job.id }).whereNull("voided_at").orderBy("id");
    if (c.cylinderId !== undefined) {
      if (kind === "charge" && !movements.some((m) => m.direction === "charged_from_cylinder")) {
        throw new InvalidInputError(
          "This charge came from stock, not from a cylinder; void it and log it again if that was wrong",
          "changes.cylinderId",
        );
      }
      const cylinder = await jobCylinder(trx, actor.organisationId, Number(job.branch_id), c.cylinderId, "changes.cylinderId");
      if (
        kind === "charge" &&
        (!cylinder.refrigerant || normaliseDesignation(cylinder.refrigerant) !== normaliseDesignation(String(job.refrigerant)))
      ) {
        throw new RecordConflictError(`Cylinder ${cylinder.serial} does not hold ${job.refrigerant} on record`, "changes.cylinderId");
      }
      changes.cylinder_id = c.cylinderId;
    }
    if (c.equipmentId !== undefined)
      await jobEquipment(trx, actor.organisationId, Number(job.branch_id), c.equipmentId, "changes.equipmentId");

    const words = Object.keys(changes)
      .filter((k) => k !== "amount_entered" && k !== "amount_unit")
      .filter((k) => String(storedLike(job[k], changes[k]) ?? "") !== String(changes[k] ?? ""))
      .map((k) => JOB_FIELD_WORDS[k] ?? k);
    const amendmentId = await amendRecord(trx, {
      table: "jobs",
      subjectType: "Job",
      id: job.id,
      organisationId: actor.organisationId,
      actorId: actor.userId,
      reason: input.reason,
      changes,
      summary: `Corrected the ${words.join(", ") || "record"} of job #${job.id} on ${job.appliance_tag}`,
      at,
    });

    if (kind === "disposal" && changes.performed_on !== undefined) {
      await trx("appliances")
        .where({ id: job.appliance_id, status: "disposed" })
        .update({ disposed_on: changes.performed_on, updated_at: at });
    }

    // Replace the movement when what it says has changed, and move the cylinder contents with it.
    const newGrams = changes[amountColumn] as number | undefined;
    const newCylinder = changes.cylinder_id as number | undefined;
    const newDate = changes.performed_on as string | undefined;
    const existing = movements.filter((m) => m.direction !== "purchased");
    const jobRefrigerant = job.refrigerant as string;
    const baseRow = { organisation_id: actor.organisationId, branch_id: Number(job.branch_id), job_id: job.id, created_at: at };
    if (existing.length === 0 && newGrams !== undefined && newGrams > 0 && (kind === "recovery" || kind === "disposal")) {
      // A recovery first recorded as nothing now moved refrigerant into its cylinder.
      const cylinderId = newCylinder ?? Number(job.cylinder_id);
      await trx("refrigerant_movements").insert({
        ...baseRow,
        cylinder_id: cylinderId,
        direction: "recovered_into_cylinder",
        refrigerant: jobRefrigerant,
        mass_g: newGrams,
        moved_on: newDate ?? job.performed_on,
      });
      await moveCylinderContents(trx, {
        cylinderId,
        deltaG: newGrams,
        refrigerant: jobRefrigerant,
        at,
        field: "changes.amount",
        describe: mass,
        confirmedOverFill: input.confirmOverFill,
      });
    }
    for (const m of existing) {
      const grams = newGrams ?? Number(m.mass_g);
      const cylinderId = m.cylinder_id === null ? null : (newCylinder ?? Number(m.cylinder_id));
      const movedOn = newDate ?? m.moved_on;
      if (grams === Number(m.mass_g) && cylinderId === (m.cylinder_id === null ? null : Number(m.cylinder_id)) && movedOn === m.moved_on)
        continue;
      await trx("refrigerant_movements").where({ id: m.id }).update({ voided_at: at });
      if (grams > 0) {
        await trx("refrigerant_movements").insert({
          ...baseRow,
          cylinder_id: cylinderId,
          direction: m.direction,
          refrigerant: m.refrigerant,
          mass_g: grams,
          moved_on: movedOn,
        });
      }
      const sign = SIGN[m.direction];
      if (sign && m.cylinder_id !== null) {
        const field = newCylinder !== undefined && Number(m.cylinder_id) !== newCylinder ? "changes.cylinderId" : "changes.amount";
        // Take the old movement out of its cylinder, then put the new one into its cylinder.
        await moveCylinderContents(trx, {
          cylinderId: Number(m.cylinder_id),
          deltaG: -sign * Number(m.mass_g),
          refrigerant: m.refrigerant,
          at,
          field,
          describe: mass,
          // Taking the old movement back restores contents that were already on record.
          confirmedOverFill: true,
        });
        await moveCylinderContents(trx, {
          cylinderId: cylinderId as number,
          deltaG: sign * grams,
          refrigerant: m.refrigerant,
          at,
          field,
          describe: mass,
          confirmedOverFill: input.confirmOverFill,
        });
      }
    }
    return amendmentId;
  });
}

/**
 * Voids a job entered in error: the row and its history stay, its movements are voided and taken
 * back out of the cylinders, and a disposal gives the appliance back its earlier status.
 */
export async function voidJob(db: Knex, opts: { actor: ActorRef; id: number; reason: string; now?: Date }): Promise<void> {
  const { actor } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const job = await trx("jobs as j")
      .join("appliances as a", "a.id", "j.appliance_id")
      .join("branches as b", "b.id", "j.branch_id")
      .where({ "j.id": opts.id, "j.organisation_id": actor.organisationId })
      .first("j.*", "a.tag as appliance_tag", "a.status as appliance_status", "b.mass_unit as mass_unit");
    if (!job) throw new RecordNotFoundError("No such job");
    const mass = (g: number) => describeMass(g, job.mass_unit as MassDisplayUnit);
    await voidRecord(trx, {
      table: "jobs",
      subjectType: "Job",
      id: job.id,
      organisationId: actor.organisationId,
      actorId: actor.userId,
      reason: opts.reason,
      summary: `Voided job #${job.id} on ${job.appliance_tag}: ${opts.reason.trim()}`,
      at,
    });
    const movements: Movement[] = await trx("refrigerant_movements").where({ job_id: job.id }).whereNull("voided_at").orderBy("id");
    for (const m of movements) {
      await trx("refrigerant_movements").where({ id: m.id }).update({ voided_at: at });
      const sign = SIGN[m.direction];
      if (sign && m.cylinder_id !== null) {
        await moveCylinderContents(trx, {
          cylinderId: Number(m.cylinder_id),
          deltaG: -sign * Number(m.mass_g),
          refrigerant: m.refrigerant,
          at,
          field: "reason",
          describe: mass,
          confirmedOverFill: true,
        });
      }
    }
    if (job.kind === "disposal" && job.appliance_status === "disposed") {
      // Give the appliance back the status it had before this disposal was logged.
      const created = await trx("activity")
        .where({ organisation_id: actor.organisationId, subject_type: "job", subject_id: job.id, action: "job.disposal.created" })
        .first("data");
      let previous = "retired";
      try {
        const data = created?.data ? JSON.parse(created.data) : null;
        if (data?.previousApplianceStatus === "in_service" || data?.previousApplianceStatus === "retired")
          previous = data.previousApplianceStatus;
      } catch {
        // keep "retired"
      }
      await trx("appliances").where({ id: job.appliance_id }).update({ status: previous, disposed_on: null, updated_at: at });
      await appendActivity(trx, {
        organisationId: actor.organisationId,
        actorId: actor.userId,
        branchId: Number(job.branch_id),
        action: "appliance.disposal_undone",
        subjectType: "appliance",
        subjectId: Number(job.appliance_id),
        summary: `${job.appliance_tag} is ${previous === "retired" ? "retired" : "in service"} again: its disposal job #${job.id} was voided`,
        data: { jobId: job.id },
        at,
      });
    }
  });
}
