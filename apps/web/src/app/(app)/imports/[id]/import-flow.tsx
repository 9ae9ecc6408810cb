"use client";

import Link from "next/link";
import { useId, useState } from "react";
import { keepPreviousData, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { createColumnHelper, rowPaginationFeature, tableFeatures, useTable, type PaginationState } from "@tanstack/react-table";
import { IMPORT_FIELDS, IMPORT_KIND_LABELS, checkImportMapping, type ImportMapping } from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { count, hasHave } from "@/lib/client/count";
import { LoadError } from "@/components/detail";
import { ImportStateBadge } from "../_components/import-state";
import type { ImportIssueRow, ImportView, Paged } from "../_components/import-types";

const REGISTER_LINKS = { appliances: "/appliances", cylinders: "/cylinders", jobs: "/jobs" } as const;
const n = (x: number) => x.toLocaleString("en-US");

export function ImportFlow({ id }: { id: string }) {
  const queryClient = useQueryClient();
  const [remap, setRemap] = useState(false);
  const view = useQuery({
    queryKey: ["import", id],
    queryFn: () => fetchJson<ImportView>(`/api/imports/${encodeURIComponent(id)}`),
    retry: false,
    // The page follows the background work: it polls while a step runs.
    refetchInterval: (q) => (q.state.data && (q.state.data.state === "checking" || q.state.data.state === "importing") ? 1000 : false),
  });
  const refresh = () => queryClient.invalidateQueries({ queryKey: ["import", id] });

  if (view.isLoading) return <p className="text-ink-600">Loading the import…</p>;
  if (view.isError) {
    return <LoadError error={view.error} noun="import" back={{ href: "/imports", label: "Back to imports" }} />;
  }
  const d = view.data!;
  const what = IMPORT_KIND_LABELS[d.kind].toLowerCase();
  const showMapping = d.state === "mapping" || (remap && (d.state === "checked" || d.state === "failed"));

  return (
    <div className="space-y-6">
      <Link href="/imports" className="text-sm text-fjord-700 underline">
        ← Spreadsheet import
      </Link>
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm font-medium uppercase tracking-wide text-ink-600">
            {IMPORT_KIND_LABELS[d.kind]} into {d.branchName}
          </p>
          <h1 className="break-all text-2xl font-semibold text-ink-950">{d.fileLabel}</h1>
          <p className="text-sm text-ink-600">
            {d.fileFormat.toUpperCase()} · {(d.fileSize / 1024).toFixed(0)} KB · uploaded by {d.createdByName}
          </p>
        </div>
        <ImportStateBadge state={d.state} />
      </header>

      <Steps state={d.state} />

      {showMapping && (
        <MappingForm
          detail={d}
          onDone={async () => {
            setRemap(false);
            await refresh();
          }}
        />
      )}

      {(d.state === "checking" || d.state === "importing") && (
        <ProgressPanel
          label={d.state === "checking" ? "Checking every row" : `Importing ${count(d.validRows, "row")} in one go`}
          progress={d.progress}
          note={
            d.state === "checking"
              ? `${count(d.totalRows, "row")} checked so far`
              : `${count(d.totalRows, "row")} read · nothing is saved until every row is written`
          }
        />
      )}

      {d.state === "failed" && (
        <div role="alert" className="rounded-lg border border-sev-critical/50 bg-red-50 p-4 text-sev-critical">
          <p className="font-semibold">
            <span aria-hidden="true">✕ </span>The import stopped. Nothing was imported.
          </p>
          <p className="mt-1 text-ink-900" data-testid="import-error">
            {d.error}
          </p>
          <div className="mt-3 flex flex-wrap gap-2">
            <Link href="/imports/new" className="rounded-lg bg-fjord-600 px-4 py-2.5 font-semibold text-white">
              Upload a corrected file
            </Link>
            {!remap && d.mapping && (
              <button
                type="button"
                onClick={() => setRemap(true)}
                className="rounded-lg border border-ink-300 bg-white px-4 py-2.5 font-semibold text-ink-900"
              >
                Check it again
              </button>
            )}
          </div>
        </div>
      )}

      {d.state === "cancelled" && (
        <p className="rounded-lg border border-ink-300 bg-ink-100 p-4 text-ink-800">This import was cancelled; nothing was imported.</p>
      )}

      {(d.state === "checked" || d.state === "imported") && !showMapping && (
        <section aria-labelledby="summary-h" className="space-y-3">
          <h2 id="summary-h" className="sr-only">
            Summary
          </h2>
          {d.state === "imported" ? (
            <p role="status" className="rounded-lg border border-ok/50 bg-green-50 p-4 text-ok" data-testid="import-summary">
              <span aria-hidden="true">✓ </span>
              <strong>
                Imported {n(d.importedRows)} {what}
              </strong>{" "}
              into {d.branchName}.{" "}
              {d.invalidRows > 0
                ? `${count(d.invalidRows, "row")} with problems ${d.invalidRows === 1 ? "was" : "were"} not imported; ${d.invalidRows === 1 ? "it is" : "they are"} listed below.`
                : "Every row was imported."}{" "}
              <Link href={REGISTER_LINKS[d.kind]} className="font-semibold underline">
                Open the register
              </Link>
            </p>
          ) : (
            <div className="rounded-lg border border-fjord-600/50 bg-white p-4" data-testid="import-summary">
              <p className="text-lg">
                <strong className="tabular">{n(d.validRows)}</strong> of <span className="tabular">{n(d.totalRows)}</span> rows can be
                imported.{" "}
                {d.invalidRows > 0 && (
                  <span className="text-sev-major">
                    <span aria-hidden="true">⚠ </span>
                    <strong className="tabular">{n(d.invalidRows)}</strong> {d.invalidRows === 1 ? "row" : "rows"} {hasHave(d.invalidRows)}{" "}
                    problems and will not be imported.
                  </span>
                )}
              </p>
              <p className="mt-1 text-sm text-ink-600">
                Correct those rows in your file and import them later, or import the valid rows now. The rows are checked once more as they
                are written.
              </p>
              <CommitButtons detail={d} onRemap={() => setRemap(true)} onDone={refresh} />
            </div>
          )}
          <PreviewTable detail={d} />
          {d.invalidRows > 0 && <IssuesTable id={d.id} />}
        </section>
      )}
    </div>
  );
}

function Steps({ state }: { state: ImportView["state"] }) {
  const index = { mapping: 0, checking: 1, checked: 2, importing: 3, imported: 4, failed: -1, cancelled: -1 }[state];
  const steps = ["Choose the columns", "Check the rows", "Review the problems", "Import"];
  if (index < 0) return null;
  return (
    <ol className="flex flex-wrap gap-2 text-sm" aria-label="Steps">
      {steps.map((s, i) => {
        const done = i < index;
        const current = i === index || (index === 4 && i === 3);
        return (
          <li
            key={s}
            aria-current={current ? "step" : undefined}
            className={`rounded-full border px-3 py-1 ${current ? "border-fjord-600 bg-fjord-50 font-semibold text-fjord-800" : done ? "border-ok/40 text-ok" : "border-ink-200 text-ink-600"}`}
          >
            <span aria-hidden="true">{done || index === 4 ? "✓ " : `${i + 1}. `}</span>
            {s}
          </li>
        );
      })}
    </ol>
  );
}

function ProgressPanel({ label, progress, note }: { label: string; progress: number; note: string }) {
  const uid = useId();
  return (
    <section className="rounded-lg border border-ink-200 bg-white p-4" aria-labelledby={`${uid}-l`}>
      <p id={`${uid}-l`} className="font-semibold text-ink-950">
        {label}…
      </p>
      <div
        role="progressbar"
        aria-labelledby={`${uid}-l`}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={progress}
        className="mt-2 h-4 w-full overflow-hidden rounded-full bg-ink-100"
      >
        <div className="h-full rounded-full bg-fjord-600 transition-all" style={{ width: `${Math.max(2, progress)}%` }} />
      </div>
      <p className="mt-1 text-sm text-ink-600 tabular" aria-live="polite">
        {progress}% · {note}
      </p>
    </section>
  );
}

function MappingForm({ detail, onDone }: { detail: ImportView; onDone: () => Promise<void> }) {
  const uid = useId();
  const fields = IMPORT_FIELDS[detail.kind];
  const [mapping, setMapping] = useState<ImportMapping>(() => {
    const m: ImportMapping = {};
    for (const f of fields) m[f.key] = detail.mapping?.[f.key] ?? null;
    return m;
  });
  const [tried, setTried] = useState(false);
  const [serverError, setServerError] = useState<string | null>(null);
  const problems = checkImportMapping(detail.kind, mapping, detail.headings.length);
  const problemOf = (key: string) => problems.find((p) => p.field === key)?.message;
  const save = useMutation({
    mutationFn: () => fetchJson(`/api/imports/${detail.id}/mapping`, { method: "PUT", body: JSON.stringify({ mapping }) }),
    onSuccess: onDone,
    onError: (err) =>
      setServerError(
        err instanceof ApiError
          ? (Object.values(err.fieldErrors)[0]?.[0] ?? err.message)
          : "The columns could not be sent; nothing was changed.",
      ),
  });
  const sampleOf = (column: number | null) =>
    column === null ? "" : (detail.sample.map((r) => r[column] ?? "").find((v) => v.trim() !== "") ?? "");

  return (
    <section aria-labelledby={`${uid}-h`} className="space-y-4">
      <div>
        <h2 id={`${uid}-h`} className="text-lg font-semibold text-ink-950">
          Which column holds what?
        </h2>
        <p className="text-sm text-ink-600">
          Columns were matched by their headings; check them and change any that are wrong. Fields marked required must come from a column.
        </p>
      </div>
      <form
        onSubmit={(e) => {
          e.preventDefault();
          setTried(true);
          setServerError(null);
          if (problems.length === 0) save.mutate();
        }}
        noValidate
        className="space-y-4"
      >
        {tried && problems.length > 0 && (
          <p role="alert" className="rounded-lg border border-sev-critical/50 bg-red-50 px-4 py-3 font-medium text-sev-critical">
            ⚠ {problems.length === 1 ? problems[0]!.message : `${problems.length} fields need a column (see below)`}
          </p>
        )}
        {serverError && (
          <p role="alert" className="rounded-lg border border-sev-critical/50 bg-red-50 px-4 py-3 font-medium text-sev-critical">
            ⚠ {serverError}
          </p>
        )}
        <div className="grid gap-3 sm:grid-cols-2">
          {fields.map((f) => {
            const problem = tried ? problemOf(f.key) : undefined;
            const column = mapping[f.key] ?? null;
            return (
              <div key={f.key} className="rounded-lg border border-ink-200 bg-white p-3">
                <label htmlFor={`${uid}-${f.key}`} className="block font-semibold text-ink-900">
                  {f.label}{" "}
                  {f.required ? (
                    <span className="text-sm font-normal text-ink-600">(required)</span>
                  ) : (
                    <span className="text-sm font-normal text-ink-600">(optional)</span>
                  )}
                </label>
                <select
                  id={`${uid}-${f.key}`}
                  value={column === null ? "" : String(column)}
                  onChange={(e) => setMapping((m) => ({ ...m, [f.key]: e.target.value === "" ? null : Number(e.target.value) }))}
                  className="mt-1 block w-full rounded-md border border-ink-300 bg-white px-2 py-2"
                  aria-invalid={problem ? true : undefined}
                  aria-describedby={`${uid}-${f.key}-hint${problem ? ` ${uid}-${f.key}-error` : ""}`}
                >
                  <option value="">— not in the file —</option>
                  {detail.headings.map((h, i) => (
                    <option key={i} value={i}>
                      {h}
                    </option>
                  ))}
                </select>
                <p id={`${uid}-${f.key}-hint`} className="mt-1 text-xs text-ink-600">
                  {column !== null && sampleOf(column) ? (
                    <>
                      First value: <span className="font-mono text-ink-900">{sampleOf(column)}</span>
                    </>
                  ) : (
                    f.hint
                  )}
                </p>
                {problem && (
                  <p id={`${uid}-${f.key}-error`} className="mt-1 text-sm font-medium text-sev-critical">
                    <span aria-hidden="true">⚠ </span>
                    {problem}
                  </p>
                )}
              </div>
            );
          })}
        </div>

        <details className="rounded-lg border border-ink-200 bg-white p-3">
          <summary className="cursor-pointer font-medium">The first rows of the file</summary>
          <div className="mt-2 overflow-x-auto">
            <table className="min-w-full text-xs">
              <thead className="bg-ink-100 text-left">
                <tr>
                  {detail.headings.map((h, i) => (
                    <th key={i} scope="col" className="px-2 py-1 font-semibold">
                      {h}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {detail.sample.map((row, r) => (
                  <tr key={r} className="border-t border-ink-100">
                    {detail.headings.map((_, i) => (
                      <td key={i} className="px-2 py-1">
                        {row[i] ?? ""}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </details>

        <button
          type="submit"
          disabled={save.isPending}
          className="rounded-lg bg-fjord-600 px-5 py-3 text-lg font-semibold text-white hover:bg-fjord-700 disabled:opacity-60"
        >
          {save.isPending ? "Starting…" : "Check every row"}
        </button>
      </form>
    </section>
  );
}

function CommitButtons({ detail, onRemap, onDone }: { detail: ImportView; onRemap: () => void; onDone: () => Promise<unknown> }) {
  const [error, setError] = useState<string | null>(null);
  const commit = useMutation({
    mutationFn: () => fetchJson(`/api/imports/${detail.id}/commit`, { method: "POST" }),
    onSuccess: onDone,
    onError: (err) => setError(err instanceof ApiError ? err.message : "The import could not be started; nothing was imported."),
  });
  const cancel = useMutation({
    mutationFn: () => fetchJson(`/api/imports/${detail.id}/cancel`, { method: "POST" }),
    onSuccess: onDone,
    onError: (err) => setError(err instanceof ApiError ? err.message : "The import could not be cancelled."),
  });
  return (
    <div className="mt-3 space-y-2">
      <div className="flex flex-wrap gap-2">
        <button
          type="button"
          disabled={detail.validRows === 0 || commit.isPending}
          onClick={() => commit.mutate()}
          className="rounded-lg bg-fjord-600 px-5 py-3 font-semibold text-white hover:bg-fjord-700 disabled:opacity-50"
        >
          {detail.validRows === 0 ? "No row can be imported" : `Import ${count(detail.validRows, "valid row")}`}
        </button>
        <button type="button" onClick={onRemap} className="rounded-lg border border-ink-300 bg-white px-4 py-3 font-semibold text-ink-900">
          Change the columns
        </button>
        <button
          type="button"
          disabled={cancel.isPending}
          onClick={() => cancel.mutate()}
          className="rounded-lg border border-ink-300 bg-white px-4 py-3 text-ink-700"
        >
          Cancel the import
        </button>
      </div>
      {error && (
        <p role="alert" className="text-sm font-medium text-sev-critical">
          ⚠ {error}
        </p>
      )}
    </div>
  );
}

function PreviewTable({ detail }: { detail: ImportView }) {
  if (detail.preview.length === 0) return null;
  return (
    <details open className="rounded-lg border border-ink-200 bg-white p-3">
      <summary className="cursor-pointer font-semibold text-ink-950">
        Preview: the first {detail.preview.length} rows {detail.state === "imported" ? "as imported" : "as they would be imported"}
      </summary>
      <div className="mt-2 overflow-x-auto">
        <table className="min-w-full text-sm">
          <caption className="sr-only">Preview of the first rows</caption>
          <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
            <tr>
              <th scope="col" className="px-3 py-2">
                Row
              </th>
              <th scope="col" className="px-3 py-2">
                Outcome
              </th>
              <th scope="col" className="px-3 py-2">
                What it holds
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {detail.preview.map((r) => (
              <tr key={r.rowNumber} data-testid="preview-row">
                <td className="px-3 py-2 tabular">{r.rowNumber}</td>
                <td className="whitespace-nowrap px-3 py-2">
                  {r.ok ? (
                    <span className="font-medium text-ok">
                      <span aria-hidden="true">✓ </span>
                      {detail.state === "imported" ? "Imported" : "Valid"}
                    </span>
                  ) : (
                    <span className="font-medium text-sev-critical">
                      <span aria-hidden="true">✕ </span>Not imported
                    </span>
                  )}
                </td>
                <td className="px-3 py-2">
                  {r.summary}
                  {r.issues.map((i, k) => (
                    <span key={k} className="block text-xs text-sev-critical">
                      {i.message}
                    </span>
                  ))}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </details>
  );
}

const issueFeatures = tableFeatures({ rowPaginationFeature });
const issueHelper = createColumnHelper<typeof issueFeatures, ImportIssueRow>();
const emptyIssues: ImportIssueRow[] = [];
const issueColumns = issueHelper.columns([
  issueHelper.accessor("rowNumber", { header: "Row", cell: (i) => <span className="tabular">{i.getValue()}</span> }),
  issueHelper.accessor((r) => r.fieldLabel ?? "", {
    id: "field",
    header: "Field",
    cell: (i) => {
      const r = i.row.original;
      if (!r.fieldLabel) return "The whole row";
      return (
        <span>
          {r.fieldLabel}
          {r.columnLabel && r.columnLabel !== r.fieldLabel && <span className="block text-xs text-ink-600">column “{r.columnLabel}”</span>}
        </span>
      );
    },
  }),
  issueHelper.accessor((r) => r.value ?? "", {
    id: "value",
    header: "Value in the file",
    cell: (i) => (i.getValue() ? <span className="font-mono text-xs">{i.getValue()}</span> : <span className="text-ink-500">(empty)</span>),
  }),
  issueHelper.accessor("message", { header: "Why" }),
]);

function IssuesTable({ id }: { id: number }) {
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 50 });
  const issues = useQuery({
    queryKey: ["import-issues", id, pagination],
    queryFn: () =>
      fetchJson<Paged<ImportIssueRow>>(`/api/imports/${id}/issues?page=${pagination.pageIndex + 1}&pageSize=${pagination.pageSize}`),
    placeholderData: keepPreviousData,
  });
  const table = useTable({
    features: issueFeatures,
    columns: issueColumns,
    data: issues.data?.rows ?? emptyIssues,
    rowCount: issues.data?.total ?? 0,
    state: { pagination },
    onPaginationChange: setPagination,
    manualPagination: true,
    getRowId: (r) => String(r.id),
  });
  const total = issues.data?.total ?? 0;
  return (
    <section aria-labelledby="issues-h" className="space-y-2">
      <h3 id="issues-h" className="font-semibold text-ink-950">
        Problems found ({n(total)})
      </h3>
      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
        <table className="min-w-full text-sm" aria-busy={issues.isFetching}>
          <caption className="sr-only">Problems by row, field and why</caption>
          <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
            {table.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((h) => (
                  <th key={h.id} scope="col" className="px-3 py-2 font-semibold">
                    <table.FlexRender header={h} />
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-100">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} data-testid="issue-row">
                {row.getAllCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {total > pagination.pageSize && (
        <div className="flex items-center justify-end gap-2 text-sm">
          <button
            type="button"
            onClick={() => table.previousPage()}
            disabled={!table.getCanPreviousPage()}
            className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40"
          >
            Previous
          </button>
          <span className="tabular">
            Page {pagination.pageIndex + 1} of {Math.max(1, table.getPageCount())}
          </span>
          <button
            type="button"
            onClick={() => table.nextPage()}
            disabled={!table.getCanNextPage()}
            className="rounded-md border border-ink-300 bg-white px-3 py-1.5 disabled:opacity-40"
          >
            Next
          </button>
        </div>
      )}
    </section>
  );
}
