import type { Knex } from "knex";
import { toLocalDate } from "@coldtrail/core";
import { latestActivityId } from "../activity";
import { latestDoneAuditForBranch } from "./audit-runs";
import { getOrganisationAuditSettings } from "./organisation-settings";
import { auditBranchFindings, type BranchAuditSummary } from "./persist-findings";

/**
 * Continuous audit: after a record of a branch is saved, the rules run again over that branch with
 * the period and rule packs of the latest finished audit that covered it (extended to today), and
 * the branch's findings are reconciled — open findings close ("no longer found") or new ones appear
 * without waiting for the next run. A branch never audited is left alone (null).
 */
export async function reevaluateBranch(
  db: Knex,
  opts: {
    organisationId: number;
    branchId: number;
    now?: Date;
    triggeredBy?: number | null;
    /** The writes being answered: activity ids after this one, up to the newest when the re-check starts. */
    afterActivityId?: number | null;
  },
): Promise<BranchAuditSummary | null> {
  const now = opts.now ?? new Date();
  const audit = await latestDoneAuditForBranch(db, { organisationId: opts.organisationId, branchId: opts.branchId });
  if (!audit) return null;
  const branch = await db("branches").where({ id: opts.branchId, organisation_id: opts.organisationId }).first("time_zone");
  if (!branch) return null;
  const today = toLocalDate(now, branch.time_zone);
  const { settings, packs: chosenPacks } = await getOrganisationAuditSettings(db, opts.organisationId);
  const cause =
    opts.afterActivityId === undefined || opts.afterActivityId === null
      ? null
      : { afterActivityId: opts.afterActivityId, toActivityId: await latestActivityId(db) };
  return auditBranchFindings(db, {
    organisationId: opts.organisationId,
    branchId: opts.branchId,
    period: { from: audit.periodFrom, to: audit.periodTo > today ? audit.periodTo : today },
    packs: audit.packs,
    chosenPacks,
    settings,
    auditId: null,
    now,
    triggeredBy: opts.triggeredBy ?? null,
    cause,
  });
}
