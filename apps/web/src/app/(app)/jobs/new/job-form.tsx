"use client";

import Link from "next/link";
import { useEffect, useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Controller, useForm, type FieldValues, type Resolver } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import {
  ACCESS_METHOD_LABELS,
  ACCESS_METHODS,
  ADDITION_EXCLUSION_LABELS,
  ADDITION_EXCLUSIONS,
  APPLIANCE_CATEGORY_LABELS,
  CHARGE_SOURCE_LABELS,
  CHARGE_SOURCES,
  DISPOSAL_PATH_LABELS,
  DISPOSAL_PATHS,
  EVACUATION_UNIT_LABELS,
  EVACUATION_UNITS,
  JOB_KIND_LABELS,
  JOB_KINDS,
  TEMPORARY_ACCESS_METHODS,
  VERIFICATION_STAGE_LABELS,
  VERIFICATION_STAGES,
  chargeJobInput,
  disposalJobInput,
  formatMass,
  leakRepairJobInput,
  recoveryJobInput,
  verificationTestJobInput,
  type AccessMethod,
  type DraftCheckResult,
  type DraftField,
  type JobKind,
} from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { saveErrorMessage, submitOrExplain } from "@/lib/client/form-save";
import type { ApplianceOption, CylinderOption, EquipmentOption, JobListPage } from "@/lib/client/types";
import { SafetyCautions } from "@/components/safety-cautions";
import { optionsOf } from "@/lib/client/options";
import { OVER_FILL_FORM_MESSAGE, OverFillConfirm, RadioCards } from "@/components/form";
import {
  AmountField,
  DraftWarningLine,
  FieldError,
  FormAlert,
  TextField,
  YesNo,
  choiceClass,
  hintClass,
  inputClass,
  labelClass,
  primaryButton,
  secondaryButton,
  todayIn,
} from "../_components/form-bits";
import { useIdempotencyKey } from "@/lib/client/idempotency";

const SCHEMAS = {
  recovery: recoveryJobInput,
  charge: chargeJobInput,
  leak_repair: leakRepairJobInput,
  verification_test: verificationTestJobInput,
  disposal: disposalJobInput,
} as const;

/** What each kind of job is, in a line, for the kind picker. */
const KIND_HINTS: Record<JobKind, string> = {
  recovery: "Refrigerant taken out of an appliance into a recovery cylinder",
  charge: "Refrigerant added to an appliance; the leak rate is calculated",
  leak_repair: "Where the leak was and what you repaired",
  verification_test: "Initial or follow-up test of a leak repair",
  disposal: "An appliance going for scrap, with the recovery of its refrigerant",
};

export const KIND_HEADINGS: Record<JobKind, string> = {
  recovery: "Log a recovery job",
  charge: "Log a charge (refrigerant added)",
  leak_repair: "Log a leak repair",
  verification_test: "Log a verification test",
  disposal: "Log a disposal",
};

const SAVE_LABELS: Record<JobKind, string> = {
  recovery: "Save recovery job",
  charge: "Save charge",
  leak_repair: "Save leak repair",
  verification_test: "Save verification test",
  disposal: "Save disposal",
};

const TEST_METHODS = [
  "Bubble test (soap solution)",
  "Electronic leak detector",
  "Standing pressure test with dry nitrogen",
  "Standing vacuum test",
  "Ultrasonic leak detector",
];

