"use client";

import { useMemo, useState, type ReactNode } from "react";
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
import { fetchJson } from "@/lib/client/fetch-json";

export interface RecordColumn<T> {
  id: string;
  header: string;
  sortable?: boolean;
  cell: (row: T) => ReactNode;
}

interface Page<T> {
  rows: T[];
  total: number;
}

const features = tableFeatures({ rowSortingFeature, rowPaginationFeature });

/**
 * A server-paged, server-sorted table of records (disposals, shipments, purchases). The caller
 * passes the API path, the filters as query parameters, and the columns.
 */
export function RecordTable<T extends { id: number; voidedAt?: string | null }>({
  queryKey,
  path,
  params,
  columns,
  defaultSort = "date",
  noun,
  testId,
}: {
  queryKey: string;
  path: string;
  params: Record<string, string>;
  columns: RecordColumn<T>[];
  defaultSort?: string;
  noun: string;
  testId: string;
}) {
  const [sorting, setSorting] = useState<SortingState>([{ id: defaultSort, desc: true }]);
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 25 });
  const paramKey = JSON.stringify(params);
  const [lastParams, setLastParams] = useState(paramKey);
  if (lastParams !== paramKey) {
    // New filters start again at the first page.
    setLastParams(paramKey);
    setPagination((p) => ({ ...p, pageIndex: 0 }));
  }

  const qs = useMemo(() => {
    const p = new URLSearchParams({
      page: String(pagination.pageIndex + 1),
      pageSize: String(pagination.pageSize),
      sort: sorting[0]?.id ?? defaultSort,
      dir: sorting[0]?.desc === false ? "asc" : "desc",
    });
    for (const [k, v] of Object.entries(params)) if (v) p.set(k, v);
    return p.toString();
  }, [pagination, sorting, params, defaultSort]);

  const data = useQuery({ queryKey: [queryKey, qs], queryFn: () => fetchJson<Page<T>>(`${path}?${qs}`), placeholderData: keepPreviousData });

  const helper = createColumnHelper<typeof features, T>();
  const tableColumns = useMemo(
    () =>
      helper.columns(
        columns.map((c) =>
          helper.accessor((row: T) => String((row as Record<string, unknown>)[c.id] ?? ""), {
            id: c.id,
            header: c.header,
            enableSorting: c.sortable ?? false,
            cell: (info) => c.cell(info.row.original),
          }),
        ),
      ),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [columns],
  );

  const table = useTable({
    features,
    columns: tableColumns,
    data: data.data?.rows ?? [],
    rowCount: data.data?.total ?? 0,
    state: { sorting, pagination },
    onSortingChange: (u) => {
      setSorting(u);
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    },
    onPaginationChange: setPagination,
    manualSorting: true,
    manualPagination: true,
    enableSortingRemoval: false,
    getRowId: (row) => String(row.id),
  });

  const total = data.data?.total ?? 0;
  const first = total === 0 ? 0 : pagination.pageIndex * pagination.pageSize + 1;
  const last = Math.min(total, (pagination.pageIndex + 1) * pagination.pageSize);

  return (
    <div className="space-y-3">
      {data.isError && (
        <p role="alert" className="rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical">
          ⚠ The {noun} could not be loaded: {(data.error as Error).message}
        </p>
      )}
      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
        <table className="min-w-full text-sm" aria-busy={data.isFetching} aria-describedby={`${testId}-status`}>
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
              <tr key={row.id} className={`hover:bg-fjord-50 ${row.original.voidedAt ? "text-ink-500" : ""}`} data-testid={testId}>
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
            {!data.isLoading && total === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-8 text-center text-ink-600">
                  No {noun} match these filters.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      <div className="flex flex-wrap items-center justify-between gap-3 text-sm">
        <p id={`${testId}-status`} aria-live="polite" className="tabular text-ink-600">
          {data.isLoading ? `Loading ${noun}…` : `Showing ${first}–${last} of ${total.toLocaleString("en-US")} ${noun}`}
        </p>
        <div className="flex items-center gap-2">
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

/** Branch, date range, search and voided filters shared by the record lists. */
export function RecordFilters({
  branches,
  value,
  onChange,
  searchLabel,
  searchPlaceholder,
}: {
  branches: { id: number; name: string }[];
  value: Record<string, string>;
  onChange: (next: Record<string, string>) => void;
  searchLabel: string;
  searchPlaceholder: string;
}) {
  const set = (k: string, v: string) => onChange({ ...value, [k]: v });
  return (
    <form className="grid gap-3 rounded-lg border border-ink-200 bg-white p-3 sm:grid-cols-2 lg:grid-cols-5" role="search" onSubmit={(e) => e.preventDefault()}>
      <label className="text-sm">
        <span className="block font-medium text-ink-700">{searchLabel}</span>
        <input type="search" value={value.q ?? ""} onChange={(e) => set("q", e.target.value)} placeholder={searchPlaceholder} className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2" />
      </label>
      {branches.length > 1 && (
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Branch</span>
          <select value={value.branchId ?? ""} onChange={(e) => set("branchId", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2">
            <option value="">All branches</option>
            {branches.map((b) => (
              <option key={b.id} value={b.id}>
                {b.name}
              </option>
            ))}
          </select>
        </label>
      )}
      <label className="text-sm">
        <span className="block font-medium text-ink-700">From</span>
        <input type="date" value={value.from ?? ""} onChange={(e) => set("from", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2" />
      </label>
      <label className="text-sm">
        <span className="block font-medium text-ink-700">To</span>
        <input type="date" value={value.to ?? ""} onChange={(e) => set("to", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2" />
      </label>
      <label className="text-sm">
        <span className="block font-medium text-ink-700">Voided records</span>
        <select value={value.voided ?? ""} onChange={(e) => set("voided", e.target.value)} className="mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2">
          <option value="">Leave out</option>
          <option value="include">Show with the others</option>
          <option value="only">Show only voided</option>
        </select>
      </label>
    </form>
  );
}

/** "Void" marker in a list row: a word and an icon. */
export function VoidTag({ at }: { at?: string | null }) {
  if (!at) return null;
  return (
    <span className="ml-1 inline-flex items-center gap-1 rounded border border-ink-400 px-1 text-xs font-semibold uppercase text-ink-700">
      <span aria-hidden="true">⊘</span> Void
    </span>
  );
}
