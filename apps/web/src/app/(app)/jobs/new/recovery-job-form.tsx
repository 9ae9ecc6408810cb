"use client";

import { useEffect, useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useQuery, useMutation, useQueryClient } from "@tanstack/react-query";
import { Controller, useForm, type FieldPath } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  ACCESS_METHOD_LABELS,
  ACCESS_METHODS,
  APPLIANCE_CATEGORY_LABELS,
  EVACUATION_UNIT_LABELS,
  EVACUATION_UNITS,
  MASS_INPUT_UNITS,
  TEMPORARY_ACCESS_METHODS,
  formatMass,
  recoveryJobInput,
} from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import type { ApplianceOption, CylinderOption, EquipmentOption } from "@/lib/client/types";
import { SafetyCautions } from "@/components/safety-cautions";

type FormIn = z.input<typeof recoveryJobInput>;
type FormOut = z.output<typeof recoveryJobInput>;

/** Today's calendar date where the appliance is, not where the server is. */
function todayIn(timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(new Date());
}

const inputClass =
  "mt-1 block w-full rounded-lg border border-ink-300 bg-white px-3 py-3 text-lg text-ink-950 shadow-sm aria-[invalid=true]:border-sev-critical";
const labelClass = "block text-base font-semibold text-ink-900";

function FieldError({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <p id={id} className="mt-1 flex items-start gap-1.5 text-sm font-medium text-sev-critical">
      <span aria-hidden="true">⚠</span>
      <span>{message}</span>
    </p>
  );
}

