"use client";

import Link from "next/link";
import { useMemo, useState } from "react";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { createColumnHelper, rowPaginationFeature, tableFeatures, useTable, type PaginationState } from "@tanstack/react-table";
import { MASS_DISPLAY_UNIT_LABELS } from "@coldtrail/core";
import type { AdminBranchPage, AdminBranchRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { ArchivedBadge } from "../_components/badges";
import { Pager } from "../_components/form-bits";

const features = tableFeatures({ rowPaginationFeature });
const helper = createColumnHelper<typeof features, AdminBranchRow>();
const emptyRows: AdminBranchRow[] = [];

const columns = helper.columns([
  helper.accessor("name", {
    id: "name",
    header: "Branch",
    cell: (info) => (
      <Link href={`/admin/branches/${info.row.original.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
        {info.getValue()} <span className="text-xs font-normal text-ink-500">{info.row.original.code}</span>
      </Link>
    ),
  }),
  helper.accessor((r) => r.address ?? "", { id: "address", header: "Address", cell: (info) => info.getValue() || "—" }),
  helper.accessor("timeZone", { id: "timeZone", header: "Time zone" }),
  helper.accessor("massUnit", { id: "massUnit", header: "Amounts in", cell: (info) => MASS_DISPLAY_UNIT_LABELS[info.getValue()] }),
  helper.accessor("peopleCount", { id: "people", header: "People", cell: (info) => <span className="tabular">{info.getValue()}</span> }),
  helper.accessor((r) => r.archivedAt ?? "", {
    id: "state",
    header: "State",
    cell: (info) =>
      info.row.original.archivedAt ? (
        <ArchivedBadge />
      ) : (
        <span className="inline-flex items-center gap-1 text-xs font-semibold text-ok">
          <span aria-hidden="true">●</span> Open
        </span>
      ),
  }),
]);

export function BranchesTable() {
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 25 });
  const [archived, setArchived] = useState<"include" | "exclude" | "only">("include");
  const params = useMemo(
    () => new URLSearchParams({ page: String(pagination.pageIndex + 1), pageSize: String(pagination.pageSize), archived }).toString(),
    [pagination, archived],
  );
  const branches = useQuery({
    queryKey: ["admin-branches", params],
    queryFn: () => fetchJson<AdminBranchPage>(`/api/admin/branches?${params}`),
    placeholderData: keepPreviousData,
  });
  const table = useTable({
    features,
    columns,
    data: branches.data?.rows ?? emptyRows,
    rowCount: branches.data?.total ?? 0,
    state: { pagination },
    onPaginationChange: setPagination,
    manualPagination: true,
    getRowId: (row) => String(row.id),
  });
  return (
    <div className="space-y-3">
      <label className="inline-flex items-center gap-2 text-sm">
        <span className="font-medium text-ink-700">Show</span>
        <select
          value={archived}
          onChange={(e) => {
            setArchived(e.target.value as typeof archived);
            setPagination((p) => ({ ...p, pageIndex: 0 }));
          }}
          className="rounded-md border border-ink-300 bg-white px-2 py-1.5"
        >
          <option value="include">Open and archived branches</option>
          <option value="exclude">Open branches only</option>
          <option value="only">Archived branches only</option>
        </select>
      </label>
      {branches.isError && (
        <p role="alert" className="rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sm text-sev-critical">
          ⚠ Branches could not be loaded: {(branches.error as Error).message}
        </p>
      )}
      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
        <table className="min-w-full text-sm" aria-busy={branches.isFetching}>
          <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => (
                  <th key={header.id} scope="col" className="px-3 py-2 font-semibold">
                    <table.FlexRender header={header} />
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-100">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className={row.original.archivedAt ? "bg-ink-50 text-ink-600" : "hover:bg-fjord-50"} data-testid="branch-row">
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
            {!branches.isLoading && (branches.data?.total ?? 0) === 0 && (
              <tr>
                <td colSpan={columns.length} className="px-3 py-8 text-center text-ink-600">
                  No branches to show.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      <Pager
        page={pagination.pageIndex + 1}
        pageSize={pagination.pageSize}
        total={branches.data?.total ?? 0}
        noun="branches"
        onPage={(page) => setPagination((p) => ({ ...p, pageIndex: page - 1 }))}
      />
    </div>
  );
}
