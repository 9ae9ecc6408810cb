"use client";

import Link from "next/link";
import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import {
  APPLIANCE_CATEGORIES,
  APPLIANCE_CATEGORY_LABELS,
  APPLIANCE_STATUSES,
  CERTIFICATION_TYPE_LABELS,
  REFRIGERANTS,
  REGISTER_LABELS,
  formatMass,
} from "@coldtrail/core";
import type { ApplianceRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import type { BranchOption } from "@/lib/client/types";
import { DataTable, serverColumnHelper } from "@/components/registers/data-table";
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
        {info.row.original.pressureClass && <span className="block text-xs text-ink-600">{PRESSURE_CLASS_WORDS[info.row.original.pressureClass]}</span>}
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

const filterInput = "mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2";

export function AppliancesTable() {
  const [filters, setFilters] = useState({ q: "", branchId: "", category: "", status: "in_service", refrigerant: "" });
  const branches = useQuery({ queryKey: ["branches"], queryFn: () => fetchJson<{ rows: BranchOption[] }>("/api/lookup/branches") });
  const set = (key: keyof typeof filters, value: string) => setFilters((f) => ({ ...f, [key]: value }));
  const branchRows = branches.data?.rows ?? [];

  return (
    <div className="space-y-3">
      <form role="search" aria-label="Filter appliances" className="grid gap-3 rounded-lg border border-ink-200 bg-white p-3 sm:grid-cols-2 lg:grid-cols-5" onSubmit={(e) => e.preventDefault()}>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Search</span>
          <input type="search" value={filters.q} onChange={(e) => set("q", e.target.value)} placeholder="Tag, site, customer, serial" className={filterInput} />
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
          <span className="block font-medium text-ink-700">Kind</span>
          <select value={filters.category} onChange={(e) => set("category", e.target.value)} className={filterInput}>
            <option value="">All kinds</option>
            {APPLIANCE_CATEGORIES.map((c) => (
              <option key={c} value={c}>
                {APPLIANCE_CATEGORY_LABELS[c]}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Refrigerant</span>
          <select value={filters.refrigerant} onChange={(e) => set("refrigerant", e.target.value)} className={filterInput}>
            <option value="">All refrigerants</option>
            {REFRIGERANTS.map((r) => (
              <option key={r.designation} value={r.designation}>
                {r.designation}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Status</span>
          <select value={filters.status} onChange={(e) => set("status", e.target.value)} className={filterInput}>
            <option value="">Any status</option>
            {APPLIANCE_STATUSES.map((s) => (
              <option key={s} value={s}>
                {REGISTER_LABELS.applianceStatus[s]}
              </option>
            ))}
          </select>
        </label>
      </form>
      <DataTable
        label="Appliances"
        url="/api/appliances"
        queryKey="appliances"
        columns={columns}
        getRowId={(r) => String(r.id)}
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
