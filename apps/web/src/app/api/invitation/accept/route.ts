import { acceptInvitationInput } from "@coldtrail/core";
import { acceptInvitation } from "@coldtrail/db";
import { publicRoute } from "@/lib/api/public-route";

/**
 * Accept an invitation: the single-use link's token, the person's name and a new password. Answers
 * with the e-mail address so the page can sign the person in with the password they just chose.
 */
export const POST = publicRoute(
  { body: acceptInvitationInput, throttle: { route: "invitation-accept", what: "attempts to accept an invitation" } },
  async ({ db, body }) => {
    const { email } = await acceptInvitation(db, { input: body });
    return { email };
  },
);
