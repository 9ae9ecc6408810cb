"use client";

import Link from "next/link";
import { useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useForm, type FieldValues, type Resolver, type UseFormReturn } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { DISPOSAL_PATH_LABELS, DISPOSAL_PATHS, disposalRecordInput, disposalStatementInput, formatMass } from "@coldtrail/core";
import { ApiError, fetchJson, readApiResponse } from "@/lib/client/fetch-json";
import { saveErrorMessage, submitOrExplain } from "@/lib/client/form-save";
import type { JobDetail, JobListPage } from "@/lib/client/types";
import { RadioCards, fieldAria } from "@/components/form";
import { AmountField, Field, FormAlert, TextField, labelClass, primaryButton, todayIn } from "../../jobs/_components/form-bits";

const MAX_DOCUMENT_BYTES = 10 * 1024 * 1024;
const DISPOSAL_PATH_OPTIONS = DISPOSAL_PATHS.map((p) => ({ value: p, label: DISPOSAL_PATH_LABELS[p] }));
const DOCUMENT_TYPES = ["image/jpeg", "image/png", "image/webp", "image/heic", "application/pdf"];

/** Grams shown back in the branch's unit, for prefilling a form. */
function massIn(grams: number, unit: "lb_oz" | "kg"): string {
  const v = unit === "kg" ? grams / 1000 : grams / 453.59237;
  return String(Math.round(v * 100) / 100);
}

/** A text, date or textarea field of these forms, by its name in the form. */
function fieldsOf(uid: string, form: UseFormReturn<FieldValues>) {
  return (name: string, label: string, opts: { type?: string; hint?: string; textarea?: boolean } = {}) => (
    <TextField
      id={`${uid}-${name}`}
      label={label}
      hint={opts.hint}
      hintFirst
      error={form.formState.errors[name]?.message as string | undefined}
      registration={form.register(name)}
      type={opts.type ?? "text"}
      rows={opts.textarea ? 2 : undefined}
    />
  );
}

/** The record or signed statement that proves a disposal, chosen by the appliance's size. */
export function DisposalProofForm({ jobId }: { jobId: string | null }) {
  const job = useQuery({
    queryKey: ["job", jobId],
    queryFn: () => fetchJson<JobDetail>(`/api/jobs/${jobId}`),
    enabled: jobId !== null,
    retry: false,
  });
  const recent = useQuery({
    queryKey: ["jobs", "disposals-recent"],
    queryFn: () => fetchJson<JobListPage>("/api/jobs?kind=disposal&pageSize=20"),
    enabled: jobId === null,
  });
  const [override, setOverride] = useState<"record" | "statement" | null>(null);

  if (jobId === null) {
    return (
      <div className="space-y-4">
        <h1 className="text-2xl font-semibold text-ink-950">Disposal record or signed statement</h1>
        <p className="text-ink-600">
          Choose the disposal job it documents. Log the disposal job first if the recovery is not recorded yet.
        </p>
        <ul className="space-y-2" aria-label="Recent disposal jobs">
          {recent.isLoading && <li className="text-ink-600">Loading disposal jobs…</li>}
          {recent.data?.rows.length === 0 && <li className="text-ink-600">No disposal jobs you may see.</li>}
          {recent.data?.rows.map((r) => (
            <li key={r.id}>
              <Link
                href={`/disposals/new?jobId=${r.id}`}
                className="block min-h-14 rounded-lg border border-ink-200 bg-white px-4 py-3 hover:border-fjord-600"
              >
                <span className="block font-semibold text-ink-950">
                  {r.applianceTag} <span className="font-normal text-ink-600">· {r.performedOn}</span>
                </span>
                <span className="block text-sm text-ink-600">
                  {r.applianceDescription} — {formatMass(r.recoveredG, r.branchMassUnit)} {r.refrigerant}
                </span>
              </Link>
            </li>
          ))}
        </ul>
        <Link href="/jobs/new?kind=disposal" className="inline-block font-medium text-fjord-700 underline">
          Log a disposal job
        </Link>
      </div>
    );
  }
  if (job.isLoading) return <p className="text-ink-600">Loading the disposal job…</p>;
  if (job.isError || !job.data) return <p role="alert">No such job, or it is not one you may see.</p>;
  const j = job.data;
  const existing = j.disposalStatementId
    ? `/disposals/statements/${j.disposalStatementId}`
    : j.disposalRecordId
      ? `/disposals/records/${j.disposalRecordId}`
      : null;
  const type = override ?? (j.applianceCategory === "small_appliance" ? "statement" : "record");
  return (
    <div className="space-y-5">
      <header>
        <h1 className="text-2xl font-semibold text-ink-950">
          {type === "statement" ? "Signed statement" : "Disposal record"} for {j.applianceTag}
        </h1>
        <p className="text-ink-600">
          Disposal job #{j.id} on {j.performedOn}: {formatMass(j.recoveredG, j.branchMassUnit)} {j.refrigerant} recovered by{" "}
          {j.technicianName}.
        </p>
      </header>
      {existing && (
        <p role="note" className="rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-ok">
          <span aria-hidden="true">✓ </span>This disposal already has its proof on file.{" "}
          <Link href={existing} className="underline">
            Open it
          </Link>
        </p>
      )}
      <p className="text-sm text-ink-700">
        {type === "statement"
          ? "Small appliances need a statement, signed by whoever delivers the unit for disposal, that the refrigerant was recovered (40 CFR 82.155(b))."
          : "Appliances of more than 5 and less than 50 lb need a record of each disposal (40 CFR 82.155(c))."}{" "}
        <button
          type="button"
          className="font-medium text-fjord-700 underline"
          onClick={() => setOverride(type === "statement" ? "record" : "statement")}
        >
          {type === "statement" ? "Keep a disposal record instead" : "Keep a signed statement instead"}
        </button>
      </p>
      {type === "record" ? <RecordForm job={j} /> : <StatementForm job={j} />}
    </div>
  );
}

