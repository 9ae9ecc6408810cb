"use client";

import Link from "next/link";
import { CERTIFICATION_STATE_LABELS, CERTIFICATION_STATES, CERTIFICATION_TYPE_LABELS } from "@coldtrail/core";
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
import { CardState } from "./card-state";
import { CardThumb } from "./card-image";
import type { CardRow } from "./card-types";

const helper = serverColumnHelper<CardRow>();
const dateOf = (iso: string | null) => (iso ? iso.slice(0, 10) : "—");

const columns = helper.columns([
  helper.display({
    id: "card",
    header: "Card",
    cell: (info) => {
      const r = info.row.original;
      return <CardThumb id={r.id} mime={r.cardMime} hasThumbnail={r.hasThumbnail} label={`Card of ${r.technicianName}`} />;
    },
  }),
  helper.accessor("technicianName", {
    id: "technician",
    header: "Technician",
    cell: (info) => {
      const r = info.row.original;
      return (
        <Link
          href={`/certifications/${r.id}`}
          className="font-medium text-fjord-700 underline-offset-2 hover:underline"
          data-testid="card-link"
        >
          {r.technicianName}
          <span className="block text-xs font-normal text-ink-600">
            {r.branchNames.length ? r.branchNames.join(", ") : "No branch as technician"}
          </span>
        </Link>
      );
    },
  }),
  helper.accessor((r) => r.types.map((t) => CERTIFICATION_TYPE_LABELS[t]).join(" + "), {
    id: "types",
    header: "Type",
    enableSorting: false,
  }),
  helper.accessor("certifyingOrganisation", {
    id: "certifyingOrganisation",
    header: "Certifying organisation",
    cell: (info) => (
      <span>
        {info.getValue()}
        <span className="block text-xs text-ink-600 tabular">No. {info.row.original.certificateNumber}</span>
      </span>
    ),
  }),
  helper.accessor("uploadedAt", {
    id: "uploadedAt",
    header: "Uploaded",
    cell: (info) => <span className="tabular whitespace-nowrap">{dateOf(info.getValue())}</span>,
  }),
  helper.accessor("state", { id: "state", header: "State", cell: (info) => <CardState state={info.getValue()} /> }),
  helper.accessor((r) => r.decidedAt ?? "", {
    id: "decidedAt",
    header: "Decided",
    cell: (info) => {
      const r = info.row.original;
      return r.decidedAt ? (
        <span className="whitespace-nowrap text-xs">
          <span className="tabular">{dateOf(r.decidedAt)}</span>
          {r.decidedByName && <span className="block text-ink-600">{r.decidedByName}</span>}
        </span>
      ) : (
        "—"
      );
    },
  }),
]);

/**
 * Cards the person may read, paged, sorted and filtered on the server. For the compliance officer it
 * opens on the cards awaiting verification, oldest first: the verification queue.
 */
export function CardsTable({ queue, caption }: { queue: boolean; caption: string }) {
  const [filters, set] = useFilters({ state: queue ? "pending" : "", q: "", branchId: "" });
  const branches = useBranchOptions();

  return (
    <div className="space-y-3">
      <FilterBar className="sm:grid-cols-3">
        <SelectFilter
          label="State"
          value={filters.state}
          onChange={(v) => set("state", v)}
          anyLabel="All states"
          options={optionsOf(CERTIFICATION_STATES, CERTIFICATION_STATE_LABELS)}
        />
        <SearchFilter
          label="Search cards"
          value={filters.q}
          onChange={(v) => set("q", v)}
          placeholder="Technician, number or organisation"
        />
        <BranchFilter branches={branches.data?.rows ?? []} value={filters.branchId} onChange={(v) => set("branchId", v)} />
      </FilterBar>
      <DataTable
        caption={caption}
        url="/api/certifications"
        queryKey="certifications"
        columns={columns}
        filters={filters}
        defaultSort={{ id: "uploadedAt", desc: !queue }}
        noun="cards"
        emptyText={queue && filters.state === "pending" ? "No card is waiting for verification." : "No card matches these filters."}
        errorText="Cards could not be loaded"
        rowTestId="card-row"
      />
    </div>
  );
}
