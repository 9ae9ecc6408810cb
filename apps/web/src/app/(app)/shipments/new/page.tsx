import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { ShipmentForm } from "./shipment-form";

export const metadata: Metadata = { title: "Record a reclaim shipment" };

export default async function NewShipmentPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("create", "ReclaimShipment")) redirect("/shipments");
  return (
    <div className="mx-auto max-w-xl">
      <ShipmentForm organisationId={signedIn.actor.organisationId} />
    </div>
  );
}