function RecordForm({ job }: { job: JobDetail }) {
  const uid = useId();
  const router = useRouter();
  const queryClient = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<FieldValues>({
    resolver: zodResolver(disposalRecordInput as never) as unknown as Resolver<FieldValues>,
    mode: "onTouched",
    defaultValues: {
      applianceId: job.applianceId,
      jobId: job.id,
      disposedOn: job.performedOn,
      disposalPath: "on_site",
      companyName: job.customerName ?? "",
      applianceLocation: job.siteAddress ?? job.siteName,
      recoveredOn: job.performedOn,
      refrigerant: job.refrigerant ?? job.applianceRefrigerant,
      recoveredAmount: massIn(job.recoveredG, job.branchMassUnit),
      recoveredUnit: job.branchMassUnit === "kg" ? "kg" : "lb",
      sentTo: "",
    },
  });
  const { register, handleSubmit, formState, setError } = form;
  const errors = formState.errors;
  const save = useMutation({
    mutationFn: (v: FieldValues) => fetchJson<{ id: number }>("/api/disposals/records", { method: "POST", body: JSON.stringify(v) }),
    onSuccess: async ({ id }) => {
      await queryClient.invalidateQueries({ queryKey: ["disposals"] });
      await queryClient.invalidateQueries({ queryKey: ["job", String(job.id)] });
      router.push(`/disposals/records/${id}?saved=1`);
    },
    onError: (err) => {
      setFormError(saveErrorMessage(err, setError, "The record could not be sent; nothing was saved."));
    },
  });
  const field = fieldsOf(uid, form);
  return (
    <form
      noValidate
      className="space-y-5"
      onSubmit={submitOrExplain(handleSubmit, {
        save: save.mutate,
        setFormError,
        invalid: "Some fields need attention before the record can be saved.",
      })}
    >
      <FormAlert message={formError} />
      {field("companyName", "Company name", { hint: "The company whose appliance was disposed of." })}
      {field("applianceLocation", "Location of the appliance", { textarea: true })}
      <div className="grid gap-5 sm:grid-cols-2">
        {field("recoveredOn", "Date of recovery", { type: "date" })}
        {field("disposedOn", "Date of disposal", { type: "date" })}
      </div>
      {field("refrigerant", "Refrigerant recovered")}
      <AmountField
        id={`${uid}-amount`}
        label="Quantity recovered"
        error={errors.recoveredAmount?.message as string | undefined}
        unitId={`${uid}-unit`}
        unitLabel="Unit of the quantity"
        amount={register("recoveredAmount")}
        unit={register("recoveredUnit")}
      />
      <fieldset>
        <legend className={labelClass}>Where was it taken apart?</legend>
        <RadioCards className="mt-2 grid gap-2" registration={register("disposalPath")} options={DISPOSAL_PATH_OPTIONS} />
      </fieldset>
      {field("sentTo", "Sent to (scrap yard or disposal facility, optional)")}
      <button type="submit" disabled={save.isPending} className={primaryButton}>
        {save.isPending ? "Saving…" : "Save disposal record"}
      </button>
    </form>
  );
}

