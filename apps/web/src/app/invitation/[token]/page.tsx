import type { Metadata } from "next";
import { LINK_REFUSALS, describeInvitation } from "@coldtrail/db";
import { db } from "@/lib/db";
import { linkOpenRefusal } from "@/lib/server/throttle";
import { LinkRefused, PublicShell } from "../_components/public-shell";
import { NewPasswordForm } from "../_components/new-password-form";

export const metadata: Metadata = { title: "Accept your invitation", robots: { index: false }, referrer: "no-referrer" };
export const dynamic = "force-dynamic";

const utc = (iso: string) => `${iso.slice(0, 16).replace("T", " ")} UTC`;

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const throttled = await linkOpenRefusal();
  if (throttled) {
    return (
      <PublicShell title="This invitation link cannot be used">
        <LinkRefused message={throttled} next={[{ href: "/sign-in", label: "Go to sign-in" }]} />
      </PublicShell>
    );
  }
  const view = /^[A-Za-z0-9_-]{20,200}$/.test(token) ? await describeInvitation(db(), { token }) : { state: "unknown" as const };

  if (view.state !== "valid") {
    const message =
      view.state === "expired"
        ? `This invitation expired on ${utc(view.expiresAt!)}. Ask ${view.invitedByName ?? "the person who invited you"} to send a new one.`
        : view.state === "used"
          ? "This invitation has already been used. Sign in with the password you chose, or ask for a new password."
          : LINK_REFUSALS[view.state];
    return (
      <PublicShell title="This invitation link cannot be used">
        <LinkRefused
          message={message}
          next={[
            { href: "/sign-in", label: "Go to sign-in" },
            { href: "/password/forgot", label: "Forgot your password?" },
          ]}
        />
      </PublicShell>
    );
  }
  return (
    <PublicShell title={`Join ${view.organisationName} on Coldtrail`}>
      <p className="text-ink-700">
        {view.invitedByName} invited <strong className="break-all">{view.email}</strong> as {view.access}.
      </p>
      <p className="text-sm text-ink-600">Choose your password to finish. This link works once, until {utc(view.expiresAt!)}.</p>
      <NewPasswordForm
        token={token}
        endpoint="/api/invitation/accept"
        askName
        initialName={view.name ?? ""}
        submitLabel="Save my password and sign in"
      />
    </PublicShell>
  );
}
