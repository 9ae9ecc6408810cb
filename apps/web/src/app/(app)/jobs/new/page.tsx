import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { JOB_KINDS, type JobKind } from "@coldtrail/core";
import { currentActor } from "@/lib/auth/current-actor";
import { JobForm } from "./job-form";

export const metadata: Metadata = { title: "Log a job" };

export default async function NewJobPage({ searchParams }: { searchParams: Promise<{ kind?: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("create", "Job")) redirect("/jobs");
  const { kind } = await searchParams;
  const initialKind = (JOB_KINDS as readonly string[]).includes(kind ?? "") ? (kind as JobKind) : null;
  return (
    <div className="mx-auto max-w-xl">
      <JobForm initialKind={initialKind} />
    </div>
  );
}
