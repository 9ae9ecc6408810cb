import type { Metadata } from "next";
import Link from "next/link";
import { PublicShell } from "../../invitation/_components/public-shell";
import { ForgotForm } from "./forgot-form";

export const metadata: Metadata = { title: "Forgot your password?" };

export default function ForgotPasswordPage() {
  return (
    <PublicShell title="Forgot your password?">
      <p className="text-ink-700">
        Enter the e-mail address you sign in with. We will send a link to choose a new password; it works once, for one hour.
      </p>
      <ForgotForm />
      <Link href="/sign-in" className="inline-block text-sm font-medium text-fjord-700 underline">
        Back to sign-in
      </Link>
    </PublicShell>
  );
}
