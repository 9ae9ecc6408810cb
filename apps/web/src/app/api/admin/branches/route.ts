import { NextResponse } from "next/server";
import { branchInput, branchListQuery } from "@coldtrail/core";
import { createBranch, listAdminBranches, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Branches the signed-in person may read, archived ones included, one page at a time. */
export const GET = route({ can: ["read", "Branch"], query: branchListQuery }, async ({ ability, db, query }) => {
  return listAdminBranches(db, { scope: scopeByAbility(ability, "read", "Branch", "branches"), query });
});

/** Open a branch in the signed-in person's organisation. */
export const POST = route({ idempotent: true, can: ["create", "Branch"], body: branchInput }, async ({ actor, db, body }) => {
  const id = await createBranch(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
  return NextResponse.json({ id }, { status: 201 });
});
