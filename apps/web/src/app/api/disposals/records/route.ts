import { NextResponse } from "next/server";
import { ForbiddenError, subject } from "@casl/ability";
import { disposalRecordInput } from "@coldtrail/core";
import { createDisposalRecord, DomainError, getApplianceRef } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Keep the disposal record of an appliance of more than 5 and less than 50 lb (40 CFR 82.155(c)). */
export const POST = route(
  { idempotent: true, can: ["create", "Disposal"], body: disposalRecordInput },
  async ({ actor, ability, db, body }) => {
    const appliance = await getApplianceRef(db, { organisationId: actor.organisationId, id: body.applianceId });
    if (!appliance) throw new DomainError("invalid", "That appliance is not in your organisation's register", "applianceId");
    ForbiddenError.from(ability).throwUnlessCan(
      "create",
      subject("Disposal", { organisationId: actor.organisationId, branchId: appliance.branchId }),
    );
    const id = await createDisposalRecord(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
    return NextResponse.json({ id }, { status: 201 });
  },
);
