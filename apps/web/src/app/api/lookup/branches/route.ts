import { listBranches } from "@coldtrail/db";
import { subject } from "@casl/ability";
import { route } from "@/lib/api/route";

/** Branches the signed-in person may read (for filters and pickers). */
export const GET = route({ can: ["read", "Branch"] }, async ({ actor, ability, db }) => {
  const branches = await listBranches(db, { organisationId: actor.organisationId });
  return {
    rows: branches.filter((b) => ability.can("read", subject("Branch", { ...b, organisationId: actor.organisationId }))),
  };
});
