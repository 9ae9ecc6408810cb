import Link from "next/link";
import { redirect } from "next/navigation";
import { canInBranchAnyDate, ROLE_LABELS, rolesOf } from "@coldtrail/core";
import { listBranches } from "@coldtrail/db";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { JobsTable } from "@/components/jobs-table";
import { OverviewDashboard } from "@/components/findings/overview-dashboard";
import { FindingsTable } from "@/components/findings/findings-table";

export default async function OverviewPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { actor, ability } = signedIn;
  const roles = rolesOf(actor);
  const firstName = actor.name.split(" ")[0];
  const technicianOnly = roles.length === 1 && roles[0] === "technician";
  // The organisation overview is for whoever may read the findings of a whole branch (officer, owner, manager, inspector).
  const branches = await listBranches(db(), { organisationId: actor.organisationId, includeArchived: true });
  const seesBranchFindings = branches.some((b) =>
    canInBranchAnyDate(ability, "read", "Finding", { organisationId: actor.organisationId, branchId: b.id }),
  );
  const today = new Date().toISOString().slice(0, 10);

  return (
    <div className="space-y-6">
      <section className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">Hello, {firstName}</h1>
          <p className="text-ink-600">Signed in as {roles.map((r) => ROLE_LABELS[r]).join(", ")}.</p>
        </div>
        {ability.can("run", "Audit") && (
          <Link href="/audits/new" className="rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700">
            New audit
          </Link>
        )}
      </section>

      {ability.can("create", "Job") && (
        <Link
          href="/jobs/new"
          className="flex min-h-16 items-center justify-between rounded-xl bg-fjord-600 px-5 py-4 text-lg font-semibold text-white shadow-sm hover:bg-fjord-700 sm:max-w-md"
        >
          Log a recovery job <span aria-hidden="true">→</span>
        </Link>
      )}

      {seesBranchFindings && (
        <section aria-labelledby="org-h" className="space-y-3">
          <h2 id="org-h" className="text-lg font-semibold text-ink-950">
            {roles.includes("inspector") && roles.length === 1 ? "The branches you may review" : "Every branch at a glance"}
          </h2>
          <OverviewDashboard />
        </section>
      )}

      {!seesBranchFindings && ability.can("read", "Finding") && (
        <section aria-labelledby="mine-h" className="space-y-3">
          <div className="flex items-baseline justify-between">
            <h2 id="mine-h" className="text-lg font-semibold text-ink-950">
              Findings about your work
            </h2>
            <Link href="/findings" className="text-sm font-medium text-fjord-700 underline">
              All of them
            </Link>
          </div>
          <FindingsTable compact canAssign={false} today={today} />
        </section>
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
