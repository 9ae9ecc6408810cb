import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { RecoveryJobForm } from "./recovery-job-form";

export const metadata: Metadata = { title: "Log a recovery job" };

export default async function NewJobPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  if (signedIn.ability.cannot("create", "Job")) redirect("/jobs");
  return (
    <div className="mx-auto max-w-xl">
      <h1 className="text-2xl font-semibold text-ink-950">Log a recovery job</h1>
      <p className="mb-5 text-ink-600">Record what you took out of the appliance, into which cylinder and with which machine.</p>
      <RecoveryJobForm />
    </div>
  );
}
