import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { NoAccess } from "../../_components/no-access";
import { BranchForm } from "../branch-form";

export const metadata: Metadata = { title: "Open a branch" };

export default async function NewBranchPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (!signedIn.ability.can("create", "Branch")) return <NoAccess what="opening branches" />;
  return (
    <div className="mx-auto max-w-2xl space-y-4">
      <Link href="/admin/branches" className="text-sm text-fjord-700 underline">
        ← Branches
      </Link>
      <h1 className="text-2xl font-semibold text-ink-950">Open a branch</h1>
      <BranchForm />
    </div>
  );
}
