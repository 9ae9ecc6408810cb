import { ForbiddenError, subject } from "@casl/ability";
import { signOutEverywhere } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** Ends every session of the signed-in person, on every device, this one included. */
export const POST = route({ can: ["update", "Account"] }, async ({ actor, ability, db }) => {
  ForbiddenError.from(ability).throwUnlessCan("update", subject("Account", { organisationId: actor.organisationId, userId: actor.userId }));
  const ended = await signOutEverywhere(db, { userId: actor.userId, organisationId: actor.organisationId });
  return { ended };
});
