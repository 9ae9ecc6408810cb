"use client";

import Link from "next/link";
import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import type { RecordFindingRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { SeverityBadge, StateBadge } from "@/components/findings/finding-badges";

/** How long after a save the list keeps looking for the findings the background re-check raises or closes. */
const WATCH_AFTER_SAVE_MS = 60_000;

const EFFECT_WORDS = { raised: "Raised by this job", closed: "Closed by this job" } as const;

/**
 * The findings this job raised or closed: the ones about the job itself and the ones the re-check
 * after its save (or correction) opened or closed. Only findings the reader may see are listed.
 */
export function JobFindings({ jobId, saved }: { jobId: number; saved: boolean }) {
  const [openedAt] = useState(() => Date.now());
  const findings = useQuery({
    queryKey: ["job", String(jobId), "findings"],
    queryFn: () => fetchJson<{ rows: RecordFindingRow[] }>(`/api/jobs/${jobId}/findings`),
    refetchInterval: () => (saved && Date.now() - openedAt < WATCH_AFTER_SAVE_MS ? 3000 : false),
    retry: false,
  });
  const rows = findings.data?.rows ?? [];

  return (
    <section aria-labelledby="job-findings-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="job-findings">
      <h2 id="job-findings-h" className="text-lg font-semibold text-ink-950">
        Findings from this job
      </h2>
      {findings.isLoading ? (
        <p className="mt-1 text-ink-600">Loading the findings…</p>
      ) : findings.isError ? (
        <p className="mt-1 text-ink-600">The findings could not be loaded.</p>
      ) : rows.length === 0 ? (
        <p className="mt-1 text-ink-600">
          {saved
            ? "None so far. The branch's records are re-checked in the background after a save; this list updates when that is done."
            : "This job raised or closed no finding you can see."}
        </p>
      ) : (
        <ul className="mt-2 divide-y divide-ink-100" aria-live="polite">
          {rows.map((f) => {
            const last = f.effects[f.effects.length - 1];
            return (
              <li key={f.id} className="py-2" data-testid="job-finding">
                <Link href={`/findings/${f.id}`} className="font-medium text-fjord-700 underline">
                  {f.title}
                </Link>
                <div className="mt-1 flex flex-wrap items-center gap-2 text-sm">
                  <SeverityBadge severity={f.severity} />
                  <StateBadge state={f.state} />
                  <span className="text-ink-700">
                    {last ? EFFECT_WORDS[last.effect] : "About this job"}
                    {last && f.aboutRecord ? " · about this job" : ""}
                  </span>
                </div>
              </li>
            );
          })}
        </ul>
      )}
    </section>
  );
}
