"use client";

import { useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useForm, type FieldPath, type Resolver } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { EQUIPMENT_CERTIFICATION_STATES, EQUIPMENT_STATUSES, REGISTER_LABELS, equipmentInput, equipmentUpdateInput, equipmentEra } from "@coldtrail/core";
import type { EquipmentRow } from "@coldtrail/db";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { Field, FieldError, FormAlert, buttonPrimary, buttonSecondary, describedBy, inputClass, labelClass, selectClass } from "@/components/registers/form-fields";
import { ERA_WORDS } from "@/components/registers/words";
import type { WritableBranch } from "../appliances/appliance-form";

type FormIn = z.input<typeof equipmentInput> & { reason?: string };
type FormOut = z.output<typeof equipmentInput> & { reason?: string };

export function EquipmentForm(props: { mode: "create"; branches: WritableBranch[] } | { mode: "edit"; branches: WritableBranch[]; equipment: EquipmentRow }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const uid = useId();
  const editing = props.mode === "edit" ? props.equipment : null;
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(editing ? equipmentUpdateInput : equipmentInput) as unknown as Resolver<FormIn, unknown, FormOut>,
    mode: "onTouched",
    defaultValues: editing
      ? {
          serial: editing.serial,
          makeModel: editing.makeModel ?? "",
          manufacturedOn: editing.manufacturedOn ?? "",
          certificationState: editing.certificationState,
          certifiedBy: editing.certifiedBy ?? "",
          smallApplianceOnly: editing.smallApplianceOnly,
          systemDependent: editing.systemDependent,
          status: editing.status,
          reason: "",
        }
      : { branchId: props.branches[0]?.id, serial: "", makeModel: "", certificationState: "unknown", smallApplianceOnly: false, systemDependent: false, status: "in_service" },
  });
  const { register, handleSubmit, watch, setError, formState } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const err = (name: string) => errors[name]?.message;
  const dirty = formState.dirtyFields as Record<string, unknown>;
  const regulatedDirty = editing && (dirty.manufacturedOn || dirty.certificationState);
  const manufacturedOn = watch("manufacturedOn");

  const save = useMutation({
    mutationFn: async (values: FormOut) => {
      if (editing) {
        const { branchId: _b, ...body } = values;
        await fetchJson(`/api/equipment/${editing.id}`, { method: "PATCH", body: JSON.stringify(body) });
        return editing.id;
      }
      const { reason: _r, ...body } = values;
      return (await fetchJson<{ id: number }>("/api/equipment", { method: "POST", body: JSON.stringify(body) })).id;
    },
    onSuccess: async (id) => {
      await queryClient.invalidateQueries({ queryKey: ["equipment"] });
      await queryClient.invalidateQueries({ queryKey: ["equipment-unit", String(id)] });
      router.push(`/equipment/${id}?saved=${editing ? "updated" : "created"}`);
    },
    onError: (e) => {
      if (e instanceof ApiError) {
        for (const [field, messages] of Object.entries(e.fieldErrors)) setError(field as FieldPath<FormIn>, { type: "server", message: messages[0] });
        setFormError(e.message);
      } else setFormError("The equipment could not be sent. Check your connection; nothing was saved.");
    },
  });

  const f = (n: string) => `${uid}-${n}`;
  return (
    <form
      noValidate
      className="space-y-5"
      data-testid="equipment-form"
      onSubmit={handleSubmit(
        (v) => {
          setFormError(null);
          save.mutate(v);
        },
        () => setFormError("Some fields need attention before the equipment can be saved."),
      )}
    >
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
        <Field id={f("serial")} label="Serial number" hint="As printed on the unit's label" error={err("serial")}>
          <input id={f("serial")} {...register("serial")} autoComplete="off" className={inputClass} aria-invalid={err("serial") ? true : undefined} aria-describedby={describedBy(f("serial"), { hint: true, error: err("serial") })} />
        </Field>
        <Field id={f("makeModel")} label="Make and model" optional error={err("makeModel")}>
          <input id={f("makeModel")} {...register("makeModel")} className={inputClass} />
        </Field>
        <Field
          id={f("manufacturedOn")}
          label="Manufactured on"
          optional
          hint={ERA_WORDS[equipmentEra(typeof manufacturedOn === "string" && manufacturedOn ? manufacturedOn : null)]}
          error={err("manufacturedOn")}
        >
          <input id={f("manufacturedOn")} type="date" {...register("manufacturedOn")} className={inputClass} aria-invalid={err("manufacturedOn") ? true : undefined} aria-describedby={describedBy(f("manufacturedOn"), { hint: true, error: err("manufacturedOn") })} />
        </Field>
        <Field id={f("status")} label="Status" error={err("status")}>
          <select id={f("status")} {...register("status")} className={selectClass}>
            {EQUIPMENT_STATUSES.map((s) => (
              <option key={s} value={s}>
                {REGISTER_LABELS.equipmentStatus[s]}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <fieldset>
        <legend className={labelClass}>Certification by an approved testing organisation</legend>
        <div className="mt-1 grid gap-2 sm:grid-cols-3">
          {EQUIPMENT_CERTIFICATION_STATES.map((s) => (
            <label key={s} className="flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border border-ink-200 bg-white px-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50">
              <input type="radio" value={s} {...register("certificationState")} className="size-5 accent-fjord-600" />
              {REGISTER_LABELS.equipmentCertification[s]}
            </label>
          ))}
        </div>
        <FieldError id={`${f("certificationState")}-error`} message={err("certificationState")} />
      </fieldset>
      <Field id={f("certifiedBy")} label="Testing organisation" optional hint="Named on the unit's certification label" error={err("certifiedBy")}>
        <input id={f("certifiedBy")} {...register("certifiedBy")} className={inputClass} aria-describedby={describedBy(f("certifiedBy"), { hint: true })} />
      </Field>
      <div className="space-y-2">
        <label className="flex min-h-11 items-start gap-3">
          <input type="checkbox" {...register("smallApplianceOnly")} className="mt-1 size-5 accent-fjord-600" />
          <span className="font-medium">Only for small appliances</span>
        </label>
        <label className="flex min-h-11 items-start gap-3">
          <input type="checkbox" {...register("systemDependent")} className="mt-1 size-5 accent-fjord-600" />
          <span>
            <span className="font-medium">System-dependent</span>
            <span className="block text-sm text-ink-600">Relies on the appliance&apos;s own compressor or pressure (e.g. a recovery bag).</span>
          </span>
        </label>
      </div>
      {editing && (
        <Field
          id={f("reason")}
          label="Reason for the change"
          optional={!regulatedDirty}
          hint="Needed when the manufacture date or certification status changes; the previous values are kept."
          error={err("reason")}
        >
          <textarea id={f("reason")} rows={2} {...register("reason")} className={inputClass} aria-invalid={err("reason") ? true : undefined} aria-describedby={describedBy(f("reason"), { hint: true, error: err("reason") })} />
        </Field>
      )}
      <div className="sticky bottom-0 -mx-4 flex gap-2 border-t border-ink-200 bg-white/95 px-4 py-3 backdrop-blur">
        <button type="submit" disabled={save.isPending} className={`${buttonPrimary} flex-1`}>
          {save.isPending ? "Saving…" : editing ? "Save changes" : "Add equipment"}
        </button>
        <button type="button" onClick={() => router.back()} className={buttonSecondary}>
          Cancel
        </button>
      </div>
    </form>
  );
}
