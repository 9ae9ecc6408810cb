"use client";

import Link from "next/link";
import { useState } from "react";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { createColumnHelper, rowPaginationFeature, tableFeatures, useTable, type PaginationState } from "@tanstack/react-table";
import { IMPORT_KIND_LABELS } from "@coldtrail/core";
import { fetchJson } from "@/lib/client/fetch-json";
import { ImportStateBadge } from "./import-state";
import type { ImportListRow, Paged } from "./import-types";

const features = tableFeatures({ rowPaginationFeature });
const helper = createColumnHelper<typeof features, ImportListRow>();
const emptyRows: ImportListRow[] = [];

const columns = helper.columns([
  helper.accessor("createdAt", { header: "Started", cell: (i) => <span className="tabular whitespace-nowrap">{new Date(i.getValue()).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" })}</span> }),
  helper.accessor("fileLabel", {
    header: "File",
    cell: (i) => (
      <Link href={`/imports/${i.row.original.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
        {i.getValue()}
        <span className="block text-xs font-normal text-ink-600">{IMPORT_KIND_LABELS[i.row.original.kind]}</span>
      </Link>
    ),
  }),
  helper.accessor("branchName", { header: "Branch" }),
  helper.accessor("state", { header: "State", cell: (i) => <ImportStateBadge state={i.getValue()} /> }),
  helper.accessor("totalRows", {
    header: "Rows",
    cell: (i) => {
      const r = i.row.original;
      return (
        <span className="tabular whitespace-nowrap text-xs">
          {r.totalRows.toLocaleString("en-US")} read
          {r.state === "imported" ? ` · ${r.importedRows.toLocaleString("en-US")} imported` : r.validRows ? ` · ${r.validRows.toLocaleString("en-US")} valid` : ""}
          {r.invalidRows ? ` · ${r.invalidRows.toLocaleString("en-US")} with problems` : ""}
        </span>
      );
    },
  }),
  helper.accessor("createdByName", { header: "By" }),
]);

/** Imports into the person's branches, newest first, a page at a time. */
export function ImportsTable() {
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 20 });
  const list = useQuery({
    queryKey: ["imports", pagination],
    queryFn: () => fetchJson<Paged<ImportListRow>>(`/api/imports?page=${pagination.pageIndex + 1}&pageSize=${pagination.pageSize}`),
    placeholderData: keepPreviousData,
  });
  const table = useTable({
    features,
    columns,
    data: list.data?.rows ?? emptyRows,
    rowCount: list.data?.total ?? 0,
    state: { pagination },
    onPaginationChange: setPagination,
    manualPagination: true,
    getRowId: (r) => String(r.id),
  });
  const total = list.data?.total ?? 0;
  return (
    <div className="space-y-2">
      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
        <table className="min-w-full text-sm" aria-busy={list.isFetching}>
          <caption className="sr-only">Spreadsheet imports</caption>
          <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
            {table.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((h) => (
                  <th key={h.id} scope="col" className="px-3 py-2 font-semibold">
                    <table.FlexRender header={h} />
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-100">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="hover:bg-fjord-50">
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
                  No import yet.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      {total > pagination.pageSize && (
        <div className="flex items-center justify-end gap-2 text-sm">
          <button type="button" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()} className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40">
            Previous
          </button>
          <span className="tabular">
            Page {pagination.pageIndex + 1} of {Math.max(1, table.getPageCount())}
          </span>
          <button type="button" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()} className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40">
            Next
          </button>
        </div>
      )}
    </div>
  );
}
