"use client";

import { useId, useState } from "react";
import { useRouter } from "next/navigation";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { subject } from "@casl/ability";
import { formatMass } from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import type { BranchOption, CylinderOption } from "@/lib/client/types";
import { useAbility } from "@/components/providers";
import { FieldError, FormAlert, hintClass, inputClass, labelClass, primaryButton, todayIn } from "../../jobs/_components/form-bits";
import { useIdempotencyKey } from "@/lib/client/idempotency";

/** Cylinders sent to a reclaimer: each ships its recorded contents and comes back empty on record. */
export function ShipmentForm({ organisationId }: { organisationId: number }) {
  const uid = useId();
  const router = useRouter();
  const ability = useAbility();
  const queryClient = useQueryClient();
  const branches = useQuery({ queryKey: ["branches"], queryFn: () => fetchJson<{ rows: BranchOption[] }>("/api/lookup/branches") });
  const writable = (branches.data?.rows ?? []).filter(
    (b) => !b.archivedAt && ability.can("create", subject("ReclaimShipment", { organisationId, branchId: b.id })),
  );
  const [branchId, setBranchId] = useState<string>("");
  const branch = writable.find((b) => String(b.id) === branchId) ?? writable[0];
  const cylinders = useQuery({
    queryKey: ["lookup-cylinders", branch?.id],
    queryFn: () => fetchJson<{ rows: CylinderOption[] }>(`/api/lookup/cylinders?branchId=${branch!.id}`),
    enabled: Boolean(branch),
  });
  const full = (cylinders.data?.rows ?? []).filter((c) => c.contentsG > 0 && c.refrigerant);
  const [picked, setPicked] = useState<number[]>([]);
  const [shippedOn, setShippedOn] = useState(todayIn(Intl.DateTimeFormat().resolvedOptions().timeZone));
  const [reclaimerName, setReclaimerName] = useState("");
  const [reclaimerAddress, setReclaimerAddress] = useState("");
  const [reference, setReference] = useState("");
  const [notes, setNotes] = useState("");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [formError, setFormError] = useState<string | null>(null);
  const massUnit = branch?.massUnit ?? "lb_oz";

  const totals = new Map<string, number>();
  for (const c of full.filter((x) => picked.includes(x.id))) totals.set(c.refrigerant!, (totals.get(c.refrigerant!) ?? 0) + c.contentsG);

  const idem = useIdempotencyKey();
  const save = useMutation({
    mutationFn: (body: unknown) =>
      fetchJson<{ id: number }>("/api/shipments", { method: "POST", headers: idem.headers, body: JSON.stringify(body) }),
    onSuccess: async ({ id }) => {
      await queryClient.invalidateQueries({ queryKey: ["shipments"] });
      await queryClient.invalidateQueries({ queryKey: ["lookup-cylinders"] });
      router.push(`/shipments/${id}?saved=1`);
    },
    onError: (err) => {
      if (err instanceof ApiError) {
        setErrors(Object.fromEntries(Object.entries(err.fieldErrors).map(([k, m]) => [k, m[0] ?? ""])));
        setFormError(err.message);
      } else setFormError("The shipment could not be sent; nothing was saved.");
    },
  });

  const text = (
    id: string,
    label: string,
    value: string,
    set: (v: string) => void,
    field: string,
    opts: { textarea?: boolean; type?: string } = {},
  ) => (
    <div>
      <label htmlFor={`${uid}-${id}`} className={labelClass}>
        {label}
      </label>
      {opts.textarea ? (
        <textarea
          id={`${uid}-${id}`}
          rows={2}
          value={value}
          onChange={(e) => set(e.target.value)}
          className={inputClass}
          aria-invalid={errors[field] ? true : undefined}
          aria-describedby={errors[field] ? `${uid}-${id}-error` : undefined}
        />
      ) : (
        <input
          id={`${uid}-${id}`}
          type={opts.type ?? "text"}
          value={value}
          onChange={(e) => set(e.target.value)}
          className={inputClass}
          aria-invalid={errors[field] ? true : undefined}
          aria-describedby={errors[field] ? `${uid}-${id}-error` : undefined}
        />
      )}
      <FieldError id={`${uid}-${id}-error`} message={errors[field]} />
    </div>
  );

  return (
    <form
      noValidate
      className="space-y-6"
      onSubmit={(e) => {
        e.preventDefault();
        setErrors({});
        setFormError(null);
        save.mutate({ branchId: branch?.id, shippedOn, reclaimerName, reclaimerAddress, reference, notes, cylinderIds: picked });
      }}
    >
      <header>
        <h1 className="text-2xl font-semibold text-ink-950">Record a reclaim shipment</h1>
        <p className="text-ink-600">
          Pick the cylinders that left for the reclaimer. Each ships what it holds on record and is then empty.
        </p>
      </header>
      <aside className="rounded-lg border border-sev-minor/40 bg-amber-50 px-4 py-3 text-sm text-ink-800">
        <p className="font-semibold">
          <span aria-hidden="true">⚠ </span>Handling cylinders
        </p>
        <p>
          Secure cylinders upright with caps on; never heat or overfill a cylinder. Local codes and licensed practice take precedence over
          this app.
        </p>
      </aside>
      <FormAlert message={formError} />
      {writable.length > 1 && (
        <div>
          <label htmlFor={`${uid}-branch`} className={labelClass}>
            Branch
          </label>
          <select
            id={`${uid}-branch`}
            value={branch?.id ?? ""}
            onChange={(e) => {
              setBranchId(e.target.value);
              setPicked([]);
            }}
            className={`${inputClass} py-3`}
          >
            {writable.map((b) => (
              <option key={b.id} value={b.id}>
                {b.name}
              </option>
            ))}
          </select>
        </div>
      )}
      <fieldset>
        <legend className={labelClass}>Cylinders shipped</legend>
        {cylinders.isLoading && <p className={hintClass}>Loading the cylinders…</p>}
        {!cylinders.isLoading && full.length === 0 && <p className={hintClass}>No cylinder of this branch holds refrigerant on record.</p>}
        <div className="mt-2 space-y-2" aria-describedby={errors.cylinderIds ? `${uid}-cyl-error` : undefined}>
          {full.map((c) => (
            <label
              key={c.id}
              className="flex min-h-14 cursor-pointer items-center gap-3 rounded-lg border border-ink-200 bg-white px-4 py-3 has-[:checked]:border-2 has-[:checked]:border-fjord-600 has-[:checked]:bg-fjord-50"
            >
              <input
                type="checkbox"
                checked={picked.includes(c.id)}
                onChange={(e) => setPicked((p) => (e.target.checked ? [...p, c.id] : p.filter((x) => x !== c.id)))}
                className="size-6 shrink-0 accent-fjord-600"
              />
              <span>
                <span className="block font-semibold">{c.serial}</span>
                <span className="block text-sm text-ink-600 tabular">
                  {formatMass(c.contentsG, massUnit)} {c.refrigerant}
                </span>
              </span>
            </label>
          ))}
        </div>
        <FieldError id={`${uid}-cyl-error`} message={errors.cylinderIds} />
        {totals.size > 0 && (
          <p className={hintClass} data-testid="shipment-totals">
            Shipping {[...totals.entries()].map(([r, g]) => `${formatMass(g, massUnit)} ${r}`).join(", ")}.
          </p>
        )}
      </fieldset>
      {text("date", "Date shipped", shippedOn, setShippedOn, "shippedOn", { type: "date" })}
      {text("reclaimer", "Reclaimer", reclaimerName, setReclaimerName, "reclaimerName")}
      {text("address", "Reclaimer's address (optional)", reclaimerAddress, setReclaimerAddress, "reclaimerAddress", { textarea: true })}
      {text("reference", "Bill of lading or manifest number (optional)", reference, setReference, "reference")}
      {text("notes", "Notes (optional)", notes, setNotes, "notes", { textarea: true })}
      <button type="submit" disabled={save.isPending} className={primaryButton}>
        {save.isPending
          ? "Saving…"
          : picked.length
            ? `Save shipment of ${picked.length} cylinder${picked.length === 1 ? "" : "s"}`
            : "Save shipment"}
      </button>
    </form>
  );
}
