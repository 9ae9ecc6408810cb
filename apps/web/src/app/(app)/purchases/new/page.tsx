import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { PurchaseForm } from "./purchase-form";

export const metadata: Metadata = { title: "Record a purchase" };

export default async function NewPurchasePage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("create", "Purchase")) redirect("/purchases");
  return (
    <div className="mx-auto max-w-xl">
      <PurchaseForm organisationId={signedIn.actor.organisationId} />
    </div>
  );
}
