import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { AppliancesTable } from "./appliances-table";

export const metadata: Metadata = { title: "Appliances" };

export default async function AppliancesPage({ searchParams }: { searchParams: Promise<{ created?: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("read", "Appliance")) redirect("/");
  const { created } = await searchParams;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Appliances</h1>
          <p className="text-sm text-ink-600">
            Every appliance your branches look after, with its refrigerant, full charge and what the rules derive from them.
          </p>
        </div>
        {signedIn.ability.can("create", "Appliance") && (
          <Link href="/appliances/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            Add an appliance
          </Link>
        )}
      </div>
      {created && (
        <p role="status" className="flex items-center gap-2 rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-sm text-ok">
          <span aria-hidden="true">✓</span> Appliance added.{" "}
          <Link href={`/appliances/${encodeURIComponent(created)}`} className="underline">
            Open it
          </Link>
        </p>
      )}
      <AppliancesTable />
    </div>
  );
}
