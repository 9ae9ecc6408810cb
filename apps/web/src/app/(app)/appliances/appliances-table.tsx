"use client";

import Link from "next/link";
import {
  APPLIANCE_CATEGORIES,
  APPLIANCE_CATEGORY_LABELS,
  APPLIANCE_STATUSES,
  CERTIFICATION_TYPE_LABELS,
  REGISTER_LABELS,
  formatMass,
} from "@coldtrail/core";
import type { ApplianceRow } from "@coldtrail/db";
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
import { StatusBadge } from "@/components/registers/badges";
import { PRESSURE_CLASS_WORDS } from "@/components/registers/words";

const helper = serverColumnHelper<ApplianceRow>();

const columns = helper.columns([
  helper.accessor("tag", {
    id: "tag",
    header: "Appliance",
    cell: (info) => {
      const a = info.row.original;
      return (
        <Link href={`/appliances/${a.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
          {a.tag}
          <span className="block text-xs font-normal text-ink-600">{a.description}</span>
        </Link>
      );
    },
  }),
  helper.accessor("siteName", {
    id: "site",
    header: "Site",
    cell: (info) => (
      <span>
        {info.getValue()}
        {info.row.original.customerName && <span className="block text-xs text-ink-600">{info.row.original.customerName}</span>}
      </span>
    ),
  }),
  helper.accessor("branchName", { id: "branch", header: "Branch" }),
  helper.accessor("category", { id: "category", header: "Kind", cell: (info) => APPLIANCE_CATEGORY_LABELS[info.getValue()] }),
  helper.accessor("refrigerant", {
    id: "refrigerant",
    header: "Refrigerant",
    cell: (info) => (
      <span className="whitespace-nowrap">
        {info.getValue()}
        {info.row.original.pressureClass && (
          <span className="block text-xs text-ink-600">{PRESSURE_CLASS_WORDS[info.row.original.pressureClass]}</span>
        )}
      </span>
    ),
  }),
  helper.accessor("fullChargeG", {
    id: "fullCharge",
    header: "Full charge",
    cell: (info) => <span className="tabular whitespace-nowrap">{formatMass(info.getValue(), info.row.original.massUnit)}</span>,
  }),
  helper.accessor((row) => row.certificationTypes.map((t) => CERTIFICATION_TYPE_LABELS[t]).join(" or "), {
    id: "certification",
    header: "Certification needed",
    enableSorting: false,
    cell: (info) => <span className="whitespace-nowrap">{info.getValue() || "—"}</span>,
  }),
  helper.accessor("status", { id: "status", header: "Status", cell: (info) => <StatusBadge kind="appliance" status={info.getValue()} /> }),
]);

function ApplianceCard({ a }: { a: ApplianceRow }) {
  return (
    <Link href={`/appliances/${a.id}`} className="block rounded-lg border border-ink-200 bg-white px-4 py-3 hover:border-fjord-600">
      <span className="flex items-baseline justify-between gap-2">
        <span className="font-semibold text-fjord-700">{a.tag}</span>
        <StatusBadge kind="appliance" status={a.status} />
      </span>
      <span className="block text-sm text-ink-700">{a.description}</span>
      <span className="mt-1 block text-sm text-ink-600">
        {a.refrigerant} · full charge <span className="tabular">{formatMass(a.fullChargeG, a.massUnit)}</span> · {a.siteName}
      </span>
    </Link>
  );
}

export function AppliancesTable() {
  const [filters, set] = useFilters({ q: "", branchId: "", category: "", status: "in_service", refrigerant: "" });
  const branches = useBranchOptions();
  const branchRows = branches.data?.rows ?? [];

  return (
    <div className="space-y-3">
      <FilterBar label="Filter appliances" className="sm:grid-cols-2 lg:grid-cols-5">
        <SearchFilter label="Search" value={filters.q} onChange={(v) => set("q", v)} placeholder="Tag, site, customer, serial" />
        <BranchFilter branches={branchRows} value={filters.branchId} onChange={(v) => set("branchId", v)} />
        <SelectFilter
          label="Kind"
          value={filters.category}
          onChange={(v) => set("category", v)}
          anyLabel="All kinds"
          options={optionsOf(APPLIANCE_CATEGORIES, APPLIANCE_CATEGORY_LABELS)}
        />
        <RefrigerantFilter value={filters.refrigerant} onChange={(v) => set("refrigerant", v)} anyLabel="All refrigerants" />
        <SelectFilter
          label="Status"
          value={filters.status}
          onChange={(v) => set("status", v)}
          anyLabel="Any status"
          options={optionsOf(APPLIANCE_STATUSES, REGISTER_LABELS.applianceStatus)}
        />
      </FilterBar>
      <DataTable
        label="Appliances"
        url="/api/appliances"
        queryKey="appliances"
        columns={columns}
        filters={filters}
        defaultSort={{ id: "tag", desc: false }}
        noun="appliances"
        emptyText="No appliance matches these filters."
        rowTestId="appliance-row"
        renderCard={(a) => <ApplianceCard a={a} />}
      />
    </div>
  );
}
