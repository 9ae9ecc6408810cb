import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { NoAccess } from "../../_components/no-access";
import { GrantForm } from "./grant-form";

export const metadata: Metadata = { title: "Give an inspector access" };

export default async function NewGrantPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (!signedIn.ability.can("create", "InspectorGrant")) return <NoAccess what="giving inspectors access" />;
  return (
    <div className="mx-auto max-w-3xl space-y-4">
      <Link href="/admin/inspectors" className="text-sm text-fjord-700 underline">
        ← Inspector access
      </Link>
      <div>
        <h1 className="text-2xl font-semibold text-ink-950">Give an inspector access</h1>
        <p className="text-sm text-ink-600">
          A new inspector gets an e-mail with a link to choose a password; one who already has an account gets a notice. They can read the
          chosen branches&apos; records dated within the window — nothing else, and nothing after the access ends.
        </p>
      </div>
      <GrantForm />
    </div>
  );
}
