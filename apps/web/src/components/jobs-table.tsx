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
import { JOB_KIND_LABELS, JOB_KINDS, formatMass, type JobKind } from "@coldtrail/core";
import { fetchJson } from "@/lib/client/fetch-json";
import { jobMassG, type BranchOption, type JobListPage, type JobListRow } from "@/lib/client/types";

const features = tableFeatures({ rowSortingFeature, rowPaginationFeature });
const helper = createColumnHelper<typeof features, JobListRow>();
const emptyRows: JobListRow[] = [];

const columns = helper.columns([
  helper.accessor("performedOn", {
    id: "performedOn",
    header: "Date",
    cell: (info) => <span className="tabular whitespace-nowrap">{info.getValue()}</span>,
  }),
  helper.accessor("kind", {
    id: "kind",
    header: "Job",
    cell: (info) => (
      <>
        {JOB_KIND_LABELS[info.getValue()]}
        {info.row.original.voidedAt && (
          <span className="ml-1 inline-flex items-center gap-1 rounded border border-ink-400 px-1 text-xs font-semibold uppercase text-ink-700">
            <span aria-hidden="true">⊘</span> Void
          </span>
        )}
      </>
    ),
  }),
  helper.accessor((row) => row.applianceTag ?? "", {
    id: "appliance",
    header: "Appliance",
    cell: (info) => {
      const row = info.row.original;
      return (
        <Link href={`/jobs/${row.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
          {row.applianceTag ?? "—"}
          {row.applianceDescription && <span className="block text-xs font-normal text-ink-600">{row.applianceDescription}</span>}
        </Link>
      );
    },
  }),
  helper.accessor("branchName", { id: "branch", header: "Branch" }),
  helper.accessor("technicianName", { id: "technician", header: "Technician" }),
  helper.accessor((row) => row.refrigerant ?? "", { id: "refrigerant", header: "Refrigerant" }),
  helper.accessor((row) => jobMassG(row) ?? 0, {
    id: "amount",
    header: "Amount",
    cell: (info) => {
      const row = info.row.original;
      const g = jobMassG(row);
      return <span className="tabular whitespace-nowrap">{g === null ? "—" : formatMass(g, row.branchMassUnit)}</span>;
    },
  }),
  helper.accessor((row) => row.cylinderSerial ?? "", {
    id: "cylinder",
    header: "Cylinder",
    enableSorting: false,
    cell: (info) => info.row.original.cylinderSerial ?? "—",
  }),
]);

interface Filters {
  kind: "" | JobKind;
  branchId: string;
  from: string;
  to: string;
  q: string;
  /** "" leaves voided jobs out; "include" or "only" asks for them. */
  voided: "" | "include" | "only";
}

export function JobsTable({ compact = false, initialPageSize = 25 }: { compact?: boolean; initialPageSize?: number }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "performedOn", desc: true }]);
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: initialPageSize });
  const [filters, setFilters] = useState<Filters>({ kind: "", branchId: "", from: "", to: "", q: "", voided: "" });

  const params = useMemo(() => {
    const p = new URLSearchParams({
      page: String(pagination.pageIndex + 1),
      pageSize: String(pagination.pageSize),
      sort: sorting[0]?.id ?? "performedOn",
      dir: sorting[0]?.desc === false ? "asc" : "desc",
    });
    for (const [key, value] of Object.entries(filters)) if (value) p.set(key, value);
    return p.toString();
  }, [pagination, sorting, filters]);

  const jobs = useQuery({
    queryKey: ["jobs", params],
    queryFn: () => fetchJson<JobListPage>(`/api/jobs?${params}`),
    placeholderData: keepPreviousData,
  });
  const branches = useQuery({
    queryKey: ["branches"],
    queryFn: () => fetchJson<{ rows: BranchOption[] }>("/api/lookup/branches"),
    enabled: !compact,
  });

  const table = useTable({
    features,
    columns,
    data: jobs.data?.rows ?? emptyRows,
    rowCount: jobs.data?.total ?? 0,
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

  const setFilter = (key: keyof Filters, value: string) => {
    setFilters((f) => ({ ...f, [key]: value }));
    setPagination((p) => ({ ...p, pageIndex: 0 }));
  };

  const total = jobs.data?.total ?? 0;
  const firstRow = total === 0 ? 0 : pagination.pageIndex * pagination.pageSize + 1;
  const lastRow = Math.min(total, (pagination.pageIndex + 1) * pagination.pageSize);
  const branchRows = branches.data?.rows ?? [];

  return (
    <div className="space-y-3">
      {!compact && (
        <form className="grid gap-3 rounded-lg border border-ink-200 bg-white p-3 sm:grid-cols-2 lg:grid-cols-6" role="search" onSubmit={(e) => e.preventDefault()}>
          <label className="text-sm">
            <span className="block font-medium text-ink-700">Search appliance</span>
            <input
              type="search"
              value={filters.q}
              onChange={(e) => setFilter("q", e.target.value)}
              placeholder="Tag or description"
              className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2"
            />
          </label>
          <label className="text-sm">
            <span className="block font-medium text-ink-700">Job kind</span>
            <select value={filters.kind} onChange={(e) => setFilter("kind", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2">
              <option value="">All kinds</option>
              {JOB_KINDS.map((k) => (
                <option key={k} value={k}>
                  {JOB_KIND_LABELS[k]}
                </option>
              ))}
            </select>
          </label>
          {branchRows.length > 1 && (
            <label className="text-sm">
              <span className="block font-medium text-ink-700">Branch</span>
              <select value={filters.branchId} onChange={(e) => setFilter("branchId", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2">
                <option value="">All branches</option>
                {branchRows.map((b) => (
                  <option key={b.id} value={b.id}>
                    {b.name}
                  </option>
                ))}
              </select>
            </label>
          )}
          <label className="text-sm">
            <span className="block font-medium text-ink-700">From</span>
            <input type="date" value={filters.from} onChange={(e) => setFilter("from", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2" />
          </label>
          <label className="text-sm">
            <span className="block font-medium text-ink-700">To</span>
            <input type="date" value={filters.to} onChange={(e) => setFilter("to", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2" />
          </label>
          <label className="text-sm">
            <span className="block font-medium text-ink-700">Voided jobs</span>
            <select value={filters.voided} onChange={(e) => setFilter("voided", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2">
              <option value="">Leave out</option>
              <option value="include">Show with the others</option>
              <option value="only">Show only voided</option>
            </select>
          </label>
        </form>
      )}

      {jobs.isError && (
        <p role="alert" className="rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical">
          ⚠ Jobs could not be loaded: {(jobs.error as Error).message}
        </p>
      )}

      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
        <table className="min-w-full text-sm" aria-busy={jobs.isFetching} aria-describedby="jobs-table-status">
          <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const canSort = header.column.getCanSort();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      className="px-3 py-2 font-semibold"
                      aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : canSort ? "none" : undefined}
                    >
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
              <tr key={row.id} className={`hover:bg-fjord-50 ${row.original.voidedAt ? "text-ink-500" : ""}`} data-testid="job-row">
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
            {!jobs.isLoading && total === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-8 text-center text-ink-600">
                  No jobs match these filters.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <div className="flex flex-wrap items-center justify-between gap-3 text-sm">
        <p id="jobs-table-status" aria-live="polite" className="tabular text-ink-600">
          {jobs.isLoading ? "Loading jobs…" : `Showing ${firstRow}–${lastRow} of ${total.toLocaleString("en-US")} jobs`}
        </p>
        {!compact && (
          <div className="flex items-center gap-2">
            <label className="flex items-center gap-2">
              <span className="text-ink-700">Rows per page</span>
              <select
                value={pagination.pageSize}
                onChange={(e) => setPagination({ pageIndex: 0, pageSize: Number(e.target.value) })}
                className="rounded-md border border-ink-300 bg-white px-2 py-1"
              >
                {[10, 25, 50, 100].map((n) => (
                  <option key={n} value={n}>
                    {n}
                  </option>
                ))}
              </select>
            </label>
            <button
              type="button"
              onClick={() => table.previousPage()}
              disabled={!table.getCanPreviousPage()}
              className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40"
            >
              Previous
            </button>
            <span className="tabular text-ink-700">
              Page {pagination.pageIndex + 1} of {Math.max(1, table.getPageCount())}
            </span>
            <button
              type="button"
              onClick={() => table.nextPage()}
              disabled={!table.getCanNextPage()}
              className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40"
            >
              Next
            </button>
          </div>
        )}
      </div>
    </div>
  );
}
