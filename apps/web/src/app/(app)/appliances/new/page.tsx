import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { writableBranches } from "@/components/registers/writable-branches";
import { ApplianceForm } from "../appliance-form";

export const metadata: Metadata = { title: "Add an appliance" };

export default async function NewAppliancePage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const branches = await writableBranches(db(), signedIn.actor, signedIn.ability, "Appliance");
  if (branches.length === 0) redirect("/appliances");
  return (
    <div className="mx-auto max-w-2xl">
      <h1 className="text-2xl font-semibold text-ink-950">Add an appliance</h1>
      <p className="mb-5 text-ink-600">
        Where it is, what it holds and how much. The rules work out its pressure class and the certification it needs.
      </p>
      <ApplianceForm mode="create" branches={branches} />
    </div>
  );
}
