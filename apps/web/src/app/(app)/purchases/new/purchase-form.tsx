"use client";

import { useEffect, useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useForm, type FieldValues, type Resolver } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { subject } from "@casl/ability";
import { MASS_INPUT_UNITS, REFRIGERANTS, purchaseInput } from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import type { BranchOption } from "@/lib/client/types";
import { useAbility } from "@/components/providers";
import { FieldError, FormAlert, inputClass, labelClass, primaryButton, todayIn } from "../../jobs/_components/form-bits";

/** Refrigerant bought by a branch. */
export function PurchaseForm({ organisationId }: { organisationId: number }) {
  const uid = useId();
  const router = useRouter();
  const ability = useAbility();
  const queryClient = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const branches = useQuery({ queryKey: ["branches"], queryFn: () => fetchJson<{ rows: BranchOption[] }>("/api/lookup/branches") });
  const writable = (branches.data?.rows ?? []).filter((b) => !b.archivedAt && ability.can("create", subject("Purchase", { organisationId, branchId: b.id })));
  const form = useForm<FieldValues>({
    resolver: zodResolver(purchaseInput as never) as unknown as Resolver<FieldValues>,
    mode: "onTouched",
    defaultValues: { branchId: "", purchasedOn: todayIn(Intl.DateTimeFormat().resolvedOptions().timeZone), supplierName: "", refrigerant: "", amount: "", unit: "lb", containerCount: "", invoiceReference: "" },
  });
  const { register, handleSubmit, formState, setError, setValue, watch } = form;
  const errors = formState.errors;
  const branchId = watch("branchId");
  useEffect(() => {
    if (!branchId && writable[0]) setValue("branchId", String(writable[0].id));
    const b = writable.find((x) => String(x.id) === String(branchId));
    if (b) setValue("unit", b.massUnit === "kg" ? "kg" : "lb");
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [branchId, writable.length]);

  const save = useMutation({
    mutationFn: (v: FieldValues) => fetchJson<{ id: number }>("/api/purchases", { method: "POST", body: JSON.stringify(v) }),
    onSuccess: async ({ id }) => {
      await queryClient.invalidateQueries({ queryKey: ["purchases"] });
      router.push(`/purchases/${id}?saved=1`);
    },
    onError: (err) => {
      if (err instanceof ApiError) {
        for (const [f, m] of Object.entries(err.fieldErrors)) setError(f, { type: "server", message: m[0] });
        setFormError(err.message);
      } else setFormError("The purchase could not be sent; nothing was saved.");
    },
  });
  const field = (name: string, label: string, opts: { type?: string; inputMode?: "decimal" | "numeric"; list?: string } = {}) => {
    const err = errors[name]?.message as string | undefined;
    return (
      <div>
        <label htmlFor={`${uid}-${name}`} className={labelClass}>
          {label}
        </label>
        <input
          id={`${uid}-${name}`}
          type={opts.type ?? "text"}
          inputMode={opts.inputMode}
          list={opts.list}
          autoComplete="off"
          {...register(name)}
          className={`${inputClass} ${opts.inputMode ? "tabular" : ""}`}
          aria-invalid={err ? true : undefined}
          aria-describedby={err ? `${uid}-${name}-error` : undefined}
        />
        <FieldError id={`${uid}-${name}-error`} message={err} />
      </div>
    );
  };
  return (
    <form
      noValidate
      className="space-y-5"
      onSubmit={handleSubmit(
        (v) => {
          setFormError(null);
          save.mutate(v);
        },
        () => setFormError("Some fields need attention before the purchase can be saved."),
      )}
    >
      <header>
        <h1 className="text-2xl font-semibold text-ink-950">Record a purchase</h1>
        <p className="text-ink-600">Refrigerant the branch bought; it counts in the branch&apos;s refrigerant balance.</p>
      </header>
      <FormAlert message={formError} />
      <div>
        <label htmlFor={`${uid}-branch`} className={labelClass}>
          Branch
        </label>
        <select id={`${uid}-branch`} {...register("branchId")} className={`${inputClass} py-3`} aria-invalid={errors.branchId ? true : undefined}>
          {writable.map((b) => (
            <option key={b.id} value={b.id}>
              {b.name}
            </option>
          ))}
        </select>
        <FieldError id={`${uid}-branchId-error`} message={errors.branchId?.message as string | undefined} />
      </div>
      {field("purchasedOn", "Date bought", { type: "date" })}
      {field("supplierName", "Supplier")}
      {field("refrigerant", "Refrigerant", { list: `${uid}-refrigerants` })}
      <datalist id={`${uid}-refrigerants`}>
        {REFRIGERANTS.map((r) => (
          <option key={r.designation} value={r.designation} />
        ))}
      </datalist>
      <div>
        <label htmlFor={`${uid}-amount`} className={labelClass}>
          Quantity bought
        </label>
        <div className="mt-1 flex gap-2">
          <input
            id={`${uid}-amount`}
            type="text"
            inputMode="decimal"
            autoComplete="off"
            {...register("amount")}
            className={`${inputClass} mt-0 flex-1 tabular`}
            aria-invalid={errors.amount ? true : undefined}
            aria-describedby={errors.amount ? `${uid}-amount-error` : undefined}
          />
          <label htmlFor={`${uid}-unit`} className="sr-only">
            Unit of the quantity
          </label>
          <select id={`${uid}-unit`} {...register("unit")} className="w-28 rounded-lg border border-ink-300 bg-white px-3 text-lg">
            {MASS_INPUT_UNITS.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </select>
        </div>
        <FieldError id={`${uid}-amount-error`} message={errors.amount?.message as string | undefined} />
      </div>
      {field("containerCount", "Number of containers (optional)", { inputMode: "numeric" })}
      {field("invoiceReference", "Invoice reference (optional)")}
      <button type="submit" disabled={save.isPending} className={primaryButton}>
        {save.isPending ? "Saving…" : "Save purchase"}
      </button>
    </form>
  );
}
