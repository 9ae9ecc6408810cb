"use client";

import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { SEVERITIES, SEVERITY_LABELS } from "@coldtrail/core";
import { fetchJson } from "@/lib/client/fetch-json";
import { ChartPatterns } from "@/components/charts/chart-patterns";
import { SeverityByBranchChart } from "@/components/charts/severity-by-branch-chart";
import { SeverityIcon } from "./finding-badges";
import { HealthScore, TrendText } from "./health";
import type { OverviewData } from "./types";

/** The organisation overview: every branch with its findings to act on, record health and trend. */
export function OverviewDashboard() {
  const overview = useQuery({ queryKey: ["overview"], queryFn: () => fetchJson<OverviewData>("/api/dashboard/overview") });
  if (overview.isLoading) return <p className="text-ink-600">Loading the overview…</p>;
  if (overview.isError || !overview.data)
    return (
      <p role="alert" className="text-sev-critical">
        ⚠ The overview could not be loaded.
      </p>
    );
  const { branches, totals, healthExplanation } = overview.data;
  return (
    <div className="space-y-4">
      <ChartPatterns />
      <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-5">
        {SEVERITIES.map((s) => (
          <div key={s} className="rounded-lg border border-ink-200 bg-white p-3">
            <p className="flex items-center gap-1.5 text-sm text-ink-700">
              <SeverityIcon
                severity={s}
                className={`h-4 w-4 ${s === "critical" ? "text-sev-critical" : s === "major" ? "text-sev-major" : "text-sev-minor"}`}
              />
              {SEVERITY_LABELS[s]} to act on
            </p>
            <p className="tabular text-2xl font-semibold text-ink-950" data-testid={`total-${s}`}>
              {totals[s]}
            </p>
          </div>
        ))}
        <Link href="/findings?due=overdue" className="rounded-lg border border-ink-200 bg-white p-3 hover:border-fjord-500">
          <p className="text-sm text-ink-700">
            <span aria-hidden="true">⚠ </span>Overdue
          </p>
          <p className="tabular text-2xl font-semibold text-ink-950">{totals.overdue}</p>
        </Link>
        <Link href="/findings?state=fix_proposed" className="rounded-lg border border-ink-200 bg-white p-3 hover:border-fjord-500">
          <p className="text-sm text-ink-700">
            <span aria-hidden="true">◐ </span>Fixes to review
          </p>
          <p className="tabular text-2xl font-semibold text-ink-950">{totals.fixProposed}</p>
        </Link>
      </div>

      {branches.length > 0 && (
        <section aria-labelledby="sev-chart-h" className="rounded-lg border border-ink-200 bg-white p-4">
          <h2 id="sev-chart-h" className="mb-2 font-semibold text-ink-950">
            Findings to act on, by branch and severity
          </h2>
          <SeverityByBranchChart rows={branches.map((b) => ({ name: b.name, ...b.active }))} />
        </section>
      )}

      <section aria-labelledby="branches-h" className="rounded-lg border border-ink-200 bg-white">
        <h2 id="branches-h" className="px-4 pt-4 font-semibold text-ink-950">
          Branches
        </h2>
        <div className="overflow-x-auto p-4">
          <table className="min-w-full text-sm">
            <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Branch
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Critical
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Major
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Minor
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Overdue
                </th>
                <th scope="col" className="px-3 py-2">
                  Record health
                </th>
                <th scope="col" className="px-3 py-2">
                  Since the last audit
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {branches.map((b) => (
                <tr key={b.branchId} data-testid="overview-branch">
                  <td className="px-3 py-2">
                    <Link href={`/branches/${b.branchId}`} className="font-medium text-fjord-700 underline">
                      {b.name}
                    </Link>
                  </td>
                  <td className="tabular px-3 py-2 text-right">{b.active.critical}</td>
                  <td className="tabular px-3 py-2 text-right">{b.active.major}</td>
                  <td className="tabular px-3 py-2 text-right">{b.active.minor}</td>
                  <td className="tabular px-3 py-2 text-right">{b.overdue}</td>
                  <td className="px-3 py-2">
                    <HealthScore health={b.health} />
                  </td>
                  <td className="px-3 py-2">
                    <TrendText trend={b.trend} since={b.lastAudit?.finishedAt ?? null} />
                    {b.history.length > 1 && (
                      <span className="tabular block text-xs text-ink-600">
                        At the last audits: {b.history.map((h) => h.health.toFixed(1)).join(" → ")}
                      </span>
                    )}
                  </td>
                </tr>
              ))}
              {branches.length === 0 && (
                <tr>
                  <td colSpan={7} className="px-3 py-6 text-center text-ink-600">
                    No branch findings for you to see.
                  </td>
                </tr>
              )}
            </tbody>
          </table>
        </div>
        <p className="px-4 pb-4 text-sm text-ink-700">
          <strong>How record health is computed.</strong> {healthExplanation}
        </p>
      </section>
    </div>
  );
}
