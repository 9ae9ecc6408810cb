"use client";

import Link from "next/link";
import { IMPORT_KIND_LABELS } from "@coldtrail/core";
import { DataTable, serverColumnHelper } from "@/components/data-table";
import { ImportStateBadge } from "./import-state";
import type { ImportListRow } from "./import-types";

const helper = serverColumnHelper<ImportListRow>();

const columns = helper.columns([
  helper.accessor("createdAt", {
    header: "Started",
    cell: (i) => (
      <span className="tabular whitespace-nowrap">
        {new Date(i.getValue()).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" })}
      </span>
    ),
  }),
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
          {r.state === "imported"
            ? ` · ${r.importedRows.toLocaleString("en-US")} imported`
            : r.validRows
              ? ` · ${r.validRows.toLocaleString("en-US")} valid`
              : ""}
          {r.invalidRows ? ` · ${r.invalidRows.toLocaleString("en-US")} with problems` : ""}
        </span>
      );
    },
  }),
  helper.accessor("createdByName", { header: "By" }),
]);

/** Imports into the person's branches, newest first, a page at a time. */
export function ImportsTable() {
  return (
    <DataTable
      caption="Spreadsheet imports"
      url="/api/imports"
      queryKey="imports"
      columns={columns}
      initialPageSize={20}
      noun="imports"
      emptyText="No import yet."
      errorText="Imports could not be loaded"
      pager="pages-when-needed"
      status={false}
    />
  );
}
