"use client";

import Link from "next/link";
import { EQUIPMENT_CERTIFICATION_STATES, EQUIPMENT_STATUSES, REGISTER_LABELS } from "@coldtrail/core";
import type { EquipmentRow } from "@coldtrail/db";
import { useBranchOptions } from "@/lib/client/use-branch-options";
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

export function EquipmentTable() {
  const [filters, set] = useFilters({ q: "", branchId: "", certificationState: "", status: "in_service" });
  const branches = useBranchOptions();
  const branchRows = branches.data?.rows ?? [];
  return (
    <div className="space-y-3">
      <FilterBar label="Filter recovery equipment" className="sm:grid-cols-2 lg:grid-cols-4">
        <SearchFilter label="Search" value={filters.q} onChange={(v) => set("q", v)} placeholder="Serial, make or model" />
        <BranchFilter branches={branchRows} value={filters.branchId} onChange={(v) => set("branchId", v)} />
        <SelectFilter
          label="Certification"
          value={filters.certificationState}
          onChange={(v) => set("certificationState", v)}
          anyLabel="Any"
          options={optionsOf(EQUIPMENT_CERTIFICATION_STATES, REGISTER_LABELS.equipmentCertification)}
        />
        <SelectFilter
          label="Status"
          value={filters.status}
          onChange={(v) => set("status", v)}
          anyLabel="Any status"
          options={optionsOf(EQUIPMENT_STATUSES, REGISTER_LABELS.equipmentStatus)}
        />
      </FilterBar>
      <DataTable
        label="Recovery equipment"
        url="/api/equipment"
        queryKey="equipment"
        columns={columns}
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
