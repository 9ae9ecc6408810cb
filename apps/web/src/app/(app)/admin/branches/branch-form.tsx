"use client";

import { useEffect, useId, useMemo, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  ISO_COUNTRY_CODES,
  MASS_DISPLAY_UNITS,
  MASS_DISPLAY_UNIT_LABELS,
  RULE_PACK_LABELS,
  US_REGION_CODES,
  branchInput,
  countryName,
  isValidTimeZone,
  packsForPlace,
} from "@coldtrail/core";
import type { AdminBranchRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { saveErrorMessage } from "@/lib/client/form-save";
import { FieldError, FormAlert, Notice, hintClass, inputClass, labelClass, primaryButton } from "../_components/form-bits";
import { useIdempotencyKey } from "@/lib/client/idempotency";

type FormIn = z.input<typeof branchInput>;
type FormOut = z.output<typeof branchInput>;

/** Local time in a zone, to confirm the choice ("it is 14:05 there now"). */
function localTimeIn(timeZone: string): string | null {
  if (!isValidTimeZone(timeZone)) return null;
  return new Intl.DateTimeFormat("en-US", { timeZone, weekday: "short", hour: "2-digit", minute: "2-digit", timeZoneName: "short" }).format(
    new Date(),
  );
}

/** Opens a branch, or edits one (the code is fixed once chosen: the tags of its records carry it). */
export function BranchForm({ branch }: { branch?: AdminBranchRow }) {
  const uid = useId();
  const router = useRouter();
  const queryClient = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const zones = useMemo(() => (typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : []), []);
  const form = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(branchInput),
    mode: "onTouched",
    defaultValues: {
      name: branch?.name ?? "",
      code: branch?.code ?? "",
      address: branch?.address ?? "",
      timeZone: branch?.timeZone ?? "",
      massUnit: branch?.massUnit ?? "lb_oz",
      country: branch?.country ?? "",
      region: branch?.region ?? "",
    },
  });
  const { register, handleSubmit, formState, setError, watch } = form;
  const errors = formState.errors;
  const timeZone = watch("timeZone");
  const country = (watch("country") ?? "").toUpperCase();
  const countries = useMemo(
    () => ISO_COUNTRY_CODES.map((code) => ({ code, name: countryName(code) })).sort((a, b) => a.name.localeCompare(b.name)),
    [],
  );
  const packsHere = ISO_COUNTRY_CODES.includes(country) ? packsForPlace({ country, region: null }) : null;
  const [clock, setClock] = useState<string | null>(null);
  useEffect(() => setClock(localTimeIn(timeZone ?? "")), [timeZone]);

  const idem = useIdempotencyKey();
  const save = useMutation({
    mutationFn: (input: FormOut) =>
      branch
        ? fetchJson<AdminBranchRow>(`/api/admin/branches/${branch.id}`, {
            method: "PATCH",
            body: JSON.stringify({
              name: input.name,
              address: input.address ?? "",
              timeZone: input.timeZone,
              massUnit: input.massUnit,
              country: input.country,
              region: input.region ?? "",
            }),
          })
        : fetchJson<{ id: number }>("/api/admin/branches", { method: "POST", headers: idem.headers, body: JSON.stringify(input) }),
    onSuccess: async (res) => {
      await queryClient.invalidateQueries({ queryKey: ["admin-branches"] });
      await queryClient.invalidateQueries({ queryKey: ["branches"] });
      if (branch) {
        await queryClient.invalidateQueries({ queryKey: ["admin-branch", String(branch.id)] });
        setNotice("Saved. Every screen and deadline of the branch uses these from now on.");
      } else {
        router.push(`/admin/branches/${res.id}?created=1`);
      }
    },
    onError: (err) => {
      setFormError(saveErrorMessage(err, setError, "The branch could not be saved. Check your connection; nothing was saved."));
    },
  });

  const onSubmit = handleSubmit(
    (values) => {
      setFormError(null);
      setNotice(null);
      save.mutate(values);
    },
    () => setFormError("Some fields need attention before the branch can be saved."),
  );
  const invalid = (name: keyof FormIn) => (errors[name] ? true : undefined);
  const describedBy = (name: keyof FormIn, hint?: boolean) =>
    [hint ? `${uid}-${name}-hint` : null, errors[name] ? `${uid}-${name}-error` : null].filter(Boolean).join(" ") || undefined;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5 rounded-lg border border-ink-200 bg-white p-5">
      <FormAlert message={formError} />
      <Notice message={notice} />
      <div className="grid gap-5 sm:grid-cols-[1fr_10rem]">
        <div>
          <label htmlFor={`${uid}-name`} className={labelClass}>
            Name
          </label>
          <input
            id={`${uid}-name`}
            {...register("name")}
            className={inputClass}
            aria-invalid={invalid("name")}
            aria-describedby={describedBy("name")}
          />
          <FieldError id={`${uid}-name-error`} message={errors.name?.message} />
        </div>
        <div>
          <label htmlFor={`${uid}-code`} className={labelClass}>
            Code
          </label>
          <input
            id={`${uid}-code`}
            {...register("code")}
            readOnly={Boolean(branch)}
            className={`${inputClass} uppercase ${branch ? "bg-ink-100" : ""}`}
            aria-invalid={invalid("code")}
            aria-describedby={describedBy("code", true)}
          />
          <p id={`${uid}-code-hint`} className={hintClass}>
            {branch ? "Fixed: record tags carry it." : "2–8 letters or digits; fixed once saved."}
          </p>
          <FieldError id={`${uid}-code-error`} message={errors.code?.message} />
        </div>
      </div>
      <div>
        <label htmlFor={`${uid}-address`} className={labelClass}>
          Address <span className="font-normal text-ink-600">(optional)</span>
        </label>
        <textarea
          id={`${uid}-address`}
          rows={2}
          {...register("address")}
          className={inputClass}
          aria-invalid={invalid("address")}
          aria-describedby={describedBy("address")}
        />
        <FieldError id={`${uid}-address-error`} message={errors.address?.message} />
      </div>
      <div className="grid gap-5 sm:grid-cols-2">
        <div>
          <label htmlFor={`${uid}-country`} className={labelClass}>
            Country
          </label>
          <select
            id={`${uid}-country`}
            {...register("country")}
            className={inputClass}
            aria-invalid={invalid("country")}
            aria-describedby={describedBy("country", true)}
          >
            <option value="">Choose the country…</option>
            {countries.map((c) => (
              <option key={c.code} value={c.code}>
                {c.name} ({c.code})
              </option>
            ))}
          </select>
          <p id={`${uid}-country-hint`} className={hintClass}>
            {packsHere === null
              ? "Decides which rules the branch is audited against."
              : packsHere.length
                ? `Audited against: ${packsHere.map((p) => RULE_PACK_LABELS[p]).join(" and ")}.`
                : "No rule pack covers this country yet, so audits find nothing here."}
          </p>
          <FieldError id={`${uid}-country-error`} message={errors.country?.message} />
        </div>
        <div>
          <label htmlFor={`${uid}-region`} className={labelClass}>
            {country === "US" ? "State" : "State or region"}
            {country !== "US" && <span className="font-normal text-ink-600"> (optional)</span>}
          </label>
          <input
            id={`${uid}-region`}
            list={country === "US" ? `${uid}-states` : undefined}
            autoComplete="off"
            placeholder={country === "US" ? "e.g. TX" : "e.g. South Holland"}
            {...register("region")}
            className={inputClass}
            aria-invalid={invalid("region")}
            aria-describedby={describedBy("region", true)}
          />
          <datalist id={`${uid}-states`}>
            {US_REGION_CODES.map((code) => (
              <option key={code} value={code} />
            ))}
          </datalist>
          <p id={`${uid}-region-hint`} className={hintClass}>
            {country === "US"
              ? "The state's two-letter code. Stricter state rules can be added for it later."
              : "Where stricter local rules may apply."}
          </p>
          <FieldError id={`${uid}-region-error`} message={errors.region?.message} />
        </div>
      </div>
      <div className="grid gap-5 sm:grid-cols-2">
        <div>
          <label htmlFor={`${uid}-tz`} className={labelClass}>
            Time zone
          </label>
          <input
            id={`${uid}-tz`}
            list={`${uid}-zones`}
            autoComplete="off"
            placeholder="e.g. America/Chicago"
            {...register("timeZone")}
            className={inputClass}
            aria-invalid={invalid("timeZone")}
            aria-describedby={describedBy("timeZone", true)}
          />
          <datalist id={`${uid}-zones`}>
            {zones.map((z) => (
              <option key={z} value={z} />
            ))}
          </datalist>
          <p id={`${uid}-timeZone-hint`} className={hintClass}>
            {clock ? `Local time there now: ${clock}.` : "Deadlines of the branch are counted in this zone. Type a city to search."}
          </p>
          <FieldError id={`${uid}-timeZone-error`} message={errors.timeZone?.message} />
        </div>
        <fieldset aria-describedby={errors.massUnit ? `${uid}-massUnit-error` : undefined}>
          <legend className={labelClass}>Show amounts in</legend>
          <div className="mt-2 space-y-2">
            {MASS_DISPLAY_UNITS.map((u) => (
              <label key={u} className="flex items-center gap-2">
                <input type="radio" value={u} {...register("massUnit")} className="h-4 w-4 accent-fjord-600" />
                {MASS_DISPLAY_UNIT_LABELS[u]}
              </label>
            ))}
          </div>
          <FieldError id={`${uid}-massUnit-error`} message={errors.massUnit?.message} />
        </fieldset>
      </div>
      <button type="submit" disabled={save.isPending} className={primaryButton}>
        {save.isPending ? "Saving…" : branch ? "Save the branch" : "Open the branch"}
      </button>
    </form>
  );
}
