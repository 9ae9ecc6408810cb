import { NextResponse } from "next/server";
import { ForbiddenError, subject } from "@casl/ability";
import { grantListQuery, inspectorGrantInput } from "@coldtrail/core";
import { createInspectorGrant, listInspectorGrants, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { sendGrantMail } from "../_lib/mail";

/** Inspector access given by the organisation, with its state (open, ended, withdrawn), newest first. */
export const GET = route({ can: ["read", "InspectorGrant"], query: grantListQuery }, async ({ ability, db, query }) => {
  return listInspectorGrants(db, { scope: scopeByAbility(ability, "read", "InspectorGrant", "g"), query });
});

/** Let an inspector read chosen branches' records for a window of dates, until an expiry. */
export const POST = route(
  { idempotent: true, can: ["create", "InspectorGrant"], body: inspectorGrantInput },
  async ({ actor, ability, db, body }) => {
    ForbiddenError.from(ability).throwUnlessCan("create", subject("InspectorGrant", { organisationId: actor.organisationId }));
    const created = await createInspectorGrant(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
    const mailSent = await sendGrantMail(db, actor.organisationId, created);
    return NextResponse.json({ id: created.grantId, userId: created.userId, kind: created.kind, mailSent }, { status: 201 });
  },
);
