"use client";

import Link from "next/link";
import { useId, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  CERTIFICATION_TYPE_LABELS,
  CERTIFICATION_TYPES,
  certificationCorrectionInput,
  certificationWithdrawInput,
  type CertificationType,
} from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { DetailRow, LoadError } from "@/components/detail";
import { saveErrorMessage } from "@/lib/client/form-save";
import { CardImage } from "../_components/card-image";
import { CardState } from "../_components/card-state";
import type { CardDetail } from "../_components/card-types";
import { FieldError } from "@/components/form";

const typesText = (types: CertificationType[]) => types.map((t) => CERTIFICATION_TYPE_LABELS[t]).join(" + ") || "—";
const when = (iso: string | null) => (iso ? new Date(iso).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" }) : "—");
const FIELD_WORDS: Record<string, string> = {
  certifying_organisation: "Certifying organisation",
  certificate_number: "Certificate number",
  issued_on: "Issue date",
  types: "Type",
};
const shown = (key: string, v: unknown) =>
  v === null || v === undefined || v === "" ? "—" : key === "types" && Array.isArray(v) ? typesText(v as CertificationType[]) : String(v);

export function CardDetailView({ id }: { id: string }) {
  const queryClient = useQueryClient();
  const card = useQuery({
    queryKey: ["certification", id],
    queryFn: () => fetchJson<CardDetail>(`/api/certifications/${encodeURIComponent(id)}`),
    retry: false,
  });
  const [notice, setNotice] = useState<string | null>(null);
  const refresh = async (message: string) => {
    setNotice(message);
    await queryClient.invalidateQueries({ queryKey: ["certification", id] });
    await queryClient.invalidateQueries({ queryKey: ["certifications"] });
  };

  if (card.isLoading) return <p className="text-ink-600">Loading the card…</p>;
  if (card.isError) {
    return <LoadError error={card.error} noun="card" back={{ href: "/certifications", label: "Back to certification cards" }} />;
  }
  const c = card.data!;
  const label = `${typesText(c.types)} certification card of ${c.technicianName}, number ${c.certificateNumber}`;

  return (
    <article className="space-y-5">
      <Link href="/certifications" className="text-sm text-fjord-700 underline">
        ← Certification cards
      </Link>
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm font-medium uppercase tracking-wide text-ink-600">{typesText(c.types)} · Section 608</p>
          <h1 className="text-2xl font-semibold text-ink-950">Certification card of {c.technicianName}</h1>
        </div>
        <CardState state={c.state} size="lg" />
      </header>

      {notice && (
        <p role="status" className="flex items-center gap-2 rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-ok">
          <span aria-hidden="true">✓</span> {notice}
        </p>
      )}
      {c.voidedAt && (
        <p className="rounded-md border border-ink-300 bg-ink-100 px-3 py-2 text-ink-800">
          <span aria-hidden="true">⊘ </span>Withdrawn on {when(c.voidedAt)}: {c.voidReason}
        </p>
      )}

      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <section aria-label="The card">
          <CardImage id={c.id} mime={c.cardMime} hasCard={c.hasCard} label={label} />
        </section>

        <div className="space-y-5">
          {c.can.verify && <DecisionPanel id={c.id} technician={c.technicianName} onDone={refresh} />}

          <dl className="divide-y divide-ink-100 rounded-lg border border-ink-200 bg-white px-4">
            <DetailRow label="Technician">
              {c.technicianName}
              <span className="block text-sm text-ink-600">{c.technicianEmail}</span>
              <span className="block text-sm text-ink-600">
                {c.branchNames.length ? c.branchNames.join(", ") : "Not a technician of any branch"}
              </span>
            </DetailRow>
            <DetailRow label="Type">{typesText(c.types)}</DetailRow>
            <DetailRow label="Certifying organisation">{c.certifyingOrganisation}</DetailRow>
            <DetailRow label="Certificate number">
              <span className="tabular">{c.certificateNumber}</span>
            </DetailRow>
            <DetailRow label="Issue date">{c.issuedOn ?? "—"}</DetailRow>
            <DetailRow label="Uploaded">{when(c.uploadedAt)}</DetailRow>
            {c.state !== "pending" && (
              <DetailRow label={c.state === "verified" ? "Verified" : "Not accepted"}>
                {when(c.decidedAt)}
                {c.decidedByName && <span className="block text-sm text-ink-600">by {c.decidedByName}</span>}
              </DetailRow>
            )}
            {c.state === "rejected" && c.rejectionReason && <DetailRow label="Reason">{c.rejectionReason}</DetailRow>}
          </dl>

          {c.can.correct && <CorrectionForm key={c.updatedAt} card={c} onDone={refresh} />}
          {c.can.withdraw && <WithdrawForm id={c.id} onDone={refresh} />}

          <section aria-labelledby="history-h" className="rounded-lg border border-ink-200 bg-white p-4">
            <h2 id="history-h" className="font-semibold text-ink-950">
              History
            </h2>
            <ol className="mt-2 space-y-3 text-sm">
              <li>
                <span className="tabular text-ink-600">{when(c.uploadedAt)}</span> — uploaded by {c.technicianName}
              </li>
              {c.amendments.map((a) => (
                <li key={a.id} data-testid="card-amendment">
                  <span className="tabular text-ink-600">{when(a.at)}</span> — corrected by {a.actorName}
                  <ul className="ml-4 list-disc">
                    {Object.keys(a.next).map((k) => (
                      <li key={k}>
                        {FIELD_WORDS[k] ?? k}: {shown(k, a.previous[k])} → {shown(k, a.next[k])}
                      </li>
                    ))}
                  </ul>
                  <span className="text-ink-700">Reason: {a.reason}</span>
                </li>
              ))}
              {c.state !== "pending" && (
                <li>
                  <span className="tabular text-ink-600">{when(c.decidedAt)}</span> — {c.state === "verified" ? "verified" : "not accepted"}
                  {c.decidedByName ? ` by ${c.decidedByName}` : ""}
                </li>
              )}
            </ol>
          </section>
        </div>
      </div>
    </article>
  );
}

function DecisionPanel({ id, technician, onDone }: { id: number; technician: string; onDone: (message: string) => Promise<void> }) {
  const uid = useId();
  const [mode, setMode] = useState<"choose" | "reject">("choose");
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);
  const decide = useMutation({
    mutationFn: (body: { decision: "verify" } | { decision: "reject"; reason: string }) =>
      fetchJson<{ state: string; emailed: boolean }>(`/api/certifications/${id}/decision`, { method: "POST", body: JSON.stringify(body) }),
    onSuccess: async (r) => {
      setError(null);
      const told = r.emailed
        ? `${technician} has been told by e-mail and in the app.`
        : `${technician} has been told in the app; the e-mail could not be sent.`;
      await onDone(`${r.state === "verified" ? "Card verified." : "Card not accepted."} ${told}`);
    },
    onError: (err) =>
      setError(
        err instanceof ApiError
          ? (Object.values(err.fieldErrors)[0]?.[0] ?? err.message)
          : "The decision could not be sent; nothing was changed.",
      ),
  });

  return (
    <section aria-labelledby={`${uid}-h`} className="rounded-lg border-2 border-fjord-600 bg-fjord-50 p-4">
      <h2 id={`${uid}-h`} className="font-semibold text-ink-950">
        Your decision
      </h2>
      <p className="text-sm text-ink-700">Check that the name, type and number on the card match what was entered.</p>
      {mode === "choose" ? (
        <div className="mt-3 flex flex-wrap gap-2">
          <button
            type="button"
            disabled={decide.isPending}
            onClick={() => decide.mutate({ decision: "verify" })}
            className="rounded-lg bg-fjord-600 px-4 py-3 font-semibold text-white hover:bg-fjord-700 disabled:opacity-60"
          >
            <span aria-hidden="true">✓ </span>Verify this card
          </button>
          <button
            type="button"
            onClick={() => setMode("reject")}
            className="rounded-lg border border-ink-300 bg-white px-4 py-3 font-semibold text-ink-900 hover:border-sev-critical"
          >
            <span aria-hidden="true">✕ </span>Do not accept…
          </button>
        </div>
      ) : (
        <form
          className="mt-3 space-y-2"
          onSubmit={(e) => {
            e.preventDefault();
            if (reason.trim().length < 5) {
              setError("Tell the technician why the card is not accepted (at least a few words)");
              return;
            }
            decide.mutate({ decision: "reject", reason: reason.trim() });
          }}
        >
          <label htmlFor={`${uid}-reason`} className="block font-medium text-ink-900">
            Why is the card not accepted?
          </label>
          <textarea
            id={`${uid}-reason`}
            rows={3}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            className="block w-full rounded-lg border border-ink-300 bg-white px-3 py-2"
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? `${uid}-reason-error` : `${uid}-reason-hint`}
          />
          <p id={`${uid}-reason-hint`} className="text-sm text-ink-600">
            The technician reads this in the e-mail and in the app.
          </p>
          <div className="flex flex-wrap gap-2">
            <button
              type="submit"
              disabled={decide.isPending}
              className="rounded-lg bg-sev-critical px-4 py-3 font-semibold text-white disabled:opacity-60"
            >
              <span aria-hidden="true">✕ </span>Do not accept the card
            </button>
            <button type="button" onClick={() => setMode("choose")} className="rounded-lg border border-ink-300 bg-white px-4 py-3">
              Back
            </button>
          </div>
        </form>
      )}
      <FieldError id={`${uid}-reason-error`} message={error} />
    </section>
  );
}

