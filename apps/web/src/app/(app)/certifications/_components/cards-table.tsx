"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import {
  createColumnHelper,
  rowPaginationFeature,
  rowSortingFeature,
  tableFeatures,
  useTable,
  type PaginationState,
  type SortingState,
} from "@tanstack/react-table";
import { CERTIFICATION_STATE_LABELS, CERTIFICATION_STATES, CERTIFICATION_TYPE_LABELS, type CertificationState } from "@coldtrail/core";
import { fetchJson } from "@/lib/client/fetch-json";
import type { BranchOption } from "@/lib/client/types";
import { CardState } from "./card-state";
import { CardThumb } from "./card-image";
import type { CardPage, CardRow } from "./card-types";

const features = tableFeatures({ rowSortingFeature, rowPaginationFeature });
const helper = createColumnHelper<typeof features, CardRow>();
const emptyRows: CardRow[] = [];
const dateOf = (iso: string | null) => (iso ? iso.slice(0, 10) : "—");

const columns = helper.columns([
  helper.display({
    id: "card",
    header: "Card",
    cell: (info) => {
      const r = info.row.original;
      return <CardThumb id={r.id} mime={r.cardMime} hasThumbnail={r.hasThumbnail} label={`Card of ${r.technicianName}`} />;
    },
  }),
  helper.accessor("technicianName", {
    id: "technician",
    header: "Technician",
    cell: (info) => {
      const r = info.row.original;
      return (
        <Link href={`/certifications/${r.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline" data-testid="card-link">
          {r.technicianName}
          <span className="block text-xs font-normal text-ink-600">{r.branchNames.length ? r.branchNames.join(", ") : "No branch as technician"}</span>
        </Link>
      );
    },
  }),
  helper.accessor((r) => r.types.map((t) => CERTIFICATION_TYPE_LABELS[t]).join(" + "), { id: "types", header: "Type", enableSorting: false }),
  helper.accessor("certifyingOrganisation", {
    id: "certifyingOrganisation",
    header: "Certifying organisation",
    cell: (info) => (
      <span>
        {info.getValue()}
        <span className="block text-xs text-ink-600 tabular">No. {info.row.original.certificateNumber}</span>
      </span>
    ),
  }),
  helper.accessor("uploadedAt", { id: "uploadedAt", header: "Uploaded", cell: (info) => <span className="tabular whitespace-nowrap">{dateOf(info.getValue())}</span> }),
  helper.accessor("state", { id: "state", header: "State", cell: (info) => <CardState state={info.getValue()} /> }),
  helper.accessor((r) => r.decidedAt ?? "", {
    id: "decidedAt",
    header: "Decided",
    cell: (info) => {
      const r = info.row.original;
      return r.decidedAt ? (
        <span className="whitespace-nowrap text-xs">
          <span className="tabular">{dateOf(r.decidedAt)}</span>
          {r.decidedByName && <span className="block text-ink-600">{r.decidedByName}</span>}
        </span>
      ) : (
        "—"
      );
    },
  }),
]);

/**
 * Cards the person may read, paged, sorted and filtered on the server. For the compliance officer it
 * opens on the cards awaiting verification, oldest first: the verification queue.
 */
export function CardsTable({ queue, caption }: { queue: boolean; caption: string }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "uploadedAt", desc: !queue }]);
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 25 });
  const [state, setState] = useState<"" | CertificationState>(queue ? "pending" : "");
  const [q, setQ] = useState("");
  const [branchId, setBranchId] = useState("");

  const params = useMemo(() => {
    const p = new URLSearchParams({
      page: String(pagination.pageIndex + 1),
      pageSize: String(pagination.pageSize),
      sort: sorting[0]?.id ?? "uploadedAt",
      dir: sorting[0]?.desc ? "desc" : "asc",
    });
    if (state) p.set("state", state);
    if (q) p.set("q", q);
    if (branchId) p.set("branchId", branchId);
    return p.toString();
  }, [pagination, sorting, state, q, branchId]);

  const cards = useQuery({ queryKey: ["certifications", params], queryFn: () => fetchJson<CardPage>(`/api/certifications?${params}`), placeholderData: keepPreviousData });
  const branches = useQuery({ queryKey: ["branches"], queryFn: () => fetchJson<{ rows: BranchOption[] }>("/api/lookup/branches") });

  const table = useTable({
    features,
    columns,
    data: cards.data?.rows ?? emptyRows,
    rowCount: cards.data?.total ?? 0,
    state: { sorting, pagination },
    onSortingChange: (updater) => {
      setSorting(updater);
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    },
    onPaginationChange: setPagination,
    manualSorting: true,
    manualPagination: true,
    enableSortingRemoval: false,
    getRowId: (row) => String(row.id),
  });

  const resetPage = () => setPagination((p) => ({ ...p, pageIndex: 0 }));
  const total = cards.data?.total ?? 0;
  const firstRow = total === 0 ? 0 : pagination.pageIndex * pagination.pageSize + 1;
  const lastRow = Math.min(total, (pagination.pageIndex + 1) * pagination.pageSize);
  const branchRows = branches.data?.rows ?? [];

  return (
    <div className="space-y-3">
      <form className="grid gap-3 rounded-lg border border-ink-200 bg-white p-3 sm:grid-cols-3" role="search" onSubmit={(e) => e.preventDefault()}>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">State</span>
          <select
            value={state}
            onChange={(e) => {
              setState(e.target.value as "" | CertificationState);
              resetPage();
            }}
            className="mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2"
          >
            <option value="">All states</option>
            {CERTIFICATION_STATES.map((s) => (
              <option key={s} value={s}>
                {CERTIFICATION_STATE_LABELS[s]}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Search cards</span>
          <input
            type="search"
            value={q}
            onChange={(e) => {
              setQ(e.target.value);
              resetPage();
            }}
            placeholder="Technician, number or organisation"
            className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2"
          />
        </label>
        {branchRows.length > 1 && (
          <label className="text-sm">
            <span className="block font-medium text-ink-700">Branch</span>
            <select
              value={branchId}
              onChange={(e) => {
                setBranchId(e.target.value);
                resetPage();
              }}
              className="mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2"
            >
              <option value="">All branches</option>
              {branchRows.map((b) => (
                <option key={b.id} value={b.id}>
                  {b.name}
                </option>
              ))}
            </select>
          </label>
        )}
      </form>

      {cards.isError && (
        <p role="alert" className="rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical">
          ⚠ Cards could not be loaded: {(cards.error as Error).message}
        </p>
      )}

      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
        <table className="min-w-full text-sm" aria-busy={cards.isFetching} aria-describedby="cards-table-status">
          <caption className="sr-only">{caption}</caption>
          <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const canSort = header.column.getCanSort() && header.column.id !== "card";
                  return (
                    <th key={header.id} scope="col" className="px-3 py-2 font-semibold" aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : canSort ? "none" : undefined}>
                      {canSort ? (
                        <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 uppercase hover:text-ink-950">
                          <table.FlexRender header={header} />
                          <span aria-hidden="true">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
                        </button>
                      ) : (
                        <table.FlexRender header={header} />
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-100">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="hover:bg-fjord-50" data-testid="card-row">
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
            {!cards.isLoading && total === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-8 text-center text-ink-600">
                  {queue && state === "pending" ? "No card is waiting for verification." : "No card matches these filters."}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <div className="flex flex-wrap items-center justify-between gap-3 text-sm">
        <p id="cards-table-status" aria-live="polite" className="tabular text-ink-600">
          {cards.isLoading ? "Loading cards…" : `Showing ${firstRow}–${lastRow} of ${total.toLocaleString("en-US")} cards`}
        </p>
        <div className="flex items-center gap-2">
          <label className="flex items-center gap-2">
            <span className="text-ink-700">Rows per page</span>
            <select value={pagination.pageSize} onChange={(e) => setPagination({ pageIndex: 0, pageSize: Number(e.target.value) })} className="rounded-md border border-ink-300 bg-white px-2 py-1">
              {[10, 25, 50, 100].map((n) => (
                <option key={n} value={n}>
                  {n}
                </option>
              ))}
            </select>
          </label>
          <button type="button" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()} className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40">
            Previous
          </button>
          <span className="tabular text-ink-700">
            Page {pagination.pageIndex + 1} of {Math.max(1, table.getPageCount())}
          </span>
          <button type="button" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()} className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40">
            Next
          </button>
        </div>
      </div>
    </div>
  );
}
