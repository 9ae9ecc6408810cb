"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { GRANT_STATES, GRANT_STATE_LABELS, type GrantState } from "@coldtrail/core";
import type { InspectorGrantRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { DataTable, ShowFilter, optionsOf, serverColumnHelper } from "@/components/data-table";
import { GrantStateBadge, PersonStatusBadge } from "../_components/badges";
import { FormAlert, Notice, errorMessage, when } from "../_components/form-bits";

const helper = serverColumnHelper<InspectorGrantRow>();

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
      <button
        type="button"
        onClick={() => setConfirming(true)}
        className="rounded-md border border-sev-critical/50 bg-white px-3 py-1.5 text-sm font-semibold text-sev-critical hover:bg-red-50"
      >
        Withdraw…
      </button>
    );
  }
  return (
    <span
      className="inline-flex flex-wrap items-center gap-2"
      role="group"
      aria-label={`Confirm withdrawing ${grant.inspectorName}'s access`}
    >
      <button
        type="button"
        onClick={() => revoke.mutate()}
        disabled={revoke.isPending}
        autoFocus
        className="rounded-md bg-sev-critical px-3 py-1.5 text-sm font-semibold text-white"
      >
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
      res.mailSent
        ? onDone(null, `A new link is on its way to ${grant.inspectorEmail}.`)
        : onDone("A new link was made but the e-mail could not be sent."),
    onError: (err) => onDone(errorMessage(err, "The link could not be sent.")),
  });
  if (grant.state !== "active" || grant.inspectorStatus !== "invited") return null;
  return (
    <button
      type="button"
      onClick={() => resend.mutate()}
      disabled={resend.isPending}
      className="rounded-md border border-ink-300 bg-white px-3 py-1.5 text-sm font-medium"
    >
      {resend.isPending ? "Sending…" : "Send a new link"}
    </button>
  );
}

export function GrantsTable({ canRevoke, canInvite }: { canRevoke: boolean; canInvite: boolean }) {
  const [notice, setNotice] = useState<string | null>(null);
  const [state, setState] = useState<GrantState | "all">("all");
  const [error, setError] = useState<string | null>(null);
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

  return (
    <div className="space-y-3">
      <ShowFilter
        value={state}
        onChange={(v) => setState(v as GrantState | "all")}
        options={[{ value: "all", label: "Every access" }, ...optionsOf(GRANT_STATES, GRANT_STATE_LABELS)]}
      />
      <FormAlert message={error} />
      <Notice message={notice} />
      <DataTable
        url="/api/admin/inspector-grants"
        queryKey="inspector-grants"
        columns={columns}
        filters={{ state }}
        noun="accesses"
        emptyText="No inspector access to show."
        errorText="Inspector access could not be loaded"
        rowTestId="grant-row"
        rowClassName={() => ""}
        rowAttributes={(row) => ({ "data-state": row.state })}
        pager="pages-when-needed"
      />
    </div>
  );
}
