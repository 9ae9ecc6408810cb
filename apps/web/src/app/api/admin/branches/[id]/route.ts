import { ForbiddenError, subject } from "@casl/ability";
import { branchUpdate } from "@coldtrail/core";
import { DomainError, getAdminBranch, scopeByAbility, updateBranch } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../_lib/params";

type Params = { id: string };

/** One branch the signed-in person may read; otherwise 404. */
export const GET = route<undefined, undefined, Params>({ can: ["read", "Branch"] }, async ({ ability, db, params }) => {
  const branch = await getAdminBranch(db, {
    scope: scopeByAbility(ability, "read", "Branch", "branches"),
    id: recordId(params.id, "branch"),
  });
  if (!branch) throw new DomainError("not_found", "No such branch");
  return branch;
});

/** Rename, move, change the unit of, archive or bring back a branch. */
export const PATCH = route<undefined, typeof branchUpdate, Params>(
  { can: ["update", "Branch"], body: branchUpdate },
  async ({ actor, ability, db, body, params }) => {
    const branch = await getAdminBranch(db, {
      scope: scopeByAbility(ability, "read", "Branch", "branches"),
      id: recordId(params.id, "branch"),
    });
    if (!branch) throw new DomainError("not_found", "No such branch");
    ForbiddenError.from(ability).throwUnlessCan("update", subject("Branch", { id: branch.id, organisationId: branch.organisationId }));
    await updateBranch(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id: branch.id, input: body });
    return getAdminBranch(db, { scope: scopeByAbility(ability, "read", "Branch", "branches"), id: branch.id });
  },
);
