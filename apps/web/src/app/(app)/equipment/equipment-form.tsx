"use client";

import { useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useForm, type Resolver } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  EQUIPMENT_CERTIFICATION_STATES,
  EQUIPMENT_STATUSES,
  REGISTER_LABELS,
  equipmentInput,
  equipmentUpdateInput,
  equipmentEra,
} from "@coldtrail/core";
import type { EquipmentRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { optionsOf } from "@/lib/client/options";
import { saveErrorMessage, submitOrExplain } from "@/lib/client/form-save";
import { RadioCards } from "@/components/form";
import {
  FieldError,
  FormAlert,
  TextField,
  labelClass,
  StickyFormActions,
  SelectField,
  BranchField,
} from "@/components/registers/form-fields";
import { ERA_WORDS } from "@/components/registers/words";
import type { WritableBranch } from "../appliances/appliance-form";
import { useIdempotencyKey } from "@/lib/client/idempotency";

type FormIn = z.input<typeof equipmentInput> & { reason?: string };
type FormOut = z.output<typeof equipmentInput> & { reason?: string };

export function EquipmentForm(
  props: { mode: "create"; branches: WritableBranch[] } | { mode: "edit"; branches: WritableBranch[]; equipment: EquipmentRow },
) {
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
      : {
          branchId: props.branches[0]?.id,
          serial: "",
          makeModel: "",
          certificationState: "unknown",
          smallApplianceOnly: false,
          systemDependent: false,
          status: "in_service",
        },
  });
  const { register, handleSubmit, watch, setError, formState } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const err = (name: string) => errors[name]?.message;
  const dirty = formState.dirtyFields as Record<string, unknown>;
  const regulatedDirty = editing && (dirty.manufacturedOn || dirty.certificationState);
  const manufacturedOn = watch("manufacturedOn");

  const idem = useIdempotencyKey();
  const save = useMutation({
    mutationFn: async (values: FormOut) => {
      if (editing) {
        const { branchId: _b, ...body } = values;
        await fetchJson(`/api/equipment/${editing.id}`, { method: "PATCH", body: JSON.stringify(body) });
        return editing.id;
      }
      const { reason: _r, ...body } = values;
      return (await fetchJson<{ id: number }>("/api/equipment", { method: "POST", headers: idem.headers, body: JSON.stringify(body) })).id;
    },
    onSuccess: async (id) => {
      await queryClient.invalidateQueries({ queryKey: ["equipment"] });
      await queryClient.invalidateQueries({ queryKey: ["equipment-unit", String(id)] });
      router.push(`/equipment/${id}?saved=${editing ? "updated" : "created"}`);
    },
    onError: (e) => {
      setFormError(saveErrorMessage(e, setError, "The equipment could not be sent. Check your connection; nothing was saved."));
    },
  });

  const f = (n: string) => `${uid}-${n}`;
  return (
    <form
      noValidate
      className="space-y-5"
      data-testid="equipment-form"
      onSubmit={submitOrExplain(handleSubmit, {
        save: save.mutate,
        setFormError,
        invalid: "Some fields need attention before the equipment can be saved.",
      })}
    >
      <FormAlert message={formError} />
      {!editing && <BranchField id={f("branchId")} branches={props.branches} registration={register("branchId")} error={err("branchId")} />}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField
          id={f("serial")}
          label="Serial number"
          hint="As printed on the unit's label"
          error={err("serial")}
          registration={register("serial")}
          autoComplete="off"
        />
        <TextField id={f("makeModel")} label="Make and model" optional error={err("makeModel")} registration={register("makeModel")} />
        <TextField
          id={f("manufacturedOn")}
          label="Manufactured on"
          optional
          hint={ERA_WORDS[equipmentEra(typeof manufacturedOn === "string" && manufacturedOn ? manufacturedOn : null)]}
          error={err("manufacturedOn")}
          registration={register("manufacturedOn")}
          type="date"
        />
        <SelectField
          id={f("status")}
          label="Status"
          error={err("status")}
          registration={register("status")}
          options={optionsOf(EQUIPMENT_STATUSES, REGISTER_LABELS.equipmentStatus)}
        />
      </div>
      <fieldset>
        <legend className={labelClass}>Certification by an approved testing organisation</legend>
        <RadioCards
          size="medium"
          className="mt-1 grid gap-2 sm:grid-cols-3"
          registration={register("certificationState")}
          options={optionsOf(EQUIPMENT_CERTIFICATION_STATES, REGISTER_LABELS.equipmentCertification)}
        />
        <FieldError id={`${f("certificationState")}-error`} message={err("certificationState")} />
      </fieldset>
      <TextField
        id={f("certifiedBy")}
        label="Testing organisation"
        optional
        hint="Named on the unit's certification label"
        error={err("certifiedBy")}
        registration={register("certifiedBy")}
      />
      <div className="space-y-2">
        <label className="flex min-h-11 items-start gap-3">
          <input type="checkbox" {...register("smallApplianceOnly")} className="mt-1 size-5 accent-fjord-600" />
          <span className="font-medium">Only for small appliances</span>
        </label>
        <label className="flex min-h-11 items-start gap-3">
          <input type="checkbox" {...register("systemDependent")} className="mt-1 size-5 accent-fjord-600" />
          <span>
            <span className="font-medium">System-dependent</span>
            <span className="block text-sm text-ink-600">
              Relies on the appliance&apos;s own compressor or pressure (e.g. a recovery bag).
            </span>
          </span>
        </label>
      </div>
      {editing && (
        <TextField
          id={f("reason")}
          label="Reason for the change"
          optional={!regulatedDirty}
          hint="Needed when the manufacture date or certification status changes; the previous values are kept."
          error={err("reason")}
          registration={register("reason")}
          rows={2}
        />
      )}
      <StickyFormActions pending={save.isPending} label={editing ? "Save changes" : "Add equipment"} onCancel={() => router.back()} />
    </form>
  );
}
