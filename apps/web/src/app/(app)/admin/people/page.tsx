import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { NoAccess } from "../_components/no-access";
import { PeopleTable } from "./people-table";

export const metadata: Metadata = { title: "People" };

export default async function PeoplePage({ searchParams }: { searchParams: Promise<{ invited?: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { ability } = signedIn;
  if (!ability.can("read", "User")) return <NoAccess what="the list of people" />;
  const { invited } = await searchParams;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">People</h1>
          <p className="text-sm text-ink-600">
            Everyone who can sign in, has been invited, or no longer signs in — with their roles and branches.
          </p>
        </div>
        {ability.can("invite", "User") && (
          <Link href="/admin/people/invite" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            Invite a person
          </Link>
        )}
      </div>
      {invited && (
        <p role="status" className="flex items-center gap-2 rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-sm text-ok">
          <span aria-hidden="true">✓</span> Invitation sent to {invited}. The link works once and expires in 7 days.
        </p>
      )}
      <PeopleTable />
    </div>
  );
}
