import { NextResponse } from "next/server";
import { findingCommentInput } from "@coldtrail/core";
import { addFindingComment, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { pathId } from "../../_lib/access";

/** A comment on a finding, by anyone who may comment on it (officer, the branch's manager, the technician it names). */
export const POST = route<undefined, typeof findingCommentInput, { id: string }>(
  { idempotent: true, can: ["comment", "Finding"], body: findingCommentInput },
  async ({ actor, ability, db, params, body }) => {
    const id = await addFindingComment(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      scope: scopeByAbility(ability, "comment", "Finding", "findings"),
      id: pathId(params.id, "finding"),
      body: body.body,
    });
    return NextResponse.json({ id }, { status: 201 });
  },
);
