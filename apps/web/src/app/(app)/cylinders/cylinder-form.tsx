"use client";

import { useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useForm, type FieldPath, type Resolver, type UseFormRegister } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  COMMON_CYLINDER_SPECIFICATIONS,
  CYLINDER_PURPOSES,
  CYLINDER_STATUSES,
  MASS_INPUT_UNITS,
  REGISTER_LABELS,
  cylinderInput,
  cylinderUpdateInput,
  roundTo,
  type MassDisplayUnit,
} from "@coldtrail/core";
import type { CylinderRow } from "@coldtrail/db";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { Field, FieldError, FormAlert, buttonPrimary, buttonSecondary, describedBy, inputClass, labelClass, selectClass } from "@/components/registers/form-fields";
import { CylinderCautions } from "@/components/registers/cylinder-cautions";
import type { WritableBranch } from "../appliances/appliance-form";

type FormIn = z.input<typeof cylinderInput> & { reason?: string };
type FormOut = z.output<typeof cylinderInput> & { reason?: string };

function editAmount(grams: number, massUnit: MassDisplayUnit) {
  return massUnit === "kg" ? { amount: String(roundTo(grams / 1000, 3)), unit: "kg" as const } : { amount: String(roundTo(grams / 453.59237, 2)), unit: "lb" as const };
}

function MassField({
  id,
  label,
  hint,
  amountName,
  unitName,
  register,
  error,
}: {
  id: string;
  label: string;
  hint: string;
  amountName: "waterCapacityAmount" | "tareAmount";
  unitName: "waterCapacityUnit" | "tareUnit";
  register: UseFormRegister<FormIn>;
  error?: string;
}) {
  return (
    <div>
      <label htmlFor={id} className={labelClass}>
        {label}
      </label>
      <div className="mt-1 flex gap-2">
        <input
          id={id}
          type="text"
          inputMode="decimal"
          autoComplete="off"
          {...register(amountName)}
          className={`${inputClass} mt-0 flex-1 tabular`}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(id, { hint: true, error })}
        />
        <label htmlFor={`${id}-unit`} className="sr-only">
          Unit of the {label.toLowerCase()}
        </label>
        <select id={`${id}-unit`} {...register(unitName)} className="w-24 rounded-lg border border-ink-300 bg-white px-2 text-base">
          {MASS_INPUT_UNITS.map((u) => (
            <option key={u} value={u}>
              {u}
            </option>
          ))}
        </select>
      </div>
      <p id={`${id}-hint`} className="mt-1 text-sm text-ink-600">
        {hint}
      </p>
      <FieldError id={`${id}-error`} message={error} />
    </div>
  );
}

