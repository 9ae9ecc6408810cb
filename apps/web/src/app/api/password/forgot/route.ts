import { forgotPasswordInput } from "@coldtrail/core";
import { requestPasswordReset } from "@coldtrail/db";
import { publicRoute } from "@/lib/api/public-route";
import { FORGOT_PASSWORD_ANSWER, sendResetMail } from "../../admin/_lib/mail";

/**
 * Ask for a password-reset link. The answer is the same whether or not the address has an account,
 * and the mail is sent after answering, so neither the words nor the wait tell.
 */
export const POST = publicRoute({ body: forgotPasswordInput }, async ({ db, body }) => {
  const issued = await requestPasswordReset(db, { email: body.email });
  if (issued) await sendResetMail(db, issued);
  return { message: FORGOT_PASSWORD_ANSWER };
});
