import { NextResponse } from "next/server";
import { applianceInput, applianceListQuery } from "@coldtrail/core";
import { createAppliance, listAppliances, plannedSiteRecords, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeCreateInBranch } from "./_shared/register-access";

/** The appliance register: one page the signed-in person may read, filtered and sorted on the server. */
export const GET = route({ can: ["read", "Appliance"], query: applianceListQuery }, async ({ ability, db, query }) => {
  return listAppliances(db, { scope: scopeByAbility(ability, "read", "Appliance", "appliances"), query });
});

/** Adds an appliance (and, when asked, its new site and customer) to a branch's register. */
export const POST = route(
  { idempotent: true, can: ["create", "Appliance"], body: applianceInput },
  async ({ actor, ability, db, body }) => {
    authorizeCreateInBranch(ability, actor, "appliance", body.branchId);
    const planned = plannedSiteRecords(body);
    if (planned.site) authorizeCreateInBranch(ability, actor, "Site", body.branchId);
    if (planned.customer) authorizeCreateInBranch(ability, actor, "Customer", body.branchId);
    const id = await createAppliance(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
    return NextResponse.json({ id }, { status: 201 });
  },
);
