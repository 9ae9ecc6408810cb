import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { ShipmentsView } from "./shipments-view";

export const metadata: Metadata = { title: "Reclaim shipments" };

export default async function ShipmentsPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("read", "ReclaimShipment")) redirect("/");
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Reclaim shipments</h1>
          <p className="text-sm text-ink-600">
            Recovery cylinders sent to a reclaimer: which cylinders, how much of each refrigerant, to whom and when.
          </p>
        </div>
        {signedIn.ability.can("create", "ReclaimShipment") && (
          <Link href="/shipments/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            Record a shipment
          </Link>
        )}
      </div>
      <ShipmentsView />
    </div>
  );
}
