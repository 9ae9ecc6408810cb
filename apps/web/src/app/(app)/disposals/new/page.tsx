import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { DisposalProofForm } from "./disposal-proof-form";

export const metadata: Metadata = { title: "Disposal record or statement" };

export default async function NewDisposalPage({ searchParams }: { searchParams: Promise<{ jobId?: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("create", "Disposal")) redirect("/disposals");
  const { jobId } = await searchParams;
  return (
    <div className="mx-auto max-w-xl">
      <DisposalProofForm jobId={jobId && /^\d+$/.test(jobId) ? jobId : null} />
    </div>
  );
}
