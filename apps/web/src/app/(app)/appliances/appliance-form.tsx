"use client";

import { useId, useMemo, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useForm, type Resolver } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  APPLIANCE_CATEGORIES,
  APPLIANCE_CATEGORY_LABELS,
  CERTIFICATION_TYPE_LABELS,
  FULL_CHARGE_METHODS,
  REGISTER_LABELS,
  applianceInput,
  applianceUpdateInput,
  classifyPressure,
  getRefrigerant,
  isSmallAppliance,
  leakRepairRegime,
  normaliseDesignation,
  requiredCertificationTypes,
  toGrams,
  type MassDisplayUnit,
  type MassInputUnit,
} from "@coldtrail/core";
import type { ApplianceRow, CustomerOption, SiteOption } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { optionsOf } from "@/lib/client/options";
import { editAmount } from "@/lib/client/form-values";
import { saveErrorMessage, submitOrExplain } from "@/lib/client/form-save";
import { RadioCards, RefrigerantList } from "@/components/form";
import {
  AmountField,
  Field,
  FieldError,
  FormAlert,
  TextField,
  buttonSecondary,
  describedBy,
  fieldAria,
  inputClass,
  labelClass,
  selectClass,
  StickyFormActions,
  SelectField,
} from "@/components/registers/form-fields";
import { PRESSURE_CLASS_WORDS, todayIn } from "@/components/registers/words";
import { useIdempotencyKey } from "@/lib/client/idempotency";

export interface WritableBranch {
  id: number;
  name: string;
  massUnit: MassDisplayUnit;
  timeZone: string;
}

type FormIn = z.input<typeof applianceInput> & { reason?: string };
type FormOut = z.output<typeof applianceInput> & { reason?: string };

/** What the rules core derives from what is typed so far: shown before saving. */
function DerivedPreview({
  refrigerant,
  amount,
  unit,
  factorySealed,
  category,
  today,
}: {
  refrigerant: string;
  amount: unknown;
  unit: MassInputUnit;
  factorySealed: boolean;
  category: string;
  today: string;
}) {
  const designation = refrigerant ? normaliseDesignation(refrigerant) : "";
  const known = designation ? getRefrigerant(designation) : undefined;
  const numeric = typeof amount === "number" ? amount : Number(String(amount ?? "").replace(",", "."));
  const grams = Number.isFinite(numeric) && numeric > 0 ? toGrams(numeric, unit) : null;
  if (!known) {
    return (
      <p className="text-sm text-ink-600" data-testid="derived-preview">
        Enter a catalogued refrigerant to see its pressure class and the certification it needs.
      </p>
    );
  }
  let pressure: string | null;
  try {
    pressure = PRESSURE_CLASS_WORDS[classifyPressure(designation)];
  } catch {
    pressure = null;
  }
  const small = isSmallAppliance({ fullChargeG: grams, factorySealed });
  const types = (() => {
    try {
      return requiredCertificationTypes({ refrigerant: designation, fullChargeG: grams, factorySealed });
    } catch {
      return [];
    }
  })();
  const regime =
    category && (APPLIANCE_CATEGORIES as readonly string[]).includes(category)
      ? leakRepairRegime({
          refrigerant: designation,
          fullChargeG: grams,
          category: category as (typeof APPLIANCE_CATEGORIES)[number],
          on: today,
        })
      : null;
  return (
    <dl className="grid gap-1 text-sm" data-testid="derived-preview">
      <div>
        <dt className="inline text-ink-600">Refrigerant: </dt>
        <dd className="inline font-medium">
          {known.designation} ({known.safetyGroup}){pressure && ` · ${pressure}`}
        </dd>
      </div>
      <div>
        <dt className="inline text-ink-600">Small appliance: </dt>
        <dd className="inline font-medium">{small ? "Yes (factory sealed, 5 lb or less)" : "No"}</dd>
      </div>
      <div>
        <dt className="inline text-ink-600">Certification needed: </dt>
        <dd className="inline font-medium">{types.map((t) => CERTIFICATION_TYPE_LABELS[t]).join(" or ") || "—"}</dd>
      </div>
      {regime && (
        <div>
          <dt className="inline text-ink-600">Leak repair rules: </dt>
          <dd className="inline font-medium">
            {regime.regime
              ? `Apply (${regime.citation})`
              : `Do not apply: ${regime.reason.charAt(0).toLowerCase()}${regime.reason.slice(1)}`}
          </dd>
        </div>
      )}
    </dl>
  );
}

