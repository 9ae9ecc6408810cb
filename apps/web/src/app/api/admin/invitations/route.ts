import { NextResponse } from "next/server";
import { ForbiddenError, subject } from "@casl/ability";
import { invitationInput } from "@coldtrail/core";
import { createInvitation } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { sendInvitationMail } from "../_lib/mail";

/** Invite a person by e-mail with their roles and branches; the link is sent, never returned. */
export const POST = route({ idempotent: true, can: ["invite", "User"], body: invitationInput }, async ({ actor, ability, db, body }) => {
  ForbiddenError.from(ability).throwUnlessCan("invite", subject("User", { organisationId: actor.organisationId }));
  const issued = await createInvitation(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
  const mailSent = await sendInvitationMail(db, actor.organisationId, issued);
  return NextResponse.json({ userId: issued.userId, expiresAt: issued.expiresAt, mailSent }, { status: 201 });
});