function useDebounced<T>(value: T, ms: number): T {
  const [debounced, setDebounced] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setDebounced(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return debounced;
}

/** The phone-first job form: pick the kind, pick the appliance, then the kind's own fields. */
export function JobForm({ initialKind }: { initialKind: JobKind | null }) {
  const [kind, setKind] = useState<JobKind | null>(initialKind);
  const [appliance, setAppliance] = useState<ApplianceOption | null>(null);
  const router = useRouter();
  const uid = useId();

  const choose = (k: JobKind | null) => {
    setKind(k);
    router.replace(k ? `/jobs/new?kind=${k}` : "/jobs/new", { scroll: false });
  };

  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-2xl font-semibold text-ink-950">{kind ? KIND_HEADINGS[kind] : "Log a job"}</h1>
        <p className="text-ink-600">{kind ? KIND_HINTS[kind] : "Choose what you did; each kind asks for its own details."}</p>
      </header>
      {kind === null ? (
        <fieldset>
          <legend className={labelClass}>What kind of job?</legend>
          <div className="mt-2 grid gap-2">
            {JOB_KINDS.map((k) => (
              <label key={k} className={choiceClass}>
                <input
                  type="radio"
                  name={`${uid}-kind`}
                  value={k}
                  onChange={() => choose(k)}
                  className="size-5 shrink-0 accent-fjord-600"
                />
                <span>
                  <span className="block text-lg font-semibold text-ink-950">{JOB_KIND_LABELS[k]}</span>
                  <span className="block text-sm text-ink-600">{KIND_HINTS[k]}</span>
                </span>
              </label>
            ))}
          </div>
          <p className="mt-4 text-sm text-ink-700">
            Several retired units waiting at the shop to be scrapped?{" "}
            <Link href="/disposals/shop" className="font-medium text-fjord-700 underline">
              Record the shop&apos;s scrap run
            </Link>
          </p>
        </fieldset>
      ) : (
        <>
          <div className="flex flex-wrap items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 py-3">
            <span className="text-ink-700">
              Kind: <strong className="text-ink-950">{JOB_KIND_LABELS[kind]}</strong>
            </span>
            <button type="button" onClick={() => choose(null)} className={secondaryButton}>
              Change kind
            </button>
          </div>
          <KindForm key={kind} kind={kind} appliance={appliance} setAppliance={setAppliance} />
        </>
      )}
    </div>
  );
}

