"use client";

import { useId, useState } from "react";
import { useMutation, useQueryClient, type QueryKey } from "@tanstack/react-query";
import { formatMass, shortestAmountFor, type MassDisplayUnit, type MassInputUnit } from "@coldtrail/core";
import type { AmendmentRecord } from "@coldtrail/db";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { OVER_FILL_FORM_MESSAGE, OverFillConfirm } from "@/components/form";
import { FieldError, FormAlert, SavedNotice, inputClass, labelClass, secondaryButton } from "./form-bits";

/** How a stored value reads in the history: grams in the branch's unit, yes/no, dates as they are. */
export function describeValue(
  column: string,
  value: unknown,
  massUnit: MassDisplayUnit,
  words: Record<string, Record<string, string>> = {},
): string {
  if (value === null || value === undefined || value === "") return "—";
  if (column.endsWith("_g") && typeof value === "number") return formatMass(value, massUnit);
  if (typeof value === "boolean" || ((value === 0 || value === 1) && /(removed|operating|passed|needed)$/.test(column)))
    return value ? "Yes" : "No";
  if (column === "document_file_key") return "signed document on file";
  if (column.endsWith("_id")) return `#${String(value)}`;
  const mapped = words[column]?.[String(value)];
  return mapped ?? String(value);
}

