"use client";

import Link from "next/link";
import { useId, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { subject } from "@casl/ability";
import { APPLIANCE_CATEGORY_LABELS, smallApplianceStatementCompleteness } from "@coldtrail/core";
import type { DisposalStatementDetail } from "@coldtrail/db";
import { ApiError, fetchJson, readApiResponse } from "@/lib/client/fetch-json";
import { DetailRow, LoadError, CompletenessLine } from "@/components/detail";
import { useAbility } from "@/components/providers";
import { FieldError, SavedNotice, inputClass, labelClass, secondaryButton } from "../../../jobs/_components/form-bits";
import { AmendPanel, AmendmentHistory, VoidPanel, VoidedBanner } from "../../../jobs/_components/record-history";

const FIELD_WORDS: Record<string, string> = {
  recovered_by_name: "Recovered by",
  recovered_by_address: "Their address",
  recovered_on: "Date of recovery",
  signed_by_name: "Signed by",
  signed_on: "Date signed",
  contract_reference: "Contract reference",
  document_file_key: "Signed document",
  document_mime: "Document type",
};

/** Attach the signed document to a statement already on file: an amendment with a reason. */
function AttachDocument({ id, invalidate }: { id: number; invalidate: string[][] }) {
  const uid = useId();
  const queryClient = useQueryClient();
  const [open, setOpen] = useState(false);
  const [file, setFile] = useState<File | null>(null);
  const [reason, setReason] = useState("Signed copy received");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const upload = useMutation({
    mutationFn: async () => {
      const body = new FormData();
      body.set("reason", reason);
      if (file) body.set("document", file);
      const res = await fetch(`/api/disposals/statements/${id}/document`, {
        method: "POST",
        body,
        headers: { accept: "application/json" },
      });
      await readApiResponse(res, "Upload failed");
    },
    onSuccess: async () => {
      await Promise.all(invalidate.map((queryKey) => queryClient.invalidateQueries({ queryKey })));
      setOpen(false);
    },
    onError: (err) =>
      setErrors(
        err instanceof ApiError
          ? Object.fromEntries(Object.entries(err.fieldErrors).map(([k, m]) => [k, m[0] ?? ""]))
          : { document: "The file could not be sent." },
      ),
  });
  if (!open)
    return (
      <button type="button" className={secondaryButton} onClick={() => setOpen(true)}>
        Upload the signed document
      </button>
    );
  return (
    <form
      noValidate
      className="space-y-3 rounded-lg border-2 border-fjord-600 bg-white p-4"
      onSubmit={(e) => {
        e.preventDefault();
        setErrors({});
        upload.mutate();
      }}
    >
      <div>
        <label htmlFor={`${uid}-file`} className={labelClass}>
          Signed document (photo or PDF)
        </label>
        <input
          id={`${uid}-file`}
          type="file"
          accept="image/jpeg,image/png,image/webp,image/heic,application/pdf"
          onChange={(e) => setFile(e.target.files?.[0] ?? null)}
          className="mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-3"
          aria-invalid={errors.document ? true : undefined}
          aria-describedby={errors.document ? `${uid}-file-error` : undefined}
        />
        <FieldError id={`${uid}-file-error`} message={errors.document} />
      </div>
      <div>
        <label htmlFor={`${uid}-reason`} className={labelClass}>
          Why is it being added?
        </label>
        <input
          id={`${uid}-reason`}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          className={inputClass}
          aria-invalid={errors.reason ? true : undefined}
        />
        <FieldError id={`${uid}-reason-error`} message={errors.reason} />
      </div>
      <div className="flex gap-2">
        <button
          type="submit"
          disabled={upload.isPending}
          className="rounded-lg bg-fjord-600 px-5 py-3 font-semibold text-white disabled:opacity-60"
        >
          {upload.isPending ? "Uploading…" : "Upload"}
        </button>
        <button type="button" className={secondaryButton} onClick={() => setOpen(false)}>
          Cancel
        </button>
      </div>
    </form>
  );
}

export function DisposalStatementView({ id, saved }: { id: string; saved: boolean }) {
  const ability = useAbility();
  const q = useQuery({
    queryKey: ["disposal-statement", id],
    queryFn: () => fetchJson<DisposalStatementDetail>(`/api/disposals/statements/${encodeURIComponent(id)}`),
    retry: false,
  });
  if (q.isLoading) return <p className="text-ink-600">Loading the signed statement…</p>;
  if (q.isError || !q.data) {
    return <LoadError error={q.error} noun="signed statement" />;
  }
  const s = q.data;
  const where = subject("Disposal", { organisationId: s.organisationId, branchId: s.branchId });
  const complete = smallApplianceStatementCompleteness({
    id: s.id,
    applianceId: s.applianceId,
    signedBy: s.signedByName,
    signedOn: s.signedOn,
    recoveredByName: s.recoveredByName,
    recoveredByAddress: s.recoveredByAddress,
    recoveredOn: s.recoveredOn,
    contractReference: s.contractReference,
  });
  const invalidate = [["disposal-statement", id], ["disposals"]];
  return (
    <article className="mx-auto max-w-2xl space-y-4">
      <Link href="/disposals?tab=statement" className="text-sm text-fjord-700 underline">
        ← All signed statements
      </Link>
      {saved && <SavedNotice>Signed statement saved{s.hasDocument ? " with its signed document" : ""}.</SavedNotice>}
      <header>
        <p className="text-sm font-medium text-ink-600">Signed statement #{s.id} · 40 CFR 82.155(b)</p>
        <h1 className="text-2xl font-semibold text-ink-950">Refrigerant recovered from {s.applianceTag}</h1>
      </header>
      <VoidedBanner at={s.voidedAt} reason={s.voidReason} />
      <CompletenessLine
        complete={complete.complete}
        missing={complete.missing}
        completeText="The statement has everything the rule asks for."
      />
      <section aria-labelledby="doc-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="statement-document">
        <h2 id="doc-h" className="text-lg font-semibold text-ink-950">
          Signed document
        </h2>
        {s.hasDocument ? (
          <p className="mt-1 flex flex-wrap items-center gap-2 text-ok">
            <span aria-hidden="true">✓</span> On file ({s.documentMime === "application/pdf" ? "PDF" : "photo"}).
            <a
              href={`/api/disposals/statements/${s.id}/document`}
              target="_blank"
              rel="noopener"
              className="font-medium text-fjord-700 underline"
            >
              Open the signed document
            </a>
          </p>
        ) : (
          <p className="mt-1 text-ink-700">
            <span aria-hidden="true">— </span>Only the form is on file.
          </p>
        )}
        {!s.voidedAt && ability.can("update", where) && (
          <div className="mt-3">
            <AttachDocument id={s.id} invalidate={invalidate} />
          </div>
        )}
      </section>
      <dl className="divide-y divide-ink-100 rounded-lg border border-ink-200 bg-white px-4">
        <DetailRow layout="stacked" label="Appliance">
          {s.applianceTag} — {s.applianceDescription}
          <span className="block text-sm text-ink-600">{APPLIANCE_CATEGORY_LABELS[s.applianceCategory]}</span>
        </DetailRow>
        <DetailRow layout="stacked" label="Recovered by">
          {s.recoveredByName}
        </DetailRow>
        <DetailRow layout="stacked" label="Their address">
          {s.recoveredByAddress}
        </DetailRow>
        <DetailRow layout="stacked" label="Date of recovery">
          {s.recoveredOn}
        </DetailRow>
        <DetailRow layout="stacked" label="Signed by">
          {s.signedByName ?? "—"}
        </DetailRow>
        <DetailRow layout="stacked" label="Date signed">
          {s.signedOn ?? "—"}
        </DetailRow>
        {s.contractReference && (
          <DetailRow layout="stacked" label="Contract">
            {s.contractReference}
          </DetailRow>
        )}
        <DetailRow layout="stacked" label="Branch">
          {s.branchName}
        </DetailRow>
        {s.jobId && (
          <DetailRow layout="stacked" label="Disposal job">
            <Link href={`/jobs/${s.jobId}`} className="text-fjord-700 underline">
              Job #{s.jobId}
            </Link>
          </DetailRow>
        )}
        <DetailRow layout="stacked" label="Recorded">
          {new Date(s.createdAt).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" })} by {s.createdByName}
        </DetailRow>
      </dl>
      {!s.voidedAt && (
        <div className="flex flex-wrap items-start gap-3">
          {ability.can("update", where) && (
            <AmendPanel
              url={`/api/disposals/statements/${s.id}`}
              invalidate={invalidate}
              fields={[
                {
                  name: "recoveredByName",
                  label: "Name of the person who recovered the refrigerant",
                  type: "text",
                  value: s.recoveredByName,
                },
                { name: "recoveredByAddress", label: "Their address", type: "textarea", value: s.recoveredByAddress },
                { name: "recoveredOn", label: "Date of recovery", type: "date", value: s.recoveredOn },
                { name: "signedByName", label: "Signed by", type: "text", value: s.signedByName },
                { name: "signedOn", label: "Date signed", type: "date", value: s.signedOn },
                { name: "contractReference", label: "Contract reference", type: "text", value: s.contractReference },
              ]}
            />
          )}
          {ability.can("void", where) && (
            <VoidPanel url={`/api/disposals/statements/${s.id}/void`} invalidate={invalidate} what="statement" />
          )}
        </div>
      )}
      <AmendmentHistory amendments={s.amendments} fieldWords={FIELD_WORDS} massUnit={s.branchMassUnit} />
    </article>
  );
}
