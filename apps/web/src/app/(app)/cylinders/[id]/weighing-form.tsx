"use client";

import { useId, useState } from "react";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useForm, type Resolver } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  celsiusToFahrenheit,
  cylinderWeighingAmendInput,
  cylinderWeighingInput,
  formatMass,
  getRefrigerant,
  maxCylinderFill,
  normaliseDesignation,
  roundTo,
  shortestAmountFor,
  toGrams,
  type MassInputUnit,
} from "@coldtrail/core";
import type { CylinderRow, CylinderWeighingRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { saveErrorMessage, submitOrExplain } from "@/lib/client/form-save";
import { RefrigerantList } from "@/components/form";
import { AmountField, FormAlert, TextField, buttonPrimary, buttonSecondary, inputClass } from "@/components/registers/form-fields";
import { todayIn } from "@/components/registers/words";
import { useIdempotencyKey } from "@/lib/client/idempotency";

type FormIn = z.input<typeof cylinderWeighingAmendInput>;

const TEMPERATURE_UNITS = [
  { value: "F", label: "°F" },
  { value: "C", label: "°C" },
];
type FormOut = z.output<typeof cylinderWeighingAmendInput>;

/** What the reading means before it is saved: net contents against the maximum fill (rules core). */
function NetPreview({
  cylinder,
  gross,
  unit,
  refrigerant,
}: {
  cylinder: CylinderRow;
  gross: unknown;
  unit: MassInputUnit;
  refrigerant: string;
}) {
  const value = Number(String(gross ?? "").replace(",", "."));
  if (!String(gross ?? "").trim() || !Number.isFinite(value) || value <= 0) return null;
  const grossG = toGrams(value, unit);
  const netG = grossG - cylinder.tareG;
  if (netG < 0) {
    return (
      <p className="text-sm font-medium text-sev-critical" data-testid="weighing-preview">
        <span aria-hidden="true">⚠ </span>Lighter than the empty cylinder (tare {formatMass(cylinder.tareG, cylinder.massUnit)}): check the
        scale and the unit.
      </p>
    );
  }
  const designation = refrigerant ? normaliseDesignation(refrigerant) : "";
  let maxText = "";
  let over = false;
  if (designation && getRefrigerant(designation)) {
    const max = maxCylinderFill({
      waterCapacityG: cylinder.waterCapacityG,
      tareG: cylinder.tareG,
      refrigerant: designation,
      strict130F: cylinder.fill?.strict130F ?? false,
    });
    const percent = max.maxNetG > 0 ? (netG / max.maxNetG) * 100 : 0;
    over = netG > max.maxNetG;
    maxText = ` — ${Math.round(percent)} % of the maximum fill (${formatMass(max.maxNetG, cylinder.massUnit)} net)`;
  }
  return (
    <p className={`text-sm font-medium ${over ? "text-sev-critical" : "text-ink-800"}`} data-testid="weighing-preview" aria-live="polite">
      {over && <span aria-hidden="true">⛔ </span>}
      Net contents {formatMass(netG, cylinder.massUnit)}
      {maxText}
      {over && ". Over the maximum: do not add refrigerant; transfer the excess."}
    </p>
  );
}

/**
 * Records a scale reading of a cylinder, or corrects an earlier one (an amendment with a reason).
 * The reading is the cylinder with its contents; net = reading − tare.
 */
export function WeighingForm({ cylinder, amend, onDone }: { cylinder: CylinderRow; amend?: CylinderWeighingRow; onDone?: () => void }) {
  const uid = useId();
  const queryClient = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const [saved, setSaved] = useState<string | null>(null);
  const unit: MassInputUnit = cylinder.massUnit === "kg" ? "kg" : "lb";
  const defaults: FormIn = amend
    ? {
        weighedOn: amend.weighedOn,
        // As typed when known; otherwise the shortest figure that converts back to the same grams.
        grossAmount: String(amend.grossEntered?.amount ?? shortestAmountFor(amend.grossG, unit)),
        grossUnit: amend.grossEntered?.unit ?? unit,
        refrigerant: amend.refrigerant ?? "",
        pressurePsig: amend.pressurePsig ?? "",
        temperatureValue:
          amend.temperatureC === null
            ? ""
            : String(roundTo(unit === "kg" ? amend.temperatureC : celsiusToFahrenheit(amend.temperatureC), 1)),
        temperatureUnit: unit === "kg" ? "C" : "F",
        notes: amend.notes ?? "",
        reason: "",
      }
    : {
        weighedOn: todayIn(cylinder.timeZone),
        grossAmount: "",
        grossUnit: unit,
        refrigerant: cylinder.refrigerant ?? "",
        temperatureUnit: unit === "kg" ? "C" : "F",
        notes: "",
        reason: "",
      };
  const form = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(amend ? cylinderWeighingAmendInput : cylinderWeighingInput) as unknown as Resolver<FormIn, unknown, FormOut>,
    mode: "onTouched",
    defaultValues: defaults,
  });
  const { register, handleSubmit, watch, setError, formState, reset } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const err = (n: string) => errors[n]?.message;

  const idem = useIdempotencyKey();
  const save = useMutation({
    mutationFn: (values: FormOut) => {
      const dirty = formState.dirtyFields as Record<string, unknown>;
      const body: Record<string, unknown> = { ...values };
      if (amend && !dirty.grossAmount && !dirty.grossUnit) Object.assign(body, { grossAmount: amend.grossG, grossUnit: "g" });
      if (!amend) delete body.reason;
      return amend
        ? fetchJson(`/api/cylinders/${cylinder.id}/weighings/${amend.id}`, { method: "PATCH", body: JSON.stringify(body) })
        : fetchJson<{ id: number; netG: number }>(`/api/cylinders/${cylinder.id}/weighings`, {
            method: "POST",
            headers: idem.headers,
            body: JSON.stringify(body),
          });
    },
    onSuccess: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: ["cylinder", String(cylinder.id)] }),
        queryClient.invalidateQueries({ queryKey: ["cylinder-weighings"] }),
        queryClient.invalidateQueries({ queryKey: ["cylinders"] }),
      ]);
      setSaved(amend ? "Weighing corrected." : "Weighing recorded.");
      if (!amend) idem.renew();
      if (!amend) reset({ ...defaults, weighedOn: watch("weighedOn"), refrigerant: watch("refrigerant") });
      onDone?.();
    },
    onError: (e) => {
      setSaved(null);
      setFormError(saveErrorMessage(e, setError, "The weighing could not be sent; nothing was saved."));
    },
  });

  const f = (n: string) => `${uid}-${n}`;
  return (
    <form
      noValidate
      className="space-y-4 rounded-lg border border-ink-200 bg-white p-4"
      aria-labelledby={f("title")}
      data-testid={amend ? "weighing-amend-form" : "weighing-form"}
      onSubmit={submitOrExplain(handleSubmit, {
        save: save.mutate,
        setFormError,
        invalid: "Some fields need attention before the weighing can be saved.",
      })}
    >
      <h2 id={f("title")} className="text-lg font-semibold text-ink-950">
        {amend ? `Correct the weighing of ${amend.weighedOn}` : "Record a weighing"}
      </h2>
      <FormAlert message={formError} />
      {saved && (
        <p role="status" className="text-sm font-medium text-ok">
          <span aria-hidden="true">✓ </span>
          {saved}
        </p>
      )}
      <div className="grid gap-4 sm:grid-cols-2">
        <AmountField
          id={f("grossAmount")}
          label="Scale reading"
          hint={`Cylinder and contents together (tare ${formatMass(cylinder.tareG, cylinder.massUnit)}).`}
          error={err("grossAmount")}
          unitId={f("grossUnit")}
          unitLabel="Unit of the scale reading"
          amount={register("grossAmount")}
          unit={register("grossUnit")}
          inputClassName={`${inputClass} text-lg`}
        />
        <TextField id={f("weighedOn")} label="Weighed on" error={err("weighedOn")} registration={register("weighedOn")} type="date" />
        <TextField
          id={f("refrigerant")}
          label="Refrigerant"
          optional={!cylinder.refrigerant}
          error={err("refrigerant")}
          registration={register("refrigerant")}
          list={f("refrigerants")}
          autoComplete="off"
          after={<RefrigerantList id={f("refrigerants")} />}
        />
        <TextField
          id={f("pressurePsig")}
          label="Gauge pressure (psig)"
          optional
          hint="With the temperature, checks for air in the cylinder"
          error={err("pressurePsig")}
          registration={register("pressurePsig")}
          type="text"
          inputMode="decimal"
        />
        <AmountField
          id={f("temperatureValue")}
          label="Cylinder temperature"
          optional
          error={err("temperatureValue")}
          unitId={f("temperatureUnit")}
          unitLabel="Temperature unit"
          amount={register("temperatureValue")}
          unit={register("temperatureUnit")}
          options={TEMPERATURE_UNITS}
          unitClassName="w-20 rounded-lg border border-ink-300 bg-white px-2 text-base"
          tabular={false}
        />
        <TextField id={f("notes")} label="Notes" optional error={err("notes")} registration={register("notes")} />
      </div>
      <NetPreview
        cylinder={cylinder}
        gross={watch("grossAmount")}
        unit={watch("grossUnit")}
        refrigerant={String(watch("refrigerant") ?? "")}
      />
      {amend && (
        <TextField
          id={f("reason")}
          label="Why it is corrected"
          hint="The previous values stay in the weighing's history."
          error={err("reason")}
          registration={register("reason")}
          rows={2}
        />
      )}
      <div className="flex flex-wrap gap-2">
        <button type="submit" className={buttonPrimary} disabled={save.isPending}>
          {save.isPending ? "Saving…" : amend ? "Save the correction" : "Record weighing"}
        </button>
        {onDone && amend && (
          <button type="button" className={buttonSecondary} onClick={onDone}>
            Cancel
          </button>
        )}
      </div>
    </form>
  );
}
