import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { DisposalsView } from "./disposals-view";

export const metadata: Metadata = { title: "Disposals" };

export default async function DisposalsPage({ searchParams }: { searchParams: Promise<{ tab?: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("read", "Disposal")) redirect("/");
  const { tab } = await searchParams;
  const canCreate = signedIn.ability.can("create", "Disposal");
  const canLogJobs = signedIn.ability.can("create", "Job");
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Disposals</h1>
          <p className="text-sm text-ink-600">
            Disposal records for appliances of more than 5 and less than 50 lb, signed statements for small appliances, and the monthly
            quantities the log keeps.
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          {canCreate && canLogJobs && (
            <Link
              href="/disposals/shop"
              className="rounded-md border border-fjord-600 bg-white px-4 py-2.5 font-semibold text-fjord-700 hover:bg-fjord-50"
            >
              Scrap run at the shop
            </Link>
          )}
          {canCreate && (
            <Link href="/disposals/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
              Add a record or statement
            </Link>
          )}
        </div>
      </div>
      <DisposalsView initialTab={tab === "statement" ? "statement" : "record"} />
    </div>
  );
}
