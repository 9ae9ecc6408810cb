import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { writableBranches } from "@/components/registers/writable-branches";
import { EquipmentForm } from "../equipment-form";

export const metadata: Metadata = { title: "Add recovery equipment" };

export default async function NewEquipmentPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const branches = await writableBranches(db(), signedIn.actor, signedIn.ability, "RecoveryEquipment");
  if (branches.length === 0) redirect("/equipment");
  return (
    <div className="mx-auto max-w-2xl">
      <h1 className="text-2xl font-semibold text-ink-950">Add recovery equipment</h1>
      <p className="mb-5 text-ink-600">
        The manufacture date decides which evacuation levels the unit may be used to claim; attach its certification label after saving.
      </p>
      <EquipmentForm mode="create" branches={branches} />
    </div>
  );
}