function StatementForm({ job }: { job: JobDetail }) {
  const uid = useId();
  const router = useRouter();
  const queryClient = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const form = useForm<FieldValues>({
    resolver: zodResolver(disposalStatementInput as never) as unknown as Resolver<FieldValues>,
    mode: "onTouched",
    defaultValues: {
      applianceId: job.applianceId,
      jobId: job.id,
      recoveredByName: job.technicianName,
      recoveredByAddress: "",
      recoveredOn: job.performedOn,
      signedByName: "",
      signedOn: todayIn(job.branchTimeZone),
      contractReference: "",
    },
  });
  const { handleSubmit, setError } = form;
  const save = useMutation({
    mutationFn: async (v: FieldValues) => {
      const body = new FormData();
      for (const [k, value] of Object.entries(v)) if (value !== undefined && value !== null) body.set(k, String(value));
      if (file) body.set("document", file);
      const res = await fetch("/api/disposals/statements", { method: "POST", body, headers: { accept: "application/json" } });
      return readApiResponse<{ id: number }>(res, `Request failed (${res.status})`);
    },
    onSuccess: async ({ id }) => {
      await queryClient.invalidateQueries({ queryKey: ["disposals"] });
      await queryClient.invalidateQueries({ queryKey: ["job", String(job.id)] });
      router.push(`/disposals/statements/${id}?saved=1`);
    },
    onError: (err) => {
      if (err instanceof ApiError) {
        for (const [f, m] of Object.entries(err.fieldErrors)) {
          if (f === "document") setFileError(m[0] ?? null);
          else setError(f, { type: "server", message: m[0] });
        }
        setFormError(err.message);
      } else setFormError("The statement could not be sent; nothing was saved.");
    },
  });
  const field = fieldsOf(uid, form);
  return (
    <form
      noValidate
      className="space-y-5"
      onSubmit={handleSubmit(
        (v) => {
          setFormError(null);
          if (fileError) return setFormError("The signed document cannot be uploaded; choose another file or leave it out.");
          save.mutate(v);
        },
        () => setFormError("Some fields need attention before the statement can be saved."),
      )}
    >
      <FormAlert message={formError} />
      <p className="rounded-md border border-ink-200 bg-ink-50 px-3 py-2 text-sm text-ink-800">
        I state that the refrigerant in this appliance was recovered before disposal, as the federal recovery rules require.
      </p>
      {field("recoveredByName", "Name of the person who recovered the refrigerant")}
      {field("recoveredByAddress", "Their address", { textarea: true })}
      {field("recoveredOn", "Date of recovery", { type: "date" })}
      <div className="grid gap-5 sm:grid-cols-2">
        {field("signedByName", "Signed by")}
        {field("signedOn", "Date signed", { type: "date" })}
      </div>
      {field("contractReference", "Contract reference (optional)", {
        hint: "Only if a contract says the refrigerant is removed before delivery.",
      })}
      <Field
        id={`${uid}-document`}
        label={
          <>
            Signed document <span className="font-normal text-ink-600">(photo or PDF, optional)</span>
          </>
        }
        hint="Take a photo of the signed paper or choose a PDF, up to 10 MB."
        hintFirst
        error={fileError ?? undefined}
      >
        <input
          id={`${uid}-document`}
          type="file"
          accept="image/jpeg,image/png,image/webp,image/heic,application/pdf"
          onChange={(e) => {
            const f = e.target.files?.[0] ?? null;
            setFile(f);
            setFileError(
              f && f.size > MAX_DOCUMENT_BYTES
                ? "The file is larger than 10 MB"
                : f && f.type && !DOCUMENT_TYPES.includes(f.type)
                  ? "Only photos (JPEG, PNG, WebP, HEIC) and PDF documents can be uploaded"
                  : null,
            );
          }}
          className="mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-3 text-base file:mr-3 file:min-h-11 file:rounded-md file:border-0 file:bg-fjord-600 file:px-4 file:font-semibold file:text-white"
          {...fieldAria(`${uid}-document`, { hint: true, error: fileError ?? undefined })}
        />
        {file && !fileError && (
          <p className="mt-1 text-sm text-ok">
            ✓ {file.type === "application/pdf" ? "PDF" : "Photo"} chosen ({Math.ceil(file.size / 1024)} KB)
          </p>
        )}
      </Field>
      <button type="submit" disabled={save.isPending} className={primaryButton}>
        {save.isPending ? "Saving…" : "Save signed statement"}
      </button>
    </form>
  );
}