export function CylinderForm(props: { mode: "create"; branches: WritableBranch[] } | { mode: "edit"; branches: WritableBranch[]; cylinder: CylinderRow }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const uid = useId();
  const editing = props.mode === "edit" ? props.cylinder : null;
  const first = props.branches[0];
  const unit = (editing?.massUnit ?? first?.massUnit) === "kg" ? "kg" : "lb";
  const [formError, setFormError] = useState<string | null>(null);
  const wc = editing ? editAmount(editing.waterCapacityG, editing.massUnit) : null;
  const tw = editing ? editAmount(editing.tareG, editing.massUnit) : null;
  const form = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(editing ? cylinderUpdateInput : cylinderInput) as unknown as Resolver<FormIn, unknown, FormOut>,
    mode: "onTouched",
    defaultValues: editing
      ? {
          serial: editing.serial,
          specification: editing.specification ?? "",
          purpose: editing.purpose,
          waterCapacityAmount: wc!.amount,
          waterCapacityUnit: wc!.unit,
          tareAmount: tw!.amount,
          tareUnit: tw!.unit,
          manufacturedOn: editing.manufacturedOn ?? "",
          lastRequalifiedOn: editing.lastRequalifiedOn ?? "",
          status: editing.status,
          reason: "",
        }
      : { branchId: first?.id, serial: "", specification: "", purpose: "recovery", waterCapacityUnit: unit, tareUnit: unit, status: "in_service" },
  });
  const { register, handleSubmit, setError, formState } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const err = (name: string) => errors[name]?.message;
  const dirty = formState.dirtyFields as Record<string, unknown>;
  const regulatedDirty = editing && ["waterCapacityAmount", "waterCapacityUnit", "tareAmount", "tareUnit", "lastRequalifiedOn"].some((k) => dirty[k]);

  const save = useMutation({
    mutationFn: async (values: FormOut) => {
      if (editing) {
        const { branchId: _b, ...rest } = values;
        const body: Record<string, unknown> = { ...rest };
        // Untouched stamped figures go back exactly as stored (display rounding never changes them).
        if (!dirty.waterCapacityAmount && !dirty.waterCapacityUnit) Object.assign(body, { waterCapacityAmount: editing.waterCapacityG, waterCapacityUnit: "g" });
        if (!dirty.tareAmount && !dirty.tareUnit) Object.assign(body, { tareAmount: editing.tareG, tareUnit: "g" });
        await fetchJson(`/api/cylinders/${editing.id}`, { method: "PATCH", body: JSON.stringify(body) });
        return editing.id;
      }
      const { reason: _r, ...body } = values;
      return (await fetchJson<{ id: number }>("/api/cylinders", { method: "POST", body: JSON.stringify(body) })).id;
    },
    onSuccess: async (id) => {
      await queryClient.invalidateQueries({ queryKey: ["cylinders"] });
      await queryClient.invalidateQueries({ queryKey: ["cylinder", String(id)] });
      router.push(`/cylinders/${id}?saved=${editing ? "updated" : "created"}`);
    },
    onError: (e) => {
      if (e instanceof ApiError) {
        for (const [field, messages] of Object.entries(e.fieldErrors)) setError(field as FieldPath<FormIn>, { type: "server", message: messages[0] });
        setFormError(e.message);
      } else setFormError("The cylinder could not be sent. Check your connection; nothing was saved.");
    },
  });

  const f = (n: string) => `${uid}-${n}`;
  return (
    <form
      noValidate
      className="space-y-5"
      data-testid="cylinder-form"
      onSubmit={handleSubmit(
        (v) => {
          setFormError(null);
          save.mutate(v);
        },
        () => setFormError("Some fields need attention before the cylinder can be saved."),
      )}
    >
      <CylinderCautions />
      <FormAlert message={formError} />
      {!editing && props.branches.length > 1 && (
        <Field id={f("branchId")} label="Branch" error={err("branchId")}>
          <select id={f("branchId")} {...register("branchId")} className={selectClass}>
            {props.branches.map((b) => (
              <option key={b.id} value={b.id}>
                {b.name}
              </option>
            ))}
          </select>
        </Field>
      )}
      {!editing && props.branches.length === 1 && <input type="hidden" {...register("branchId")} />}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id={f("serial")} label="Serial number" hint="Stamped on the cylinder's collar" error={err("serial")}>
          <input id={f("serial")} {...register("serial")} autoComplete="off" className={inputClass} aria-invalid={err("serial") ? true : undefined} aria-describedby={describedBy(f("serial"), { hint: true, error: err("serial") })} />
        </Field>
        <Field id={f("specification")} label="Specification" optional hint="Marking such as DOT-4BA400" error={err("specification")}>
          <input
            id={f("specification")}
            list={f("specs")}
            autoCapitalize="characters"
            {...register("specification")}
            className={inputClass}
            aria-describedby={describedBy(f("specification"), { hint: true, error: err("specification") })}
          />
          <datalist id={f("specs")}>
            {COMMON_CYLINDER_SPECIFICATIONS.map((s) => (
              <option key={s} value={s} />
            ))}
          </datalist>
        </Field>
        <MassField id={f("waterCapacityAmount")} label="Water capacity" hint="Stamped WC" amountName="waterCapacityAmount" unitName="waterCapacityUnit" register={register} error={err("waterCapacityAmount")} />
        <MassField id={f("tareAmount")} label="Tare weight" hint="Stamped TW: the empty cylinder with its valve" amountName="tareAmount" unitName="tareUnit" register={register} error={err("tareAmount")} />
        <Field id={f("manufacturedOn")} label="Manufactured on" optional error={err("manufacturedOn")}>
          <input id={f("manufacturedOn")} type="date" {...register("manufacturedOn")} className={inputClass} aria-invalid={err("manufacturedOn") ? true : undefined} aria-describedby={describedBy(f("manufacturedOn"), { error: err("manufacturedOn") })} />
        </Field>
        <Field id={f("lastRequalifiedOn")} label="Last requalified on" hint="The latest retest date stamped on the cylinder (the manufacture date if never retested)" error={err("lastRequalifiedOn")}>
          <input
            id={f("lastRequalifiedOn")}
            type="date"
            {...register("lastRequalifiedOn")}
            className={inputClass}
            aria-invalid={err("lastRequalifiedOn") ? true : undefined}
            aria-describedby={describedBy(f("lastRequalifiedOn"), { hint: true, error: err("lastRequalifiedOn") })}
          />
        </Field>
        <Field id={f("purpose")} label="Used for" error={err("purpose")}>
          <select id={f("purpose")} {...register("purpose")} className={selectClass}>
            {CYLINDER_PURPOSES.map((p) => (
              <option key={p} value={p}>
                {REGISTER_LABELS.cylinderPurpose[p]}
              </option>
            ))}
          </select>
        </Field>
        <Field id={f("status")} label="Status" error={err("status")}>
          <select id={f("status")} {...register("status")} className={selectClass}>
            {CYLINDER_STATUSES.map((s) => (
              <option key={s} value={s}>
                {REGISTER_LABELS.cylinderStatus[s]}
              </option>
            ))}
          </select>
        </Field>
      </div>
      {editing && (
        <Field
          id={f("reason")}
          label="Reason for the change"
          optional={!regulatedDirty}
          hint="Needed when the water capacity, tare weight or requalification date changes; the previous values are kept."
          error={err("reason")}
        >
          <textarea id={f("reason")} rows={2} {...register("reason")} className={inputClass} aria-invalid={err("reason") ? true : undefined} aria-describedby={describedBy(f("reason"), { hint: true, error: err("reason") })} />
        </Field>
      )}
      <div className="sticky bottom-0 -mx-4 flex gap-2 border-t border-ink-200 bg-white/95 px-4 py-3 backdrop-blur">
        <button type="submit" disabled={save.isPending} className={`${buttonPrimary} flex-1`}>
          {save.isPending ? "Saving…" : editing ? "Save changes" : "Add cylinder"}
        </button>
        <button type="button" onClick={() => router.back()} className={buttonSecondary}>
          Cancel
        </button>
      </div>
    </form>
  );
}
