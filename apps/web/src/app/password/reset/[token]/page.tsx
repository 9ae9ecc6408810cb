import type { Metadata } from "next";
import { LINK_REFUSALS, describePasswordReset } from "@coldtrail/db";
import { db } from "@/lib/db";
import { linkOpenRefusal } from "@/lib/server/throttle";
import { LinkRefused, PublicShell } from "../../../invitation/_components/public-shell";
import { NewPasswordForm } from "../../../invitation/_components/new-password-form";

export const metadata: Metadata = { title: "Choose a new password", robots: { index: false }, referrer: "no-referrer" };
export const dynamic = "force-dynamic";

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const throttled = await linkOpenRefusal();
  if (throttled) {
    return (
      <PublicShell title="This password link cannot be used">
        <LinkRefused
          message={throttled}
          next={[
            { href: "/password/forgot", label: "Ask for a new link" },
            { href: "/sign-in", label: "Go to sign-in" },
          ]}
        />
      </PublicShell>
    );
  }
  const view = /^[A-Za-z0-9_-]{20,200}$/.test(token) ? await describePasswordReset(db(), { token }) : { state: "unknown" as const };
  if (view.state !== "valid") {
    const message =
      view.state === "expired" ? "This password link has expired: links work for one hour. Ask for a new one." : LINK_REFUSALS[view.state];
    return (
      <PublicShell title="This password link cannot be used">
        <LinkRefused
          message={message}
          next={[
            { href: "/password/forgot", label: "Ask for a new link" },
            { href: "/sign-in", label: "Go to sign-in" },
          ]}
        />
      </PublicShell>
    );
  }
  return (
    <PublicShell title="Choose a new password">
      <p className="text-ink-700">
        For <strong className="break-all">{view.email}</strong>. The link works once.
      </p>
      <NewPasswordForm token={token} endpoint="/api/password/reset" submitLabel="Save the new password and sign in" />
    </PublicShell>
  );
}
