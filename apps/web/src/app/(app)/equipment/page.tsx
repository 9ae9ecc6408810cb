import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { EquipmentTable } from "./equipment-table";

export const metadata: Metadata = { title: "Recovery equipment" };

export default async function EquipmentPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("read", "RecoveryEquipment")) redirect("/");
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Recovery equipment</h1>
          <p className="text-sm text-ink-600">Recovery units, their certification and the evacuation levels they may be used to claim.</p>
        </div>
        {signedIn.ability.can("create", "RecoveryEquipment") && (
          <Link href="/equipment/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            Add recovery equipment
          </Link>
        )}
      </div>
      <EquipmentTable />
    </div>
  );
}
