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
import { PERSON_STATUSES, PERSON_STATUS_LABELS, ROLES, ROLE_LABELS, type PersonStatus, type Role } from "@coldtrail/core";
import type { AdminBranchPage, PeoplePage, PersonRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { PersonStatusBadge } from "../_components/badges";

const features = tableFeatures({ rowSortingFeature, rowPaginationFeature });
const helper = createColumnHelper<typeof features, PersonRow>();
const emptyRows: PersonRow[] = [];

const columns = helper.columns([
  helper.accessor("name", {
    id: "name",
    header: "Name",
    cell: (info) => (
      <Link href={`/admin/people/${info.row.original.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
        {info.getValue()}
      </Link>
    ),
  }),
  helper.accessor("email", { id: "email", header: "E-mail", cell: (info) => <span className="break-all">{info.getValue()}</span> }),
  helper.accessor((row) => row.roles.map((r) => ROLE_LABELS[r]).join(", "), {
    id: "roles",
    header: "Roles",
    enableSorting: false,
    cell: (info) => info.getValue() || "—",
  }),
  helper.accessor((row) => row.branches.map((b) => b.name).join(", "), {
    id: "branches",
    header: "Branches",
    enableSorting: false,
    cell: (info) => {
      const row = info.row.original;
      if (row.branches.length === 0) {
        if (row.roles.some((r) => r === "owner" || r === "compliance_officer")) return "All branches";
        return row.roles.includes("inspector") ? <span className="text-ink-600">As given under Inspector access</span> : "—";
      }
      return row.branches.map((b) => (b.archived ? `${b.name} (archived)` : b.name)).join(", ");
    },
  }),
  helper.accessor("status", { id: "status", header: "Status", enableSorting: false, cell: (info) => <PersonStatusBadge status={info.getValue()} /> }),
  helper.accessor("createdAt", {
    id: "createdAt",
    header: "Added",
    cell: (info) => <span className="tabular whitespace-nowrap">{info.getValue().slice(0, 10)}</span>,
  }),
]);

interface Filters {
  q: string;
  role: "" | Role;
  branchId: string;
  status: "" | PersonStatus;
}

export function PeopleTable() {
  const [sorting, setSorting] = useState<SortingState>([{ id: "name", desc: false }]);
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 25 });
  const [filters, setFilters] = useState<Filters>({ q: "", role: "", branchId: "", status: "" });

  const params = useMemo(() => {
    const p = new URLSearchParams({
      page: String(pagination.pageIndex + 1),
      pageSize: String(pagination.pageSize),
      sort: sorting[0]?.id ?? "name",
      dir: sorting[0]?.desc ? "desc" : "asc",
    });
    for (const [key, value] of Object.entries(filters)) if (value) p.set(key, value);
    return p.toString();
  }, [pagination, sorting, filters]);

  const people = useQuery({
    queryKey: ["people", params],
    queryFn: () => fetchJson<PeoplePage>(`/api/admin/people?${params}`),
    placeholderData: keepPreviousData,
  });
  const branches = useQuery({
    queryKey: ["admin-branches", "all"],
    queryFn: () => fetchJson<AdminBranchPage>("/api/admin/branches?archived=include&pageSize=200"),
  });

  const table = useTable({
    features,
    columns,
    data: people.data?.rows ?? emptyRows,
    rowCount: people.data?.total ?? 0,
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
  const total = people.data?.total ?? 0;
  const firstRow = total === 0 ? 0 : pagination.pageIndex * pagination.pageSize + 1;
  const lastRow = Math.min(total, (pagination.pageIndex + 1) * pagination.pageSize);
  const branchRows = branches.data?.rows ?? [];

  return (
    <div className="space-y-3">
      <form className="grid gap-3 rounded-lg border border-ink-200 bg-white p-3 sm:grid-cols-2 lg:grid-cols-4" role="search" onSubmit={(e) => e.preventDefault()}>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Search</span>
          <input type="search" value={filters.q} onChange={(e) => setFilter("q", e.target.value)} placeholder="Name or e-mail" className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2" />
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Role</span>
          <select value={filters.role} onChange={(e) => setFilter("role", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2">
            <option value="">All roles</option>
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
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
                  {b.archivedAt ? " (archived)" : ""}
                </option>
              ))}
            </select>
          </label>
        )}
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Status</span>
          <select value={filters.status} onChange={(e) => setFilter("status", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2">
            <option value="">Any status</option>
            {PERSON_STATUSES.map((s) => (
              <option key={s} value={s}>
                {PERSON_STATUS_LABELS[s]}
              </option>
            ))}
          </select>
        </label>
      </form>

      {people.isError && (
        <p role="alert" className="rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical">
          ⚠ People could not be loaded: {(people.error as Error).message}
        </p>
      )}

      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
        <table className="min-w-full text-sm" aria-busy={people.isFetching} aria-describedby="people-table-status">
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
              <tr key={row.id} className="hover:bg-fjord-50" data-testid="person-row">
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
            {!people.isLoading && total === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-8 text-center text-ink-600">
                  Nobody matches these filters.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <div className="flex flex-wrap items-center justify-between gap-3 text-sm">
        <p id="people-table-status" aria-live="polite" className="tabular text-ink-600">
          {people.isLoading ? "Loading people…" : `Showing ${firstRow}–${lastRow} of ${total.toLocaleString("en-US")} people`}
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
