import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { subject } from "@casl/ability";
import { getEquipment, scopeByAbility } from "@coldtrail/db";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { EquipmentForm } from "../../equipment-form";

export const metadata: Metadata = { title: "Edit recovery equipment" };

export default async function EditEquipmentPage({ params }: { params: Promise<{ id: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const numeric = Number((await params).id);
  if (!Number.isInteger(numeric) || numeric <= 0) notFound();
  const equipment = await getEquipment(db(), {
    scope: scopeByAbility(signedIn.ability, "read", "RecoveryEquipment", "recovery_equipment"),
    id: numeric,
  });
  if (!equipment) notFound();
  if (
    signedIn.ability.cannot(
      "update",
      subject("RecoveryEquipment", { organisationId: equipment.organisationId, branchId: equipment.branchId }),
    )
  )
    redirect(`/equipment/${numeric}`);
  const branch = { id: equipment.branchId, name: equipment.branchName, massUnit: equipment.massUnit, timeZone: equipment.timeZone };
  return (
    <div className="mx-auto max-w-2xl">
      <Link href={`/equipment/${numeric}`} className="text-sm text-fjord-700 underline">
        ← {equipment.serial}
      </Link>
      <h1 className="text-2xl font-semibold text-ink-950">Edit {equipment.serial}</h1>
      <p className="mb-5 text-ink-600">A new manufacture date or certification status is kept with its previous value and your reason.</p>
      <EquipmentForm mode="edit" branches={[branch]} equipment={equipment} />
    </div>
  );
}
