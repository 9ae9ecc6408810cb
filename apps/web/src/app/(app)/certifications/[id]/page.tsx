import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { CardDetailView } from "./card-detail";

export const metadata: Metadata = { title: "Certification card" };

export default async function CardPage({ params }: { params: Promise<{ id: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { id } = await params;
  return <CardDetailView id={id} />;
}
