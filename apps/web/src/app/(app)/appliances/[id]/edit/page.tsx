import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { subject } from "@casl/ability";
import { getAppliance, scopeByAbility } from "@coldtrail/db";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { ApplianceForm } from "../../appliance-form";

export const metadata: Metadata = { title: "Edit appliance" };

export default async function EditAppliancePage({ params }: { params: Promise<{ id: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { id } = await params;
  const numeric = Number(id);
  if (!Number.isInteger(numeric) || numeric <= 0) notFound();
  const appliance = await getAppliance(db(), { scope: scopeByAbility(signedIn.ability, "read", "Appliance", "appliances"), id: numeric });
  if (!appliance) notFound();
  if (signedIn.ability.cannot("update", subject("Appliance", { organisationId: appliance.organisationId, branchId: appliance.branchId })))
    redirect(`/appliances/${numeric}`);
  const branch = { id: appliance.branchId, name: appliance.branchName, massUnit: appliance.massUnit, timeZone: appliance.timeZone };
  return (
    <div className="mx-auto max-w-2xl">
      <Link href={`/appliances/${numeric}`} className="text-sm text-fjord-700 underline">
        ← {appliance.tag}
      </Link>
      <h1 className="text-2xl font-semibold text-ink-950">Edit {appliance.tag}</h1>
      <p className="mb-5 text-ink-600">
        Corrections of the refrigerant, full charge or kind are kept with their previous values and your reason.
      </p>
      <ApplianceForm mode="edit" branches={[branch]} appliance={appliance} />
    </div>
  );
}
