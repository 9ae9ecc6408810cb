"use client";

import { useEffect, useId, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  DEFAULT_SETTINGS,
  LEAK_RATE_METHODS,
  LEAK_RATE_METHOD_LABELS,
  REQUALIFICATION_YEARS,
  SESSION_IDLE_DEFAULTS,
  SESSION_IDLE_LIMITS,
  SETTING_EXPLANATIONS,
  organisationSettingsInput,
  type AuditSettings,
} from "@coldtrail/core";
import type { OrganisationSettings } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { saveErrorMessage } from "@/lib/client/form-save";
import { FieldError, FormAlert, Notice, inputClass, labelClass, primaryButton, secondaryButton } from "../_components/form-bits";

type FormIn = z.input<typeof organisationSettingsInput>;
type FormOut = z.output<typeof organisationSettingsInput>;

const DEFAULT_WORDS: Record<keyof AuditSettings, string> = {
  ptTolerancePsi: `${DEFAULT_SETTINGS.ptTolerancePsi} psi`,
  massBalanceTolerancePercent: `${DEFAULT_SETTINGS.massBalanceTolerancePercent} %`,
  massBalanceToleranceG: `${DEFAULT_SETTINGS.massBalanceToleranceG} g`,
  requalificationYears: `${DEFAULT_SETTINGS.requalificationYears} years`,
  strictFill130F: DEFAULT_SETTINGS.strictFill130F ? "on" : "off",
  leakRateMethod: LEAK_RATE_METHOD_LABELS[DEFAULT_SETTINGS.leakRateMethod],
  disposalRecordGraceDays: `${DEFAULT_SETTINGS.disposalRecordGraceDays} days`,
  cardVerificationGraceDays: `${DEFAULT_SETTINGS.cardVerificationGraceDays} days`,
};

function toForm(s: OrganisationSettings): FormIn {
  return {
    name: s.name,
    rulePacks: s.rulePacks,
    ...s.settings,
    sessionIdleMinutesOfficers: s.sessionIdle.officers,
    sessionIdleMinutesOthers: s.sessionIdle.others,
  };
}

