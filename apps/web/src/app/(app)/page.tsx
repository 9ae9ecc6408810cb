import Link from "next/link";
import { redirect } from "next/navigation";
import { ROLE_LABELS, rolesOf } from "@coldtrail/core";
import { currentActor } from "@/lib/auth/current-actor";
import { JobsTable } from "@/components/jobs-table";

export default async function OverviewPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { actor, ability } = signedIn;
  const roles = rolesOf(actor);
  const firstName = actor.name.split(" ")[0];
  const technicianOnly = roles.length === 1 && roles[0] === "technician";

  return (
    <div className="space-y-6">
      <section>
        <h1 className="text-2xl font-semibold text-ink-950">Hello, {firstName}</h1>
        <p className="text-ink-600">Signed in as {roles.map((r) => ROLE_LABELS[r]).join(", ")}.</p>
      </section>

      {ability.can("create", "Job") && (
        <Link
          href="/jobs/new"
          className="flex min-h-16 items-center justify-between rounded-xl bg-fjord-600 px-5 py-4 text-lg font-semibold text-white shadow-sm hover:bg-fjord-700 sm:max-w-md"
        >
          Log a recovery job <span aria-hidden="true">→</span>
        </Link>
      )}

      {ability.can("read", "Job") && (
        <section aria-labelledby="recent-h" className="space-y-3">
          <div className="flex items-baseline justify-between">
            <h2 id="recent-h" className="text-lg font-semibold text-ink-950">
              {technicianOnly ? "Your latest jobs" : "Latest jobs you can see"}
            </h2>
            <Link href="/jobs" className="text-sm font-medium text-fjord-700 underline">
              All jobs
            </Link>
          </div>
          <JobsTable compact initialPageSize={5} />
        </section>
      )}
    </div>
  );
}
