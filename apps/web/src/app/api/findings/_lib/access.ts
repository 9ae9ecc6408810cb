import "server-only";
import { subject } from "@casl/ability";
import { canInBranchAnyDate, type Action, type Actor, type AppAbility, type SubjectName } from "@coldtrail/core";
import { listBranches, type Knex } from "@coldtrail/db";
import { recordId } from "@/lib/api/params";

/** Today's calendar date (UTC) for due-date buckets of organisation-wide lists. */
export const todayUtc = (now: Date = new Date()) => now.toISOString().slice(0, 10);

/** A positive id from a path segment; anything else is a 404 (we never reveal what exists). */
export function pathId(raw: string | undefined, what: string): number {
  return recordId(raw, `No such ${what}`);
}

/** Branches of the organisation on which the person may `action` the subject (branch-level conditions only). */
export async function branchesAllowed(
  db: Knex,
  actor: Actor,
  ability: AppAbility,
  action: Action,
  subjectName: SubjectName,
): Promise<{ id: number; name: string }[]> {
  const branches = await listBranches(db, { organisationId: actor.organisationId, includeArchived: true });
  return (
    branches
      // A branch-level question: an inspector's date window applies to the records, not to the branch.
      .filter((b) => canInBranchAnyDate(ability, action, subjectName, { organisationId: actor.organisationId, branchId: b.id, id: b.id }))
      .map((b) => ({ id: b.id, name: b.name }))
  );
}

/**
 * Whether the person may do `action` to a finding, judged on the fields the ability conditions read.
 * A finding shown in several branches (a person-level finding) allows what any of them allows.
 */
export function canOnFinding(
  ability: AppAbility,
  action: Action,
  f: {
    organisationId: number;
    branchId: number;
    technicianId: number | null;
    occurredOn?: string | null;
    openedAt?: string;
    branches?: { id: number }[];
  },
): boolean {
  const branchIds = f.branches?.length ? f.branches.map((b) => b.id) : [f.branchId];
  return branchIds.some((branchId) =>
    ability.can(
      action,
      subject("Finding", {
        organisationId: f.organisationId,
        branchId,
        technicianId: f.technicianId,
        occurredOn: f.occurredOn ?? null,
        openedAt: f.openedAt,
      }),
    ),
  );
}
