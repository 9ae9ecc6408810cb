"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import { keepPreviousData, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { createColumnHelper, rowPaginationFeature, tableFeatures, useTable, type PaginationState } from "@tanstack/react-table";
import { GRANT_STATES, GRANT_STATE_LABELS, type GrantState } from "@coldtrail/core";
import type { InspectorGrantPage, InspectorGrantRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { GrantStateBadge, PersonStatusBadge } from "../_components/badges";
import { FormAlert, Notice, Pager, errorMessage, when } from "../_components/form-bits";

const features = tableFeatures({ rowPaginationFeature });
const helper = createColumnHelper<typeof features, InspectorGrantRow>();
const emptyRows: InspectorGrantRow[] = [];

function RevokeButton({ grant, onDone }: { grant: InspectorGrantRow; onDone: (error: string | null) => void }) {
  const queryClient = useQueryClient();
  const [confirming, setConfirming] = useState(false);
  const revoke = useMutation({
    mutationFn: () => fetchJson(`/api/admin/inspector-grants/${grant.id}/revoke`, { method: "POST" }),
    onSuccess: async () => {
      setConfirming(false);
      onDone(null);
      await queryClient.invalidateQueries({ queryKey: ["inspector-grants"] });
    },
    onError: (err) => onDone(errorMessage(err, "The access could not be withdrawn.")),
  });
  if (grant.state !== "active") return null;
  if (!confirming) {
    return (
      <button type="button" onClick={() => setConfirming(true)} className="rounded-md border border-sev-critical/50 bg-white px-3 py-1.5 text-sm font-semibold text-sev-critical hover:bg-red-50">
        Withdraw…
      </button>
    );
  }
  return (
    <span className="inline-flex flex-wrap items-center gap-2" role="group" aria-label={`Confirm withdrawing ${grant.inspectorName}'s access`}>
      <button type="button" onClick={() => revoke.mutate()} disabled={revoke.isPending} autoFocus className="rounded-md bg-sev-critical px-3 py-1.5 text-sm font-semibold text-white">
        Withdraw now
      </button>
      <button type="button" onClick={() => setConfirming(false)} className="rounded-md border border-ink-300 bg-white px-3 py-1.5 text-sm">
        Keep
      </button>
    </span>
  );
}

function ResendButton({ grant, onDone }: { grant: InspectorGrantRow; onDone: (error: string | null, notice?: string) => void }) {
  const resend = useMutation({
    mutationFn: () => fetchJson<{ mailSent: boolean }>(`/api/admin/inspector-grants/${grant.id}/invitation`, { method: "POST" }),
    onSuccess: (res) =>
      res.mailSent ? onDone(null, `A new link is on its way to ${grant.inspectorEmail}.`) : onDone("A new link was made but the e-mail could not be sent."),
    onError: (err) => onDone(errorMessage(err, "The link could not be sent.")),
  });
  if (grant.state !== "active" || grant.inspectorStatus !== "invited") return null;
  return (
    <button type="button" onClick={() => resend.mutate()} disabled={resend.isPending} className="rounded-md border border-ink-300 bg-white px-3 py-1.5 text-sm font-medium">
      {resend.isPending ? "Sending…" : "Send a new link"}
    </button>
  );
}

export function GrantsTable({ canRevoke, canInvite }: { canRevoke: boolean; canInvite: boolean }) {
  const [notice, setNotice] = useState<string | null>(null);
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 25 });
  const [state, setState] = useState<GrantState | "all">("all");
  const [error, setError] = useState<string | null>(null);
  const params = useMemo(
    () => new URLSearchParams({ page: String(pagination.pageIndex + 1), pageSize: String(pagination.pageSize), state }).toString(),
    [pagination, state],
  );
  const grants = useQuery({
    queryKey: ["inspector-grants", params],
    queryFn: () => fetchJson<InspectorGrantPage>(`/api/admin/inspector-grants?${params}`),
    placeholderData: keepPreviousData,
  });

  const columns = useMemo(
    () =>
      helper.columns([
        helper.accessor("inspectorName", {
          id: "inspector",
          header: "Inspector",
          cell: (info) => {
            const g = info.row.original;
            return (
              <div>
                <Link href={`/admin/people/${g.userId}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
                  {g.inspectorName}
                </Link>
                <span className="block break-all text-xs text-ink-600">{g.inspectorEmail}</span>
                {g.inspectorStatus !== "active" && (
                  <span className="mt-1 block">
                    <PersonStatusBadge status={g.inspectorStatus} />
                  </span>
                )}
              </div>
            );
          },
        }),
        helper.accessor((g) => g.branches.map((b) => b.name).join(", "), { id: "branches", header: "Branches" }),
        helper.accessor((g) => `${g.recordsFrom} – ${g.recordsTo}`, {
          id: "window",
          header: "Records dated",
          cell: (info) => <span className="tabular whitespace-nowrap">{info.getValue()}</span>,
        }),
        helper.accessor("expiresAt", {
          id: "until",
          header: "Until",
          cell: (info) => <span className="tabular whitespace-nowrap">{info.getValue().slice(0, 10)}</span>,
        }),
        helper.accessor("state", {
          id: "state",
          header: "State",
          cell: (info) => {
            const g = info.row.original;
            return (
              <div>
                <GrantStateBadge state={g.state} />
                {g.revokedAt && (
                  <span className="mt-1 block text-xs text-ink-600">
                    {when(g.revokedAt)}
                    {g.revokedByName && ` by ${g.revokedByName}`}
                  </span>
                )}
              </div>
            );
          },
        }),
        helper.accessor("grantedByName", {
          id: "given",
          header: "Given by",
          cell: (info) => (
            <span>
              {info.getValue()}
              <span className="block text-xs text-ink-600">{info.row.original.createdAt.slice(0, 10)}</span>
              {info.row.original.note && <span className="block text-xs text-ink-600">“{info.row.original.note}”</span>}
            </span>
          ),
        }),
        ...(canRevoke || canInvite
          ? [
              helper.display({
                id: "actions",
                header: () => <span className="sr-only">Actions</span>,
                cell: (info) => (
                  <div className="flex flex-col items-start gap-2">
                    {canInvite && (
                      <ResendButton
                        grant={info.row.original}
                        onDone={(err, note) => {
                          setError(err);
                          setNotice(note ?? null);
                        }}
                      />
                    )}
                    {canRevoke && <RevokeButton grant={info.row.original} onDone={setError} />}
                  </div>
                ),
              }),
            ]
          : []),
      ]),
    [canRevoke, canInvite],
  );

  const table = useTable({
    features,
    columns,
    data: grants.data?.rows ?? emptyRows,
    rowCount: grants.data?.total ?? 0,
    state: { pagination },
    onPaginationChange: setPagination,
    manualPagination: true,
    getRowId: (row) => String(row.id),
  });

  return (
    <div className="space-y-3">
      <label className="inline-flex items-center gap-2 text-sm">
        <span className="font-medium text-ink-700">Show</span>
        <select
          value={state}
          onChange={(e) => {
            setState(e.target.value as GrantState | "all");
            setPagination((p) => ({ ...p, pageIndex: 0 }));
          }}
          className="rounded-md border border-ink-300 bg-white px-2 py-1.5"
        >
          <option value="all">Every access</option>
          {GRANT_STATES.map((s) => (
            <option key={s} value={s}>
              {GRANT_STATE_LABELS[s]}
            </option>
          ))}
        </select>
      </label>
      <FormAlert message={error} />
      <Notice message={notice} />
      {grants.isError && <FormAlert message={`Inspector access could not be loaded: ${(grants.error as Error).message}`} />}
      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
        <table className="min-w-full text-sm" aria-busy={grants.isFetching}>
          <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => (
                  <th key={header.id} scope="col" className="px-3 py-2 font-semibold">
                    <table.FlexRender header={header} />
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-100">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} data-testid="grant-row" data-state={row.original.state}>
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
            {!grants.isLoading && (grants.data?.total ?? 0) === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-8 text-center text-ink-600">
                  No inspector access to show.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      <Pager
        page={pagination.pageIndex + 1}
        pageSize={pagination.pageSize}
        total={grants.data?.total ?? 0}
        noun="accesses"
        onPage={(page) => setPagination((p) => ({ ...p, pageIndex: page - 1 }))}
      />
    </div>
  );
}
