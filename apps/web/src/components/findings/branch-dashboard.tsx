"use client";

import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { CERTIFICATION_TYPE_LABELS, formatMass, type ApplianceCertificationClass } from "@coldtrail/core";
import { fetchJson } from "@/lib/client/fetch-json";
import { ChartPatterns } from "@/components/charts/chart-patterns";
import { FindingsByRuleChart } from "@/components/charts/findings-by-rule-chart";
import { FindingsOverTimeChart } from "@/components/charts/findings-over-time-chart";
import { RefrigerantFlowsChart } from "@/components/charts/refrigerant-flows-chart";
import { HealthScore, TrendText } from "./health";
import type { BranchDashboardData } from "./types";

const CLASS_WORDS: Record<ApplianceCertificationClass, string> = {
  small_appliance: "Small appliances (Type I)",
  low: "Low pressure (Type III)",
  medium: "Medium pressure (Type II)",
  high: "High pressure (Type II)",
  very_high: "Very high pressure (Type II)",
};
const CYLINDER_WORDS = {
  past_requalification: "⚠ Past its requalification date",
  requalification_soon: "◷ Requalification due within 60 days",
  near_full: "▲ At 90 % of its maximum fill or more",
  over_full: "⚠ Over its maximum fill",
  no_requalification_date: "? No requalification date on record",
} as const;

function Card({ title, id, children, wide = false }: { title: string; id: string; children: React.ReactNode; wide?: boolean }) {
  return (
    <section aria-labelledby={id} className={`min-w-0 rounded-lg border border-ink-200 bg-white p-4 ${wide ? "lg:col-span-2" : ""}`}>
      <h2 id={id} className="mb-2 font-semibold text-ink-950">
        {title}
      </h2>
      <div className="overflow-x-auto">{children}</div>
    </section>
  );
}

