"use client";

import Link from "next/link";
import { usePathname, useRouter } from "next/navigation";
import { useEffect, useId, useMemo, useState } from "react";
import { keepPreviousData, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import {
  createColumnHelper,
  rowSelectionFeature,
  tableFeatures,
  useTable,
  type PaginationState,
  type RowSelectionState,
  type SortingState,
} from "@tanstack/react-table";
import {
  DUE_BUCKETS,
  FINDING_GROUP_FIELDS,
  FINDING_SORT_FIELDS,
  FINDING_STATE_LABELS,
  FINDING_STATES,
  RULES,
  SEVERITIES,
  SEVERITY_LABELS,
  type FindingGroupField,
  type FindingSortField,
  type FindingViewQuery,
} from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { useBranchOptions } from "@/lib/client/use-branch-options";
import { FilterBar, FilterField, TableView, serverTableFeatures } from "@/components/data-table";
import { DueText, SeverityBadge, StateBadge } from "./finding-badges";
import type { Assignee, FindingListRow, FindingPage, SavedView } from "./types";
import { useIdempotencyKey } from "@/lib/client/idempotency";

const features = tableFeatures({ ...serverTableFeatures, rowSelectionFeature });
const helper = createColumnHelper<typeof features, FindingListRow>();
const emptyRows: FindingListRow[] = [];

export const DUE_WORDS: Record<(typeof DUE_BUCKETS)[number], string> = {
  overdue: "Overdue",
  week: "Due within 7 days",
  month: "Due within 30 days",
  later: "Due later",
  none: "No due date",
};
const GROUP_WORDS: Record<FindingGroupField, string> = {
  branch: "Branch",
  rule: "Rule",
  severity: "Severity",
  state: "Status",
  assignee: "Assignee",
  due: "Due date",
};
const SORT_WORDS: Record<FindingSortField, string> = {
  due: "Due date",
  severity: "Severity",
  branch: "Branch",
  rule: "Rule",
  state: "Status",
  assignee: "Assignee",
  opened: "First found",
  updated: "Last change",
};

type ViewState = FindingViewQuery;

const DEFAULT_VIEW: ViewState = { sort: "due", dir: "asc", state: "active" };

function toParams(view: ViewState): URLSearchParams {
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(view)) if (v !== undefined && v !== null && v !== "") p.set(k, String(v));
  return p;
}

