import { resetPasswordInput } from "@coldtrail/core";
import { resetPassword } from "@coldtrail/db";
import { publicRoute } from "@/lib/api/public-route";

/** Choose a new password with a single-use reset link; answers with the address to sign in with. */
export const POST = publicRoute(
  { body: resetPasswordInput, throttle: { route: "password-reset", what: "attempts to use a reset link" } },
  async ({ db, body }) => {
    const { email } = await resetPassword(db, { input: body });
    return { email };
  },
);
