"use client";

import { useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Controller, useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { inspectorGrantInput } from "@coldtrail/core";
import type { AdminBranchPage } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { saveErrorMessage, submitOrExplain } from "@/lib/client/form-save";
import { FieldError, FormAlert, hintClass, inputClass, labelClass, primaryButton } from "../../_components/form-bits";
import { useIdempotencyKey } from "@/lib/client/idempotency";

type FormIn = z.input<typeof inspectorGrantInput>;
type FormOut = z.output<typeof inspectorGrantInput>;

const isoDay = (d: Date) => d.toISOString().slice(0, 10);

export function GrantForm() {
  const uid = useId();
  const router = useRouter();
  const queryClient = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const branches = useQuery({
    queryKey: ["admin-branches", "all"],
    queryFn: () => fetchJson<AdminBranchPage>("/api/admin/branches?archived=include&pageSize=200"),
  });
  const now = new Date();
  const form = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(inspectorGrantInput),
    mode: "onTouched",
    defaultValues: {
      email: "",
      name: "",
      branchIds: [],
      recordsFrom: `${now.getUTCFullYear() - 1}-01-01`,
      recordsTo: `${now.getUTCFullYear() - 1}-12-31`,
      expiresOn: isoDay(new Date(now.getTime() + 30 * 24 * 3600 * 1000)),
      note: "",
    },
  });
  const { register, handleSubmit, control, formState, setError } = form;
  const errors = formState.errors;

  const idem = useIdempotencyKey();
  const grant = useMutation({
    mutationFn: (input: FormOut) =>
      fetchJson<{ id: number; kind: "invited" | "notified"; mailSent: boolean }>("/api/admin/inspector-grants", {
        method: "POST",
        headers: idem.headers,
        body: JSON.stringify(input),
      }),
    onSuccess: async (res) => {
      await queryClient.invalidateQueries({ queryKey: ["inspector-grants"] });
      await queryClient.invalidateQueries({ queryKey: ["people"] });
      router.push(`/admin/inspectors?granted=${res.mailSent ? res.kind : "unsent"}`);
    },
    onError: (err) => {
      setFormError(saveErrorMessage(err, setError, "The access could not be given. Check your connection; nothing was saved."));
    },
  });
  const onSubmit = submitOrExplain(handleSubmit, {
    save: grant.mutate,
    setFormError,
    invalid: "Some fields need attention before access can be given.",
  });
  const field = (name: keyof FormIn, label: string, type = "text", hint?: string) => (
    <div>
      <label htmlFor={`${uid}-${name}`} className={labelClass}>
        {label}
      </label>
      <input
        id={`${uid}-${name}`}
        type={type}
        autoComplete="off"
        {...register(name)}
        className={inputClass}
        aria-invalid={errors[name] ? true : undefined}
        aria-describedby={
          [hint ? `${uid}-${name}-hint` : null, errors[name] ? `${uid}-${name}-error` : null].filter(Boolean).join(" ") || undefined
        }
      />
      {hint && (
        <p id={`${uid}-${name}-hint`} className={hintClass}>
          {hint}
        </p>
      )}
      <FieldError id={`${uid}-${name}-error`} message={errors[name]?.message} />
    </div>
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6 rounded-lg border border-ink-200 bg-white p-5">
      <FormAlert message={formError} />
      <div className="grid gap-5 sm:grid-cols-2">
        {field("name", "Inspector's full name")}
        {field("email", "Inspector's e-mail address", "email")}
      </div>
      <Controller
        control={control}
        name="branchIds"
        render={({ field: f }) => {
          const value = (f.value ?? []).map(Number);
          return (
            <fieldset aria-describedby={errors.branchIds ? `${uid}-branchIds-error` : undefined}>
              <legend className={labelClass}>Branches they may read</legend>
              <div className="mt-2 flex flex-wrap gap-2">
                {(branches.data?.rows ?? []).map((b) => {
                  const checked = value.includes(b.id);
                  return (
                    <label
                      key={b.id}
                      className={`flex items-center gap-2 rounded-md border px-3 py-2 ${checked ? "border-fjord-600 bg-fjord-50" : "border-ink-200"}`}
                    >
                      <input
                        type="checkbox"
                        checked={checked}
                        onChange={(e) => f.onChange(e.target.checked ? [...value, b.id] : value.filter((x) => x !== b.id))}
                        onBlur={f.onBlur}
                        className="h-4 w-4 accent-fjord-600"
                      />
                      {b.name}
                      {b.archivedAt && <span className="text-xs text-ink-600">· archived</span>}
                    </label>
                  );
                })}
              </div>
              <FieldError id={`${uid}-branchIds-error`} message={errors.branchIds?.message} />
            </fieldset>
          );
        }}
      />
      <fieldset className="grid gap-5 sm:grid-cols-2">
        <legend className={`${labelClass} mb-2`}>Records dated within</legend>
        {field("recordsFrom", "From", "date")}
        {field("recordsTo", "To", "date")}
      </fieldset>
      <div className="grid gap-5 sm:grid-cols-2">
        {field(
          "expiresOn",
          "Access ends after",
          "date",
          "After this day (end of day, UTC) the inspector can no longer read these records.",
        )}
        {field("note", "Note (optional)", "text", "Why the access is given, e.g. “State review of 2025 records”.")}
      </div>
      <button type="submit" disabled={grant.isPending} className={primaryButton}>
        {grant.isPending ? "Giving access…" : "Give access and e-mail the inspector"}
      </button>
    </form>
  );
}
