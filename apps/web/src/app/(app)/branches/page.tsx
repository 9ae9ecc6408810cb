import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { OverviewDashboard } from "@/components/findings/overview-dashboard";

export const metadata: Metadata = { title: "Branches" };

export default async function BranchesPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("read", "Finding")) redirect("/");
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold text-ink-950">Branches</h1>
        <p className="text-sm text-ink-600">
          Open a branch for its dashboard: findings by rule, refrigerant by month, the leak watchlist, certification coverage and cylinders
          to watch.
        </p>
      </div>
      <OverviewDashboard />
    </div>
  );
}
