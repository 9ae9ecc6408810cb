import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { ApplianceDetail } from "./appliance-detail";

export const metadata: Metadata = { title: "Appliance" };

export default async function AppliancePage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ saved?: string }>;
}) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { id } = await params;
  const { saved } = await searchParams;
  return <ApplianceDetail id={id} saved={saved === "created" || saved === "updated" ? saved : undefined} />;
}
