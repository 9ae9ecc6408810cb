import type { Metadata } from "next";
import { notFound, redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { FindingDetailView } from "@/components/findings/finding-detail";

export const metadata: Metadata = { title: "Finding" };

export default async function FindingPage({ params }: { params: Promise<{ id: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("read", "Finding")) redirect("/");
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  return <FindingDetailView id={id} today={new Date().toISOString().slice(0, 10)} />;
}
