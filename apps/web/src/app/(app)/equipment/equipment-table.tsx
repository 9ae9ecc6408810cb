"use client";

import Link from "next/link";
import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import { EQUIPMENT_CERTIFICATION_STATES, EQUIPMENT_STATUSES, REGISTER_LABELS } from "@coldtrail/core";
import type { EquipmentRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import type { BranchOption } from "@/lib/client/types";
import { DataTable, serverColumnHelper } from "@/components/registers/data-table";
import { CertificationBadge, StatusBadge } from "@/components/registers/badges";
import { ERA_WORDS, equipmentKind } from "@/components/registers/words";

const helper = serverColumnHelper<EquipmentRow>();

const columns = helper.columns([
  helper.accessor("serial", {
    id: "serial",
    header: "Serial",
    cell: (info) => {
      const e = info.row.original;
      return (
        <Link href={`/equipment/${e.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
          {e.serial}
          {e.unregistered && <span className="block text-xs font-normal text-sev-major">⚠ Named by a job, not registered</span>}
        </Link>
      );
    },
  }),
  helper.accessor((r) => r.makeModel ?? "", { id: "makeModel", header: "Make and model", cell: (i) => i.getValue() || "—" }),
  helper.accessor("branchName", { id: "branch", header: "Branch" }),
  helper.accessor((r) => r.manufacturedOn ?? "", {
    id: "manufacturedOn",
    header: "Made",
    cell: (i) => (
      <span className="whitespace-nowrap">
        <span className="tabular">{i.getValue() || "Unknown"}</span>
        <span className="block text-xs text-ink-600">{ERA_WORDS[i.row.original.era]}</span>
      </span>
    ),
  }),
  helper.display({ id: "kind", header: "Kind", cell: (i) => equipmentKind(i.row.original) }),
  helper.accessor("certificationState", {
    id: "certificationState",
    header: "Certification",
    cell: (i) => (
      <span>
        <CertificationBadge state={i.getValue()} />
        <span className="block text-xs text-ink-600">{i.row.original.hasEvidence ? "Evidence on file" : "No evidence on file"}</span>
      </span>
    ),
  }),
  helper.accessor("status", { id: "status", header: "Status", cell: (i) => <StatusBadge kind="equipment" status={i.getValue()} /> }),
]);

function EquipmentCard({ e }: { e: EquipmentRow }) {
  return (
    <Link href={`/equipment/${e.id}`} className="block rounded-lg border border-ink-200 bg-white px-4 py-3 hover:border-fjord-600">
      <span className="flex items-baseline justify-between gap-2">
        <span className="font-semibold text-fjord-700">{e.serial}</span>
        <StatusBadge kind="equipment" status={e.status} />
      </span>
      <span className="block text-sm text-ink-700">{e.makeModel ?? "Make and model not recorded"}</span>
      <span className="mt-1 block">
        <CertificationBadge state={e.certificationState} />
      </span>
    </Link>
  );
}

const filterInput = "mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2";

export function EquipmentTable() {
  const [filters, setFilters] = useState({ q: "", branchId: "", certificationState: "", status: "in_service" });
  const branches = useQuery({ queryKey: ["branches"], queryFn: () => fetchJson<{ rows: BranchOption[] }>("/api/lookup/branches") });
  const set = (key: keyof typeof filters, value: string) => setFilters((f) => ({ ...f, [key]: value }));
  const branchRows = branches.data?.rows ?? [];
  return (
    <div className="space-y-3">
      <form role="search" aria-label="Filter recovery equipment" className="grid gap-3 rounded-lg border border-ink-200 bg-white p-3 sm:grid-cols-2 lg:grid-cols-4" onSubmit={(e) => e.preventDefault()}>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Search</span>
          <input type="search" value={filters.q} onChange={(e) => set("q", e.target.value)} placeholder="Serial, make or model" className={filterInput} />
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
          <span className="block font-medium text-ink-700">Certification</span>
          <select value={filters.certificationState} onChange={(e) => set("certificationState", e.target.value)} className={filterInput}>
            <option value="">Any</option>
            {EQUIPMENT_CERTIFICATION_STATES.map((s) => (
              <option key={s} value={s}>
                {REGISTER_LABELS.equipmentCertification[s]}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-700">Status</span>
          <select value={filters.status} onChange={(e) => set("status", e.target.value)} className={filterInput}>
            <option value="">Any status</option>
            {EQUIPMENT_STATUSES.map((s) => (
              <option key={s} value={s}>
                {REGISTER_LABELS.equipmentStatus[s]}
              </option>
            ))}
          </select>
        </label>
      </form>
      <DataTable
        label="Recovery equipment"
        url="/api/equipment"
        queryKey="equipment"
        columns={columns}
        getRowId={(r) => String(r.id)}
        filters={filters}
        defaultSort={{ id: "serial", desc: false }}
        noun="units"
        emptyText="No recovery equipment matches these filters."
        rowTestId="equipment-row"
        renderCard={(e) => <EquipmentCard e={e} />}
      />
    </div>
  );
}