export function BranchDashboardView({ branchId }: { branchId: number }) {
  const dash = useQuery({
    queryKey: ["branch-dashboard", branchId],
    queryFn: () => fetchJson<BranchDashboardData>(`/api/dashboard/branches/${branchId}?months=12`),
  });
  if (dash.isLoading) return <p className="text-ink-600">Loading the dashboard…</p>;
  if (dash.isError || !dash.data)
    return (
      <p role="alert" className="text-sev-critical">
        ⚠ There is no such branch, or you may not see it.
      </p>
    );
  const d = dash.data;
  const unit = d.branch.massUnit;
  const classes = (Object.keys(d.coverage.appliancesByClass) as ApplianceCertificationClass[]).filter(
    (c) => d.coverage.appliancesByClass[c] > 0,
  );

  return (
    <div className="space-y-4">
      <ChartPatterns />
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <p className="text-sm text-ink-600">
            <Link href="/branches" className="text-fjord-700 underline">
              Branches
            </Link>{" "}
            › {d.branch.name}
          </p>
          <h1 className="text-2xl font-semibold text-ink-950">{d.branch.name}</h1>
          <p className="text-sm text-ink-600">
            Today {d.today} in {d.branch.timeZone} · masses in {unit === "kg" ? "kilograms" : "pounds"}
          </p>
        </div>
        <div className="flex flex-col items-end gap-1">
          <HealthScore health={d.overview?.health ?? null} size="lg" />
          <TrendText trend={d.overview?.trend ?? null} since={d.overview?.lastAudit?.finishedAt ?? null} />
        </div>
      </header>
      <p className="text-sm text-ink-700">
        <strong>Record health.</strong> {d.healthExplanation}{" "}
        <Link href={`/findings?branchId=${d.branch.id}`} className="text-fjord-700 underline">
          See this branch&apos;s findings
        </Link>
      </p>

      <div className="grid gap-4 lg:grid-cols-2">
        <Card title="Findings to act on, by rule" id="by-rule-h">
          <FindingsByRuleChart rows={d.findingsByRule} />
        </Card>
        <Card title="Findings opened and closed by month" id="over-time-h">
          <FindingsOverTimeChart rows={d.findingsOverTime} />
        </Card>
        <Card title={`Refrigerant by month (${unit === "kg" ? "kg" : "lb"})`} id="flows-h" wide>
          <RefrigerantFlowsChart rows={d.flows} massUnit={unit} />
        </Card>

        <Card title="Leak watchlist" id="leak-h">
          {d.leakWatchlist === null ? (
            <p className="text-sm text-ink-600">Not shown: your access covers part of this branch&apos;s jobs only.</p>
          ) : d.leakWatchlist.length === 0 ? (
            <p className="text-sm text-ink-600">No appliance under the leak-repair rules had refrigerant added in the last 12 months.</p>
          ) : (
            <table className="min-w-full text-sm" data-testid="leak-watchlist">
              <thead className="text-left text-xs uppercase text-ink-600">
                <tr>
                  <th scope="col" className="px-2 py-1">
                    Appliance
                  </th>
                  <th scope="col" className="px-2 py-1 text-right">
                    Leak rate (%)
                  </th>
                  <th scope="col" className="px-2 py-1 text-right">
                    Threshold (%)
                  </th>
                  <th scope="col" className="px-2 py-1">
                    Deadline
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {d.leakWatchlist.map((r) => (
                  <tr key={r.applianceId}>
                    <td className="px-2 py-1.5">
                      <Link href={`/appliances/${r.applianceId}`} className="font-medium text-fjord-700 underline">
                        {r.tag}
                      </Link>
                      <span className="block text-xs text-ink-600">
                        {r.refrigerant}, {formatMass(r.fullChargeG, unit)} · last addition {r.lastAdditionOn}
                      </span>
                    </td>
                    <td className="tabular px-2 py-1.5 text-right">
                      {r.exceeds && <span aria-hidden="true">▲ </span>}
                      {r.percent.toFixed(1)}
                    </td>
                    <td className="tabular px-2 py-1.5 text-right">{r.threshold}</td>
                    <td className="px-2 py-1.5">
                      {r.exceeds ? (
                        r.repairedOn ? (
                          <span className="text-ok">✓ Repaired {r.repairedOn}</span>
                        ) : (
                          <span
                            className={`font-medium ${r.repairDueOn && r.repairDueOn < d.today ? "text-sev-critical" : "text-ink-950"}`}
                          >
                            {r.repairDueOn && r.repairDueOn < d.today ? "⚠ Repair overdue since " : "Repair due by "}
                            {r.repairDueOn}
                          </span>
                        )
                      ) : (
                        <span className="text-ink-600">Under the threshold ({Math.round(r.ratio * 100)} % of it)</span>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </Card>

        <Card title="Certification coverage" id="coverage-h">
          <table className="min-w-full text-sm" data-testid="coverage-table">
            <thead className="text-left text-xs uppercase text-ink-600">
              <tr>
                <th scope="col" className="px-2 py-1">
                  Technician
                </th>
                <th scope="col" className="px-2 py-1">
                  Verified
                </th>
                {classes.map((c) => (
                  <th key={c} scope="col" className="px-2 py-1 text-center">
                    {CLASS_WORDS[c]}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {d.coverage.technicians.map((t) => (
                <tr key={t.technicianId}>
                  <td className="px-2 py-1.5">{t.name}</td>
                  <td className="px-2 py-1.5">
                    {t.verified.length ? (
                      t.verified.map((v) => CERTIFICATION_TYPE_LABELS[v]).join(" + ")
                    ) : (
                      <span className="text-sev-critical">⚠ none</span>
                    )}
                    {t.pending.length > 0 && (
                      <span className="block text-xs text-ink-600">
                        awaiting check: {t.pending.map((v) => CERTIFICATION_TYPE_LABELS[v]).join(" + ")}
                      </span>
                    )}
                  </td>
                  {classes.map((c) => (
                    <td key={c} className="px-2 py-1.5 text-center">
                      {t.covers[c] ? <span className="text-ok">✓ yes</span> : <span className="text-ink-600">✕ no</span>}
                    </td>
                  ))}
                </tr>
              ))}
              <tr className="font-medium">
                <td className="px-2 py-1.5" colSpan={2}>
                  Technicians who may open them / appliances in service
                </td>
                {classes.map((c) => (
                  <td key={c} className="tabular px-2 py-1.5 text-center">
                    {d.coverage.technicians.filter((t) => t.covers[c]).length} / {d.coverage.appliancesByClass[c]}
                  </td>
                ))}
              </tr>
            </tbody>
          </table>
        </Card>

        <Card title="Cylinders due for requalification or nearly full" id="cylinders-h" wide>
          {d.cylinders.length === 0 ? (
            <p className="text-sm text-ink-600">
              Every cylinder in service is within its requalification date and under 90 % of its maximum fill.
            </p>
          ) : (
            <table className="min-w-full text-sm" data-testid="cylinder-watchlist">
              <thead className="text-left text-xs uppercase text-ink-600">
                <tr>
                  <th scope="col" className="px-2 py-1">
                    Cylinder
                  </th>
                  <th scope="col" className="px-2 py-1">
                    Contents
                  </th>
                  <th scope="col" className="px-2 py-1 text-right">
                    Fill (% of maximum)
                  </th>
                  <th scope="col" className="px-2 py-1">
                    Requalification due
                  </th>
                  <th scope="col" className="px-2 py-1">
                    Why it is listed
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {d.cylinders.map((c) => (
                  <tr key={c.cylinderId}>
                    <td className="px-2 py-1.5">
                      <Link href={`/cylinders/${c.cylinderId}`} className="font-medium text-fjord-700 underline">
                        {c.serial}
                      </Link>
                    </td>
                    <td className="tabular px-2 py-1.5">{c.refrigerant ? `${formatMass(c.contentsG, unit)} ${c.refrigerant}` : "Empty"}</td>
                    <td className="tabular px-2 py-1.5 text-right">{c.fillPercent === null ? "—" : `${c.fillPercent.toFixed(1)} %`}</td>
                    <td className="tabular px-2 py-1.5">{c.requalificationDueOn ?? "—"}</td>
                    <td className="px-2 py-1.5">{c.reasons.map((r) => CYLINDER_WORDS[r]).join("; ")}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </Card>
      </div>
    </div>
  );
}