export function SettingsForm({ canEdit }: { canEdit: boolean }) {
  const uid = useId();
  const queryClient = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const settings = useQuery({ queryKey: ["settings"], queryFn: () => fetchJson<OrganisationSettings>("/api/admin/settings") });
  const form = useForm<FormIn, unknown, FormOut>({ resolver: zodResolver(organisationSettingsInput), mode: "onTouched" });
  const { register, handleSubmit, formState, setError, reset, setValue } = form;
  const errors = formState.errors;
  useEffect(() => {
    if (settings.data) reset(toForm(settings.data));
  }, [settings.data, reset]);

  const save = useMutation({
    mutationFn: (input: FormOut) => fetchJson<OrganisationSettings>("/api/admin/settings", { method: "PUT", body: JSON.stringify(input) }),
    onSuccess: async (saved) => {
      queryClient.setQueryData(["settings"], saved);
      setNotice("Settings saved. The next audit uses them; the change is in the activity history.");
    },
    onError: (err) => {
      setFormError(saveErrorMessage(err, setError, "The settings could not be saved; nothing was changed."));
    },
  });

  if (settings.isLoading) return <p className="text-ink-600">Loading the settings…</p>;
  if (settings.isError) return <FormAlert message="The settings could not be loaded." />;

  const onSubmit = handleSubmit(
    (values) => {
      setFormError(null);
      setNotice(null);
      save.mutate(values);
    },
    () => setFormError("Some fields need attention before the settings can be saved."),
  );
  const described = (name: keyof FormIn, explained: boolean) =>
    [explained ? `${uid}-${name}-why` : null, errors[name] ? `${uid}-${name}-error` : null].filter(Boolean).join(" ") || undefined;

  const why = (name: keyof AuditSettings) => (
    <p id={`${uid}-${name}-why`} className="mt-1 text-sm text-ink-600">
      {SETTING_EXPLANATIONS[name]} <span className="whitespace-nowrap text-ink-500">Default: {DEFAULT_WORDS[name]}.</span>
    </p>
  );

  const numberField = (
    name:
      "ptTolerancePsi" | "massBalanceTolerancePercent" | "massBalanceToleranceG" | "disposalRecordGraceDays" | "cardVerificationGraceDays",
    label: string,
    unit: string,
    step: string,
  ) => (
    <div className="rounded-md border border-ink-200 p-4">
      <label htmlFor={`${uid}-${name}`} className={labelClass}>
        {label}
      </label>
      <div className="mt-1 flex items-center gap-2">
        <input
          id={`${uid}-${name}`}
          type="number"
          inputMode="decimal"
          step={step}
          {...register(name)}
          disabled={!canEdit}
          className={`${inputClass} mt-0 max-w-40 tabular`}
          aria-invalid={errors[name] ? true : undefined}
          aria-describedby={described(name, true)}
        />
        <span className="text-ink-700">{unit}</span>
      </div>
      {why(name)}
      <FieldError id={`${uid}-${name}-error`} message={errors[name]?.message} />
    </div>
  );

  const idleField = (name: "sessionIdleMinutesOfficers" | "sessionIdleMinutesOthers", label: string, why: string) => (
    <div className="rounded-md border border-ink-200 p-4">
      <label htmlFor={`${uid}-${name}`} className={labelClass}>
        {label}
      </label>
      <div className="mt-1 flex items-center gap-2">
        <input
          id={`${uid}-${name}`}
          type="number"
          inputMode="numeric"
          step="1"
          {...register(name)}
          disabled={!canEdit}
          className={`${inputClass} mt-0 max-w-40 tabular`}
          aria-invalid={errors[name] ? true : undefined}
          aria-describedby={described(name, true)}
        />
        <span className="text-ink-700">minutes</span>
      </div>
      <p id={`${uid}-${name}-why`} className="mt-1 text-sm text-ink-600">
        {why}
      </p>
      <FieldError id={`${uid}-${name}-error`} message={errors[name]?.message} />
    </div>
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      <FormAlert message={formError} />
      <Notice message={notice} />

      <section aria-labelledby={`${uid}-org-h`} className="space-y-4 rounded-lg border border-ink-200 bg-white p-5">
        <h2 id={`${uid}-org-h`} className="text-lg font-semibold text-ink-950">
          Organisation
        </h2>
        <div>
          <label htmlFor={`${uid}-name`} className={labelClass}>
            Name
          </label>
          <input
            id={`${uid}-name`}
            {...register("name")}
            disabled={!canEdit}
            className={inputClass}
            aria-invalid={errors.name ? true : undefined}
            aria-describedby={described("name", false)}
          />
          <FieldError id={`${uid}-name-error`} message={errors.name?.message} />
        </div>
      </section>

      <section aria-labelledby={`${uid}-tol-h`} className="space-y-4 rounded-lg border border-ink-200 bg-white p-5">
        <div>
          <h2 id={`${uid}-tol-h`} className="text-lg font-semibold text-ink-950">
            Choices the rules leave to the company
          </h2>
          <p className="text-sm text-ink-600">The rules leave these values to the company; they decide when an audit raises a finding.</p>
        </div>
        {numberField("ptTolerancePsi", "Pressure–temperature tolerance for suspected non-condensables", "psi", "0.5")}
        {numberField("massBalanceTolerancePercent", "Mass-balance tolerance", "% of refrigerant taken in", "0.1")}
        {numberField("massBalanceToleranceG", "Smallest mass-balance gap flagged", "g", "1")}
        <div className="rounded-md border border-ink-200 p-4">
          <label htmlFor={`${uid}-requalificationYears`} className={labelClass}>
            Cylinder requalification period
          </label>
          <select
            id={`${uid}-requalificationYears`}
            {...register("requalificationYears")}
            disabled={!canEdit}
            className={`${inputClass} max-w-40`}
            aria-invalid={errors.requalificationYears ? true : undefined}
            aria-describedby={described("requalificationYears", true)}
          >
            {REQUALIFICATION_YEARS.map((y) => (
              <option key={y} value={y}>
                {y} years
              </option>
            ))}
          </select>
          {why("requalificationYears")}
          <FieldError id={`${uid}-requalificationYears-error`} message={errors.requalificationYears?.message} />
        </div>
        <div className="rounded-md border border-ink-200 p-4">
          <label className="flex items-start gap-3">
            <input
              type="checkbox"
              {...register("strictFill130F")}
              disabled={!canEdit}
              className="mt-1 h-4 w-4 accent-fjord-600"
              aria-describedby={described("strictFill130F", true)}
            />
            <span className={labelClass}>Stricter cylinder fill (liquid density at 130 °F)</span>
          </label>
          {why("strictFill130F")}
        </div>
        <fieldset className="rounded-md border border-ink-200 p-4" aria-describedby={described("leakRateMethod", true)}>
          <legend className={`${labelClass} px-1`}>Leak-rate method</legend>
          <div className="mt-1 flex flex-wrap gap-4">
            {LEAK_RATE_METHODS.map((m) => (
              <label key={m} className="flex items-center gap-2">
                <input type="radio" value={m} {...register("leakRateMethod")} disabled={!canEdit} className="h-4 w-4 accent-fjord-600" />
                {LEAK_RATE_METHOD_LABELS[m]}
              </label>
            ))}
          </div>
          {why("leakRateMethod")}
          <FieldError id={`${uid}-leakRateMethod-error`} message={errors.leakRateMethod?.message} />
        </fieldset>
        {numberField("disposalRecordGraceDays", "Days a disposal record or signed statement may follow the disposal", "days", "1")}
        {numberField("cardVerificationGraceDays", "Days a new certification card may wait for verification", "days", "1")}
      </section>

      <section aria-labelledby={`${uid}-sess-h`} className="space-y-4 rounded-lg border border-ink-200 bg-white p-5">
        <div>
          <h2 id={`${uid}-sess-h`} className="text-lg font-semibold text-ink-950">
            Signing out when idle
          </h2>
          <p className="text-sm text-ink-600">
            A session ends after this many minutes without use, and in any case 12 hours after signing in. {SESSION_IDLE_DEFAULTS.officers}{" "}
            minutes is the figure of the OWASP application security standard (ASVS level 2).
          </p>
        </div>
        {idleField(
          "sessionIdleMinutesOfficers",
          "Owners and compliance officers",
          `They reach every branch's records, people and settings. ${SESSION_IDLE_LIMITS.min}–${SESSION_IDLE_LIMITS.officersMax} minutes; default ${SESSION_IDLE_DEFAULTS.officers}.`,
        )}
        {idleField(
          "sessionIdleMinutesOthers",
          "Branch managers, technicians and inspectors",
          `Their reach is one branch, their own work or a read-only window. Technicians logging work on site may need longer; above ${SESSION_IDLE_DEFAULTS.others} minutes goes beyond the ASVS level-2 figure. ${SESSION_IDLE_LIMITS.min}–${SESSION_IDLE_LIMITS.othersMax} minutes; default ${SESSION_IDLE_DEFAULTS.others}.`,
        )}
      </section>

      {canEdit && (
        <div className="flex flex-wrap gap-2">
          <button type="submit" disabled={save.isPending} className={primaryButton}>
            {save.isPending ? "Saving…" : "Save the settings"}
          </button>
          <button
            type="button"
            className={secondaryButton}
            onClick={() => {
              for (const [key, value] of Object.entries(DEFAULT_SETTINGS))
                setValue(key as keyof AuditSettings, value as never, { shouldDirty: true });
              setNotice(null);
            }}
          >
            Put back the defaults
          </button>
        </div>
      )}
    </form>
  );
}