function AppliancePicker({
  appliance,
  setAppliance,
  error,
  onClear,
}: {
  appliance: ApplianceOption | null;
  setAppliance: (a: ApplianceOption) => void;
  error?: string;
  onClear: () => void;
}) {
  const uid = useId();
  const [search, setSearch] = useState("");
  const q = useDebounced(search, 250);
  const appliances = useQuery({
    queryKey: ["lookup-appliances", q],
    queryFn: () => fetchJson<{ rows: ApplianceOption[] }>(`/api/lookup/appliances?limit=12&q=${encodeURIComponent(q)}`),
    enabled: appliance === null,
  });
  return (
    <section aria-labelledby={`${uid}-h`} className="space-y-2">
      <h2 id={`${uid}-h`} className={labelClass}>
        Appliance
      </h2>
      {appliance ? (
        <div className="rounded-lg border-2 border-fjord-600 bg-fjord-50 p-4" data-testid="chosen-appliance">
          <p className="text-lg font-semibold text-ink-950">{appliance.tag}</p>
          <p className="text-ink-700">{appliance.description}</p>
          <p className="mt-1 text-sm text-ink-600">
            {APPLIANCE_CATEGORY_LABELS[appliance.category]} · {appliance.refrigerant} · full charge{" "}
            {formatMass(appliance.fullChargeG, appliance.massUnit)}
          </p>
          <p className="text-sm text-ink-600">
            {appliance.siteName} · {appliance.branchName}
          </p>
          <button type="button" onClick={onClear} className={`mt-3 ${secondaryButton}`}>
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
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? `${uid}-error` : undefined}
            placeholder="e.g. RTU-07"
          />
          <FieldError id={`${uid}-error`} message={error} />
          <ul className="space-y-2" aria-label="Matching appliances">
            {appliances.isLoading && <li className="text-ink-600">Looking up appliances…</li>}
            {appliances.data?.rows.length === 0 && <li className="text-ink-600">No appliance in service in your branches matches.</li>}
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
  );
}

function defaultsFor(kind: JobKind): FieldValues {
  const base = { kind, performedOn: todayIn(Intl.DateTimeFormat().resolvedOptions().timeZone), notes: "" };
  switch (kind) {
    case "recovery":
      return { ...base, refrigerant: "", recoveredUnit: "lb", evacuationUnit: "in_hg_vacuum" };
    case "disposal":
      return { ...base, refrigerant: "", recoveredUnit: "lb", evacuationUnit: "in_hg_vacuum", disposalPath: "on_site" };
    case "charge":
      return { ...base, refrigerant: "", chargedUnit: "lb", chargeSource: "stock", additionExclusion: "", sameLeakAsJobId: "" };
    case "leak_repair":
      return { ...base, leakLocation: "", repairDescription: "" };
    case "verification_test":
      return { ...base, verificationMethod: "", relatedJobId: "" };
  }
}

function KindForm({
  kind,
  appliance,
  setAppliance,
}: {
  kind: JobKind;
  appliance: ApplianceOption | null;
  setAppliance: (a: ApplianceOption | null) => void;
}) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const uid = useId();
  const [formError, setFormError] = useState<string | null>(null);
  // The server's question when the amount would put the cylinder above its safe fill.
  const [overFillAsk, setOverFillAsk] = useState<string | null>(null);
  const recovering = kind === "recovery" || kind === "disposal";

  const form = useForm<FieldValues>({
    resolver: zodResolver(SCHEMAS[kind] as never) as unknown as Resolver<FieldValues>,
    mode: "onTouched",
    defaultValues: defaultsFor(kind),
  });
  const { register, handleSubmit, setValue, watch, control, formState, setError } = form;
  const errors = formState.errors;
  const values = watch();
  const accessMethod = values.accessMethod as AccessMethod | undefined;
  const temporary = accessMethod ? TEMPORARY_ACCESS_METHODS.includes(accessMethod) : false;

  const branchId = appliance?.branchId;
  const cylinders = useQuery({
    queryKey: ["lookup-cylinders", branchId],
    queryFn: () => fetchJson<{ rows: CylinderOption[] }>(`/api/lookup/cylinders?branchId=${branchId}`),
    enabled: branchId !== undefined && (recovering || kind === "charge"),
  });
  const equipment = useQuery({
    queryKey: ["lookup-equipment", branchId],
    queryFn: () => fetchJson<{ rows: EquipmentOption[] }>(`/api/lookup/equipment?branchId=${branchId}`),
    enabled: branchId !== undefined && recovering,
  });
  const repairs = useQuery({
    queryKey: ["jobs", "repairs-of", appliance?.id],
    queryFn: () => fetchJson<JobListPage>(`/api/jobs?kind=leak_repair&applianceId=${appliance!.id}&pageSize=10`),
    enabled: appliance !== null && kind === "verification_test",
  });
  const earlierCharges = useQuery({
    queryKey: ["jobs", "charges-of", appliance?.id],
    queryFn: () => fetchJson<JobListPage>(`/api/jobs?kind=charge&applianceId=${appliance!.id}&pageSize=10`),
    enabled: appliance !== null && kind === "charge",
  });

  useEffect(() => {
    if (!appliance) return;
    setValue("applianceId", appliance.id, { shouldValidate: formState.isSubmitted });
    setValue("performedOn", todayIn(appliance.timeZone));
    if (kind !== "leak_repair" && kind !== "verification_test") setValue("refrigerant", appliance.refrigerant);
    const unit = appliance.massUnit === "kg" ? "kg" : "lb";
    if (recovering) setValue("recoveredUnit", unit);
    if (kind === "charge") setValue("chargedUnit", unit);
    if (appliance.category !== "small_appliance" && recovering) setValue("compressorOperating", null);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- fills defaults when the appliance is picked, not again when the kind or submit state changes
  }, [appliance]);

  // Instant feedback: the rules run on the draft (debounced) and say what would become a finding.
  const draftBody = JSON.stringify({ ...values, kind });
  const debouncedDraft = useDebounced(draftBody, 450);
  const feedback = useQuery({
    queryKey: ["job-draft-check", debouncedDraft],
    queryFn: () => fetchJson<DraftCheckResult>("/api/jobs/check", { method: "POST", body: debouncedDraft }),
    enabled: appliance !== null,
    staleTime: 60_000,
    retry: false,
  });
  const warnings = appliance ? (feedback.data?.warnings ?? []) : [];
  const fieldWarnings = (field: DraftField) =>
    warnings.filter((w) => w.field === field).map((w) => <DraftWarningLine key={w.ruleId + w.message} warning={w} compact />);

  const idem = useIdempotencyKey();
  const save = useMutation({
    mutationFn: (input: FieldValues) =>
      fetchJson<{ id: number }>("/api/jobs", { method: "POST", headers: idem.headers, body: JSON.stringify(input) }),
    onSuccess: async ({ id }) => {
      await queryClient.invalidateQueries({ queryKey: ["jobs"] });
      router.push(`/jobs/${id}?saved=1`);
    },
    onError: (err) => {
      const ask = err instanceof ApiError ? err.fieldErrors.confirmOverFill?.[0] : undefined;
      if (ask) setOverFillAsk(ask);
      const message = saveErrorMessage(err, setError, "The job could not be sent. Check your connection; nothing was saved.");
      setFormError(ask ? OVER_FILL_FORM_MESSAGE : message);
    },
  });

  const onSubmit = submitOrExplain(handleSubmit, {
    save: save.mutate,
    setFormError,
    invalid: "Some fields need attention before the job can be saved.",
  });

  const errorOf = (name: string) => errors[name]?.message as string | undefined;
  const describedBy = (name: string) => (errors[name] ? `${uid}-${name}-error` : undefined);
  const massUnit = appliance?.massUnit ?? "lb_oz";
  const amountName = kind === "charge" ? "chargedAmount" : "recoveredAmount";
  const unitName = kind === "charge" ? "chargedUnit" : "recoveredUnit";
  const chargeFromCylinder = kind === "charge" && values.chargeSource === "cylinder";
  const cylinderRows = (cylinders.data?.rows ?? []).filter(
    (c) => !chargeFromCylinder || (c.contentsG > 0 && c.refrigerant === appliance?.refrigerant),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-7" aria-describedby={formError ? `${uid}-form-error` : undefined}>
      <SafetyCautions />
      <FormAlert id={`${uid}-form-error`} message={formError} />

      <input type="hidden" {...register("applianceId")} />
      <AppliancePicker
        appliance={appliance}
        setAppliance={setAppliance}
        error={errorOf("applianceId")}
        onClear={() => {
          setAppliance(null);
          setValue("cylinderId", undefined);
          setValue("equipmentId", undefined);
        }}
      />
      {fieldWarnings("applianceId")}

      <div className="grid gap-5 sm:grid-cols-2">
        {(recovering || kind === "charge") && (
          <TextField
            id={`${uid}-refrigerant`}
            label="Refrigerant"
            hint="Taken from the appliance register."
            registration={register("refrigerant")}
            readOnly
            inputClassName={`${inputClass} bg-ink-50`}
          />
        )}
        <TextField
          id={`${uid}-date`}
          label="Date of the work"
          error={errorOf("performedOn")}
          registration={register("performedOn")}
          type="date"
        />
      </div>

      {(recovering || kind === "charge") && (
        <div>
          <AmountField
            id={`${uid}-amount`}
            label={kind === "charge" ? "Amount added" : "Amount recovered"}
            error={errorOf(amountName)}
            unitLabel={kind === "charge" ? "Unit of the amount added" : "Unit of the amount recovered"}
            amount={register(amountName)}
            unit={register(unitName)}
          />
          {fieldWarnings(kind === "charge" ? "chargedAmount" : "recoveredAmount")}
        </div>
      )}
      {recovering && overFillAsk && (
        <OverFillConfirm id={`${uid}-confirm-over-fill`} message={overFillAsk} registration={register("confirmOverFill")} />
      )}

      {kind === "charge" && (
        <>
          <fieldset aria-describedby={describedBy("chargeSource")}>
            <legend className={labelClass}>Where did the refrigerant come from?</legend>
            <RadioCards
              className="mt-2 grid gap-2"
              registration={register("chargeSource")}
              options={optionsOf(CHARGE_SOURCES, CHARGE_SOURCE_LABELS)}
            />
            <FieldError id={`${uid}-chargeSource-error`} message={errorOf("chargeSource")} />
          </fieldset>
          <fieldset>
            <legend className={labelClass}>Leave this addition out of the leak rate?</legend>
            <p className={hintClass}>Only for these three cases; every other addition counts.</p>
            <RadioCards
              className="mt-2 grid gap-2"
              registration={register("additionExclusion")}
              options={[{ value: "", label: "No, it counts (usual)" }, ...optionsOf(ADDITION_EXCLUSIONS, ADDITION_EXCLUSION_LABELS)]}
            />
          </fieldset>
          <div>
            <label htmlFor={`${uid}-same-leak`} className={labelClass}>
              Same leak as an earlier addition?
            </label>
            <p id={`${uid}-same-leak-hint`} className={hintClass}>
              If this tops up the same leak as an earlier charge, choose it: the two are added together for one leak rate.
            </p>
            <select
              id={`${uid}-same-leak`}
              {...register("sameLeakAsJobId")}
              className={`${inputClass} py-3`}
              aria-describedby={[`${uid}-same-leak-hint`, describedBy("sameLeakAsJobId")].filter(Boolean).join(" ")}
              aria-invalid={errors.sameLeakAsJobId ? true : undefined}
            >
              <option value="">No, a new leak or not known (usual)</option>
              {(earlierCharges.data?.rows ?? [])
                .filter((r) => !values.performedOn || r.performedOn <= values.performedOn)
                .map((r) => (
                  <option key={r.id} value={r.id}>
                    {r.performedOn} · {formatMass(r.chargedG, massUnit)} · job #{r.id}
                  </option>
                ))}
            </select>
            <FieldError id={`${uid}-sameLeakAsJobId-error`} message={errorOf("sameLeakAsJobId")} />
          </div>
        </>
      )}

      {(recovering || chargeFromCylinder) && (
        <fieldset>
          <legend className={labelClass}>{chargeFromCylinder ? "Cylinder it came from" : "Recovery cylinder"}</legend>
          {!appliance && <p className={hintClass}>Choose the appliance first; the cylinders of its branch appear here.</p>}
          {appliance && chargeFromCylinder && cylinderRows.length === 0 && (
            <p className={hintClass}>No cylinder of this branch holds {appliance.refrigerant} on record.</p>
          )}
          <RadioCards
            className="mt-2 space-y-2"
            groupProps={{ role: "radiogroup", "aria-describedby": describedBy("cylinderId") }}
            registration={register("cylinderId")}
            options={cylinderRows.map((c) => ({
              value: c.id,
              label: (
                <span>
                  <span className="block font-semibold">{c.serial}</span>
                  <span className="block text-sm text-ink-600">
                    {c.refrigerant && c.contentsG > 0 ? `Holds ${formatMass(c.contentsG, massUnit)} ${c.refrigerant}` : "Empty"}
                    {recovering && c.refrigerant && c.contentsG > 0 && values.refrigerant && c.refrigerant !== values.refrigerant && (
                      <strong className="ml-1 text-sev-major">⚠ different refrigerant</strong>
                    )}
                  </span>
                </span>
              ),
            }))}
          />
          <FieldError id={`${uid}-cylinderId-error`} message={errorOf("cylinderId")} />
          {fieldWarnings("cylinderId")}
          {feedback.data?.cylinderAfter && values.cylinderId && (
            <p className={hintClass} data-testid="cylinder-after">
              After this job the cylinder holds {formatMass(feedback.data.cylinderAfter.netG, massUnit)}
              {feedback.data.cylinderAfter.maxNetG !== null &&
                ` of its ${formatMass(feedback.data.cylinderAfter.maxNetG, massUnit)} maximum`}
              .
            </p>
          )}
        </fieldset>
      )}

      {recovering && (
        <>
          <fieldset>
            <legend className={labelClass}>Recovery equipment</legend>
            <RadioCards
              className="mt-2 space-y-2"
              groupProps={{ role: "radiogroup", "aria-describedby": describedBy("equipmentId") }}
              registration={register("equipmentId")}
              options={(equipment.data?.rows ?? []).map((e) => ({
                value: e.id,
                label: (
                  <span>
                    <span className="block font-semibold">{e.serial}</span>
                    <span className="block text-sm text-ink-600">
                      {e.makeModel} · {e.certificationState === "certified" ? "✓ certified" : "⚠ no certification on file"}
                    </span>
                  </span>
                ),
              }))}
            />
            <FieldError id={`${uid}-equipmentId-error`} message={errorOf("equipmentId")} />
            {fieldWarnings("equipmentId")}
          </fieldset>

          <div>
            <AmountField
              id={`${uid}-evac`}
              label="Evacuation level reached"
              hint={
                feedback.data?.evacuationRequired && appliance ? (
                  <span data-testid="evacuation-required">Required here: {feedback.data.evacuationRequired}</span>
                ) : undefined
              }
              hintFirst
              error={errorOf("evacuationValue")}
              unitLabel="Unit of the evacuation level"
              amount={register("evacuationValue")}
              unit={register("evacuationUnit")}
              options={optionsOf(EVACUATION_UNITS, EVACUATION_UNIT_LABELS)}
              unitClassName="w-40 rounded-lg border border-ink-300 bg-white px-2 text-base"
            />
            {fieldWarnings("evacuationValue")}
          </div>
        </>
      )}

      {kind === "leak_repair" && (
        <>
          <TextField
            id={`${uid}-leak`}
            label="Where was the leak?"
            error={errorOf("leakLocation")}
            registration={register("leakLocation")}
            type="text"
            placeholder="e.g. Evaporator return bend"
          />
          <TextField
            id={`${uid}-repair`}
            label="What was repaired?"
            error={errorOf("repairDescription")}
            registration={register("repairDescription")}
            rows={3}
          />
          {appliance?.category === "industrial_process" && (
            <Controller
              control={control}
              name="shutdownNeeded"
              render={({ field }) => (
                <fieldset>
                  <legend className={labelClass}>Did the repair need an industrial-process shutdown?</legend>
                  <p className={hintClass}>With a shutdown the repair deadline is 120 days instead of 30.</p>
                  <YesNo name={field.name} value={field.value as boolean | null} onChange={field.onChange} />
                </fieldset>
              )}
            />
          )}
        </>
      )}

      {kind === "verification_test" && (
        <>
          <fieldset aria-describedby={describedBy("verificationStage")}>
            <legend className={labelClass}>Which test?</legend>
            <RadioCards
              className="mt-2 grid gap-2"
              registration={register("verificationStage")}
              options={optionsOf(VERIFICATION_STAGES, VERIFICATION_STAGE_LABELS)}
            />
            <FieldError id={`${uid}-verificationStage-error`} message={errorOf("verificationStage")} />
          </fieldset>
          <Controller
            control={control}
            name="verificationPassed"
            render={({ field }) => (
              <fieldset aria-describedby={describedBy("verificationPassed")}>
                <legend className={labelClass}>Did the repair pass?</legend>
                <YesNo name={field.name} value={field.value as boolean | null} onChange={field.onChange} yes="✓ Passed" no="✕ Failed" />
                <FieldError id={`${uid}-verificationPassed-error`} message={errorOf("verificationPassed")} />
              </fieldset>
            )}
          />
          <TextField
            id={`${uid}-method`}
            label="How was it tested?"
            error={errorOf("verificationMethod")}
            registration={register("verificationMethod")}
            type="text"
            list={`${uid}-methods`}
            after={
              <datalist id={`${uid}-methods`}>
                {TEST_METHODS.map((m) => (
                  <option key={m} value={m} />
                ))}
              </datalist>
            }
          />
          <div>
            <label htmlFor={`${uid}-related`} className={labelClass}>
              Repair this test checks
            </label>
            <select id={`${uid}-related`} {...register("relatedJobId")} className={`${inputClass} py-3`}>
              <option value="">Latest repair on or before the test date</option>
              {repairs.data?.rows.map((r) => (
                <option key={r.id} value={r.id}>
                  {r.performedOn} — repair #{r.id}
                </option>
              ))}
            </select>
          </div>
        </>
      )}

      {kind === "disposal" && (
        <fieldset>
          <legend className={labelClass}>Where is it taken apart?</legend>
          <RadioCards
            className="mt-2 grid gap-2"
            registration={register("disposalPath")}
            options={optionsOf(DISPOSAL_PATHS, DISPOSAL_PATH_LABELS)}
          />
          <p className={hintClass}>After saving, add the disposal record (more than 5 lb) or the signed statement (small appliance).</p>
        </fieldset>
      )}

      {kind !== "verification_test" && (
        <fieldset>
          <legend className={labelClass}>
            How was the circuit accessed?
            {kind === "charge" || kind === "leak_repair" ? <span className="font-normal text-ink-600"> (optional)</span> : null}
          </legend>
          <RadioCards
            className="mt-2 grid gap-2 sm:grid-cols-2"
            groupProps={{ "aria-describedby": describedBy("accessMethod") }}
            registration={register("accessMethod")}
            options={optionsOf(ACCESS_METHODS, ACCESS_METHOD_LABELS)}
          />
          <FieldError id={`${uid}-accessMethod-error`} message={errorOf("accessMethod")} />
        </fieldset>
      )}

      {temporary && (
        <Controller
          control={control}
          name="temporaryAccessRemoved"
          render={({ field }) => (
            <fieldset aria-describedby={describedBy("temporaryAccessRemoved")}>
              <legend className={labelClass}>Was the temporary piercing device removed?</legend>
              <p className={hintClass}>
                A piercing device left on the line is a leak point; remove it and install a proper access fitting.
              </p>
              <YesNo
                name={field.name}
                value={field.value as boolean | null}
                onChange={field.onChange}
                yes="Yes, removed"
                no="No, still in place"
              />
              <FieldError id={`${uid}-temporaryAccessRemoved-error`} message={errorOf("temporaryAccessRemoved")} />
              {fieldWarnings("temporaryAccessRemoved")}
            </fieldset>
          )}
        />
      )}

      {recovering && appliance?.category === "small_appliance" && (
        <Controller
          control={control}
          name="compressorOperating"
          render={({ field }) => (
            <fieldset>
              <legend className={labelClass}>Was the appliance&apos;s compressor running during recovery?</legend>
              <p className={hintClass}>
                Small appliances: 90 % of the charge must be recovered with a running compressor, 80 % without (or 4 in Hg vacuum).
              </p>
              <YesNo name={field.name} value={field.value as boolean | null} onChange={field.onChange} yes="Running" no="Not running" />
            </fieldset>
          )}
        />
      )}

      <TextField id={`${uid}-notes`} label="Notes" optional error={errorOf("notes")} registration={register("notes")} rows={3} />

      <DraftFeedback appliance={appliance} feedback={feedback.data} checking={feedback.isFetching} massUnitLabel={kind === "charge"} />

      <div className="sticky bottom-0 -mx-4 border-t border-ink-200 bg-white/95 px-4 py-3 backdrop-blur">
        {warnings.length > 0 && (
          <p className="mb-2 text-sm font-medium text-ink-800">
            <span aria-hidden="true">⚠ </span>
            {warnings.length === 1 ? "1 thing would become a finding." : `${warnings.length} things would become findings.`} You can still
            save; fix what you can first.
          </p>
        )}
        <button type="submit" disabled={save.isPending} className={primaryButton}>
          {save.isPending ? "Saving…" : SAVE_LABELS[kind]}
        </button>
      </div>
    </form>
  );
}

