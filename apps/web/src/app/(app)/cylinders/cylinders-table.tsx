"use client";

import Link from "next/link";
import { CYLINDER_STATUSES, REGISTER_LABELS, formatMass } from "@coldtrail/core";
import type { CylinderRow } from "@coldtrail/db";
import { useBranchOptions } from "@/lib/client/use-branch-options";
import {
  BranchFilter,
  DataTable,
  FilterBar,
  RefrigerantFilter,
  SearchFilter,
  SelectFilter,
  optionsOf,
  serverColumnHelper,
  useFilters,
} from "@/components/data-table";
import { RequalificationBadge, StatusBadge } from "@/components/registers/badges";
import { FillGauge } from "@/components/registers/fill-gauge";

const helper = serverColumnHelper<CylinderRow>();

const columns = helper.columns([
  helper.accessor("serial", {
    id: "serial",
    header: "Cylinder",
    cell: (info) => {
      const c = info.row.original;
      return (
        <Link href={`/cylinders/${c.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
          {c.serial}
          <span className="block text-xs font-normal text-ink-600">
            {[c.specification, REGISTER_LABELS.cylinderPurpose[c.purpose]].filter(Boolean).join(" · ")}
          </span>
        </Link>
      );
    },
  }),
  helper.accessor("branchName", { id: "branch", header: "Branch" }),
  helper.accessor((r) => r.refrigerant ?? "", {
    id: "refrigerant",
    header: "Refrigerant",
    cell: (i) => (i.row.original.netG > 0 ? i.getValue() || "—" : "—"),
  }),
  helper.accessor("recordedContentsG", {
    id: "contents",
    header: "Net contents",
    cell: (i) => {
      const c = i.row.original;
      return (
        <span className="tabular whitespace-nowrap">
          {c.netG > 0 ? formatMass(c.netG, c.massUnit) : "Empty"}
          {c.netSource === "weighing" && c.lastWeighing && <span className="block text-xs text-ink-600">weighed {c.lastWeighing.on}</span>}
        </span>
      );
    },
  }),
  helper.display({
    id: "fill",
    header: "Fill",
    cell: (i) => <FillGauge size="small" netG={i.row.original.netG} fill={i.row.original.fill} massUnit={i.row.original.massUnit} />,
  }),
  helper.accessor("waterCapacityG", {
    id: "waterCapacity",
    header: "Water capacity",
    enableSorting: false,
    cell: (i) => <span className="tabular whitespace-nowrap">{formatMass(i.getValue(), i.row.original.massUnit)}</span>,
  }),
  helper.accessor((r) => r.lastRequalifiedOn ?? "", {
    id: "lastRequalifiedOn",
    header: "Requalification",
    cell: (i) => <RequalificationBadge {...i.row.original.requalification} />,
  }),
  helper.accessor("status", { id: "status", header: "Status", cell: (i) => <StatusBadge kind="cylinder" status={i.getValue()} /> }),
]);

function CylinderCard({ c }: { c: CylinderRow }) {
  return (
    <Link
      href={`/cylinders/${c.id}`}
      className="block space-y-1.5 rounded-lg border border-ink-200 bg-white px-4 py-3 hover:border-fjord-600"
    >
      <span className="flex items-baseline justify-between gap-2">
        <span className="font-semibold text-fjord-700">{c.serial}</span>
        <StatusBadge kind="cylinder" status={c.status} />
      </span>
      <span className="block text-sm text-ink-700">
        {c.netG > 0 ? `${formatMass(c.netG, c.massUnit)} ${c.refrigerant ?? ""}` : "Empty"} · {c.branchName}
      </span>
      <FillGauge size="small" netG={c.netG} fill={c.fill} massUnit={c.massUnit} />
      <RequalificationBadge {...c.requalification} />
    </Link>
  );
}

const REQUALIFICATION_OPTIONS = [
  { value: "overdue", label: "Overdue" },
  { value: "due_soon", label: "Due within 90 days" },
  { value: "current", label: "Current" },
  { value: "unknown", label: "No date on record" },
];

export function CylindersTable() {
  const [filters, set] = useFilters({ q: "", branchId: "", status: "in_service", refrigerant: "", requalification: "" });
  const branches = useBranchOptions();
  const branchRows = branches.data?.rows ?? [];
  return (
    <div className="space-y-3">
      <FilterBar label="Filter cylinders" className="sm:grid-cols-2 lg:grid-cols-5">
        <SearchFilter label="Search" value={filters.q} onChange={(v) => set("q", v)} placeholder="Serial or specification" />
        <BranchFilter branches={branchRows} value={filters.branchId} onChange={(v) => set("branchId", v)} />
        <RefrigerantFilter value={filters.refrigerant} onChange={(v) => set("refrigerant", v)} anyLabel="Any" />
        <SelectFilter
          label="Requalification"
          value={filters.requalification}
          onChange={(v) => set("requalification", v)}
          anyLabel="Any"
          options={REQUALIFICATION_OPTIONS}
        />
        <SelectFilter
          label="Status"
          value={filters.status}
          onChange={(v) => set("status", v)}
          anyLabel="Any status"
          options={optionsOf(CYLINDER_STATUSES, REGISTER_LABELS.cylinderStatus)}
        />
      </FilterBar>
      <DataTable
        label="Cylinders"
        url="/api/cylinders"
        queryKey="cylinders"
        columns={columns}
        filters={filters}
        defaultSort={{ id: "serial", desc: false }}
        noun="cylinders"
        emptyText="No cylinder matches these filters."
        rowTestId="cylinder-row"
        renderCard={(c) => <CylinderCard c={c} />}
      />
    </div>
  );
}
