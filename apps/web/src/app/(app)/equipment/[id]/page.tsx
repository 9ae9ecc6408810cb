import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { EquipmentDetail } from "./equipment-detail";

export const metadata: Metadata = { title: "Recovery equipment" };

export default async function EquipmentUnitPage({
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
  return <EquipmentDetail id={id} saved={saved === "created" || saved === "updated" ? saved : undefined} />;
}
