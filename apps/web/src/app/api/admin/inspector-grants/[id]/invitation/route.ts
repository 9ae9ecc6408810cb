import { ForbiddenError, subject } from "@casl/ability";
import { DomainError, getInspectorGrantRef, resendInvitation } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { sendInvitationMail } from "../../../_lib/mail";
import { recordId } from "../../../_lib/params";

/** Send the inspector of this access a fresh invitation link, while they have not chosen a password. */
export const POST = route<undefined, undefined, { id: string }>(
  { can: ["invite", "InspectorGrant"] },
  async ({ actor, ability, db, params }) => {
    const grant = await getInspectorGrantRef(db, recordId(params.id, "inspector access"));
    if (!grant || !ability.can("read", subject("InspectorGrant", { ...grant })))
      throw new DomainError("not_found", "No such inspector access");
    ForbiddenError.from(ability).throwUnlessCan("invite", subject("InspectorGrant", { ...grant }));
    const issued = await resendInvitation(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      userId: grant.userId,
    });
    const mailSent = await sendInvitationMail(db, actor.organisationId, issued);
    return { userId: issued.userId, expiresAt: issued.expiresAt, mailSent };
  },
);
