"use client";

import Link from "next/link";
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { AdminBranchRow } from "@coldtrail/db";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { ArchivedBadge } from "../../_components/badges";
import { FormAlert, Notice, dangerButton, errorMessage, primaryButton, secondaryButton, when } from "../../_components/form-bits";
import { BranchForm } from "../branch-form";

export function BranchEditor({ id, created }: { id: string; created: boolean }) {
  const queryClient = useQueryClient();
  const branch = useQuery({
    queryKey: ["admin-branch", id],
    queryFn: () => fetchJson<AdminBranchRow>(`/api/admin/branches/${encodeURIComponent(id)}`),
    retry: false,
  });
  const [confirming, setConfirming] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const archive = useMutation({
    mutationFn: (archived: boolean) =>
      fetchJson<AdminBranchRow>(`/api/admin/branches/${encodeURIComponent(id)}`, { method: "PATCH", body: JSON.stringify({ archived }) }),
    onSuccess: async () => {
      setConfirming(false);
      setError(null);
      await queryClient.invalidateQueries({ queryKey: ["admin-branch", id] });
      await queryClient.invalidateQueries({ queryKey: ["admin-branches"] });
      await queryClient.invalidateQueries({ queryKey: ["branches"] });
    },
    onError: (err) => setError(errorMessage(err, "The change could not be saved.")),
  });

  if (branch.isLoading) return <p className="text-ink-600">Loading…</p>;
  if (branch.isError) {
    const notFound = branch.error instanceof ApiError && branch.error.status === 404;
    return (
      <p role="alert" className="rounded-lg border border-ink-200 bg-white p-6 font-semibold">
        {notFound ? "No such branch, or not one you may see." : "The branch could not be loaded."}
      </p>
    );
  }
  const b = branch.data!;
  return (
    <div className="space-y-4">
      <header className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-semibold text-ink-950">
          {b.name} <span className="text-base font-normal text-ink-500">{b.code}</span>
        </h1>
        {b.archivedAt && <ArchivedBadge />}
      </header>
      <Notice message={created && !b.archivedAt ? `${b.name} is open. Invite its people next.` : null} />
      {created && !b.archivedAt && (
        <Link href="/admin/people/invite" className={secondaryButton}>
          Invite a person
        </Link>
      )}
      {/* Re-mounted after saving so it shows the stored values. */}
      <BranchForm key={`${b.name}|${b.timeZone}|${b.massUnit}|${b.address}|${b.country}|${b.region}`} branch={b} />
      <section aria-labelledby="archive-h" className="space-y-3 rounded-lg border border-ink-200 bg-white p-5">
        <h2 id="archive-h" className="text-lg font-semibold text-ink-950">
          {b.archivedAt ? "Archived" : "Archive"}
        </h2>
        <p className="text-ink-700">
          {b.archivedAt
            ? `Archived on ${when(b.archivedAt)}. Its records stay and remain in audits of past periods; nobody new can join it and no new job can be logged there.`
            : "Archiving closes the branch for new work: no new jobs, nobody new joins it. Its records stay and remain in audits of past periods, and you can bring it back."}
        </p>
        <FormAlert message={error} />
        {b.archivedAt ? (
          <button type="button" className={primaryButton} disabled={archive.isPending} onClick={() => archive.mutate(false)}>
            Bring the branch back
          </button>
        ) : confirming ? (
          <div className="flex flex-wrap items-center gap-2" role="group" aria-label="Confirm archiving">
            <span className="font-medium">Archive {b.name}?</span>
            <button type="button" className={dangerButton} disabled={archive.isPending} onClick={() => archive.mutate(true)} autoFocus>
              Yes, archive
            </button>
            <button type="button" className={secondaryButton} onClick={() => setConfirming(false)}>
              Cancel
            </button>
          </div>
        ) : (
          <button type="button" className={dangerButton} onClick={() => setConfirming(true)}>
            Archive…
          </button>
        )}
      </section>
    </div>
  );
}
