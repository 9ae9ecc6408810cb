import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { NoAccess } from "../../_components/no-access";
import { InviteForm } from "./invite-form";

export const metadata: Metadata = { title: "Invite a person" };

export default async function InvitePage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (!signedIn.ability.can("invite", "User")) return <NoAccess what="inviting people" />;
  return (
    <div className="mx-auto max-w-3xl space-y-4">
      <Link href="/admin/people" className="text-sm text-fjord-700 underline">
        ← People
      </Link>
      <div>
        <h1 className="text-2xl font-semibold text-ink-950">Invite a person</h1>
        <p className="text-sm text-ink-600">
          They get an e-mail with a link to choose their password. The link works once and expires in 7 days; until then they appear as
          “Invitation sent”.
        </p>
      </div>
      <InviteForm />
    </div>
  );
}
