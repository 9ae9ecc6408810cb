"use client";

import Link from "next/link";
import { useState } from "react";
import { formatMass } from "@coldtrail/core";
import type { PurchaseRow } from "@coldtrail/db";
import { useBranchOptions } from "@/lib/client/use-branch-options";
import { RecordFilters, RecordTable, VoidTag, type RecordColumn } from "../jobs/_components/record-table";

const columns: RecordColumn<PurchaseRow>[] = [
  {
    id: "date",
    header: "Bought",
    sortable: true,
    cell: (r) => (
      <Link href={`/purchases/${r.id}`} className="tabular whitespace-nowrap font-medium text-fjord-700 underline-offset-2 hover:underline">
        {r.purchasedOn}
        <VoidTag at={r.voidedAt} />
      </Link>
    ),
  },
  { id: "branch", header: "Branch", sortable: true, cell: (r) => r.branchName },
  {
    id: "supplier",
    header: "Supplier",
    sortable: true,
    cell: (r) => (
      <>
        {r.supplierName}
        {r.invoiceReference && <span className="block text-xs text-ink-600">{r.invoiceReference}</span>}
      </>
    ),
  },
  { id: "refrigerant", header: "Refrigerant", sortable: true, cell: (r) => r.refrigerant },
  { id: "containers", header: "Containers", cell: (r) => <span className="tabular">{r.containerCount ?? "—"}</span> },
  {
    id: "amount",
    header: "Quantity",
    sortable: true,
    cell: (r) => <span className="tabular whitespace-nowrap font-medium">{formatMass(r.massG, r.branchMassUnit)}</span>,
  },
];

export function PurchasesView() {
  const [filters, setFilters] = useState<Record<string, string>>({});
  const branches = useBranchOptions();
  return (
    <div className="space-y-3">
      <RecordFilters
        branches={branches.data?.rows ?? []}
        value={filters}
        onChange={setFilters}
        searchLabel="Search supplier"
        searchPlaceholder="Supplier or invoice"
      />
      <RecordTable<PurchaseRow>
        queryKey="purchases"
        path="/api/purchases"
        params={filters}
        columns={columns}
        noun="purchases"
        testId="purchase-row"
      />
    </div>
  );
}
