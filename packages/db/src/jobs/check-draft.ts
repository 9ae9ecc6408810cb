import type { Knex } from "knex";
import {
  checkJobDraft,
  leakRateAtJob,
  toGrams,
  toLocalDate,
  type DraftCheckResult,
  type JobDraftInput,
  type LeakRateVerdict,
} from "@coldtrail/core";
import { RecordConflictError, RecordNotFoundError } from "../errors";
import { organisationSettings } from "../records/common";
import type { ActorRef } from "../types";
import { ruleAppliance, ruleApplianceJobs, ruleBranch, ruleCylinder, ruleEquipment, ruleTechnician, toCoreExclusion } from "./rule-records";

export interface JobDraftCheck extends DraftCheckResult {
  /** The branch the appliance belongs to (for the caller's permission check). */
  branchId: number | null;
}

const EMPTY: JobDraftCheck = { warnings: [], evacuationRequired: null, cylinderAfter: null, leakRate: null, branchId: null };

/**
 * Loads what the rules need about a job being typed (the appliance, the technician's certifications
 * as recorded, the equipment, the cylinder's contents now, the appliance's earlier jobs) and runs the
 * core check. Nothing is written. Without an appliance there is nothing to judge yet.
 * The technician is the actor: the person logging the job is the one on it.
 */
export async function checkJobDraftForActor(db: Knex, opts: { actor: ActorRef; draft: JobDraftInput; now?: Date }): Promise<JobDraftCheck> {
  const { actor, draft } = opts;
  if (draft.applianceId === undefined) return EMPTY;
  const found = await ruleAppliance(db, actor.organisationId, draft.applianceId);
  if (!found) throw new RecordNotFoundError("That appliance is not in your organisation's register", "applianceId");
  const { appliance, branchId } = found;
  const branch = await ruleBranch(db, actor.organisationId, branchId);
  if (!branch) throw new RecordNotFoundError("That branch does not exist", "branchId");

  const [technician, settings, applianceJobs] = await Promise.all([
    ruleTechnician(db, actor.organisationId, actor.userId),
    organisationSettings(db, actor.organisationId),
    draft.kind === "charge" ? ruleApplianceJobs(db, actor.organisationId, appliance.id) : Promise.resolve([]),
  ]);
  const equipment = draft.equipmentId !== undefined ? await ruleEquipment(db, actor.organisationId, draft.equipmentId) : undefined;
  const cylinder = draft.cylinderId !== undefined ? await ruleCylinder(db, actor.organisationId, draft.cylinderId) : undefined;
  // Registers of another branch are refused on save; the check does not judge them.
  if (equipment && equipment.branchId !== branchId)
    throw new RecordConflictError("That recovery equipment belongs to another branch", "equipmentId");
  if (cylinder && cylinder.branchId !== branchId) throw new RecordConflictError("That cylinder belongs to another branch", "cylinderId");

  const grams = (amount: number | undefined, unit: string | null | undefined) =>
    amount === undefined || !unit ? null : toGrams(amount, unit as "lb" | "oz" | "kg" | "g");
  const result = checkJobDraft(
    {
      kind: draft.kind,
      performedOn: draft.performedOn ?? toLocalDate(opts.now ?? new Date(), branch.timeZone),
      refrigerant: draft.refrigerant || appliance.refrigerant,
      recoveredG: grams(draft.recoveredAmount, draft.recoveredUnit),
      chargedG: grams(draft.chargedAmount, draft.chargedUnit),
      chargeFromCylinder: draft.chargeSource === "cylinder",
      evacuation:
        draft.evacuationValue !== undefined && draft.evacuationUnit ? { value: draft.evacuationValue, unit: draft.evacuationUnit } : null,
      accessMethod: draft.accessMethod ?? null,
      temporaryAccessRemoved: draft.temporaryAccessRemoved ?? null,
      compressorOperating: draft.compressorOperating ?? null,
      additionExclusion: toCoreExclusion(draft.additionExclusion),
      sameLeakAsJobId: draft.sameLeakAsJobId ?? null,
    },
    {
      branch,
      appliance,
      technician: technician ?? null,
      equipment: equipment ?? null,
      cylinder: cylinder ?? null,
      applianceJobs,
      settings,
    },
  );
  return { ...result, branchId };
}

/** The leak rate a recorded charge gave, by the organisation's method (null for other kinds). */
export async function leakRateOfJob(
  db: Knex,
  opts: { organisationId: number; jobId: number; applianceId: number; branchId: number },
): Promise<LeakRateVerdict | null> {
  const found = await ruleAppliance(db, opts.organisationId, opts.applianceId);
  const branch = await ruleBranch(db, opts.organisationId, opts.branchId);
  if (!found || !branch) return null;
  const [jobs, settings] = await Promise.all([
    ruleApplianceJobs(db, opts.organisationId, opts.applianceId),
    organisationSettings(db, opts.organisationId),
  ]);
  return leakRateAtJob(found.appliance, jobs, opts.jobId, { timeZone: branch.timeZone, settings });
}
