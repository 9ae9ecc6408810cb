"use client";

import { useId, useMemo, useState, type ReactNode } from "react";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useTable, type PaginationState, type RowData, type SortingState } from "@tanstack/react-table";
import { fetchJson } from "@/lib/client/fetch-json";
import { TableView, serverTableFeatures, type PagerMode, type RowAttributes, type ServerColumn, type ServerPage } from "./table-view";

export interface DataTableProps<T extends RowData> {
  /** The list route, e.g. "/api/appliances". */
  url: string;
  /** First element of the TanStack Query key (invalidate it after a write). */
  queryKey: string;
  columns: ServerColumn<T>[];
  /** Defaults to the row's `id`. */
  getRowId?: (row: T) => string;
  /** Query-string filters; empty values are left out. Changing them returns to the first page. */
  filters?: Record<string, string | undefined>;
  /**
   * The initial sort, sent as `sort` and `dir`. `null`: the route takes only `dir` (newest first) and the
   * columns are not sortable. Left out: nothing about sorting is sent and the columns are not sortable.
   */
  defaultSort?: { id: string; desc: boolean } | null;
  initialPageSize?: number;
  pageSizes?: readonly number[];
  /** Accessible name of the table, e.g. "Appliances". */
  label?: string;
  /** A caption read by screen readers only. */
  caption?: string;
  /** Words for the status line: "Showing 1–25 of 380 appliances". */
  noun: string;
  emptyText: ReactNode;
  /** The start of the alert when the list fails; defaults to "<label> could not be loaded". */
  errorText?: string;
  rowTestId?: string;
  rowClassName?: (row: T) => string;
  rowAttributes?: (row: T) => RowAttributes;
  /** On narrow screens (below 640 px) rows become these cards instead of a wide table. */
  renderCard?: (row: T) => ReactNode;
  pager?: PagerMode;
  /** Show the "Showing x–y of n" line (default true). */
  status?: boolean;
}

const EMPTY: unknown[] = [];
const rowIdOf = (row: unknown) => String((row as { id: unknown }).id);

/**
 * A server-paged, server-sorted table over one of the app's list routes. The route answers
 * `{ rows, total }` for `?page&pageSize&sort&dir&…filters`. Filters live with the caller (any form
 * above the table).
 */
export function DataTable<T extends RowData>(props: DataTableProps<T>) {
  const { url, queryKey, columns, filters = {}, defaultSort, initialPageSize = 25 } = props;
  const [sorting, setSorting] = useState<SortingState>(defaultSort ? [defaultSort] : []);
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: initialPageSize });
  const statusId = `${useId()}-status`;

  const filterKey = JSON.stringify(Object.entries(filters).filter(([, v]) => v !== undefined && v !== ""));
  const [lastFilterKey, setLastFilterKey] = useState(filterKey);
  if (lastFilterKey !== filterKey) {
    // New filters start again at the first page.
    setLastFilterKey(filterKey);
    setPagination((p) => ({ ...p, pageIndex: 0 }));
  }

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
    enableSorting: Boolean(defaultSort),
    getRowId: props.getRowId ?? rowIdOf,
  });

  return (
    <TableView
      table={table}
      query={list}
      total={list.data?.total ?? 0}
      pageIndex={pagination.pageIndex}
      pageSize={pagination.pageSize}
      label={props.label}
      caption={props.caption}
      statusId={statusId}
      noun={props.noun}
      emptyText={props.emptyText}
      errorText={props.errorText ?? `${props.label ?? "The list"} could not be loaded`}
      rowTestId={props.rowTestId}
      rowClassName={props.rowClassName}
      rowAttributes={props.rowAttributes}
      renderCard={props.renderCard}
      pager={props.pager}
      pageSizes={props.pageSizes}
      status={props.status}
    />
  );
}
