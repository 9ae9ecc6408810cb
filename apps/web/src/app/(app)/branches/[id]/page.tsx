import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { BranchDashboardView } from "@/components/findings/branch-dashboard";

export const metadata: Metadata = { title: "Branch dashboard" };

export default async function BranchDashboardPage({ params }: { params: Promise<{ id: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("read", "Finding")) redirect("/");
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  return <BranchDashboardView branchId={id} />;
}
