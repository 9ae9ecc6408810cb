import { NextResponse } from "next/server";
import { ForbiddenError, subject } from "@casl/ability";
import { purchaseInput, purchaseListQuery } from "@coldtrail/core";
import { createPurchase, listPurchases, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Refrigerant purchases the signed-in person may read, one page at a time. */
export const GET = route({ can: ["read", "Purchase"], query: purchaseListQuery }, async ({ ability, db, query }) => {
  return listPurchases(db, { scope: scopeByAbility(ability, "read", "Purchase", "p"), query });
});

/** Record refrigerant bought by a branch. */
export const POST = route({ idempotent: true, can: ["create", "Purchase"], body: purchaseInput }, async ({ actor, ability, db, body }) => {
  ForbiddenError.from(ability).throwUnlessCan(
    "create",
    subject("Purchase", { organisationId: actor.organisationId, branchId: body.branchId }),
  );
  const id = await createPurchase(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
  return NextResponse.json({ id }, { status: 201 });
});
