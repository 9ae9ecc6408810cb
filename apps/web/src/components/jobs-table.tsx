"use client";

import Link from "next/link";
import { JOB_KIND_LABELS, JOB_KINDS, formatMass } from "@coldtrail/core";
import { jobMassG, type JobListRow } from "@/lib/client/types";
import { useBranchOptions } from "@/lib/client/use-branch-options";
import {
  BranchFilter,
  DataTable,
  DateFilter,
  FilterBar,
  SearchFilter,
  SelectFilter,
  VoidedFilter,
  optionsOf,
  serverColumnHelper,
  VoidTag,
  useFilters,
  voidedRowClass,
} from "@/components/data-table";

const helper = serverColumnHelper<JobListRow>();

const columns = helper.columns([
  helper.accessor("performedOn", {
    id: "performedOn",
    header: "Date",
    cell: (info) => <span className="tabular whitespace-nowrap">{info.getValue()}</span>,
  }),
  helper.accessor("kind", {
    id: "kind",
    header: "Job",
    cell: (info) => (
      <>
        {JOB_KIND_LABELS[info.getValue()]}
        <VoidTag at={info.row.original.voidedAt} />
      </>
    ),
  }),
  helper.accessor((row) => row.applianceTag ?? "", {
    id: "appliance",
    header: "Appliance",
    cell: (info) => {
      const row = info.row.original;
      return (
        <Link href={`/jobs/${row.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
          {row.applianceTag ?? "—"}
          {row.applianceDescription && <span className="block text-xs font-normal text-ink-600">{row.applianceDescription}</span>}
        </Link>
      );
    },
  }),
  helper.accessor("branchName", { id: "branch", header: "Branch" }),
  helper.accessor("technicianName", { id: "technician", header: "Technician" }),
  helper.accessor((row) => row.refrigerant ?? "", { id: "refrigerant", header: "Refrigerant" }),
  helper.accessor((row) => jobMassG(row) ?? 0, {
    id: "amount",
    header: "Amount",
    cell: (info) => {
      const row = info.row.original;
      const g = jobMassG(row);
      return <span className="tabular whitespace-nowrap">{g === null ? "—" : formatMass(g, row.branchMassUnit)}</span>;
    },
  }),
  helper.accessor((row) => row.cylinderSerial ?? "", {
    id: "cylinder",
    header: "Cylinder",
    enableSorting: false,
    cell: (info) => info.row.original.cylinderSerial ?? "—",
  }),
]);

export function JobsTable({ compact = false, initialPageSize = 25 }: { compact?: boolean; initialPageSize?: number }) {
  const [filters, set] = useFilters({ kind: "", branchId: "", from: "", to: "", q: "", voided: "" });
  const branches = useBranchOptions(!compact);

  return (
    <div className="space-y-3">
      {!compact && (
        <FilterBar className="sm:grid-cols-2 lg:grid-cols-6">
          <SearchFilter label="Search appliance" value={filters.q} onChange={(v) => set("q", v)} placeholder="Tag or description" />
          <SelectFilter
            label="Job kind"
            value={filters.kind}
            onChange={(v) => set("kind", v)}
            anyLabel="All kinds"
            options={optionsOf(JOB_KINDS, JOB_KIND_LABELS)}
          />
          <BranchFilter branches={branches.data?.rows ?? []} value={filters.branchId} onChange={(v) => set("branchId", v)} />
          <DateFilter label="From" value={filters.from} onChange={(v) => set("from", v)} />
          <DateFilter label="To" value={filters.to} onChange={(v) => set("to", v)} />
          {/* "" leaves voided jobs out; "include" or "only" asks for them. */}
          <VoidedFilter label="Voided jobs" value={filters.voided} onChange={(v) => set("voided", v)} />
        </FilterBar>
      )}
      <DataTable
        url="/api/jobs"
        queryKey="jobs"
        columns={columns}
        filters={filters}
        defaultSort={{ id: "performedOn", desc: true }}
        initialPageSize={initialPageSize}
        noun="jobs"
        emptyText="No jobs match these filters."
        errorText="Jobs could not be loaded"
        rowTestId="job-row"
        rowClassName={voidedRowClass}
        pager={compact ? "none" : "full"}
      />
    </div>
  );
}
