"use client";

import Link from "next/link";
import { useState } from "react";
import { MASS_DISPLAY_UNIT_LABELS, placeWords } from "@coldtrail/core";
import type { AdminBranchRow } from "@coldtrail/db";
import { DataTable, ShowFilter, serverColumnHelper } from "@/components/data-table";
import { ArchivedBadge } from "../_components/badges";

const helper = serverColumnHelper<AdminBranchRow>();

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
  helper.accessor("country", {
    id: "country",
    header: "Place",
    enableSorting: false,
    cell: (info) => placeWords({ country: info.getValue(), region: info.row.original.region }),
  }),
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
  const [archived, setArchived] = useState<"include" | "exclude" | "only">("include");
  return (
    <div className="space-y-3">
      <ShowFilter
        value={archived}
        onChange={(v) => setArchived(v as typeof archived)}
        options={[
          { value: "include", label: "Open and archived branches" },
          { value: "exclude", label: "Open branches only" },
          { value: "only", label: "Archived branches only" },
        ]}
      />
      <DataTable
        url="/api/admin/branches"
        queryKey="admin-branches"
        columns={columns}
        filters={{ archived }}
        noun="branches"
        emptyText="No branches to show."
        errorText="Branches could not be loaded"
        rowTestId="branch-row"
        rowClassName={(row) => (row.archivedAt ? "bg-ink-50 text-ink-600" : "hover:bg-fjord-50")}
        pager="pages-when-needed"
      />
    </div>
  );
}