function dueBucket(dueOn: string | null, today: string, active: boolean): string {
  if (!dueOn) return "none";
  const days = Math.round((Date.parse(`${dueOn}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / 86_400_000);
  if (days < 0 && active) return "overdue";
  if (days <= 7) return "week";
  if (days <= 30) return "month";
  return "later";
}

function groupKeyOf(row: FindingListRow, field: FindingGroupField, today: string): string {
  switch (field) {
    case "branch":
      return row.branchName;
    case "rule":
      return row.ruleId;
    case "severity":
      return row.severity;
    case "state":
      return row.state;
    case "assignee":
      return row.assigneeName ?? "";
    case "due":
      return dueBucket(row.dueOn, today, row.state === "open" || row.state === "fix_proposed");
  }
}

export interface FindingsTableProps {
  /** Filters the page fixes (e.g. one audit's findings); not shown as inputs. */
  fixed?: Partial<Pick<ViewState, "auditId" | "branchId">>;
  /** Initial filters (from the address bar). */
  initial?: Partial<ViewState>;
  canAssign: boolean;
  /** Keep the filters in the address bar (the findings page does; an embedded table does not). */
  syncUrl?: boolean;
  today: string;
  compact?: boolean;
}

export function FindingsTable({ fixed = {}, initial = {}, canAssign, syncUrl = false, today, compact = false }: FindingsTableProps) {
  const router = useRouter();
  const pathname = usePathname();
  const queryClient = useQueryClient();
  const [view, setView] = useState<ViewState>({ ...DEFAULT_VIEW, ...initial });
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: compact ? 10 : 25 });
  const [rowSelection, setRowSelection] = useState<RowSelectionState>({});
  const [assignTo, setAssignTo] = useState("");
  const [notice, setNotice] = useState<{ ok: boolean; text: string } | null>(null);
  const [viewName, setViewName] = useState("");
  const statusId = `${useId()}-status`;

  const sorting: SortingState = [{ id: view.sort, desc: view.dir === "desc" }];
  const params = useMemo(() => {
    const p = toParams({ ...view, ...fixed });
    p.set("page", String(pagination.pageIndex + 1));
    p.set("pageSize", String(pagination.pageSize));
    return p.toString();
  }, [view, fixed, pagination]);

  useEffect(() => {
    if (!syncUrl) return;
    const p = toParams(view).toString();
    router.replace(p ? `${pathname}?${p}` : pathname, { scroll: false });
  }, [view, syncUrl, pathname, router]);

  const findings = useQuery({
    queryKey: ["findings", params],
    queryFn: () => fetchJson<FindingPage>(`/api/findings?${params}`),
    placeholderData: keepPreviousData,
  });
  const branches = useBranchOptions(!compact);
  const assignees = useQuery({
    queryKey: ["assignees"],
    queryFn: () => fetchJson<{ rows: Assignee[] }>("/api/findings/assignees"),
    enabled: canAssign,
  });
  const views = useQuery({
    queryKey: ["saved-views"],
    queryFn: () => fetchJson<{ rows: SavedView[] }>("/api/saved-views"),
    enabled: !compact,
  });

  const selectedIds = Object.keys(rowSelection).map(Number);

  const assign = useMutation({
    mutationFn: (body: { findingIds: number[]; assigneeId: number | null }) =>
      fetchJson<{ assigned: number }>("/api/findings/assign", { method: "POST", body: JSON.stringify(body) }),
    onSuccess: (res, vars) => {
      const who = assignees.data?.rows.find((a) => a.id === vars.assigneeId)?.name;
      setNotice({
        ok: true,
        text:
          vars.assigneeId === null
            ? `Assignment removed from ${res.assigned} finding${res.assigned === 1 ? "" : "s"}.`
            : `Assigned ${res.assigned} finding${res.assigned === 1 ? "" : "s"} to ${who ?? "them"}; they have been e-mailed.`,
      });
      setRowSelection({});
      void queryClient.invalidateQueries({ queryKey: ["findings"] });
    },
    onError: (err) =>
      setNotice({
        ok: false,
        text: err instanceof ApiError ? (Object.values(err.fieldErrors)[0]?.[0] ?? err.message) : "The findings could not be assigned",
      }),
  });

  const idem = useIdempotencyKey();
  const saveViewMutation = useMutation({
    mutationFn: (name: string) =>
      fetchJson<SavedView>("/api/saved-views", {
        method: "POST",
        headers: idem.headers,
        body: JSON.stringify({ list: "findings", name, query: view }),
      }),
    onSuccess: (saved) => {
      setNotice({ ok: true, text: `View "${saved.name}" saved.` });
      setViewName("");
      void queryClient.invalidateQueries({ queryKey: ["saved-views"] });
    },
    onError: (err) =>
      setNotice({
        ok: false,
        text: err instanceof ApiError ? (Object.values(err.fieldErrors)[0]?.[0] ?? err.message) : "The view could not be saved",
      }),
  });
  const deleteView = useMutation({
    mutationFn: (id: number) => fetchJson(`/api/saved-views/${id}`, { method: "DELETE" }),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: ["saved-views"] }),
  });

  const columns = useMemo(
    () =>
      helper.columns([
        ...(canAssign
          ? [
              helper.display({
                id: "select",
                header: ({ table }) => (
                  <input
                    type="checkbox"
                    aria-label="Select every finding on this page"
                    checked={table.getIsAllPageRowsSelected()}
                    onChange={table.getToggleAllPageRowsSelectedHandler()}
                    className="h-4 w-4"
                  />
                ),
                cell: ({ row }) => (
                  <input
                    type="checkbox"
                    aria-label={`Select finding ${row.original.id}`}
                    checked={row.getIsSelected()}
                    disabled={!row.getCanSelect()}
                    onChange={row.getToggleSelectedHandler()}
                    className="h-4 w-4"
                  />
                ),
              }),
            ]
          : []),
        helper.accessor("severity", { id: "severity", header: "Severity", cell: (i) => <SeverityBadge severity={i.getValue()} /> }),
        helper.accessor("state", { id: "state", header: "Status", cell: (i) => <StateBadge state={i.getValue()} /> }),
        helper.accessor("ruleId", {
          id: "rule",
          header: "Finding",
          cell: (i) => {
            const r = i.row.original;
            return (
              <div className="min-w-[16rem] max-w-xl">
                <Link
                  href={`/findings/${r.id}`}
                  className="font-medium text-fjord-700 underline-offset-2 hover:underline"
                  data-testid="finding-link"
                >
                  <span className="tabular text-ink-600">{r.ruleId}</span> {r.title}
                </Link>
                <p className="mt-0.5 line-clamp-2 text-xs text-ink-600">{r.detail}</p>
              </div>
            );
          },
        }),
        helper.accessor("recordLabel", {
          id: "record",
          header: "Record",
          enableSorting: false,
          cell: (i) => <span className="whitespace-nowrap">{i.getValue()}</span>,
        }),
        helper.accessor("branchName", { id: "branch", header: "Branch" }),
        helper.accessor((r) => r.assigneeName ?? "", {
          id: "assignee",
          header: "Assignee",
          cell: (i) =>
            i.row.original.assigneeName ? (
              <span className="whitespace-nowrap">{i.row.original.assigneeName}</span>
            ) : (
              <span className="text-ink-500">Not assigned</span>
            ),
        }),
        helper.accessor((r) => r.dueOn ?? "", {
          id: "due",
          header: "Due",
          cell: (i) => (
            <DueText
              dueOn={i.row.original.dueOn}
              today={today}
              active={i.row.original.state === "open" || i.row.original.state === "fix_proposed"}
            />
          ),
        }),
      ]),
    [canAssign, today],
  );

  const table = useTable({
    features,
    columns,
    data: findings.data?.rows ?? emptyRows,
    rowCount: findings.data?.total ?? 0,
    state: { sorting, pagination, rowSelection },
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const s = next[0];
      if (s && (FINDING_SORT_FIELDS as readonly string[]).includes(s.id))
        setView((v) => ({ ...v, sort: s.id as FindingSortField, dir: s.desc ? "desc" : "asc" }));
      setPagination((p) => ({ ...p, pageIndex: 0 }));
    },
    onPaginationChange: setPagination,
    onRowSelectionChange: setRowSelection,
    enableRowSelection: (row) => row.original.state === "open" || row.original.state === "fix_proposed",
    manualSorting: true,
    manualPagination: true,
    enableSortingRemoval: false,
    getRowId: (row) => String(row.id),
  });

  const set = <K extends keyof ViewState>(key: K, value: ViewState[K] | "") => {
    setView((v) => {
      const next = { ...v } as Record<string, unknown>;
      if (value === "" || value === undefined) delete next[key];
      else next[key] = value;
      return next as ViewState;
    });
    setPagination((p) => ({ ...p, pageIndex: 0 }));
  };

  const total = findings.data?.total ?? 0;
  const groups = new Map((findings.data?.groups ?? []).map((g) => [g.key, g]));
  const groupBy = (findings.data?.groupBy ?? null) as FindingGroupField | null;
  const selectClass = "mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-1.5 text-sm";
  const visibleColumns = table.getAllLeafColumns().length;

  return (
    <div className="space-y-3">
      {!compact && (
        <FilterBar label="Filter findings" className="sm:grid-cols-3 lg:grid-cols-6">
          <FilterField label="Search" className="sm:col-span-2">
            <input
              type="search"
              value={view.q ?? ""}
              onChange={(e) => set("q", e.target.value)}
              placeholder="Words, rule id or appliance tag"
              className={selectClass}
            />
          </FilterField>
          {!fixed.branchId && (branches.data?.rows.length ?? 0) > 1 && (
            <FilterField label="Branch">
              <select
                value={view.branchId ?? ""}
                onChange={(e) => set("branchId", e.target.value ? Number(e.target.value) : "")}
                className={selectClass}
              >
                <option value="">All branches</option>
                {branches.data!.rows.map((b) => (
                  <option key={b.id} value={b.id}>
                    {b.name}
                  </option>
                ))}
              </select>
            </FilterField>
          )}
          <FilterField label="Rule">
            <select value={view.ruleId ?? ""} onChange={(e) => set("ruleId", e.target.value)} className={selectClass}>
              <option value="">All rules</option>
              {RULES.map((r) => (
                <option key={r.id} value={r.id}>
                  {r.id} · {r.title}
                </option>
              ))}
            </select>
          </FilterField>
          <FilterField label="Severity">
            <select
              value={view.severity ?? ""}
              onChange={(e) => set("severity", e.target.value as ViewState["severity"])}
              className={selectClass}
            >
              <option value="">Every severity</option>
              {SEVERITIES.map((s) => (
                <option key={s} value={s}>
                  {SEVERITY_LABELS[s]}
                </option>
              ))}
            </select>
          </FilterField>
          <FilterField label="Status">
            <select
              value={view.state ?? "active"}
              onChange={(e) => set("state", e.target.value as ViewState["state"])}
              className={selectClass}
            >
              <option value="active">To act on</option>
              <option value="all">Every status</option>
              {FINDING_STATES.map((s) => (
                <option key={s} value={s}>
                  {FINDING_STATE_LABELS[s]}
                </option>
              ))}
            </select>
          </FilterField>
          <FilterField label="Assignee">
            <select
              value={view.assignee === undefined ? "" : String(view.assignee)}
              onChange={(e) => set("assignee", e.target.value === "" ? "" : e.target.value === "none" ? "none" : Number(e.target.value))}
              className={selectClass}
            >
              <option value="">Anyone</option>
              <option value="none">Not assigned</option>
              {(assignees.data?.rows ?? []).map((a) => (
                <option key={a.id} value={a.id}>
                  {a.name}
                </option>
              ))}
            </select>
          </FilterField>
          <FilterField label="Due">
            <select value={view.due ?? ""} onChange={(e) => set("due", e.target.value as ViewState["due"])} className={selectClass}>
              <option value="">Any due date</option>
              {DUE_BUCKETS.map((d) => (
                <option key={d} value={d}>
                  {DUE_WORDS[d]}
                </option>
              ))}
            </select>
          </FilterField>
          <FilterField label="Group by">
            <select
              value={view.groupBy ?? ""}
              onChange={(e) => set("groupBy", e.target.value as FindingGroupField)}
              className={selectClass}
            >
              <option value="">No grouping</option>
              {FINDING_GROUP_FIELDS.map((g) => (
                <option key={g} value={g}>
                  {GROUP_WORDS[g]}
                </option>
              ))}
            </select>
          </FilterField>
          <FilterField label="Sort by">
            <select
              value={`${view.sort}:${view.dir}`}
              onChange={(e) => {
                const [sort, dir] = e.target.value.split(":") as [FindingSortField, "asc" | "desc"];
                setView((v) => ({ ...v, sort, dir }));
              }}
              className={selectClass}
            >
              {FINDING_SORT_FIELDS.flatMap((s) => [
                <option key={`${s}:asc`} value={`${s}:asc`}>
                  {SORT_WORDS[s]} ↑
                </option>,
                <option key={`${s}:desc`} value={`${s}:desc`}>
                  {SORT_WORDS[s]} ↓
                </option>,
              ])}
            </select>
          </FilterField>
          <div className="flex items-end gap-2 text-sm sm:col-span-3 lg:col-span-3">
            <label className="flex-1">
              <span className="block font-medium text-ink-700">Saved views</span>
              <select
                value=""
                onChange={(e) => {
                  const v = views.data?.rows.find((x) => String(x.id) === e.target.value);
                  if (v) {
                    setView({
                      ...DEFAULT_VIEW,
                      ...Object.fromEntries(Object.entries(v.query).filter(([, x]) => x !== undefined && x !== null)),
                    });
                    setPagination((p) => ({ ...p, pageIndex: 0 }));
                    setNotice({ ok: true, text: `Showing the view "${v.name}".` });
                  }
                }}
                className={selectClass}
              >
                <option value="">{(views.data?.rows.length ?? 0) === 0 ? "No saved views yet" : "Open a saved view…"}</option>
                {(views.data?.rows ?? []).map((v) => (
                  <option key={v.id} value={v.id}>
                    {v.name}
                  </option>
                ))}
              </select>
            </label>
          </div>
          <div className="flex items-end gap-2 text-sm sm:col-span-3 lg:col-span-3">
            <label className="flex-1">
              <span className="block font-medium text-ink-700">Save these filters as</span>
              <input
                value={viewName}
                onChange={(e) => setViewName(e.target.value)}
                placeholder="e.g. Overdue in Peoria"
                maxLength={100}
                className={selectClass}
              />
            </label>
            <button
              type="button"
              disabled={!viewName.trim() || saveViewMutation.isPending}
              onClick={() => saveViewMutation.mutate(viewName.trim())}
              className="rounded-md border border-fjord-600 px-3 py-1.5 font-medium text-fjord-700 hover:bg-fjord-50 disabled:opacity-40"
            >
              Save view
            </button>
          </div>
          {(views.data?.rows.length ?? 0) > 0 && (
            <ul className="flex flex-wrap gap-2 text-xs sm:col-span-3 lg:col-span-6" aria-label="Your saved views">
              {views.data!.rows.map((v) => (
                <li key={v.id} className="inline-flex items-center gap-1 rounded-full border border-ink-200 bg-ink-50 px-2 py-0.5">
                  {v.name}
                  <button
                    type="button"
                    onClick={() => deleteView.mutate(v.id)}
                    className="text-ink-600 hover:text-sev-critical"
                    aria-label={`Delete the saved view ${v.name}`}
                  >
                    ✕
                  </button>
                </li>
              ))}
            </ul>
          )}
        </FilterBar>
      )}

      {notice && (
        <p
          role={notice.ok ? "status" : "alert"}
          className={`rounded-md border px-3 py-2 text-sm ${notice.ok ? "border-ok/40 bg-green-50 text-ok" : "border-sev-critical/40 bg-red-50 text-sev-critical"}`}
        >
          <span aria-hidden="true">{notice.ok ? "✓ " : "⚠ "}</span>
          {notice.text}
        </p>
      )}

      {canAssign && selectedIds.length > 0 && (
        <div
          className="flex flex-wrap items-end gap-3 rounded-lg border border-fjord-200 bg-fjord-50 p-3 text-sm"
          role="region"
          aria-label="Assign the selected findings"
        >
          <p className="font-medium text-ink-900">
            {selectedIds.length} finding{selectedIds.length === 1 ? "" : "s"} selected
          </p>
          <label>
            <span className="block font-medium text-ink-700">Assign to</span>
            <select
              value={assignTo}
              onChange={(e) => setAssignTo(e.target.value)}
              className="mt-1 rounded-md border border-ink-300 bg-white px-2 py-1.5"
            >
              <option value="">Choose a person…</option>
              {(assignees.data?.rows ?? []).map((a) => (
                <option key={a.id} value={a.id}>
                  {a.name} ({a.role === "owner" ? "owner" : "branch manager"})
                </option>
              ))}
              <option value="none">Nobody (remove the assignment)</option>
            </select>
          </label>
          <button
            type="button"
            disabled={!assignTo || assign.isPending}
            onClick={() => assign.mutate({ findingIds: selectedIds, assigneeId: assignTo === "none" ? null : Number(assignTo) })}
            className="rounded-md bg-fjord-600 px-4 py-2 font-semibold text-white hover:bg-fjord-700 disabled:opacity-40"
          >
            {assign.isPending ? "Assigning…" : "Assign"}
          </button>
          <button type="button" onClick={() => setRowSelection({})} className="rounded-md border border-ink-300 bg-white px-3 py-2">
            Clear selection
          </button>
        </div>
      )}

      <TableView
        table={table}
        query={findings}
        total={total}
        pageIndex={pagination.pageIndex}
        pageSize={pagination.pageSize}
        statusId={statusId}
        noun="findings"
        emptyText="No findings match these filters."
        errorText="Findings could not be loaded"
        rowTestId="finding-row"
        rowAttributes={(row) => ({ "data-finding-id": row.id, "data-rule": row.ruleId })}
        renderBeforeRow={(row, i, rows) => {
          if (!groupBy) return null;
          const key = groupKeyOf(row.original, groupBy, today);
          if (i > 0 && key === groupKeyOf(rows[i - 1]!.original, groupBy, today)) return null;
          const group = groups.get(key);
          return (
            <tr className="bg-ink-50" data-testid="finding-group">
              <th colSpan={visibleColumns} scope="colgroup" className="px-3 py-1.5 text-left text-sm font-semibold text-ink-900">
                {GROUP_WORDS[groupBy]}: {group?.label ?? (key || "—")}
                <span className="ml-2 font-normal text-ink-600">
                  {group?.count ?? "?"} finding{group?.count === 1 ? "" : "s"}
                </span>
              </th>
            </tr>
          );
        }}
        pager={compact ? "pages" : "full"}
        pageSizes={[10, 25, 50, 100, 200]}
      />
    </div>
  );
}
