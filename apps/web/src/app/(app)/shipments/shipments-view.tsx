"use client";

import Link from "next/link";
import { useState } from "react";
import { formatMass } from "@coldtrail/core";
import type { ShipmentListRow } from "@coldtrail/db";
import { useBranchOptions } from "@/lib/client/use-branch-options";
import { RecordFilters, RecordTable, VoidTag, type RecordColumn } from "../jobs/_components/record-table";

const columns: RecordColumn<ShipmentListRow>[] = [
  {
    id: "date",
    header: "Shipped",
    sortable: true,
    cell: (r) => (
      <Link href={`/shipments/${r.id}`} className="tabular whitespace-nowrap font-medium text-fjord-700 underline-offset-2 hover:underline">
        {r.shippedOn}
        <VoidTag at={r.voidedAt} />
      </Link>
    ),
  },
  { id: "branch", header: "Branch", sortable: true, cell: (r) => r.branchName },
  {
    id: "reclaimer",
    header: "Reclaimer",
    sortable: true,
    cell: (r) => (
      <>
        {r.reclaimerName}
        {r.reference && <span className="block text-xs text-ink-600">{r.reference}</span>}
      </>
    ),
  },
  { id: "cylinders", header: "Cylinders", cell: (r) => <span className="tabular">{r.cylinderCount}</span> },
  {
    id: "byRefrigerant",
    header: "By refrigerant",
    cell: (r) => (
      <ul className="tabular">
        {r.byRefrigerant.map((x) => (
          <li key={x.refrigerant} className="whitespace-nowrap">
            {x.refrigerant}: {formatMass(x.massG, r.branchMassUnit)}
          </li>
        ))}
      </ul>
    ),
  },
  {
    id: "amount",
    header: "Total",
    sortable: true,
    cell: (r) => <span className="tabular whitespace-nowrap font-medium">{formatMass(r.totalG, r.branchMassUnit)}</span>,
  },
];

export function ShipmentsView() {
  const [filters, setFilters] = useState<Record<string, string>>({});
  const branches = useBranchOptions();
  return (
    <div className="space-y-3">
      <RecordFilters
        branches={branches.data?.rows ?? []}
        value={filters}
        onChange={setFilters}
        searchLabel="Search reclaimer"
        searchPlaceholder="Name or reference"
      />
      <RecordTable<ShipmentListRow>
        queryKey="shipments"
        path="/api/shipments"
        params={filters}
        columns={columns}
        noun="shipments"
        testId="shipment-row"
      />
    </div>
  );
}
