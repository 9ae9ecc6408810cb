"use client";

import Link from "next/link";
import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import { CYLINDER_STATUSES, REFRIGERANTS, REGISTER_LABELS, formatMass } from "@coldtrail/core";
import type { CylinderRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import type { BranchOption } from "@/lib/client/types";
import { DataTable, serverColumnHelper } from "@/components/registers/data-table";
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
          <span className="block text-xs font-normal text-ink-600">{[c.specification, REGISTER_LABELS.cylinderPurpose[c.purpose]].filter(Boolean).join(" · ")}</span>
        </Link>
      );
    },
  }),
  helper.accessor("branchName", { id: "branch", header: "Branch" }),
  helper.accessor((r) => r.refrigerant ?? "", { id: "refrigerant", header: "Refrigerant", cell: (i) => (i.row.original.netG > 0 ? i.getValue() || "—" : "—") }),
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
  helper.display({ id: "fill", header: "Fill", cell: (i) => <FillGauge size="small" netG={i.row.original.netG} fill={i.row.original.fill} massUnit={i.row.original.massUnit} /> }),
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
    <Link href={`/cylinders/${c.id}`} className="block space-y-1.5 rounded-lg border border-ink-200 bg-white px-4 py-3 hover:border-fjord-600">
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

const filterInput = "mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2";

export function CylindersTable() {
  const [filters, setFilters] = useState({ q: "", branchId: "", status: "in_service", refrigerant: "", requalification: "" });
  const branches = useQuery({ queryKey: ["branches"], queryFn: () => fetchJson<{ rows: BranchOption[] }>("/api/lookup/branches") });
  const set = (key: keyof typeof filters, value: string) => setFilters((f) => ({ ...f, [key]: value }));
  const branchRows = branches.data?.rows ?? [];
  return (
    <div className="space-y-3">
      <form role="search" aria-label="Filter cylinders" className="grid gap-3 rounded-lg border border-ink-200 bg-white p-3 sm:grid-cols-2 lg:grid-cols-5" onSubmit={(e) => e.preventDefault()}>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Search</span>
          <input type="search" value={filters.q} onChange={(e) => set("q", e.target.value)} placeholder="Serial or specification" className={filterInput} />
        </label>
        {branchRows.length > 1 && (
          <label className="text-sm">
            <span className="block font-medium text-ink-700">Branch</span>
            <select value={filters.branchId} onChange={(e) => set("branchId", e.target.value)} className={filterInput}>
              <option value="">All branches</option>
              {branchRows.map((b) => (
                <option key={b.id} value={b.id}>
                  {b.name}
                </option>
              ))}
            </select>
          </label>
        )}
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Refrigerant</span>
          <select value={filters.refrigerant} onChange={(e) => set("refrigerant", e.target.value)} className={filterInput}>
            <option value="">Any</option>
            {REFRIGERANTS.map((r) => (
              <option key={r.designation} value={r.designation}>
                {r.designation}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Requalification</span>
          <select value={filters.requalification} onChange={(e) => set("requalification", e.target.value)} className={filterInput}>
            <option value="">Any</option>
            <option value="overdue">Overdue</option>
            <option value="due_soon">Due within 90 days</option>
            <option value="current">Current</option>
            <option value="unknown">No date on record</option>
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Status</span>
          <select value={filters.status} onChange={(e) => set("status", e.target.value)} className={filterInput}>
            <option value="">Any status</option>
            {CYLINDER_STATUSES.map((s) => (
              <option key={s} value={s}>
                {REGISTER_LABELS.cylinderStatus[s]}
              </option>
            ))}
          </select>
        </label>
      </form>
      <DataTable
        label="Cylinders"
        url="/api/cylinders"
        queryKey="cylinders"
        columns={columns}
        getRowId={(r) => String(r.id)}
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