export function ApplianceForm(
  props: { mode: "create"; branches: WritableBranch[] } | { mode: "edit"; branches: WritableBranch[]; appliance: ApplianceRow },
) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const uid = useId();
  const editing = props.mode === "edit" ? props.appliance : null;
  const firstBranch = editing ? props.branches.find((b) => b.id === editing.branchId) : props.branches[0];
  const [formError, setFormError] = useState<string | null>(null);
  const [siteSearch, setSiteSearch] = useState("");
  const [chosenSite, setChosenSite] = useState<SiteOption | null>(
    editing
      ? {
          id: editing.siteId,
          branchId: editing.branchId,
          name: editing.siteName,
          address: editing.siteAddress,
          customerId: editing.customerId,
          customerName: editing.customerName,
        }
      : null,
  );

  const charge = editing ? editAmount(editing.fullChargeG, editing.massUnit) : null;
  const form = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(props.mode === "create" ? applianceInput : applianceUpdateInput) as unknown as Resolver<FormIn, unknown, FormOut>,
    mode: "onTouched",
    defaultValues: editing
      ? {
          siteChoice: "existing",
          siteId: editing.siteId,
          customerChoice: "none",
          tag: editing.tag,
          description: editing.description,
          category: editing.category,
          refrigerant: editing.refrigerant,
          fullChargeAmount: charge!.amount,
          fullChargeUnit: charge!.unit,
          fullChargeMethod: editing.fullChargeMethod,
          factorySealed: editing.factorySealed,
          hasLeakDetection: editing.hasLeakDetection,
          industrialShutdownNeeded: editing.industrialShutdownNeeded,
          makeModel: editing.makeModel ?? "",
          serialNumber: editing.serialNumber ?? "",
          manufacturedOn: editing.manufacturedOn ?? "",
          installedOn: editing.installedOn ?? "",
          reason: "",
        }
      : {
          branchId: firstBranch?.id,
          siteChoice: "existing",
          customerChoice: "none",
          tag: "",
          description: "",
          refrigerant: "",
          fullChargeUnit: firstBranch?.massUnit === "kg" ? "kg" : "lb",
          fullChargeMethod: "nameplate",
          factorySealed: false,
          hasLeakDetection: false,
          industrialShutdownNeeded: false,
          status: "in_service",
        },
  });
  const { register, handleSubmit, watch, setValue, setError, formState } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const err = (name: string) => errors[name]?.message;

  const branchId = Number(watch("branchId") ?? editing?.branchId ?? firstBranch?.id);
  const branch = props.branches.find((b) => b.id === branchId) ?? firstBranch;
  const siteChoice = watch("siteChoice");
  const customerChoice = watch("customerChoice");
  const category = watch("category") as string;
  const status = watch("status");
  const dirty = formState.dirtyFields as Record<string, unknown>;
  const regulatedDirty =
    editing && ["category", "refrigerant", "fullChargeAmount", "fullChargeUnit", "fullChargeMethod", "factorySealed"].some((k) => dirty[k]);

  const sites = useQuery({
    queryKey: ["register-sites", branchId, siteSearch],
    queryFn: () =>
      fetchJson<{ rows: SiteOption[] }>(`/api/appliances/sites?branchId=${branchId}&limit=8&q=${encodeURIComponent(siteSearch)}`),
    enabled: Boolean(branchId) && siteChoice === "existing" && chosenSite === null,
  });
  const customers = useQuery({
    queryKey: ["register-customers", branchId],
    queryFn: () => fetchJson<{ rows: CustomerOption[] }>(`/api/appliances/customers?branchId=${branchId}&limit=50`),
    enabled: Boolean(branchId) && siteChoice === "new" && customerChoice === "existing",
  });

  const idem = useIdempotencyKey();
  const save = useMutation({
    mutationFn: async (values: FormOut) => {
      if (editing) {
        const { branchId: _ignored, status: _s, retiredOn: _r, ...rest } = values;
        const body: Record<string, unknown> = { ...rest };
        // An untouched full charge goes back exactly as stored, so rounding for display never changes it.
        if (!dirty.fullChargeAmount && !dirty.fullChargeUnit) {
          body.fullChargeAmount = editing.fullChargeG;
          body.fullChargeUnit = "g";
        }
        await fetchJson(`/api/appliances/${editing.id}`, { method: "PATCH", body: JSON.stringify(body) });
        return editing.id;
      }
      const { reason: _reason, ...body } = values;
      const { id } = await fetchJson<{ id: number }>("/api/appliances", {
        method: "POST",
        headers: idem.headers,
        body: JSON.stringify(body),
      });
      return id;
    },
    onSuccess: async (id) => {
      await queryClient.invalidateQueries({ queryKey: ["appliances"] });
      await queryClient.invalidateQueries({ queryKey: ["appliance", String(id)] });
      router.push(`/appliances/${id}?saved=${editing ? "updated" : "created"}`);
    },
    onError: (e) => {
      setFormError(saveErrorMessage(e, setError, "The appliance could not be sent. Check your connection; nothing was saved."));
    },
  });

  const onSubmit = submitOrExplain(handleSubmit, {
    save: save.mutate,
    setFormError,
    invalid: "Some fields need attention before the appliance can be saved.",
  });

  const f = (name: string) => `${uid}-${name}`;
  const today = todayIn(branch?.timeZone ?? "UTC");
  const categoryOptions = useMemo(() => APPLIANCE_CATEGORIES.map((c) => ({ value: c, label: APPLIANCE_CATEGORY_LABELS[c] })), []);

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6" data-testid="appliance-form">
      <FormAlert message={formError} />

      {!editing && (
        <Field id={f("branchId")} label="Branch" error={err("branchId")}>
          {props.branches.length === 1 ? (
            <>
              <input type="hidden" {...register("branchId")} />
              <p id={f("branchId")} className="mt-1 text-base font-medium">
                {props.branches[0]!.name}
              </p>
            </>
          ) : (
            <select
              id={f("branchId")}
              {...register("branchId", {
                onChange: () => {
                  setChosenSite(null);
                  setValue("siteId", undefined as unknown as number);
                },
              })}
              className={selectClass}
              {...fieldAria(f("branchId"), { error: err("branchId") })}
            >
              {props.branches.map((b) => (
                <option key={b.id} value={b.id}>
                  {b.name}
                </option>
              ))}
            </select>
          )}
        </Field>
      )}

      <fieldset className="space-y-3 rounded-lg border border-ink-200 bg-white p-4">
        <legend className="px-1 text-base font-semibold text-ink-950">Where it is</legend>
        <RadioCards
          size="medium"
          className="flex flex-wrap gap-2"
          cardClassName="flex-1"
          groupProps={{ role: "radiogroup", "aria-label": "Site" }}
          registration={register("siteChoice")}
          options={[
            { value: "existing", label: "A site already on file" },
            { value: "new", label: "A new site" },
          ]}
        />

        {siteChoice === "existing" && (
          <div>
            <input type="hidden" {...register("siteId")} />
            {chosenSite ? (
              <div className="rounded-lg border-2 border-fjord-600 bg-fjord-50 p-3" data-testid="chosen-site">
                <p className="font-semibold">{chosenSite.name}</p>
                {chosenSite.customerName && <p className="text-sm text-ink-700">{chosenSite.customerName}</p>}
                {chosenSite.address && <p className="text-sm text-ink-600">{chosenSite.address}</p>}
                <button
                  type="button"
                  className={`${buttonSecondary} mt-2`}
                  onClick={() => {
                    setChosenSite(null);
                    setValue("siteId", undefined as unknown as number, { shouldDirty: true });
                  }}
                >
                  Choose another site
                </button>
              </div>
            ) : (
              <div className="space-y-2">
                <label htmlFor={f("siteSearch")} className={labelClass}>
                  Find the site
                </label>
                <input
                  id={f("siteSearch")}
                  type="search"
                  value={siteSearch}
                  onChange={(e) => setSiteSearch(e.target.value)}
                  placeholder="Site, address or customer"
                  className={inputClass}
                  {...fieldAria(f("siteId"), { error: err("siteId") })}
                />
                <FieldError id={`${f("siteId")}-error`} message={err("siteId")} />
                <ul className="space-y-1.5" aria-label="Matching sites">
                  {sites.isLoading && <li className="text-sm text-ink-600">Looking up sites…</li>}
                  {sites.data?.rows.length === 0 && <li className="text-sm text-ink-600">No site matches. Add a new site instead.</li>}
                  {sites.data?.rows.map((s) => (
                    <li key={s.id}>
                      <button
                        type="button"
                        onClick={() => {
                          setChosenSite(s);
                          setValue("siteId", s.id, { shouldValidate: formState.isSubmitted, shouldDirty: true });
                        }}
                        className="block min-h-11 w-full rounded-lg border border-ink-200 bg-white px-3 py-2 text-left hover:border-fjord-600"
                      >
                        <span className="block font-medium">{s.name}</span>
                        <span className="block text-sm text-ink-600">{[s.customerName, s.address].filter(Boolean).join(" · ")}</span>
                      </button>
                    </li>
                  ))}
                </ul>
              </div>
            )}
          </div>
        )}

        {siteChoice === "new" && (
          <div className="space-y-3">
            <TextField id={f("newSiteName")} label="Site name" error={err("newSiteName")} registration={register("newSiteName")} />
            <TextField
              id={f("newSiteAddress")}
              label="Address"
              optional
              error={err("newSiteAddress")}
              registration={register("newSiteAddress")}
              autoComplete="street-address"
            />
            <fieldset>
              <legend className={labelClass}>Customer</legend>
              <RadioCards
                size="medium"
                className="mt-1 flex flex-wrap gap-2"
                registration={register("customerChoice")}
                options={[
                  { value: "none", label: "Our own shop" },
                  { value: "existing", label: "A customer on file" },
                  { value: "new", label: "A new customer" },
                ]}
              />
            </fieldset>
            {customerChoice === "existing" && (
              <SelectField
                id={f("customerId")}
                label="Which customer"
                error={err("customerId")}
                registration={register("customerId")}
                placeholder="Choose…"
                options={(customers.data?.rows ?? []).map((c) => ({ value: c.id, label: c.name }))}
              />
            )}
            {customerChoice === "new" && (
              <TextField
                id={f("newCustomerName")}
                label="Customer name"
                error={err("newCustomerName")}
                registration={register("newCustomerName")}
              />
            )}
          </div>
        )}
      </fieldset>

      <fieldset className="space-y-4 rounded-lg border border-ink-200 bg-white p-4">
        <legend className="px-1 text-base font-semibold text-ink-950">The appliance</legend>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            id={f("tag")}
            label="Tag"
            hint="How people name it, e.g. RTU-07"
            error={err("tag")}
            registration={register("tag")}
            autoComplete="off"
          />
          <SelectField
            id={f("category")}
            label="Kind of appliance"
            error={err("category")}
            registration={register("category")}
            placeholder="Choose…"
            options={categoryOptions}
          />
        </div>
        <TextField id={f("description")} label="Description" error={err("description")} registration={register("description")} />
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField
            id={f("refrigerant")}
            label="Refrigerant"
            hint="ASHRAE designation; any spelling, e.g. r410a"
            error={err("refrigerant")}
            registration={register("refrigerant")}
            list={f("refrigerants")}
            autoComplete="off"
            autoCapitalize="characters"
            after={<RefrigerantList id={f("refrigerants")} />}
          />
          <AmountField
            id={f("fullChargeAmount")}
            label="Full charge"
            error={err("fullChargeAmount")}
            unitId={f("fullChargeUnit")}
            unitLabel="Unit of the full charge"
            amount={register("fullChargeAmount")}
            unit={register("fullChargeUnit")}
          />
        </div>
        <SelectField
          id={f("fullChargeMethod")}
          label="How the full charge was determined"
          error={err("fullChargeMethod")}
          registration={register("fullChargeMethod")}
          options={optionsOf(FULL_CHARGE_METHODS, REGISTER_LABELS.fullChargeMethod)}
        />
        <div className="space-y-2">
          <label className="flex min-h-11 items-start gap-3">
            <input
              type="checkbox"
              {...register("factorySealed")}
              className="mt-1 size-5 accent-fjord-600"
              aria-describedby={describedBy(f("factorySealed"), { error: err("factorySealed") })}
            />
            <span>
              <span className="font-medium">Charged and sealed in the factory</span>
              <span className="block text-sm text-ink-600">Fully manufactured, charged and hermetically sealed by its maker.</span>
            </span>
          </label>
          <FieldError id={`${f("factorySealed")}-error`} message={err("factorySealed")} />
          <label className="flex min-h-11 items-start gap-3">
            <input type="checkbox" {...register("hasLeakDetection")} className="mt-1 size-5 accent-fjord-600" />
            <span className="font-medium">Automatic leak detection fitted</span>
          </label>
          {category === "industrial_process" && (
            <label className="flex min-h-11 items-start gap-3">
              <input type="checkbox" {...register("industrialShutdownNeeded")} className="mt-1 size-5 accent-fjord-600" />
              <span>
                <span className="font-medium">A repair needs an industrial process shutdown</span>
                <span className="block text-sm text-ink-600">Allows 120 days instead of 30 to repair a leak.</span>
              </span>
            </label>
          )}
        </div>
        <div className="rounded-lg bg-ink-50 p-3" aria-live="polite">
          <p className="mb-1 text-sm font-semibold text-ink-800">What the rules derive</p>
          <DerivedPreview
            refrigerant={String(watch("refrigerant") ?? "")}
            amount={watch("fullChargeAmount")}
            unit={watch("fullChargeUnit") ?? "lb"}
            factorySealed={Boolean(watch("factorySealed"))}
            category={category}
            today={today}
          />
        </div>
      </fieldset>

      <fieldset className="space-y-4 rounded-lg border border-ink-200 bg-white p-4">
        <legend className="px-1 text-base font-semibold text-ink-950">Nameplate and dates</legend>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField id={f("makeModel")} label="Make and model" optional error={err("makeModel")} registration={register("makeModel")} />
          <TextField
            id={f("serialNumber")}
            label="Serial number"
            optional
            error={err("serialNumber")}
            registration={register("serialNumber")}
            autoComplete="off"
          />
          <TextField
            id={f("manufacturedOn")}
            label="Manufactured on"
            optional
            error={err("manufacturedOn")}
            registration={register("manufacturedOn")}
            type="date"
          />
          <TextField
            id={f("installedOn")}
            label="Installed on"
            optional
            error={err("installedOn")}
            registration={register("installedOn")}
            type="date"
          />
        </div>
        {!editing && (
          <div className="grid gap-4 sm:grid-cols-2">
            <SelectField
              id={f("status")}
              label="Status"
              error={err("status")}
              registration={register("status")}
              options={[
                { value: "in_service", label: REGISTER_LABELS.applianceStatus.in_service },
                { value: "retired", label: `${REGISTER_LABELS.applianceStatus.retired} (e.g. waiting at the shop to be scrapped)` },
              ]}
            />
            {status === "retired" && (
              <TextField
                id={f("retiredOn")}
                label="Taken out of service on"
                error={err("retiredOn")}
                registration={register("retiredOn")}
                type="date"
              />
            )}
          </div>
        )}
      </fieldset>

      {editing && (
        <TextField
          id={f("reason")}
          label="Reason for the change"
          optional={!regulatedDirty}
          hint={
            regulatedDirty
              ? "You are correcting a regulated field (refrigerant, full charge, how it was determined, kind or factory sealing). Say why; the previous values are kept."
              : "Needed when you correct the refrigerant, full charge, how it was determined, the kind or factory sealing."
          }
          error={err("reason")}
          registration={register("reason")}
          rows={2}
        />
      )}

      <StickyFormActions pending={save.isPending} label={editing ? "Save changes" : "Add appliance"} onCancel={() => router.back()} />
    </form>
  );
}
