import { NextResponse } from "next/server";
import { cylinderInput, cylinderListQuery } from "@coldtrail/core";
import { createCylinder, listCylinders, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeCreateInBranch } from "../appliances/_shared/register-access";

/** The cylinder register with each cylinder's fill and requalification, one page at a time. */
export const GET = route({ can: ["read", "Cylinder"], query: cylinderListQuery }, async ({ actor, ability, db, query }) => {
  return listCylinders(db, {
    scope: scopeByAbility(ability, "read", "Cylinder", "cylinders"),
    organisationId: actor.organisationId,
    query,
  });
});

/** Adds an empty cylinder to a branch's register. */
export const POST = route({ idempotent: true, can: ["create", "Cylinder"], body: cylinderInput }, async ({ actor, ability, db, body }) => {
  authorizeCreateInBranch(ability, actor, "cylinder", body.branchId);
  const id = await createCylinder(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
  return NextResponse.json({ id }, { status: 201 });
});