export function RecoveryJobForm() {
  const router = useRouter();
  const queryClient = useQueryClient();
  const uid = useId();
  const [search, setSearch] = useState("");
  const [appliance, setAppliance] = useState<ApplianceOption | null>(null);
  const [formError, setFormError] = useState<string | null>(null);

  const form = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(recoveryJobInput),
    mode: "onTouched",
    defaultValues: {
      kind: "recovery",
      performedOn: todayIn(Intl.DateTimeFormat().resolvedOptions().timeZone),
      refrigerant: "",
      recoveredUnit: "lb",
      evacuationUnit: "in_hg_vacuum",
      notes: "",
    },
  });
  const { register, handleSubmit, setValue, watch, control, formState, setError } = form;
  const errors = formState.errors;
  const accessMethod = watch("accessMethod");
  const temporary = accessMethod ? TEMPORARY_ACCESS_METHODS.includes(accessMethod) : false;

  const appliances = useQuery({
    queryKey: ["lookup-appliances", search],
    queryFn: () => fetchJson<{ rows: ApplianceOption[] }>(`/api/lookup/appliances?limit=12&q=${encodeURIComponent(search)}`),
    enabled: appliance === null,
  });
  const branchId = appliance?.branchId;
  const cylinders = useQuery({
    queryKey: ["lookup-cylinders", branchId],
    queryFn: () => fetchJson<{ rows: CylinderOption[] }>(`/api/lookup/cylinders?branchId=${branchId}`),
    enabled: branchId !== undefined,
  });
  const equipment = useQuery({
    queryKey: ["lookup-equipment", branchId],
    queryFn: () => fetchJson<{ rows: EquipmentOption[] }>(`/api/lookup/equipment?branchId=${branchId}`),
    enabled: branchId !== undefined,
  });

  useEffect(() => {
    if (!appliance) return;
    setValue("applianceId", appliance.id, { shouldValidate: formState.isSubmitted });
    setValue("refrigerant", appliance.refrigerant);
    setValue("recoveredUnit", appliance.massUnit === "kg" ? "kg" : "lb");
    setValue("performedOn", todayIn(appliance.timeZone));
    if (appliance.category !== "small_appliance") setValue("compressorOperating", null);
  }, [appliance, setValue, formState.isSubmitted]);

  const save = useMutation({
    mutationFn: (input: FormOut) => fetchJson<{ id: number }>("/api/jobs", { method: "POST", body: JSON.stringify(input) }),
    onSuccess: async ({ id }) => {
      await queryClient.invalidateQueries({ queryKey: ["jobs"] });
      router.push(`/jobs?created=${id}`);
    },
    onError: (err) => {
      if (err instanceof ApiError) {
        for (const [field, messages] of Object.entries(err.fieldErrors)) {
          setError(field as FieldPath<FormIn>, { type: "server", message: messages[0] });
        }
        setFormError(err.message);
      } else {
        setFormError("The job could not be sent. Check your connection; nothing was saved.");
      }
    },
  });

  const onSubmit = handleSubmit(
    (values) => {
      setFormError(null);
      save.mutate(values);
    },
    () => setFormError("Some fields need attention before the job can be saved."),
  );

  const describedBy = (name: string) => (errors[name as keyof typeof errors] ? `${uid}-${name}-error` : undefined);
  const errorOf = (name: keyof typeof errors) => errors[name]?.message as string | undefined;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-7" aria-describedby={formError ? `${uid}-form-error` : undefined}>
      <SafetyCautions />

      {formError && (
        <p id={`${uid}-form-error`} role="alert" className="rounded-lg border border-sev-critical/50 bg-red-50 px-4 py-3 font-medium text-sev-critical">
          ⚠ {formError}
        </p>
      )}

      {/* Appliance */}
      <section aria-labelledby={`${uid}-appliance-h`} className="space-y-2">
        <h2 id={`${uid}-appliance-h`} className={labelClass}>
          Appliance
        </h2>
        <input type="hidden" {...register("applianceId")} />
        {appliance ? (
          <div className="rounded-lg border-2 border-fjord-600 bg-fjord-50 p-4" data-testid="chosen-appliance">
            <p className="text-lg font-semibold text-ink-950">{appliance.tag}</p>
            <p className="text-ink-700">{appliance.description}</p>
            <p className="mt-1 text-sm text-ink-600">
              {APPLIANCE_CATEGORY_LABELS[appliance.category]} · {appliance.refrigerant}
              {appliance.fullChargeG !== null && <> · full charge {formatMass(appliance.fullChargeG, appliance.massUnit)}</>}
            </p>
            <p className="text-sm text-ink-600">
              {appliance.siteName} · {appliance.branchName}
            </p>
            <button
              type="button"
              onClick={() => {
                setAppliance(null);
                setValue("cylinderId", undefined as unknown as number);
                setValue("equipmentId", undefined as unknown as number);
              }}
              className="mt-3 rounded-md border border-ink-300 bg-white px-4 py-2 text-base font-medium text-ink-800"
            >
              Choose another appliance
            </button>
          </div>
        ) : (
          <div className="space-y-2">
            <label htmlFor={`${uid}-search`} className="text-sm text-ink-700">
              Search by tag, description or site
            </label>
            <input
              id={`${uid}-search`}
              type="search"
              value={search}
              onChange={(e) => setSearch(e.target.value)}
              className={inputClass}
              aria-invalid={errors.applianceId ? true : undefined}
              aria-describedby={describedBy("applianceId")}
              placeholder="e.g. RTU-07"
            />
            <FieldError id={`${uid}-applianceId-error`} message={errorOf("applianceId")} />
            <ul className="space-y-2" aria-label="Matching appliances">
              {appliances.isLoading && <li className="text-ink-600">Looking up appliances…</li>}
              {appliances.data?.rows.length === 0 && <li className="text-ink-600">No appliance in your branches matches.</li>}
              {appliances.data?.rows.map((a) => (
                <li key={a.id}>
                  <button
                    type="button"
                    onClick={() => setAppliance(a)}
                    className="block min-h-14 w-full rounded-lg border border-ink-200 bg-white px-4 py-3 text-left hover:border-fjord-600"
                  >
                    <span className="block font-semibold text-ink-950">
                      {a.tag} <span className="font-normal text-ink-600">· {a.refrigerant}</span>
                    </span>
                    <span className="block text-sm text-ink-600">
                      {a.description ?? APPLIANCE_CATEGORY_LABELS[a.category]} — {a.siteName}
                    </span>
                  </button>
                </li>
              ))}
            </ul>
          </div>
        )}
      </section>

      <div className="grid gap-5 sm:grid-cols-2">
        <div>
          <label htmlFor={`${uid}-refrigerant`} className={labelClass}>
            Refrigerant
          </label>
          <input
            id={`${uid}-refrigerant`}
            readOnly
            {...register("refrigerant")}
            className={`${inputClass} bg-ink-50`}
            aria-describedby={`${uid}-refrigerant-hint`}
          />
          <p id={`${uid}-refrigerant-hint`} className="mt-1 text-sm text-ink-600">
            Taken from the appliance register.
          </p>
        </div>
        <div>
          <label htmlFor={`${uid}-date`} className={labelClass}>
            Date of the work
          </label>
          <input
            id={`${uid}-date`}
            type="date"
            {...register("performedOn")}
            className={inputClass}
            aria-invalid={errors.performedOn ? true : undefined}
            aria-describedby={describedBy("performedOn")}
          />
          <FieldError id={`${uid}-performedOn-error`} message={errorOf("performedOn")} />
        </div>
      </div>

      <div>
        <label htmlFor={`${uid}-amount`} className={labelClass}>
          Amount recovered
        </label>
        <div className="mt-1 flex gap-2">
          <input
            id={`${uid}-amount`}
            type="text"
            inputMode="decimal"
            autoComplete="off"
            {...register("recoveredAmount")}
            className={`${inputClass} mt-0 flex-1 tabular`}
            aria-invalid={errors.recoveredAmount ? true : undefined}
            aria-describedby={describedBy("recoveredAmount")}
          />
          <label htmlFor={`${uid}-amount-unit`} className="sr-only">
            Unit of the amount recovered
          </label>
          <select id={`${uid}-amount-unit`} {...register("recoveredUnit")} className="w-28 rounded-lg border border-ink-300 bg-white px-3 text-lg">
            {MASS_INPUT_UNITS.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </select>
        </div>
        <FieldError id={`${uid}-recoveredAmount-error`} message={errorOf("recoveredAmount")} />
      </div>

      <fieldset>
        <legend className={labelClass}>Recovery cylinder</legend>
        {!appliance && <p className="mt-1 text-sm text-ink-600">Choose the appliance first; the cylinders of its branch appear here.</p>}
        <div className="mt-2 space-y-2" role="radiogroup" aria-describedby={describedBy("cylinderId")}>
          {cylinders.data?.rows.map((c) => (
            <label key={c.id} className="flex min-h-14 cursor-pointer items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 py-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50">
              <input type="radio" value={c.id} {...register("cylinderId")} className="size-5 accent-fjord-600" />
              <span>
                <span className="block font-semibold">{c.serial}</span>
                <span className="block text-sm text-ink-600">
                  {c.refrigerant ? `Holds ${formatMass(c.contentsG, appliance?.massUnit ?? "lb_oz")} ${c.refrigerant}` : "Empty"}
                  {c.refrigerant && watch("refrigerant") && c.refrigerant !== watch("refrigerant") && (
                    <strong className="ml-1 text-sev-major">⚠ different refrigerant</strong>
                  )}
                </span>
              </span>
            </label>
          ))}
        </div>
        <FieldError id={`${uid}-cylinderId-error`} message={errorOf("cylinderId")} />
      </fieldset>

      <fieldset>
        <legend className={labelClass}>Recovery equipment</legend>
        <div className="mt-2 space-y-2" role="radiogroup" aria-describedby={describedBy("equipmentId")}>
          {equipment.data?.rows.map((e) => (
            <label key={e.id} className="flex min-h-14 cursor-pointer items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 py-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50">
              <input type="radio" value={e.id} {...register("equipmentId")} className="size-5 accent-fjord-600" />
              <span>
                <span className="block font-semibold">{e.serial}</span>
                <span className="block text-sm text-ink-600">
                  {e.makeModel} · {e.certificationState === "certified" ? "✓ certified" : "⚠ no certification on file"}
                </span>
              </span>
            </label>
          ))}
        </div>
        <FieldError id={`${uid}-equipmentId-error`} message={errorOf("equipmentId")} />
      </fieldset>

      <div>
        <label htmlFor={`${uid}-evac`} className={labelClass}>
          Evacuation level reached
        </label>
        <div className="mt-1 flex gap-2">
          <input
            id={`${uid}-evac`}
            type="text"
            inputMode="decimal"
            autoComplete="off"
            {...register("evacuationValue")}
            className={`${inputClass} mt-0 flex-1 tabular`}
            aria-invalid={errors.evacuationValue ? true : undefined}
            aria-describedby={describedBy("evacuationValue")}
          />
          <label htmlFor={`${uid}-evac-unit`} className="sr-only">
            Unit of the evacuation level
          </label>
          <select id={`${uid}-evac-unit`} {...register("evacuationUnit")} className="w-40 rounded-lg border border-ink-300 bg-white px-2 text-base">
            {EVACUATION_UNITS.map((u) => (
              <option key={u} value={u}>
                {EVACUATION_UNIT_LABELS[u]}
              </option>
            ))}
          </select>
        </div>
        <FieldError id={`${uid}-evacuationValue-error`} message={errorOf("evacuationValue")} />
      </div>

      <fieldset>
        <legend className={labelClass}>How the circuit was accessed</legend>
        <div className="mt-2 grid gap-2 sm:grid-cols-2" aria-describedby={describedBy("accessMethod")}>
          {ACCESS_METHODS.map((m) => (
            <label key={m} className="flex min-h-14 cursor-pointer items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 py-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50">
              <input type="radio" value={m} {...register("accessMethod")} className="size-5 accent-fjord-600" />
              <span>{ACCESS_METHOD_LABELS[m]}</span>
            </label>
          ))}
        </div>
        <FieldError id={`${uid}-accessMethod-error`} message={errorOf("accessMethod")} />
      </fieldset>

      {temporary && (
        <Controller
          control={control}
          name="temporaryAccessRemoved"
          render={({ field }) => (
            <fieldset aria-describedby={describedBy("temporaryAccessRemoved")}>
              <legend className={labelClass}>Was the temporary piercing device removed?</legend>
              <p className="text-sm text-ink-600">A piercing device left on the line is a leak point; remove it and install a proper access fitting.</p>
              <div className="mt-2 flex gap-2">
                {[
                  { v: true, label: "Yes, removed" },
                  { v: false, label: "No, still in place" },
                ].map((o) => (
                  <label key={String(o.v)} className="flex min-h-14 flex-1 cursor-pointer items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50">
                    <input type="radio" name={field.name} checked={field.value === o.v} onChange={() => field.onChange(o.v)} onBlur={field.onBlur} className="size-5 accent-fjord-600" />
                    {o.label}
                  </label>
                ))}
              </div>
              <FieldError id={`${uid}-temporaryAccessRemoved-error`} message={errorOf("temporaryAccessRemoved")} />
            </fieldset>
          )}
        />
      )}

      {appliance?.category === "small_appliance" && (
        <Controller
          control={control}
          name="compressorOperating"
          render={({ field }) => (
            <fieldset>
              <legend className={labelClass}>Was the appliance&apos;s compressor running during recovery?</legend>
              <p className="text-sm text-ink-600">Small appliances: 90 % of the charge must be recovered with a running compressor, 80 % without (or 4 in Hg vacuum).</p>
              <div className="mt-2 flex gap-2">
                {[
                  { v: true, label: "Running" },
                  { v: false, label: "Not running" },
                ].map((o) => (
                  <label key={String(o.v)} className="flex min-h-14 flex-1 cursor-pointer items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50">
                    <input type="radio" name={field.name} checked={field.value === o.v} onChange={() => field.onChange(o.v)} onBlur={field.onBlur} className="size-5 accent-fjord-600" />
                    {o.label}
                  </label>
                ))}
              </div>
            </fieldset>
          )}
        />
      )}

      <div>
        <label htmlFor={`${uid}-notes`} className={labelClass}>
          Notes <span className="font-normal text-ink-600">(optional)</span>
        </label>
        <textarea id={`${uid}-notes`} rows={3} {...register("notes")} className={inputClass} aria-describedby={describedBy("notes")} />
        <FieldError id={`${uid}-notes-error`} message={errorOf("notes")} />
      </div>

      <div className="sticky bottom-0 -mx-4 border-t border-ink-200 bg-white/95 px-4 py-3 backdrop-blur">
        <button
          type="submit"
          disabled={save.isPending}
          className="w-full rounded-lg bg-fjord-600 px-4 py-4 text-lg font-semibold text-white hover:bg-fjord-700 disabled:opacity-60"
        >
          {save.isPending ? "Saving…" : "Save recovery job"}
        </button>
      </div>
    </form>
  );
}
