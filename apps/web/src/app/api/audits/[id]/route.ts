import { DomainError, getAuditRun, listBranches } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { pathId } from "../../findings/_lib/access";
import { readableFindingBranches, visibleAudit } from "../_visible";

/** One audit with its state and progress (the page polls this while it runs). */
export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "Audit"] }, async ({ actor, ability, db, params }) => {
  const run = await getAuditRun(db, { organisationId: actor.organisationId, id: pathId(params.id, "audit") });
  if (!run) throw new DomainError("not_found", "No such audit");
  const names = new Map(
    (await listBranches(db, { organisationId: actor.organisationId, includeArchived: true })).map((b) => [b.id, b.name]),
  );
  return {
    ...visibleAudit(run, await readableFindingBranches(db, actor, ability)),
    branchNames: run.branchIds.map((id) => names.get(id) ?? `#${id}`),
  };
});
