import { ForbiddenError, subject } from "@casl/ability";
import { resendInvitation, withdrawInvitation } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { sendInvitationMail } from "../../../_lib/mail";
import { visiblePerson } from "../../_shared";

type Params = { id: string };

/** Send a fresh invitation link (earlier links stop working). */
export const POST = route<undefined, undefined, Params>({ can: ["invite", "User"] }, async ({ actor, ability, db, params }) => {
  const person = await visiblePerson(db, ability, params.id);
  ForbiddenError.from(ability).throwUnlessCan("invite", subject("User", { organisationId: person.organisationId, id: person.id }));
  const issued = await resendInvitation(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, userId: person.id });
  const mailSent = await sendInvitationMail(db, actor.organisationId, issued);
  return { userId: issued.userId, expiresAt: issued.expiresAt, mailSent };
});

/** Withdraw an invitation not yet accepted; the account is deactivated. */
export const DELETE = route<undefined, undefined, Params>({ can: ["invite", "User"] }, async ({ actor, ability, db, params }) => {
  const person = await visiblePerson(db, ability, params.id);
  ForbiddenError.from(ability).throwUnlessCan("invite", subject("User", { organisationId: person.organisationId, id: person.id }));
  await withdrawInvitation(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, userId: person.id });
  return visiblePerson(db, ability, params.id);
});
