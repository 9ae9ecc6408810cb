"use client";

import Link from "next/link";
import { useState } from "react";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { fetchJson } from "@/lib/client/fetch-json";
import type { AuditPage } from "./types";

const STATE_WORDS = { queued: "◌ Waiting", running: "◐ Running", done: "✓ Finished", failed: "⚠ Stopped" } as const;

export function AuditsList() {
  const [page, setPage] = useState(1);
  const audits = useQuery({
    queryKey: ["audits", page],
    queryFn: () => fetchJson<AuditPage>(`/api/audits?page=${page}&pageSize=20`),
    placeholderData: keepPreviousData,
    refetchInterval: (q) => (q.state.data?.rows.some((r) => r.state === "queued" || r.state === "running") ? 2000 : false),
  });
  const rows = audits.data?.rows ?? [];
  const total = audits.data?.total ?? 0;
  return (
    <div className="space-y-3">
      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
        <table className="min-w-full text-sm">
          <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
            <tr>
              <th scope="col" className="px-3 py-2">
                Audit
              </th>
              <th scope="col" className="px-3 py-2">
                Branches
              </th>
              <th scope="col" className="px-3 py-2">
                Period
              </th>
              <th scope="col" className="px-3 py-2">
                Run by
              </th>
              <th scope="col" className="px-3 py-2">
                State
              </th>
              <th scope="col" className="px-3 py-2 text-right">
                Findings
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {rows.map((a) => (
              <tr key={a.id} data-testid="audit-row">
                <td className="px-3 py-2">
                  <Link href={`/audits/${a.id}`} className="font-medium text-fjord-700 underline">
                    Audit #{a.id}
                  </Link>
                  <span className="block text-xs text-ink-600">{a.createdAt.slice(0, 16).replace("T", " ")} UTC</span>
                </td>
                <td className="px-3 py-2">{a.branchNames.join(", ")}</td>
                <td className="tabular px-3 py-2 whitespace-nowrap">
                  {a.periodFrom} – {a.periodTo}
                </td>
                <td className="px-3 py-2">{a.startedByName}</td>
                <td className="px-3 py-2 whitespace-nowrap">
                  {STATE_WORDS[a.state]}
                  {a.state === "running" && <span className="tabular text-ink-600"> {a.progress} %</span>}
                </td>
                <td className="tabular px-3 py-2 text-right">{a.summary ? a.summary.totals.found : "—"}</td>
              </tr>
            ))}
            {!audits.isLoading && rows.length === 0 && (
              <tr>
                <td colSpan={6} className="px-3 py-8 text-center text-ink-600">
                  No audits yet.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      <div className="flex items-center justify-end gap-2 text-sm">
        <button
          type="button"
          disabled={page <= 1}
          onClick={() => setPage((p) => p - 1)}
          className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40"
        >
          Previous
        </button>
        <span className="tabular">
          Page {page} of {Math.max(1, Math.ceil(total / 20))}
        </span>
        <button
          type="button"
          disabled={page * 20 >= total}
          onClick={() => setPage((p) => p + 1)}
          className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40"
        >
          Next
        </button>
      </div>
    </div>
  );
}