type CorrectionIn = z.input<typeof certificationCorrectionInput>;
type CorrectionOut = z.output<typeof certificationCorrectionInput>;

function CorrectionForm({ card, onDone }: { card: CardDetail; onDone: (message: string) => Promise<void> }) {
  const uid = useId();
  const [error, setErrorText] = useState<string | null>(null);
  const { register, handleSubmit, formState, setError } = useForm<CorrectionIn, unknown, CorrectionOut>({
    resolver: zodResolver(certificationCorrectionInput),
    defaultValues: {
      reason: "",
      types: card.types,
      certifyingOrganisation: card.certifyingOrganisation,
      certificateNumber: card.certificateNumber,
      issuedOn: card.issuedOn ?? "",
    },
  });
  const save = useMutation({
    mutationFn: (values: CorrectionOut) => {
      // Only what changed is sent; the server keeps the previous values.
      const body: Record<string, unknown> = { reason: values.reason };
      if (values.types && values.types.join() !== card.types.join()) body.types = values.types;
      if (values.certifyingOrganisation !== card.certifyingOrganisation) body.certifyingOrganisation = values.certifyingOrganisation;
      if (values.certificateNumber !== card.certificateNumber) body.certificateNumber = values.certificateNumber;
      if ((values.issuedOn ?? null) !== (card.issuedOn ?? null)) body.issuedOn = values.issuedOn ?? null;
      return fetchJson(`/api/certifications/${card.id}/corrections`, { method: "POST", body: JSON.stringify(body) });
    },
    onSuccess: async () => {
      setErrorText(null);
      await onDone("Correction saved; the previous values are kept in the history.");
    },
    onError: (err) => {
      setErrorText(saveErrorMessage(err, setError, "The correction could not be sent; nothing was changed."));
    },
  });
  const e = formState.errors;
  return (
    <details className="rounded-lg border border-ink-200 bg-white p-4">
      <summary className="cursor-pointer font-semibold text-ink-950">Correct the details</summary>
      <form onSubmit={handleSubmit((v) => save.mutate(v))} noValidate className="mt-3 space-y-3">
        <fieldset>
          <legend className="text-sm font-medium text-ink-800">Type</legend>
          <div className="mt-1 flex flex-wrap gap-3">
            {CERTIFICATION_TYPES.map((t) => (
              <label key={t} className="flex items-center gap-2">
                <input type="checkbox" value={t} {...register("types")} className="size-4 accent-fjord-600" />
                {CERTIFICATION_TYPE_LABELS[t]}
              </label>
            ))}
          </div>
          <FieldError message={e.types?.message} />
        </fieldset>
        <label className="block text-sm font-medium text-ink-800">
          Certifying organisation
          <input {...register("certifyingOrganisation")} className="mt-1 block w-full rounded-md border border-ink-300 px-2 py-2" />
        </label>
        <FieldError message={e.certifyingOrganisation?.message} />
        <label className="block text-sm font-medium text-ink-800">
          Certificate number
          <input {...register("certificateNumber")} className="mt-1 block w-full rounded-md border border-ink-300 px-2 py-2" />
        </label>
        <FieldError message={e.certificateNumber?.message} />
        <label className="block text-sm font-medium text-ink-800">
          Issue date
          <input type="date" {...register("issuedOn")} className="mt-1 block w-full rounded-md border border-ink-300 px-2 py-2" />
        </label>
        <FieldError message={e.issuedOn?.message} />
        <label htmlFor={`${uid}-why`} className="block text-sm font-medium text-ink-800">
          Why is it corrected?
        </label>
        <textarea
          id={`${uid}-why`}
          rows={2}
          {...register("reason")}
          className="block w-full rounded-md border border-ink-300 px-2 py-2"
          aria-invalid={e.reason ? true : undefined}
        />
        <FieldError message={e.reason?.message} />
        <button
          type="submit"
          disabled={save.isPending}
          className="rounded-lg bg-fjord-600 px-4 py-2.5 font-semibold text-white disabled:opacity-60"
        >
          Save the correction
        </button>
        <FieldError message={error} />
      </form>
    </details>
  );
}

