"use client";

import { useEffect, useId, useMemo, useRef, useState, type ReactNode } from "react";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import {
  createColumnHelper,
  rowPaginationFeature,
  rowSortingFeature,
  tableFeatures,
  useTable,
  type ColumnDef,
  type PaginationState,
  type RowData,
  type SortingState,
} from "@tanstack/react-table";
import { fetchJson } from "@/lib/client/fetch-json";

/**
 * A server-paged, server-sorted table over one of the app's list routes. The route answers
 * `{ rows, total, page, pageSize }` for `?page&pageSize&sort&dir&…filters`. Filters live with the
 * caller (any form above the table); changing them returns to the first page.
 */
export const serverTableFeatures = tableFeatures({ rowSortingFeature, rowPaginationFeature });
export type ServerTableFeatures = typeof serverTableFeatures;
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type ServerColumn<T extends RowData> = ColumnDef<ServerTableFeatures, T, any>;
export const serverColumnHelper = <T extends RowData>() => createColumnHelper<ServerTableFeatures, T>();

export interface ServerPage<T> {
  rows: T[];
  total: number;
  page: number;
  pageSize: number;
}

export interface DataTableProps<T extends RowData> {
  /** Accessible name of the table, e.g. "Appliances". */
  label: string;
  /** The list route, e.g. "/api/appliances". */
  url: string;
  /** First element of the TanStack Query key (invalidate it after a write). */
  queryKey: string;
  columns: ServerColumn<T>[];
  getRowId: (row: T) => string;
  /** Query-string filters; empty values are left out. */
  filters?: Record<string, string | undefined>;
  /** Initial sort; `null` sends no sort (for routes that take only `dir`). */
  defaultSort?: { id: string; desc: boolean } | null;
  initialPageSize?: number;
  pageSizes?: number[];
  /** Words for the status line: "Showing 1–25 of 380 appliances". */
  noun: string;
  emptyText: string;
  rowTestId?: string;
  /** On narrow screens (below 640 px) rows become these cards instead of a wide table. */
  renderCard?: (row: T) => ReactNode;
  /** Show the rows-per-page and previous/next controls (a short panel may hide them when one page is enough). */
  compact?: boolean;
}

export function DataTable<T extends RowData>(props: DataTableProps<T>) {
  const { label, url, queryKey, columns, filters = {}, defaultSort = null, initialPageSize = 25, pageSizes = [10, 25, 50, 100], noun, emptyText } = props;
  const [sorting, setSorting] = useState<SortingState>(defaultSort ? [defaultSort] : []);
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: initialPageSize });
  const statusId = `${useId()}-status`;

  const filterKey = JSON.stringify(Object.entries(filters).filter(([, v]) => v !== undefined && v !== ""));
  const lastFilterKey = useRef(filterKey);
  useEffect(() => {
    if (lastFilterKey.current !== filterKey) {
      lastFilterKey.current = filterKey;
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    }
  }, [filterKey]);

  const params = useMemo(() => {
    const p = new URLSearchParams({ page: String(pagination.pageIndex + 1), pageSize: String(pagination.pageSize) });
    const sort = sorting[0];
    if (sort) {
      p.set("sort", sort.id);
      p.set("dir", sort.desc ? "desc" : "asc");
    } else if (defaultSort === null) {
      p.set("dir", "desc");
    }
    for (const [key, value] of JSON.parse(filterKey) as [string, string][]) p.set(key, value);
    return p.toString();
  }, [pagination, sorting, filterKey, defaultSort]);

  const list = useQuery({
    queryKey: [queryKey, url, params],
    queryFn: () => fetchJson<ServerPage<T>>(`${url}?${params}`),
    placeholderData: keepPreviousData,
  });

  const table = useTable({
    features: serverTableFeatures,
    columns,
    data: list.data?.rows ?? (EMPTY as T[]),
    rowCount: list.data?.total ?? 0,
    state: { sorting, pagination },
    onSortingChange: (updater) => {
      setSorting(updater);
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    },
    onPaginationChange: setPagination,
    manualSorting: true,
    manualPagination: true,
    enableSortingRemoval: false,
    enableSorting: defaultSort !== null,
    getRowId: props.getRowId,
  });

  const total = list.data?.total ?? 0;
  const firstRow = total === 0 ? 0 : pagination.pageIndex * pagination.pageSize + 1;
  const lastRow = Math.min(total, (pagination.pageIndex + 1) * pagination.pageSize);
  const rows = table.getRowModel().rows;

  return (
    <div className="space-y-3">
      {list.isError && (
        <p role="alert" className="rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical">
          <span aria-hidden="true">⚠ </span>
          {label} could not be loaded: {(list.error as Error).message}
        </p>
      )}

      {props.renderCard && (
        <ul className="space-y-2 sm:hidden" aria-label={label} aria-busy={list.isFetching}>
          {rows.map((row) => (
            <li key={row.id} data-testid={props.rowTestId ? `${props.rowTestId}-card` : undefined}>
              {props.renderCard!(row.original)}
            </li>
          ))}
          {!list.isLoading && total === 0 && <li className="rounded-lg border border-ink-200 bg-white px-4 py-6 text-center text-ink-600">{emptyText}</li>}
        </ul>
      )}

      <div className={`${props.renderCard ? "hidden sm:block" : ""} overflow-x-auto rounded-lg border border-ink-200 bg-white`}>
        <table className="min-w-full text-sm" aria-label={label} aria-busy={list.isFetching} aria-describedby={statusId}>
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
                      className="px-3 py-2 font-semibold whitespace-nowrap"
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
            {rows.map((row) => (
              <tr key={row.id} className="hover:bg-fjord-50" data-testid={props.rowTestId}>
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
            {!list.isLoading && total === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-8 text-center text-ink-600">
                  {emptyText}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <div className="flex flex-wrap items-center justify-between gap-3 text-sm">
        <p id={statusId} aria-live="polite" className="tabular text-ink-600">
          {list.isLoading ? `Loading ${noun}…` : `Showing ${firstRow}–${lastRow} of ${total.toLocaleString("en-US")} ${noun}`}
        </p>
        {!(props.compact && total <= pagination.pageSize) && (
          <div className="flex flex-wrap items-center gap-2">
            {!props.compact && (
              <label className="flex items-center gap-2">
                <span className="text-ink-700">Rows per page</span>
                <select
                  value={pagination.pageSize}
                  onChange={(e) => setPagination({ pageIndex: 0, pageSize: Number(e.target.value) })}
                  className="rounded-md border border-ink-300 bg-white px-2 py-1.5"
                >
                  {pageSizes.map((n) => (
                    <option key={n} value={n}>
                      {n}
                    </option>
                  ))}
                </select>
              </label>
            )}
            <button
              type="button"
              onClick={() => table.previousPage()}
              disabled={!table.getCanPreviousPage()}
              className="min-h-10 rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40"
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
              className="min-h-10 rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40"
            >
              Next
            </button>
          </div>
        )}
      </div>
    </div>
  );
}

const EMPTY: unknown[] = [];
