"use client";

import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { PERSON_STATUSES, PERSON_STATUS_LABELS, ROLES, ROLE_LABELS } from "@coldtrail/core";
import type { AdminBranchPage, PersonRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import {
  BranchFilter,
  DataTable,
  FilterBar,
  SearchFilter,
  SelectFilter,
  optionsOf,
  serverColumnHelper,
  useFilters,
} from "@/components/data-table";
import { PersonStatusBadge } from "../_components/badges";

const helper = serverColumnHelper<PersonRow>();

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
  helper.accessor("status", {
    id: "status",
    header: "Status",
    enableSorting: false,
    cell: (info) => <PersonStatusBadge status={info.getValue()} />,
  }),
  helper.accessor("createdAt", {
    id: "createdAt",
    header: "Added",
    cell: (info) => <span className="tabular whitespace-nowrap">{info.getValue().slice(0, 10)}</span>,
  }),
]);

export function PeopleTable() {
  const [filters, set] = useFilters({ q: "", role: "", branchId: "", status: "" });
  const branches = useQuery({
    queryKey: ["admin-branches", "all"],
    queryFn: () => fetchJson<AdminBranchPage>("/api/admin/branches?archived=include&pageSize=200"),
  });

  return (
    <div className="space-y-3">
      <FilterBar className="sm:grid-cols-2 lg:grid-cols-4">
        <SearchFilter label="Search" value={filters.q} onChange={(v) => set("q", v)} placeholder="Name or e-mail" />
        <SelectFilter
          label="Role"
          value={filters.role}
          onChange={(v) => set("role", v)}
          anyLabel="All roles"
          options={optionsOf(ROLES, ROLE_LABELS)}
        />
        <BranchFilter branches={branches.data?.rows ?? []} value={filters.branchId} onChange={(v) => set("branchId", v)} markArchived />
        <SelectFilter
          label="Status"
          value={filters.status}
          onChange={(v) => set("status", v)}
          anyLabel="Any status"
          options={optionsOf(PERSON_STATUSES, PERSON_STATUS_LABELS)}
        />
      </FilterBar>
      <DataTable
        url="/api/admin/people"
        queryKey="people"
        columns={columns}
        filters={filters}
        defaultSort={{ id: "name", desc: false }}
        noun="people"
        emptyText="Nobody matches these filters."
        errorText="People could not be loaded"
        rowTestId="person-row"
      />
    </div>
  );
}
