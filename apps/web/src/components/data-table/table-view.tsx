"use client";

import { Fragment, type ReactNode } from "react";
import {
  createColumnHelper,
  rowPaginationFeature,
  rowSortingFeature,
  tableFeatures,
  type ColumnDef,
  type ReactTable,
  type Row,
  type RowData,
} from "@tanstack/react-table";

/** Every server-paged table sorts and pages on the server; a table may add features (e.g. row selection). */
export const serverTableFeatures = tableFeatures({ rowSortingFeature, rowPaginationFeature });
export type ServerTableFeatures = typeof serverTableFeatures;
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- a table mixes columns of different value types, as TanStack Table documents
export type ServerColumn<T extends RowData> = ColumnDef<ServerTableFeatures, T, any>;
export const serverColumnHelper = <T extends RowData>() => createColumnHelper<ServerTableFeatures, T>();

/** What a list route answers. */
export interface ServerPage<T> {
  rows: T[];
  total: number;
  page?: number;
  pageSize?: number;
}

/**
 * Which paging controls sit under the table: `full` has rows-per-page and previous/next, `pages` only
 * previous/next, `pages-when-needed` previous/next only when there is more than one page.
 */
export type PagerMode = "full" | "pages" | "pages-when-needed" | "none";

export const DEFAULT_PAGE_SIZES: readonly number[] = [10, 25, 50, 100];

/** Data attributes put on each body row (`data-testid` comes from `rowTestId`). */
export type RowAttributes = { [key: `data-${string}`]: string | number | undefined };

export interface TableViewProps<TFeatures extends ServerTableFeatures, T extends RowData> {
  /** A TanStack table over `serverTableFeatures` (or more), with manual sorting and pagination. */
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- columns of different value types (see ServerColumn)
  table: ReactTable<TFeatures, T, any>;
  /** The list query's state. */
  query: { isLoading: boolean; isFetching: boolean; isError: boolean; error: unknown };
  total: number;
  pageIndex: number;
  pageSize: number;
  /** Accessible name of the table (and of the card list), e.g. "Appliances". */
  label?: string;
  /** A caption read by screen readers only. */
  caption?: string;
  /** Id of the status line, which describes the table. */
  statusId: string;
  /** Words for the status line: "Showing 1–25 of 380 appliances". */
  noun: string;
  emptyText: ReactNode;
  /** The start of the alert when the list fails: "Jobs could not be loaded" (the error follows). */
  errorText: string;
  rowTestId?: string;
  rowClassName?: (row: T) => string;
  rowAttributes?: (row: T) => RowAttributes;
  /** Rows put before a body row (group headings); gets the row, its index and every row of the page. */
  renderBeforeRow?: (row: Row<TFeatures, T>, index: number, rows: Row<TFeatures, T>[]) => ReactNode;
  /** On narrow screens (below 640 px) rows become these cards instead of a wide table. */
  renderCard?: (row: T) => ReactNode;
  pager?: PagerMode;
  pageSizes?: readonly number[];
  /** Show the "Showing x–y of n" line. */
  status?: boolean;
}

/** A voided record's row reads greyed (its "Void" tag says so in words). */
export const voidedRowClass = (row: { voidedAt?: string | null }) => `hover:bg-fjord-50 ${row.voidedAt ? "text-ink-500" : ""}`;

const ariaSort = (sorted: false | "asc" | "desc", canSort: boolean) =>
  sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : canSort ? "none" : undefined;

/**
 * The markup of every server-paged table: an alert when the list fails, optional cards below 640 px,
 * the table with sort buttons and `aria-sort` in its header, an empty state, the status line and the
 * paging controls. State and loading stay with the caller (see `DataTable`).
 */