type WithdrawIn = z.input<typeof certificationWithdrawInput>;

function WithdrawForm({ id, onDone }: { id: number; onDone: (message: string) => Promise<void> }) {
  const uid = useId();
  const [error, setErrorText] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<WithdrawIn>({
    resolver: zodResolver(certificationWithdrawInput),
    defaultValues: { reason: "" },
  });
  const withdraw = useMutation({
    mutationFn: (v: WithdrawIn) => fetchJson(`/api/certifications/${id}/withdraw`, { method: "POST", body: JSON.stringify(v) }),
    onSuccess: async () => onDone("Card withdrawn. It stays in the history but no longer counts or appears in lists."),
    onError: (err) => setErrorText(err instanceof ApiError ? err.message : "The card could not be withdrawn; nothing was changed."),
  });
  return (
    <details className="rounded-lg border border-ink-200 bg-white p-4">
      <summary className="cursor-pointer font-semibold text-ink-950">Withdraw this card</summary>
      <form onSubmit={handleSubmit((v) => withdraw.mutate(v))} noValidate className="mt-3 space-y-2">
        <label htmlFor={`${uid}-why`} className="block text-sm font-medium text-ink-800">
          Why? (e.g. the wrong card was uploaded)
        </label>
        <textarea id={`${uid}-why`} rows={2} {...register("reason")} className="block w-full rounded-md border border-ink-300 px-2 py-2" />
        <FieldError message={formState.errors.reason?.message} />
        <button
          type="submit"
          disabled={withdraw.isPending}
          className="rounded-lg border border-sev-critical px-4 py-2.5 font-semibold text-sev-critical disabled:opacity-60"
        >
          Withdraw the card
        </button>
        <FieldError message={error} />
      </form>
    </details>
  );
}
