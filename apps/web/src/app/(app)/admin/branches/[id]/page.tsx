import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { NoAccess } from "../../_components/no-access";
import { BranchEditor } from "./branch-editor";

export const metadata: Metadata = { title: "Branch" };

export default async function BranchPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ created?: string }>;
}) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (!signedIn.ability.can("update", "Branch")) return <NoAccess what="managing branches" />;
  const { id } = await params;
  const { created } = await searchParams;
  return (
    <div className="mx-auto max-w-2xl space-y-4">
      <Link href="/admin/branches" className="text-sm text-fjord-700 underline">
        ← Branches
      </Link>
      <BranchEditor id={id} created={Boolean(created)} />
    </div>
  );
}
