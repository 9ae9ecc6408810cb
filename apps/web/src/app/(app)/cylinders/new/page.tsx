import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { writableBranches } from "@/components/registers/writable-branches";
import { CylinderForm } from "../cylinder-form";

export const metadata: Metadata = { title: "Add a cylinder" };

export default async function NewCylinderPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const branches = await writableBranches(db(), signedIn.actor, signedIn.ability, "Cylinder");
  if (branches.length === 0) redirect("/cylinders");
  return (
    <div className="mx-auto max-w-2xl">
      <h1 className="text-2xl font-semibold text-ink-950">Add a cylinder</h1>
      <p className="mb-5 text-ink-600">
        Copy the figures stamped on the cylinder. Its maximum fill and requalification date follow from them.
      </p>
      <CylinderForm mode="create" branches={branches} />
    </div>
  );
}
