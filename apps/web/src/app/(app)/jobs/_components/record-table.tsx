"use client";

import { useMemo, type ReactNode } from "react";
import {
  DataTable,
  DateFilter,
  FilterBar,
  SearchFilter,
  BranchFilter,
  VoidedFilter,
  serverColumnHelper,
  voidedRowClass,
} from "@/components/data-table";

export { VoidTag } from "@/components/data-table";

export interface RecordColumn<T> {
  id: string;
  header: string;
  sortable?: boolean;
  cell: (row: T) => ReactNode;
}

/**
 * A server-paged, server-sorted table of records (disposals, shipments, purchases). The caller
 * passes the API path, the filters as query parameters, and the columns.
 */
export function RecordTable<T extends { id: number; voidedAt?: string | null }>({
  queryKey,
  path,
  params,
  columns,
  defaultSort = "date",
  noun,
  testId,
}: {
  queryKey: string;
  path: string;
  params: Record<string, string>;
  columns: RecordColumn<T>[];
  defaultSort?: string;
  noun: string;
  testId: string;
}) {
  const tableColumns = useMemo(() => {
    const helper = serverColumnHelper<T>();
    return helper.columns(
      columns.map((c) =>
        helper.accessor((row: T) => String((row as Record<string, unknown>)[c.id] ?? ""), {
          id: c.id,
          header: c.header,
          enableSorting: c.sortable ?? false,
          cell: (info) => c.cell(info.row.original),
        }),
      ),
    );
  }, [columns]);

  return (
    <DataTable
      url={path}
      queryKey={queryKey}
      columns={tableColumns}
      filters={params}
      defaultSort={{ id: defaultSort, desc: true }}
      noun={noun}
      emptyText={`No ${noun} match these filters.`}
      errorText={`The ${noun} could not be loaded`}
      rowTestId={testId}
      rowClassName={voidedRowClass}
      pager="pages"
    />
  );
}

/** Branch, date range, search and voided filters shared by the record lists. */
export function RecordFilters({
  branches,
  value,
  onChange,
  searchLabel,
  searchPlaceholder,
}: {
  branches: { id: number; name: string }[];
  value: Record<string, string>;
  onChange: (next: Record<string, string>) => void;
  searchLabel: string;
  searchPlaceholder: string;
}) {
  const set = (k: string, v: string) => onChange({ ...value, [k]: v });
  return (
    <FilterBar className="sm:grid-cols-2 lg:grid-cols-5">
      <SearchFilter label={searchLabel} value={value.q ?? ""} onChange={(v) => set("q", v)} placeholder={searchPlaceholder} />
      <BranchFilter branches={branches} value={value.branchId ?? ""} onChange={(v) => set("branchId", v)} />
      <DateFilter label="From" value={value.from ?? ""} onChange={(v) => set("from", v)} />
      <DateFilter label="To" value={value.to ?? ""} onChange={(v) => set("to", v)} />
      <VoidedFilter label="Voided records" value={value.voided ?? ""} onChange={(v) => set("voided", v)} />
    </FilterBar>
  );
}
