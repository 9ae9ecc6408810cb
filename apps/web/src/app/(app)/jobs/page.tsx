import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { currentActor } from "@/lib/auth/current-actor";
import { JobsTable } from "@/components/jobs-table";

export const metadata: Metadata = { title: "Jobs" };

export default async function JobsPage({ searchParams }: { searchParams: Promise<{ created?: string }> }) {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { created } = await searchParams;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Jobs</h1>
          <p className="text-sm text-ink-600">
            Every recovery, charge, repair, test and disposal you may see, newest first. Voided jobs are left out unless you ask for them.
          </p>
        </div>
        {signedIn.ability.can("create", "Job") && (
          <Link href="/jobs/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            Log a job
          </Link>
        )}
      </div>
      {created && (
        <p role="status" className="flex items-center gap-2 rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-sm text-ok">
          <span aria-hidden="true">✓</span> Job saved.{" "}
          <Link href={`/jobs/${encodeURIComponent(created)}`} className="underline">
            View it
          </Link>
        </p>
      )}
      <JobsTable />
    </div>
  );
}
