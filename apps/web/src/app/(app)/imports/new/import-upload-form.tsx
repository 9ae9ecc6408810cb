"use client";

import { useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQuery } from "@tanstack/react-query";
import { useForm, type FieldPath } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { IMPORT_FIELDS, IMPORT_KIND_LABELS, IMPORT_KINDS, IMPORT_MAX_BYTES, importUploadInput } from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import type { BranchOption } from "@/lib/client/types";
import { FieldError } from "@/components/form";
import { useIdempotencyKey } from "@/lib/client/idempotency";

type FormIn = z.input<typeof importUploadInput>;
type FormOut = z.output<typeof importUploadInput>;

const KIND_HINTS = {
  appliances: "Tag, description, category, refrigerant, full charge and site of each appliance",
  cylinders: "Serial, water capacity, tare, requalification date and contents of each recovery cylinder",
  jobs: "Date, kind, appliance tag, technician and amounts of jobs done before Coldtrail",
} as const;

export function ImportUploadForm() {
  const router = useRouter();
  const uid = useId();
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const branches = useQuery({ queryKey: ["branches"], queryFn: () => fetchJson<{ rows: BranchOption[] }>("/api/lookup/branches") });
  const { register, handleSubmit, watch, formState, setError } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(importUploadInput),
    defaultValues: { kind: "appliances", branchId: "" },
  });
  const kind: FormOut["kind"] = watch("kind");
  const branchRows = branches.data?.rows ?? [];

  const idem = useIdempotencyKey();
  const upload = useMutation({
    mutationFn: async ({ values, chosen }: { values: FormOut; chosen: File }) => {
      const data = new FormData();
      data.set("kind", values.kind);
      data.set("branchId", String(values.branchId));
      data.set("file", chosen, chosen.name);
      const res = await fetch("/api/imports", { method: "POST", body: data, headers: { accept: "application/json", ...idem.headers } });
      const body = res.headers.get("content-type")?.includes("application/json") ? await res.json() : null;
      if (!res.ok) throw new ApiError(res.status, body?.error?.message ?? `Upload failed (${res.status})`, body?.error?.fieldErrors ?? {});
      return body as { id: number };
    },
    onSuccess: ({ id }) => router.push(`/imports/${id}`),
    onError: (err) => {
      if (err instanceof ApiError) {
        for (const [field, messages] of Object.entries(err.fieldErrors)) {
          if (field === "file") setFileError(messages[0] ?? "This file cannot be imported");
          else setError(field as FieldPath<FormIn>, { type: "server", message: messages[0] });
        }
        const onFields = Object.keys(err.fieldErrors).length > 0;
        setFormError(
          err.status === 403
            ? "You may not import into that branch."
            : onFields
              ? "Nothing was saved: see the message below."
              : err.message,
        );
      } else setFormError("The file could not be sent. Check your connection; nothing was saved.");
    },
  });

  const onSubmit = handleSubmit(
    (values) => {
      setFormError(null);
      if (!file) {
        setFileError("Choose the spreadsheet to import");
        return;
      }
      upload.mutate({ values, chosen: file });
    },
    () => {
      if (!file) setFileError("Choose the spreadsheet to import");
    },
  );

  const required = IMPORT_FIELDS[kind].filter((f) => f.required).map((f) => f.label);

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      {formError && (
        <p role="alert" className="rounded-lg border border-sev-critical/50 bg-red-50 px-4 py-3 font-medium text-sev-critical">
          ⚠ {formError}
        </p>
      )}
      <fieldset>
        <legend className="text-base font-semibold text-ink-900">What does the file hold?</legend>
        <div className="mt-2 grid gap-2">
          {IMPORT_KINDS.map((k) => (
            <label
              key={k}
              className="flex min-h-14 cursor-pointer items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 py-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50"
            >
              <input type="radio" value={k} {...register("kind")} className="size-5 accent-fjord-600" />
              <span>
                <span className="block font-semibold">{IMPORT_KIND_LABELS[k]}</span>
                <span className="block text-sm text-ink-600">{KIND_HINTS[k]}</span>
              </span>
            </label>
          ))}
        </div>
        <FieldError id={`${uid}-kind-error`} message={formState.errors.kind?.message} />
      </fieldset>

      <div>
        <label htmlFor={`${uid}-branch`} className="block text-base font-semibold text-ink-900">
          Branch to import into
        </label>
        <select
          id={`${uid}-branch`}
          {...register("branchId")}
          className="mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-3 text-base"
          aria-invalid={formState.errors.branchId ? true : undefined}
          aria-describedby={formState.errors.branchId ? `${uid}-branchId-error` : undefined}
        >
          <option value="">Choose a branch</option>
          {branchRows.map((b) => (
            <option key={b.id} value={b.id}>
              {b.name} ({b.code})
            </option>
          ))}
        </select>
        <FieldError id={`${uid}-branchId-error`} message={formState.errors.branchId?.message} />
      </div>

      <div>
        <label htmlFor={`${uid}-file`} className="block text-base font-semibold text-ink-900">
          Spreadsheet
        </label>
        <p id={`${uid}-file-hint`} className="text-sm text-ink-600">
          An Excel workbook (.xlsx, first worksheet) or a CSV file, up to {IMPORT_MAX_BYTES / 1024 / 1024} MB, with the column headings in
          its first row. Required columns: {required.join(", ")}.{" "}
          <a href={`/api/imports/template?kind=${kind}`} download className="font-medium text-fjord-700 underline">
            Download the template
          </a>
          .
        </p>
        <input
          id={`${uid}-file`}
          type="file"
          accept=".xlsx,.csv,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet,text/csv"
          onChange={(e) => {
            setFileError(null);
            setFile(e.target.files?.[0] ?? null);
          }}
          className="mt-2 block w-full rounded-lg border border-ink-300 bg-white px-3 py-3 text-base file:mr-3 file:rounded-md file:border-0 file:bg-fjord-100 file:px-3 file:py-2 file:font-semibold file:text-fjord-800"
          aria-invalid={fileError ? true : undefined}
          aria-describedby={fileError ? `${uid}-file-error ${uid}-file-hint` : `${uid}-file-hint`}
        />
        <FieldError id={`${uid}-file-error`} message={fileError} />
      </div>

      <button
        type="submit"
        disabled={upload.isPending}
        className="w-full rounded-lg bg-fjord-600 px-4 py-3.5 text-lg font-semibold text-white hover:bg-fjord-700 disabled:opacity-60 sm:w-auto"
      >
        {upload.isPending ? "Reading the file…" : "Read the file"}
      </button>
    </form>
  );
}
