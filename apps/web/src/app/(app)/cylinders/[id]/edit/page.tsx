import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { subject } from "@casl/ability";
import { getCylinder, scopeByAbility } from "@coldtrail/db";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { CylinderForm } from "../../cylinder-form";

export const metadata: Metadata = { title: "Edit cylinder" };

export default async function EditCylinderPage({ params }: { params: Promise<{ id: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const numeric = Number((await params).id);
  if (!Number.isInteger(numeric) || numeric <= 0) notFound();
  const cylinder = await getCylinder(db(), { scope: scopeByAbility(signedIn.ability, "read", "Cylinder", "cylinders"), id: numeric });
  if (!cylinder) notFound();
  if (signedIn.ability.cannot("update", subject("Cylinder", { organisationId: cylinder.organisationId, branchId: cylinder.branchId })))
    redirect(`/cylinders/${numeric}`);
  const branch = { id: cylinder.branchId, name: cylinder.branchName, massUnit: cylinder.massUnit, timeZone: cylinder.timeZone };
  return (
    <div className="mx-auto max-w-2xl">
      <Link href={`/cylinders/${numeric}`} className="text-sm text-fjord-700 underline">
        ← {cylinder.serial}
      </Link>
      <h1 className="text-2xl font-semibold text-ink-950">Edit {cylinder.serial}</h1>
      <p className="mb-5 text-ink-600">
        A new water capacity, tare weight or requalification date is kept with its previous value and your reason. Cylinders are retired,
        never deleted.
      </p>
      <CylinderForm mode="edit" branches={[branch]} cylinder={cylinder} />
    </div>
  );
}
