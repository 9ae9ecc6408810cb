import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { CylinderDetail } from "./cylinder-detail";

export const metadata: Metadata = { title: "Cylinder" };

export default async function CylinderPage({
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
  return <CylinderDetail id={id} saved={saved === "created" || saved === "updated" ? saved : undefined} />;
}
