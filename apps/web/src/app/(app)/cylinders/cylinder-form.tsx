"use client";

import { useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useForm, type Resolver } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  COMMON_CYLINDER_SPECIFICATIONS,
  CYLINDER_PURPOSES,
  CYLINDER_STATUSES,
  REGISTER_LABELS,
  cylinderInput,
  cylinderUpdateInput,
} from "@coldtrail/core";
import type { CylinderRow } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { optionsOf } from "@/lib/client/options";
import { editAmount } from "@/lib/client/form-values";
import { saveErrorMessage, submitOrExplain } from "@/lib/client/form-save";
import { AmountField, FormAlert, TextField, StickyFormActions, SelectField, BranchField } from "@/components/registers/form-fields";
import { CylinderCautions } from "@/components/registers/cylinder-cautions";
import type { WritableBranch } from "../appliances/appliance-form";
import { useIdempotencyKey } from "@/lib/client/idempotency";

type FormIn = z.input<typeof cylinderInput> & { reason?: string };
type FormOut = z.output<typeof cylinderInput> & { reason?: string };

export function CylinderForm(
  props: { mode: "create"; branches: WritableBranch[] } | { mode: "edit"; branches: WritableBranch[]; cylinder: CylinderRow },
) {
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
      : {
          branchId: first?.id,
          serial: "",
          specification: "",
          purpose: "recovery",
          waterCapacityUnit: unit,
          tareUnit: unit,
          status: "in_service",
        },
  });
  const { register, handleSubmit, setError, formState } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const err = (name: string) => errors[name]?.message;
  const dirty = formState.dirtyFields as Record<string, unknown>;
  const regulatedDirty =
    editing && ["waterCapacityAmount", "waterCapacityUnit", "tareAmount", "tareUnit", "lastRequalifiedOn"].some((k) => dirty[k]);

  const idem = useIdempotencyKey();
  const save = useMutation({
    mutationFn: async (values: FormOut) => {
      if (editing) {
        const { branchId: _b, ...rest } = values;
        const body: Record<string, unknown> = { ...rest };
        // Untouched stamped figures go back exactly as stored (display rounding never changes them).
        if (!dirty.waterCapacityAmount && !dirty.waterCapacityUnit)
          Object.assign(body, { waterCapacityAmount: editing.waterCapacityG, waterCapacityUnit: "g" });
        if (!dirty.tareAmount && !dirty.tareUnit) Object.assign(body, { tareAmount: editing.tareG, tareUnit: "g" });
        await fetchJson(`/api/cylinders/${editing.id}`, { method: "PATCH", body: JSON.stringify(body) });
        return editing.id;
      }
      const { reason: _r, ...body } = values;
      return (await fetchJson<{ id: number }>("/api/cylinders", { method: "POST", headers: idem.headers, body: JSON.stringify(body) })).id;
    },
    onSuccess: async (id) => {
      await queryClient.invalidateQueries({ queryKey: ["cylinders"] });
      await queryClient.invalidateQueries({ queryKey: ["cylinder", String(id)] });
      router.push(`/cylinders/${id}?saved=${editing ? "updated" : "created"}`);
    },
    onError: (e) => {
      setFormError(saveErrorMessage(e, setError, "The cylinder could not be sent. Check your connection; nothing was saved."));
    },
  });

  const f = (n: string) => `${uid}-${n}`;
  return (
    <form
      noValidate
      className="space-y-5"
      data-testid="cylinder-form"
      onSubmit={submitOrExplain(handleSubmit, {
        save: save.mutate,
        setFormError,
        invalid: "Some fields need attention before the cylinder can be saved.",
      })}
    >
      <CylinderCautions />
      <FormAlert message={formError} />
      {!editing && <BranchField id={f("branchId")} branches={props.branches} registration={register("branchId")} error={err("branchId")} />}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField
          id={f("serial")}
          label="Serial number"
          hint="Stamped on the cylinder's collar"
          error={err("serial")}
          registration={register("serial")}
          autoComplete="off"
        />
        <TextField
          id={f("specification")}
          label="Specification"
          optional
          hint="Marking such as DOT-4BA400"
          error={err("specification")}
          registration={register("specification")}
          list={f("specs")}
          autoCapitalize="characters"
          after={
            <datalist id={f("specs")}>
              {COMMON_CYLINDER_SPECIFICATIONS.map((s) => (
                <option key={s} value={s} />
              ))}
            </datalist>
          }
        />
        <AmountField
          id={f("waterCapacityAmount")}
          label="Water capacity"
          hint="Stamped WC"
          error={err("waterCapacityAmount")}
          unitLabel="Unit of the water capacity"
          amount={register("waterCapacityAmount")}
          unit={register("waterCapacityUnit")}
        />
        <AmountField
          id={f("tareAmount")}
          label="Tare weight"
          hint="Stamped TW: the empty cylinder with its valve"
          error={err("tareAmount")}
          unitLabel="Unit of the tare weight"
          amount={register("tareAmount")}
          unit={register("tareUnit")}
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
          id={f("lastRequalifiedOn")}
          label="Last requalified on"
          hint="The latest retest date stamped on the cylinder (the manufacture date if never retested)"
          error={err("lastRequalifiedOn")}
          registration={register("lastRequalifiedOn")}
          type="date"
        />
        <SelectField
          id={f("purpose")}
          label="Used for"
          error={err("purpose")}
          registration={register("purpose")}
          options={optionsOf(CYLINDER_PURPOSES, REGISTER_LABELS.cylinderPurpose)}
        />
        <SelectField
          id={f("status")}
          label="Status"
          error={err("status")}
          registration={register("status")}
          options={optionsOf(CYLINDER_STATUSES, REGISTER_LABELS.cylinderStatus)}
        />
      </div>
      {editing && (
        <TextField
          id={f("reason")}
          label="Reason for the change"
          optional={!regulatedDirty}
          hint="Needed when the water capacity, tare weight or requalification date changes; the previous values are kept."
          error={err("reason")}
          registration={register("reason")}
          rows={2}
        />
      )}
      <StickyFormActions pending={save.isPending} label={editing ? "Save changes" : "Add cylinder"} onCancel={() => router.back()} />
    </form>
  );
}
