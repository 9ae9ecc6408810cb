import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { NoAccess } from "../_components/no-access";
import { GrantsTable } from "./grants-table";

export const metadata: Metadata = { title: "Inspector access" };

export default async function InspectorsPage({ searchParams }: { searchParams: Promise<{ granted?: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { ability } = signedIn;
  if (!ability.can("read", "InspectorGrant")) return <NoAccess what="inspector access" />;
  const { granted } = await searchParams;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Inspector access</h1>
          <p className="max-w-3xl text-sm text-ink-600">
            An inspector reads — and only reads — the records of the branches you choose, dated within the window you set, until the access
            ends. Withdrawing it takes effect on their next click.
          </p>
        </div>
        {ability.can("create", "InspectorGrant") && (
          <Link href="/admin/inspectors/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            Give an inspector access
          </Link>
        )}
      </div>
      {(granted === "invited" || granted === "notified") && (
        <p role="status" className="flex items-center gap-2 rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-sm text-ok">
          <span aria-hidden="true">✓</span> Access given; {granted === "invited" ? "an invitation to choose a password" : "a notice"} was
          e-mailed to the inspector.
        </p>
      )}
      {granted === "unsent" && (
        <p
          role="alert"
          className="flex items-center gap-2 rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical"
        >
          <span aria-hidden="true">⚠</span> Access given, but the e-mail could not be sent. Use “Send a new link” beside the access below.
        </p>
      )}
      <GrantsTable canRevoke={ability.can("update", "InspectorGrant")} canInvite={ability.can("invite", "InspectorGrant")} />
    </div>
  );
}
