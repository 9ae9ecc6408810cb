import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { ShopRunForm } from "./shop-run-form";

export const metadata: Metadata = { title: "Scrap run at the shop" };

export default async function ShopRunPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("create", "Job") || signedIn.ability.cannot("create", "Disposal")) redirect("/disposals");
  return (
    <div className="mx-auto max-w-xl">
      <ShopRunForm />
    </div>
  );
}
