"use client";

import { useEffect, useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useForm, type FieldValues, type Resolver } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { subject } from "@casl/ability";
import { purchaseInput } from "@coldtrail/core";
import { fetchJson } from "@/lib/client/fetch-json";
import { saveErrorMessage, submitOrExplain } from "@/lib/client/form-save";
import { useBranchOptions } from "@/lib/client/use-branch-options";
import { useAbility } from "@/components/providers";
import { fieldAria, RefrigerantList } from "@/components/form";
import { AmountField, Field, FormAlert, TextField, inputClass, primaryButton, todayIn } from "../../jobs/_components/form-bits";
import { useIdempotencyKey } from "@/lib/client/idempotency";

/** Refrigerant bought by a branch. */
export function PurchaseForm({ organisationId }: { organisationId: number }) {
  const uid = useId();
  const router = useRouter();
  const ability = useAbility();
  const queryClient = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const branches = useBranchOptions();
  const writable = (branches.data?.rows ?? []).filter(
    (b) => !b.archivedAt && ability.can("create", subject("Purchase", { organisationId, branchId: b.id })),
  );
  const form = useForm<FieldValues>({
    resolver: zodResolver(purchaseInput as never) as unknown as Resolver<FieldValues>,
    mode: "onTouched",
    defaultValues: {
      branchId: "",
      purchasedOn: todayIn(Intl.DateTimeFormat().resolvedOptions().timeZone),
      supplierName: "",
      refrigerant: "",
      amount: "",
      unit: "lb",
      containerCount: "",
      invoiceReference: "",
    },
  });
  const { register, handleSubmit, formState, setError, setValue, watch } = form;
  const errors = formState.errors;
  const branchId = watch("branchId") as string;
  useEffect(() => {
    if (!branchId && writable[0]) setValue("branchId", String(writable[0].id));
    const b = writable.find((x) => String(x.id) === String(branchId));
    if (b) setValue("unit", b.massUnit === "kg" ? "kg" : "lb");
    // eslint-disable-next-line react-hooks/exhaustive-deps -- writable is a new array on every render; the choice depends on its length
  }, [branchId, writable.length]);

  const idem = useIdempotencyKey();
  const save = useMutation({
    mutationFn: (v: FieldValues) =>
      fetchJson<{ id: number }>("/api/purchases", { method: "POST", headers: idem.headers, body: JSON.stringify(v) }),
    onSuccess: async ({ id }) => {
      await queryClient.invalidateQueries({ queryKey: ["purchases"] });
      router.push(`/purchases/${id}?saved=1`);
    },
    onError: (err) => {
      setFormError(saveErrorMessage(err, setError, "The purchase could not be sent; nothing was saved."));
    },
  });
  const err = (name: string) => errors[name]?.message as string | undefined;
  const field = (name: string, label: string, opts: { type?: string; inputMode?: "decimal" | "numeric"; list?: string } = {}) => (
    <TextField
      id={`${uid}-${name}`}
      label={label}
      error={err(name)}
      registration={register(name)}
      type={opts.type ?? "text"}
      inputMode={opts.inputMode}
      list={opts.list}
      autoComplete="off"
      inputClassName={`${inputClass} ${opts.inputMode ? "tabular" : ""}`}
    />
  );
  return (
    <form
      noValidate
      className="space-y-5"
      onSubmit={submitOrExplain(handleSubmit, {
        save: save.mutate,
        setFormError,
        invalid: "Some fields need attention before the purchase can be saved.",
      })}
    >
      <header>
        <h1 className="text-2xl font-semibold text-ink-950">Record a purchase</h1>
        <p className="text-ink-600">Refrigerant the branch bought; it counts in the branch&apos;s refrigerant balance.</p>
      </header>
      <FormAlert message={formError} />
      <Field id={`${uid}-branchId`} label="Branch" error={err("branchId")}>
        <select
          id={`${uid}-branchId`}
          {...register("branchId")}
          className={`${inputClass} py-3`}
          {...fieldAria(`${uid}-branchId`, { error: err("branchId") })}
        >
          {writable.map((b) => (
            <option key={b.id} value={b.id}>
              {b.name}
            </option>
          ))}
        </select>
      </Field>
      {field("purchasedOn", "Date bought", { type: "date" })}
      {field("supplierName", "Supplier")}
      {field("refrigerant", "Refrigerant", { list: `${uid}-refrigerants` })}
      <RefrigerantList id={`${uid}-refrigerants`} />
      <AmountField
        id={`${uid}-amount`}
        label="Quantity bought"
        error={err("amount")}
        unitId={`${uid}-unit`}
        unitLabel="Unit of the quantity"
        amount={register("amount")}
        unit={register("unit")}
      />
      {field("containerCount", "Number of containers (optional)", { inputMode: "numeric" })}
      {field("invoiceReference", "Invoice reference (optional)")}
      <button type="submit" disabled={save.isPending} className={primaryButton}>
        {save.isPending ? "Saving…" : "Save purchase"}
      </button>
    </form>
  );
}
