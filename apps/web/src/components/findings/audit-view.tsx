"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { getRule, SEVERITIES, SEVERITY_LABELS } from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { SeverityIcon } from "./finding-badges";
import { FindingsTable } from "./findings-table";
import type { AuditView } from "./types";
import { useIdempotencyKey } from "@/lib/client/idempotency";

const STATE_WORDS = { queued: "Waiting to start", running: "Running", done: "Finished", failed: "Stopped" } as const;

/** An audit: progress while it runs (polled, so the page can be left and reopened), then its results. */
export function AuditDetail({
  id,
  canRun,
  canExport,
  canAssign,
  today,
}: {
  id: number;
  canRun: boolean;
  canExport: boolean;
  canAssign: boolean;
  today: string;
}) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const audit = useQuery({
    queryKey: ["audit", id],
    queryFn: () => fetchJson<AuditView>(`/api/audits/${id}`),
    refetchInterval: (q) => (q.state.data && (q.state.data.state === "done" || q.state.data.state === "failed") ? false : 1000),
  });
  const idem = useIdempotencyKey();
  const rerun = useMutation({
    mutationFn: () => fetchJson<{ id: number }>(`/api/audits/${id}/rerun`, { method: "POST", headers: idem.headers }),
    onSuccess: ({ id: next }) => {
      void queryClient.invalidateQueries({ queryKey: ["audits"] });
      router.push(`/audits/${next}`);
    },
  });

  if (audit.isLoading) return <p className="text-ink-600">Loading the audit…</p>;
  if (audit.isError || !audit.data)
    return (
      <p role="alert" className="text-sev-critical">
        ⚠ {audit.error instanceof ApiError && audit.error.status === 404 ? "There is no such audit." : "The audit could not be loaded."}
      </p>
    );
  const a = audit.data;
  const finished = a.state === "done";
  const totals = a.summary?.totals;

  return (
    <div className="space-y-5">
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm text-ink-600">
            <Link href="/audits" className="text-fjord-700 underline">
              Audits
            </Link>{" "}
            › Audit #{a.id}
          </p>
          <h1 className="text-2xl font-semibold text-ink-950">Audit #{a.id}</h1>
          <p className="text-sm text-ink-700">
            {a.periodFrom} to {a.periodTo} · {a.packs.map((p) => (p === "us_federal" ? "US federal" : "EU")).join(" + ")} · run by{" "}
            {a.startedByName} on {a.createdAt.slice(0, 10)}
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          {canExport && finished && (
            <a
              href={`/api/audits/${a.id}/export`}
              className="rounded-md bg-fjord-600 px-4 py-2 font-semibold text-white hover:bg-fjord-700"
              download
              data-testid="export-link"
            >
              Download spreadsheet (.xlsx)
            </a>
          )}
          {canRun && (finished || a.state === "failed") && (
            <button
              type="button"
              onClick={() => rerun.mutate()}
              disabled={rerun.isPending}
              className="rounded-md border border-fjord-600 px-4 py-2 font-semibold text-fjord-700 hover:bg-fjord-50 disabled:opacity-40"
            >
              {rerun.isPending ? "Starting…" : "Run again"}
            </button>
          )}
        </div>
      </header>

      <section aria-labelledby="progress-h" className="rounded-lg border border-ink-200 bg-white p-4">
        <h2 id="progress-h" className="font-semibold text-ink-950">
          {STATE_WORDS[a.state]}
        </h2>
        <div className="mt-2 flex items-center gap-3">
          <div
            role="progressbar"
            aria-label="Audit progress"
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={a.progress}
            aria-valuetext={`${a.progress} % — ${a.progressNote ?? STATE_WORDS[a.state]}`}
            className="h-3 flex-1 overflow-hidden rounded-full bg-ink-100"
          >
            <div
              className={`h-full ${a.state === "failed" ? "bg-ink-500" : "bg-fjord-600"} transition-all`}
              style={{ width: `${a.progress}%` }}
            />
          </div>
          <span className="tabular w-12 text-right text-sm font-semibold" data-testid="audit-progress">
            {a.progress} %
          </span>
        </div>
        <p className="mt-1 text-sm text-ink-700" aria-live="polite" data-testid="audit-state">
          {a.state === "failed" ? `Stopped: ${a.error ?? "unknown reason"}` : (a.progressNote ?? STATE_WORDS[a.state])}
          {a.state !== "done" && a.state !== "failed" && " — you can leave this page; the audit keeps running."}
        </p>
        <p className="mt-1 text-sm text-ink-600">
          <span data-testid="audit-branches">Branches: {a.branchNames?.length ? a.branchNames.join(", ") : a.branchIds.length}</span> (
          {a.branchesDone.length} of {a.branchIds.length} checked){a.partial && " · you see the branches you may read"}
        </p>
      </section>

      {totals && (
        <section aria-labelledby="summary-h" className="grid gap-4 md:grid-cols-3">
          <h2 id="summary-h" className="sr-only">
            Summary
          </h2>
          <div className="rounded-lg border border-ink-200 bg-white p-4">
            <p className="text-sm text-ink-600">Findings this run saw</p>
            <p className="tabular text-3xl font-semibold text-ink-950" data-testid="audit-total">
              {totals.found}
            </p>
            <p className="text-sm text-ink-700">
              {totals.created} new · {totals.noLongerFound} no longer found{totals.foundAgain ? ` · ${totals.foundAgain} found again` : ""}
            </p>
            <ul className="mt-2 space-y-1 text-sm">
              {SEVERITIES.map((s) => (
                <li key={s} className="flex items-center gap-2">
                  <SeverityIcon
                    severity={s}
                    className={`h-3.5 w-3.5 ${s === "critical" ? "text-sev-critical" : s === "major" ? "text-sev-major" : "text-sev-minor"}`}
                  />
                  {SEVERITY_LABELS[s]}: <span className="tabular font-semibold">{totals.bySeverity[s]}</span>
                </li>
              ))}
            </ul>
          </div>
          <div className="rounded-lg border border-ink-200 bg-white p-4">
            <p className="mb-1 text-sm text-ink-600">By branch</p>
            <table className="w-full text-sm">
              <thead>
                <tr className="text-left text-xs uppercase text-ink-600">
                  <th scope="col">Branch</th>
                  <th scope="col" className="text-right">
                    Found
                  </th>
                  <th scope="col" className="text-right">
                    New
                  </th>
                  <th scope="col" className="text-right">
                    Gone
                  </th>
                </tr>
              </thead>
              <tbody>
                {a.summary!.branches.map((b) => (
                  <tr key={b.branchId}>
                    <td>
                      <Link href={`/branches/${b.branchId}`} className="text-fjord-700 underline">
                        {b.branchName}
                      </Link>
                    </td>
                    <td className="tabular text-right">{b.found}</td>
                    <td className="tabular text-right">{b.created}</td>
                    <td className="tabular text-right">{b.noLongerFound}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <div className="rounded-lg border border-ink-200 bg-white p-4">
            <p className="mb-1 text-sm text-ink-600">By rule</p>
            <ul className="space-y-0.5 text-sm">
              {Object.entries(a.summary!.byRule)
                .sort((x, y) => y[1] - x[1] || x[0].localeCompare(y[0]))
                .map(([rule, n]) => (
                  <li key={rule} className="flex justify-between gap-2">
                    <span>
                      <span className="tabular text-ink-600">{rule}</span> {getRule(rule)?.title ?? ""}
                    </span>
                    <span className="tabular font-semibold">{n}</span>
                  </li>
                ))}
            </ul>
          </div>
        </section>
      )}

      {(finished || (a.summary?.branches.length ?? 0) > 0) && (
        <section aria-labelledby="findings-h" className="space-y-2">
          <h2 id="findings-h" className="text-lg font-semibold text-ink-950">
            Findings of this audit
          </h2>
          <FindingsTable
            fixed={{ auditId: a.id }}
            initial={{ state: "all", sort: "severity", dir: "asc" }}
            canAssign={canAssign}
            today={today}
          />
        </section>
      )}
    </div>
  );
}
