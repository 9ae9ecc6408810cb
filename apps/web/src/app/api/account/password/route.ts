import { ForbiddenError, subject } from "@casl/ability";
import { changePasswordInput } from "@coldtrail/core";
import { InvalidInputError, changeOwnPassword } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { clientAddress, throttle } from "@/lib/server/throttle";

/**
 * Change one's own password. A wrong current password counts as a failed sign-in (the same throttle),
 * so a session left open cannot be used to guess it. Every session of the person ends; the page signs
 * in again with the new password.
 */
export const POST = route({ can: ["update", "Account"], body: changePasswordInput }, async ({ req, actor, ability, db, body }) => {
  ForbiddenError.from(ability).throwUnlessCan("update", subject("Account", { organisationId: actor.organisationId, userId: actor.userId }));
  const address = clientAddress(req.headers);
  const refusal = await throttle().signInRefusal(actor.email, address);
  if (refusal) throw new InvalidInputError(`Too many wrong passwords. ${refusal.message}`, "currentPassword");
  try {
    const { email } = await changeOwnPassword(db, { userId: actor.userId, input: body });
    await throttle().signInSucceeded(actor.email, address);
    return { email };
  } catch (err) {
    if (err instanceof InvalidInputError && err.field === "currentPassword") await throttle().signInFailed(actor.email, address);
    throw err;
  }
});