/** The "before you save" panel: what the rules would raise if the job were saved now, and the leak rate. */
function DraftFeedback({
  appliance,
  feedback,
  checking,
  massUnitLabel,
}: {
  appliance: ApplianceOption | null;
  feedback: DraftCheckResult | undefined;
  checking: boolean;
  massUnitLabel: boolean;
}) {
  if (!appliance) return null;
  const warnings = feedback?.warnings ?? [];
  const leak = feedback?.leakRate;
  return (
    <section
      aria-labelledby="draft-check-h"
      className="space-y-2 rounded-lg border border-ink-200 bg-white p-4"
      data-testid="draft-feedback"
    >
      <h2 id="draft-check-h" className="flex items-center gap-2 text-lg font-semibold text-ink-950">
        Rules check before you save {checking && <span className="text-sm font-normal text-ink-600">checking…</span>}
      </h2>
      <div aria-live="polite" className="space-y-2">
        {warnings.length === 0 ? (
          <p className="flex items-center gap-2 text-ok">
            <span aria-hidden="true">✓</span> Nothing entered so far would become a finding.
          </p>
        ) : (
          <ul className="space-y-2">
            {warnings.map((w) => (
              <DraftWarningLine key={w.ruleId + w.message} warning={w} />
            ))}
          </ul>
        )}
        {massUnitLabel && leak && (
          <p className="rounded-md border border-ink-200 bg-ink-50 px-3 py-2 text-sm text-ink-900" data-testid="draft-leak-rate">
            <span aria-hidden="true">{leak.exceeds ? "⚠ " : "ⓘ "}</span>
            {leak.reason}
          </p>
        )}
      </div>
    </section>
  );
}
