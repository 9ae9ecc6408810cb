import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { PurchasesView } from "./purchases-view";

export const metadata: Metadata = { title: "Refrigerant purchases" };

export default async function PurchasesPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("read", "Purchase")) redirect("/");
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Refrigerant purchases</h1>
          <p className="text-sm text-ink-600">Refrigerant each branch bought, by supplier and type.</p>
        </div>
        {signedIn.ability.can("create", "Purchase") && (
          <Link href="/purchases/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            Record a purchase
          </Link>
        )}
      </div>
      <PurchasesView />
    </div>
  );
}
