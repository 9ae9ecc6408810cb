import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { NoAccess } from "../_components/no-access";
import { BranchesTable } from "./branches-table";

export const metadata: Metadata = { title: "Branches" };

export default async function BranchesPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { ability } = signedIn;
  if (!ability.can("update", "Branch") && !ability.can("create", "Branch")) return <NoAccess what="managing branches" />;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Branches</h1>
          <p className="text-sm text-ink-600">
            Each branch shows amounts in its own unit and counts deadlines in its own time zone. Archived branches keep their records for
            audits of past periods.
          </p>
        </div>
        {ability.can("create", "Branch") && (
          <Link href="/admin/branches/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            Open a branch
          </Link>
        )}
      </div>
      <BranchesTable />
    </div>
  );
}
