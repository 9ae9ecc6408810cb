import { forgotPasswordInput } from "@coldtrail/core";
import { requestPasswordReset } from "@coldtrail/db";
import { publicRoute } from "@/lib/api/public-route";
import { throttle } from "@/lib/server/throttle";
import { FORGOT_PASSWORD_ANSWER, sendResetMail } from "../../admin/_lib/mail";

/**
 * Ask for a password-reset link. The answer is the same whether or not the address has an account,
 * and the mail is sent after answering, so neither the words nor the wait tell.
 */
export const POST = publicRoute(
  { body: forgotPasswordInput, throttle: { route: "password-forgot", what: "requests for a reset link" } },
  async ({ db, body }) => {
    // Also limited per address asked about (mail to one person cannot be flooded); same answer either way.
    if (await throttle().publicRequest("password-forgot-email", body.email)) return { message: FORGOT_PASSWORD_ANSWER };
    const issued = await requestPasswordReset(db, { email: body.email });
    if (issued) void sendResetMail(issued);
    return { message: FORGOT_PASSWORD_ANSWER };
  },
);