/** The corrections of a regulated record: who, when, why, and each field's previous and new value. */
export function AmendmentHistory({
  amendments,
  fieldWords,
  massUnit,
  valueWords,
  timeZone,
}: {
  amendments: AmendmentRecord[];
  fieldWords: Record<string, string>;
  massUnit: MassDisplayUnit;
  valueWords?: Record<string, Record<string, string>>;
  /** The branch's zone, so times read as they did where the work was done. */
  timeZone?: string;
}) {
  return (
    <section aria-labelledby="history-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="amendment-history">
      <h2 id="history-h" className="text-lg font-semibold text-ink-950">
        Corrections
      </h2>
      {amendments.length === 0 ? (
        <p className="mt-1 text-sm text-ink-600">No corrections: this is the record as first entered.</p>
      ) : (
        <ol className="mt-2 space-y-3">
          {amendments.map((a) => (
            <li key={a.id} className="border-l-4 border-fjord-500 pl-3" data-testid="amendment">
              <p className="text-sm text-ink-700">
                <span className="font-semibold text-ink-950">{a.actorName}</span> corrected this on{" "}
                <time dateTime={a.at}>
                  {new Date(a.at).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short", ...(timeZone ? { timeZone } : {}) })}
                </time>
              </p>
              <p className="text-sm">
                <span className="font-medium">Why:</span> {a.reason}
              </p>
              <table className="mt-1 text-sm">
                <caption className="sr-only">Changed fields</caption>
                <thead>
                  <tr className="text-left text-xs uppercase tracking-wide text-ink-600">
                    <th scope="col" className="pr-3 font-semibold">
                      Field
                    </th>
                    <th scope="col" className="pr-3 font-semibold">
                      Was
                    </th>
                    <th scope="col" className="font-semibold">
                      Now
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {Object.keys(a.next).map((column) => (
                    <tr key={column}>
                      <th scope="row" className="pr-3 text-left font-normal text-ink-700">
                        {fieldWords[column] ?? column.replaceAll("_", " ")}
                      </th>
                      <td className="pr-3 tabular text-ink-600 line-through decoration-ink-400">
                        {describeValue(column, a.previous[column], massUnit, valueWords)}
                      </td>
                      <td className="tabular font-medium text-ink-950">{describeValue(column, a.next[column], massUnit, valueWords)}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </li>
          ))}
        </ol>
      )}
    </section>
  );
}

export type AmendField =
  | { name: string; label: string; type: "text" | "textarea" | "date"; value: string | null }
  | { name: string; label: string; type: "number"; value: number | null; hint?: string }
  | {
      name: string;
      label: string;
      type: "select";
      value: string | null;
      options: { value: string; label: string }[];
      allowEmpty?: string;
      numeric?: boolean;
    }
  | { name: string; label: string; type: "yesno"; value: boolean | null }
  | {
      name: string;
      label: string;
      type: "mass";
      value: number | null;
      unitField: string;
      massUnit: MassDisplayUnit;
      /** The amount as typed when the record was saved: it re-opens in that figure and unit. */
      entered?: { amount: number; unit: MassInputUnit } | null;
    };

/** The unit a mass field is edited in: the one it was entered in, else the branch's. */
function massFieldUnit(f: Extract<AmendField, { type: "mass" }>): MassInputUnit {
  return f.entered?.unit ?? (f.massUnit === "kg" ? "kg" : "lb");
}

function initialText(f: AmendField): string {
  if (f.value === null || f.value === undefined) return "";
  if (f.type === "mass") {
    // As typed when known; otherwise the shortest figure that converts back to the same grams.
    if (f.entered) return String(f.entered.amount);
    return String(shortestAmountFor(f.value, massFieldUnit(f)));
  }
  if (f.type === "yesno") return f.value ? "true" : "false";
  return String(f.value);
}

/**
 * "Correct this record": the editable fields with their current values and a required reason.
 * Only the fields changed are sent; the server keeps the previous values in the history.
 */
export function AmendPanel({
  url,
  fields,
  invalidate,
  title = "Correct this record",
}: {
  url: string;
  fields: AmendField[];
  invalidate: QueryKey[];
  title?: string;
}) {
  const uid = useId();
  const queryClient = useQueryClient();
  const [open, setOpen] = useState(false);
  const [values, setValues] = useState<Record<string, string>>({});
  const [reason, setReason] = useState("");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  // Asked by the server when a changed amount would put a cylinder above its safe fill.
  const [overFillAsk, setOverFillAsk] = useState<string | null>(null);
  const [confirmOverFill, setConfirmOverFill] = useState(false);

  const start = () => {
    setValues(Object.fromEntries(fields.map((f) => [f.name, initialText(f)])));
    setReason("");
    setErrors({});
    setFormError(null);
    setSaved(false);
    setOverFillAsk(null);
    setConfirmOverFill(false);
    setOpen(true);
  };

  const save = useMutation({
    mutationFn: (body: unknown) => fetchJson(url, { method: "PATCH", body: JSON.stringify(body) }),
    onSuccess: async () => {
      await Promise.all(invalidate.map((queryKey) => queryClient.invalidateQueries({ queryKey })));
      setOpen(false);
      setSaved(true);
    },
    onError: (err) => {
      if (err instanceof ApiError) {
        const e: Record<string, string> = {};
        for (const [k, m] of Object.entries(err.fieldErrors)) e[k.replace(/^changes\./, "")] = m[0] ?? "";
        setErrors(e);
        const ask = err.fieldErrors.confirmOverFill?.[0];
        if (ask) setOverFillAsk(ask);
        setFormError(ask ? OVER_FILL_FORM_MESSAGE : err.message);
      } else setFormError("The correction could not be sent; nothing was changed.");
    },
  });

  const submit = (e: React.FormEvent) => {
    e.preventDefault();
    const changes: Record<string, unknown> = {};
    for (const f of fields) {
      const now = values[f.name] ?? "";
      if (now === initialText(f)) continue;
      if (f.type === "mass") {
        changes[f.name] = now;
        changes[f.unitField] = massFieldUnit(f);
      } else if (f.type === "yesno") changes[f.name] = now === "" ? null : now === "true";
      else if (f.type === "select") changes[f.name] = now === "" ? null : f.numeric ? Number(now) : now;
      else changes[f.name] = now;
    }
    if (Object.keys(changes).length === 0) {
      setFormError("Change at least one field before saving the correction.");
      return;
    }
    setFormError(null);
    save.mutate({ reason, changes, ...(overFillAsk && confirmOverFill ? { confirmOverFill: true } : {}) });
  };

  if (!open) {
    return (
      <div className="space-y-2">
        {saved && <SavedNotice>Correction saved; the previous values are kept in the history below.</SavedNotice>}
        <button type="button" onClick={start} className={secondaryButton}>
          {title}
        </button>
      </div>
    );
  }
  return (
    <form onSubmit={submit} noValidate className="space-y-4 rounded-lg border-2 border-fjord-600 bg-white p-4" aria-labelledby={`${uid}-h`}>
      <h2 id={`${uid}-h`} className="text-lg font-semibold text-ink-950">
        {title}
      </h2>
      <p className="text-sm text-ink-600">
        Change what was entered wrongly. The record keeps the previous values, who changed them and why.
      </p>
      <FormAlert message={formError} />
      {fields.map((f) => {
        const id = `${uid}-${f.name}`;
        const err = errors[f.name] ?? (f.type === "mass" ? errors[f.unitField] : undefined);
        const common = {
          id,
          "aria-invalid": err ? true : undefined,
          "aria-describedby": err ? `${id}-error` : undefined,
        } as const;
        const set = (v: string) => setValues((s) => ({ ...s, [f.name]: v }));
        return (
          <div key={f.name}>
            {f.type === "yesno" ? (
              <fieldset>
                <legend className={labelClass}>{f.label}</legend>
                <div className="mt-2 flex gap-2">
                  {[
                    ["true", "Yes"],
                    ["false", "No"],
                  ].map(([v, label]) => (
                    <label
                      key={v}
                      className="flex min-h-12 flex-1 cursor-pointer items-center gap-2 rounded-lg border border-ink-200 px-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600"
                    >
                      <input
                        type="radio"
                        name={id}
                        checked={values[f.name] === v}
                        onChange={() => set(v!)}
                        className="size-5 shrink-0 accent-fjord-600"
                      />
                      {label}
                    </label>
                  ))}
                </div>
              </fieldset>
            ) : (
              <>
                <label htmlFor={id} className={labelClass}>
                  {f.label}
                  {f.type === "mass" && <span className="font-normal text-ink-600"> ({massFieldUnit(f)})</span>}
                </label>
                {f.type === "textarea" ? (
                  <textarea
                    {...common}
                    rows={3}
                    value={values[f.name] ?? ""}
                    onChange={(e) => set(e.target.value)}
                    className={inputClass}
                  />
                ) : f.type === "select" ? (
                  <select {...common} value={values[f.name] ?? ""} onChange={(e) => set(e.target.value)} className={`${inputClass} py-3`}>
                    {f.allowEmpty !== undefined && <option value="">{f.allowEmpty}</option>}
                    {f.options.map((o) => (
                      <option key={o.value} value={o.value}>
                        {o.label}
                      </option>
                    ))}
                  </select>
                ) : (
                  <input
                    {...common}
                    type={f.type === "date" ? "date" : "text"}
                    inputMode={f.type === "number" || f.type === "mass" ? "decimal" : undefined}
                    autoComplete="off"
                    value={values[f.name] ?? ""}
                    onChange={(e) => set(e.target.value)}
                    className={`${inputClass} ${f.type === "number" || f.type === "mass" ? "tabular" : ""}`}
                  />
                )}
              </>
            )}
            <FieldError id={`${id}-error`} message={err} />
          </div>
        );
      })}
      {overFillAsk && (
        <OverFillConfirm id={`${uid}-confirm-over-fill`} message={overFillAsk} checked={confirmOverFill} onChange={setConfirmOverFill} />
      )}
      <div>
        <label htmlFor={`${uid}-reason`} className={labelClass}>
          Why is it being corrected?
        </label>
        <textarea
          id={`${uid}-reason`}
          rows={2}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          className={inputClass}
          aria-invalid={errors.reason ? true : undefined}
          aria-describedby={errors.reason ? `${uid}-reason-error` : undefined}
        />
        <FieldError id={`${uid}-reason-error`} message={errors.reason} />
      </div>
      <div className="flex flex-wrap gap-2">
        <button
          type="submit"
          disabled={save.isPending}
          className="rounded-lg bg-fjord-600 px-5 py-3 font-semibold text-white hover:bg-fjord-700 disabled:opacity-60"
        >
          {save.isPending ? "Saving…" : "Save correction"}
        </button>
        <button type="button" onClick={() => setOpen(false)} className={secondaryButton}>
          Cancel
        </button>
      </div>
    </form>
  );
}

/** "Void this record": entered in error, with a reason; the record stays, marked void. */
export function VoidPanel({ url, invalidate, what }: { url: string; invalidate: QueryKey[]; what: string }) {
  const uid = useId();
  const queryClient = useQueryClient();
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);
  const voidIt = useMutation({
    mutationFn: () => fetchJson(url, { method: "POST", body: JSON.stringify({ reason }) }),
    onSuccess: async () => {
      await Promise.all(invalidate.map((queryKey) => queryClient.invalidateQueries({ queryKey })));
      setOpen(false);
    },
    onError: (err) => setError(err instanceof ApiError ? (err.fieldErrors.reason?.[0] ?? err.message) : "Nothing was changed; try again."),
  });
  if (!open) {
    return (
      <button
        type="button"
        onClick={() => setOpen(true)}
        className="rounded-md border border-sev-critical/50 bg-white px-4 py-2 font-medium text-sev-critical hover:bg-red-50"
      >
        Void this {what}…
      </button>
    );
  }
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        setError(null);
        voidIt.mutate();
      }}
      noValidate
      className="space-y-3 rounded-lg border-2 border-sev-critical/50 bg-white p-4"
    >
      <p className="font-semibold text-ink-950">Void this {what}?</p>
      <p className="text-sm text-ink-600">
        Use this only for a record entered in error. It stays on file, marked void with your reason, and leaves the lists.
      </p>
      <div>
        <label htmlFor={`${uid}-void-reason`} className={labelClass}>
          Why is it void?
        </label>
        <textarea
          id={`${uid}-void-reason`}
          rows={2}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          className={inputClass}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${uid}-void-error` : undefined}
        />
        <FieldError id={`${uid}-void-error`} message={error ?? undefined} />
      </div>
      <div className="flex gap-2">
        <button
          type="submit"
          disabled={voidIt.isPending}
          className="rounded-lg bg-sev-critical px-5 py-3 font-semibold text-white disabled:opacity-60"
        >
          {voidIt.isPending ? "Voiding…" : `Void ${what}`}
        </button>
        <button type="button" onClick={() => setOpen(false)} className={secondaryButton}>
          Keep it
        </button>
      </div>
    </form>
  );
}

/** The banner on a voided record. */
export function VoidedBanner({ at, reason, by }: { at: string | null; reason: string | null; by?: string | null }) {
  if (!at) return null;
  return (
    <p
      role="note"
      className="flex items-start gap-2 rounded-lg border border-ink-400 bg-ink-100 px-4 py-3 text-ink-900"
      data-testid="voided-banner"
    >
      <span aria-hidden="true">⊘</span>
      <span>
        <strong>Void</strong> since {new Date(at).toLocaleDateString("en-US", { dateStyle: "medium" })}
        {by ? ` by ${by}` : ""}: {reason ?? "no reason given"}. Kept on file; not counted in the records.
      </span>
    </p>
  );
}