export function TableView<TFeatures extends ServerTableFeatures, T extends RowData>(props: TableViewProps<TFeatures, T>) {
  const { query, total, pageIndex, pageSize, label, noun, emptyText, statusId, pager = "full", status = true } = props;
  // Only the sorting and pagination features are used here, whatever else the table has.
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- columns of different value types (see ServerColumn)
  const table = props.table as unknown as ReactTable<ServerTableFeatures, T, any>;
  const rows = table.getRowModel().rows;
  const showEmpty = !query.isLoading && total === 0;

  return (
    <div className="space-y-3">
      {query.isError && (
        <p role="alert" className="rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical">
          <span aria-hidden="true">⚠ </span>
          {props.errorText}: {(query.error as Error).message}
        </p>
      )}

      {props.renderCard && (
        <ul className="space-y-2 sm:hidden" aria-label={label} aria-busy={query.isFetching}>
          {rows.map((row) => (
            <li key={row.id} data-testid={props.rowTestId ? `${props.rowTestId}-card` : undefined}>
              {props.renderCard!(row.original)}
            </li>
          ))}
          {showEmpty && <li className="rounded-lg border border-ink-200 bg-white px-4 py-6 text-center text-ink-600">{emptyText}</li>}
        </ul>
      )}

      <div className={`${props.renderCard ? "hidden sm:block" : ""} overflow-x-auto rounded-lg border border-ink-200 bg-white`}>
        <table
          className="min-w-full text-sm"
          aria-label={label}
          aria-busy={query.isFetching}
          aria-describedby={status ? statusId : undefined}
        >
          {props.caption && <caption className="sr-only">{props.caption}</caption>}
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
                      aria-sort={ariaSort(sorted, canSort)}
                    >
                      {canSort ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className="inline-flex items-center gap-1 uppercase hover:text-ink-950"
                        >
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
            {rows.map((row, i) => (
              <Fragment key={row.id}>
                {props.renderBeforeRow?.(row as unknown as Row<TFeatures, T>, i, rows as unknown as Row<TFeatures, T>[])}
                <tr
                  className={props.rowClassName ? props.rowClassName(row.original) : "hover:bg-fjord-50"}
                  data-testid={props.rowTestId}
                  {...props.rowAttributes?.(row.original)}
                >
                  {row.getAllCells().map((cell) => (
                    <td key={cell.id} className="px-3 py-2 align-top">
                      <table.FlexRender cell={cell} />
                    </td>
                  ))}
                </tr>
              </Fragment>
            ))}
            {showEmpty && (
              <tr>
                <td colSpan={table.getAllLeafColumns().length} className="px-3 py-8 text-center text-ink-600">
                  {emptyText}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <PageControls
        statusId={statusId}
        status={status ? (query.isLoading ? `Loading ${noun}…` : showingText(pageIndex + 1, pageSize, total, noun)) : null}
        page={pageIndex + 1}
        pageCount={Math.max(1, table.getPageCount())}
        mode={pager}
        onPrevious={() => table.previousPage()}
        onNext={() => table.nextPage()}
        canPrevious={table.getCanPreviousPage()}
        canNext={table.getCanNextPage()}
        pageSize={pageSize}
        pageSizes={props.pageSizes ?? DEFAULT_PAGE_SIZES}
        onPageSize={(n) => table.setPagination({ pageIndex: 0, pageSize: n })}
      />
    </div>
  );
}

/** "Showing 26–50 of 380 appliances". */
export function showingText(page: number, pageSize: number, total: number, noun: string): string {
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  return `Showing ${first}–${last} of ${total.toLocaleString("en-US")} ${noun}`;
}

/** The status line and the paging controls under a list. */
export function PageControls(props: {
  statusId?: string;
  /** The status line; `null` leaves it out. */
  status: string | null;
  page: number;
  pageCount: number;
  mode: PagerMode;
  onPrevious: () => void;
  onNext: () => void;
  canPrevious: boolean;
  canNext: boolean;
  pageSize?: number;
  pageSizes?: readonly number[];
  onPageSize?: (pageSize: number) => void;
}) {
  const showPager = props.mode === "full" || props.mode === "pages" || (props.mode === "pages-when-needed" && props.pageCount > 1);
  if (props.status === null && !showPager) return null;
  return (
    <div className={`flex flex-wrap items-center gap-3 text-sm ${props.status === null ? "justify-end" : "justify-between"}`}>
      {props.status !== null && (
        <p id={props.statusId} aria-live="polite" className="tabular text-ink-600">
          {props.status}
        </p>
      )}
      {showPager && (
        <div className="flex flex-wrap items-center gap-2">
          {props.mode === "full" && props.onPageSize && (
            <label className="flex items-center gap-2">
              <span className="text-ink-700">Rows per page</span>
              <select
                value={props.pageSize}
                onChange={(e) => props.onPageSize!(Number(e.target.value))}
                className="rounded-md border border-ink-300 bg-white px-2 py-1.5"
              >
                {(props.pageSizes ?? DEFAULT_PAGE_SIZES).map((n) => (
                  <option key={n} value={n}>
                    {n}
                  </option>
                ))}
              </select>
            </label>
          )}
          <button
            type="button"
            onClick={props.onPrevious}
            disabled={!props.canPrevious}
            className="min-h-10 rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40"
          >
            Previous
          </button>
          <span className="tabular text-ink-700">
            Page {props.page} of {props.pageCount}
          </span>
          <button
            type="button"
            onClick={props.onNext}
            disabled={!props.canNext}
            className="min-h-10 rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40"
          >
            Next
          </button>
        </div>
      )}
    </div>
  );
}
