"use client";

import Link from "next/link";
import { useId, useMemo, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import {
  ACCESS_METHOD_LABELS,
  ACCESS_METHODS,
  EVACUATION_UNIT_LABELS,
  EVACUATION_UNITS,
  TEMPORARY_ACCESS_METHODS,
  formatMass,
  type AccessMethod,
  type EvacuationUnit,
} from "@coldtrail/core";
import type { ShopBatchResult, ShopQueueRow } from "@coldtrail/db";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import type { CylinderOption, EquipmentOption } from "@/lib/client/types";
import { SafetyCautions } from "@/components/safety-cautions";
import { optionsOf } from "@/lib/client/options";
import { OverFillConfirm, RadioCards } from "@/components/form";
import {
  FieldError,
  FormAlert,
  SavedNotice,
  YesNo,
  hintClass,
  inputClass,
  labelClass,
  primaryButton,
  todayIn,
} from "../../jobs/_components/form-bits";
import { useIdempotencyKey } from "@/lib/client/idempotency";

interface ItemState {
  amount: string;
  evacuationValue: string;
  evacuationUnit: EvacuationUnit;
  compressorOperating: boolean | null;
}

/**
 * Retired units waiting at the shop to be scrapped: pick several, record the recovery for each
 * (into one cylinder, with one machine, on one day). Each gets its disposal job and the record
 * (more than 5 lb) or the signed statement (small appliance) it needs, all in one go.
 */
export function ShopRunForm() {
  const uid = useId();
  const queryClient = useQueryClient();
  const queue = useQuery({ queryKey: ["shop-queue"], queryFn: () => fetchJson<{ rows: ShopQueueRow[] }>("/api/disposals/shop") });
  const rows = queue.data?.rows ?? [];
  const branchIds = [...new Set(rows.map((r) => r.branchId))];
  const [branchId, setBranchId] = useState<number | null>(null);
  const branch = branchId ?? branchIds[0] ?? null;
  const branchRows = rows.filter((r) => r.branchId === branch);
  const massUnit = branchRows[0]?.massUnit ?? "lb_oz";
  const unit = massUnit === "kg" ? "kg" : "lb";

  const [picked, setPicked] = useState<Record<number, ItemState>>({});
  const [performedOn, setPerformedOn] = useState(todayIn(Intl.DateTimeFormat().resolvedOptions().timeZone));
  const [cylinderId, setCylinderId] = useState("");
  const [equipmentId, setEquipmentId] = useState("");
  const [accessMethod, setAccessMethod] = useState<AccessMethod | "">("");
  const [removed, setRemoved] = useState<boolean | null>(null);
  const [sentTo, setSentTo] = useState("");
  const [confirm, setConfirm] = useState(false);
  // Set when the server says the chosen cylinder would go over its safe fill: the box to confirm it.
  const [overFillAsk, setOverFillAsk] = useState<string | null>(null);
  const [confirmOverFill, setConfirmOverFill] = useState(false);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [done, setDone] = useState<ShopBatchResult | null>(null);

  const cylinders = useQuery({
    queryKey: ["lookup-cylinders", branch],
    queryFn: () => fetchJson<{ rows: CylinderOption[] }>(`/api/lookup/cylinders?branchId=${branch}`),
    enabled: branch !== null,
  });
  const equipment = useQuery({
    queryKey: ["lookup-equipment", branch],
    queryFn: () => fetchJson<{ rows: EquipmentOption[] }>(`/api/lookup/equipment?branchId=${branch}`),
    enabled: branch !== null,
  });

  const totalG = useMemo(
    () =>
      Object.values(picked).reduce((sum, item) => {
        const n = Number(item.amount);
        return Number.isFinite(n) ? sum + n * (unit === "kg" ? 1000 : 453.59237) : sum;
      }, 0),
    [picked, unit],
  );

  const idem = useIdempotencyKey();
  const save = useMutation({
    mutationFn: (body: unknown) =>
      fetchJson<ShopBatchResult>("/api/disposals/shop", { method: "POST", headers: idem.headers, body: JSON.stringify(body) }),
    onSuccess: async (result) => {
      setDone(result);
      setPicked({});
      setConfirm(false);
      setOverFillAsk(null);
      setConfirmOverFill(false);
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: ["shop-queue"] }),
        queryClient.invalidateQueries({ queryKey: ["disposals"] }),
        queryClient.invalidateQueries({ queryKey: ["jobs"] }),
      ]);
    },
    onError: (err) => {
      if (err instanceof ApiError) {
        setErrors(Object.fromEntries(Object.entries(err.fieldErrors).map(([k, m]) => [k, m[0] ?? ""])));
        setOverFillAsk(err.fieldErrors.confirmOverFill?.[0] ?? null);
        setFormError(err.message);
      } else setFormError("The scrap run could not be sent; nothing was saved.");
    },
  });

  const order = branchRows.filter((r) => picked[r.id]).map((r) => r.id);
  const pickedRefrigerants = [...new Set(branchRows.filter((r) => picked[r.id]).map((r) => r.refrigerant))];
  const submit = (e: React.FormEvent) => {
    e.preventDefault();
    setErrors({});
    setFormError(null);
    setDone(null);
    save.mutate({
      performedOn,
      cylinderId,
      equipmentId,
      accessMethod: accessMethod || undefined,
      temporaryAccessRemoved: removed,
      sentTo,
      confirmStatement: confirm,
      ...(overFillAsk && confirmOverFill ? { confirmOverFill: true } : {}),
      items: order.map((id) => ({
        applianceId: id,
        recoveredAmount: picked[id]!.amount,
        recoveredUnit: unit,
        evacuationValue: picked[id]!.evacuationValue,
        evacuationUnit: picked[id]!.evacuationUnit,
        compressorOperating: picked[id]!.compressorOperating,
      })),
    });
  };
  const itemError = (i: number, field: string) => errors[`items.${i}.${field}`];

  return (
    <form onSubmit={submit} noValidate className="space-y-6">
      <header>
        <h1 className="text-2xl font-semibold text-ink-950">Scrap run at the shop</h1>
        <p className="text-ink-600">
          Recover the refrigerant from retired units waiting to be scrapped. Each unit gets its disposal job and its record or signed
          statement.
        </p>
      </header>
      <SafetyCautions />
      {done && (
        <SavedNotice>
          Saved {done.jobIds.length} disposal{done.jobIds.length === 1 ? "" : "s"}: {done.recordIds.length} record
          {done.recordIds.length === 1 ? "" : "s"} and {done.statementIds.length} signed statement
          {done.statementIds.length === 1 ? "" : "s"}.{" "}
          <Link href="/disposals" className="underline">
            See the disposals
          </Link>
        </SavedNotice>
      )}
      <FormAlert message={formError} />

      {branchIds.length > 1 && (
        <div>
          <label htmlFor={`${uid}-branch`} className={labelClass}>
            Branch
          </label>
          <select
            id={`${uid}-branch`}
            value={branch ?? ""}
            onChange={(e) => {
              setBranchId(Number(e.target.value));
              setPicked({});
              setCylinderId("");
              setEquipmentId("");
            }}
            className={`${inputClass} py-3`}
          >
            {branchIds.map((id) => (
              <option key={id} value={id}>
                {rows.find((r) => r.branchId === id)?.branchName}
              </option>
            ))}
          </select>
        </div>
      )}

      {!queue.isLoading && branchRows.length === 0 ? (
        <div className="rounded-lg border border-ink-200 bg-white p-4" data-testid="shop-empty">
          <p className="font-semibold text-ink-950">No retired unit is waiting to be scrapped.</p>
          <p className={hintClass}>
            Units appear here once they are retired in the appliance register. To dispose of a unit at a customer&apos;s site,{" "}
            <Link href="/jobs/new?kind=disposal" className="font-medium text-fjord-700 underline">
              log a disposal job
            </Link>
            .
          </p>
        </div>
      ) : (
        <>
          <fieldset>
            <legend className={labelClass}>Units waiting to be scrapped</legend>
            {queue.isLoading && <p className={hintClass}>Loading the retired units…</p>}
            <FieldError id={`${uid}-items-error`} message={errors.items} />
            <ul className="mt-2 space-y-3">
              {branchRows.map((r) => {
                const item = picked[r.id];
                const i = order.indexOf(r.id);
                return (
                  <li key={r.id} className="rounded-lg border border-ink-200 bg-white" data-testid="shop-unit">
                    <label className="flex min-h-14 cursor-pointer items-center gap-3 px-4 py-3">
                      <input
                        type="checkbox"
                        checked={Boolean(item)}
                        onChange={(e) =>
                          setPicked((p) => {
                            const next = { ...p };
                            if (e.target.checked)
                              next[r.id] = { amount: "", evacuationValue: "", evacuationUnit: "in_hg_vacuum", compressorOperating: null };
                            else delete next[r.id];
                            return next;
                          })
                        }
                        className="size-6 shrink-0 accent-fjord-600"
                      />
                      <span>
                        <span className="block font-semibold text-ink-950">
                          {r.tag}{" "}
                          <span className="font-normal text-ink-600">
                            · {r.refrigerant} · {formatMass(r.fullChargeG, r.massUnit)}
                          </span>
                        </span>
                        <span className="block text-sm text-ink-600">
                          {r.description} — needs a {r.needs === "statement" ? "signed statement" : "disposal record"}
                          {r.awaitingAtShop ? " · at the shop" : ""}
                        </span>
                      </span>
                    </label>
                    {item && (
                      <div className="space-y-3 border-t border-ink-100 px-4 py-3">
                        <div>
                          <label htmlFor={`${uid}-amt-${r.id}`} className={labelClass}>
                            Amount recovered from {r.tag} ({unit})
                          </label>
                          <input
                            id={`${uid}-amt-${r.id}`}
                            type="text"
                            inputMode="decimal"
                            value={item.amount}
                            onChange={(e) => setPicked((p) => ({ ...p, [r.id]: { ...item, amount: e.target.value } }))}
                            className={`${inputClass} tabular`}
                            aria-invalid={itemError(i, "recoveredAmount") ? true : undefined}
                            aria-describedby={itemError(i, "recoveredAmount") ? `${uid}-amt-${r.id}-error` : undefined}
                          />
                          <FieldError
                            id={`${uid}-amt-${r.id}-error`}
                            message={itemError(i, "recoveredAmount") ?? itemError(i, "applianceId")}
                          />
                        </div>
                        <div>
                          <label htmlFor={`${uid}-evac-${r.id}`} className={labelClass}>
                            Evacuation level reached on {r.tag}
                          </label>
                          <div className="mt-1 flex gap-2">
                            <input
                              id={`${uid}-evac-${r.id}`}
                              type="text"
                              inputMode="decimal"
                              value={item.evacuationValue}
                              onChange={(e) => setPicked((p) => ({ ...p, [r.id]: { ...item, evacuationValue: e.target.value } }))}
                              className={`${inputClass} mt-0 flex-1 tabular`}
                              aria-invalid={itemError(i, "evacuationValue") ? true : undefined}
                              aria-describedby={itemError(i, "evacuationValue") ? `${uid}-evac-${r.id}-error` : undefined}
                            />
                            <label htmlFor={`${uid}-evacu-${r.id}`} className="sr-only">
                              Unit of the evacuation level on {r.tag}
                            </label>
                            <select
                              id={`${uid}-evacu-${r.id}`}
                              value={item.evacuationUnit}
                              onChange={(e) =>
                                setPicked((p) => ({ ...p, [r.id]: { ...item, evacuationUnit: e.target.value as EvacuationUnit } }))
                              }
                              className="w-40 rounded-lg border border-ink-300 bg-white px-2 text-base"
                            >
                              {EVACUATION_UNITS.map((u) => (
                                <option key={u} value={u}>
                                  {EVACUATION_UNIT_LABELS[u]}
                                </option>
                              ))}
                            </select>
                          </div>
                          <FieldError id={`${uid}-evac-${r.id}-error`} message={itemError(i, "evacuationValue")} />
                        </div>
                        {r.smallAppliance && (
                          <fieldset>
                            <legend className={labelClass}>Was its compressor running?</legend>
                            <YesNo
                              name={`${uid}-comp-${r.id}`}
                              value={item.compressorOperating}
                              onChange={(v) => setPicked((p) => ({ ...p, [r.id]: { ...item, compressorOperating: v } }))}
                              yes="Running"
                              no="Not running"
                            />
                          </fieldset>
                        )}
                      </div>
                    )}
                  </li>
                );
              })}
            </ul>
            {pickedRefrigerants.length > 1 && (
              <p
                className="mt-2 flex items-start gap-2 rounded-md border border-sev-major/50 bg-orange-50 px-3 py-2 text-sm font-medium text-sev-major"
                data-testid="shop-mixed-warning"
              >
                <span aria-hidden="true">⚠</span>
                <span>
                  These units hold different refrigerants ({pickedRefrigerants.join(", ")}). One cylinder holds one refrigerant: record one
                  run per refrigerant, each into its own cylinder.
                </span>
              </p>
            )}
          </fieldset>

          <div>
            <label htmlFor={`${uid}-date`} className={labelClass}>
              Date of the recovery
            </label>
            <input
              id={`${uid}-date`}
              type="date"
              value={performedOn}
              onChange={(e) => setPerformedOn(e.target.value)}
              className={inputClass}
              aria-invalid={errors.performedOn ? true : undefined}
            />
            <FieldError id={`${uid}-date-error`} message={errors.performedOn} />
          </div>

          <fieldset>
            <legend className={labelClass}>Recovery cylinder</legend>
            <RadioCards
              className="mt-2 space-y-2"
              groupProps={{ role: "radiogroup" }}
              name={`${uid}-cyl`}
              value={cylinderId}
              onChange={setCylinderId}
              options={(cylinders.data?.rows ?? []).map((c) => ({
                value: String(c.id),
                label: (
                  <span>
                    <span className="block font-semibold">{c.serial}</span>
                    <span className="block text-sm text-ink-600">
                      {c.refrigerant && c.contentsG > 0 ? `Holds ${formatMass(c.contentsG, massUnit)} ${c.refrigerant}` : "Empty"}
                    </span>
                  </span>
                ),
              }))}
            />
            <FieldError id={`${uid}-cyl-error`} message={errors.cylinderId} />
            {totalG > 0 && <p className={hintClass}>This run adds about {formatMass(Math.round(totalG), massUnit)} to the cylinder.</p>}
          </fieldset>

          <fieldset>
            <legend className={labelClass}>Recovery equipment</legend>
            <RadioCards
              className="mt-2 space-y-2"
              groupProps={{ role: "radiogroup" }}
              name={`${uid}-eq`}
              value={equipmentId}
              onChange={setEquipmentId}
              options={(equipment.data?.rows ?? []).map((e) => ({
                value: String(e.id),
                label: (
                  <span>
                    <span className="block font-semibold">{e.serial}</span>
                    <span className="block text-sm text-ink-600">
                      {e.makeModel} · {e.certificationState === "certified" ? "✓ certified" : "⚠ no certification on file"}
                      {e.smallApplianceOnly ? " · small appliances only" : ""}
                    </span>
                  </span>
                ),
              }))}
            />
            <FieldError id={`${uid}-eq-error`} message={errors.equipmentId} />
          </fieldset>

          <fieldset>
            <legend className={labelClass}>How were the circuits accessed?</legend>
            <RadioCards
              className="mt-2 grid gap-2"
              name={`${uid}-access`}
              value={accessMethod}
              onChange={setAccessMethod}
              options={optionsOf(ACCESS_METHODS, ACCESS_METHOD_LABELS)}
            />
            <FieldError id={`${uid}-access-error`} message={errors.accessMethod} />
          </fieldset>
          {accessMethod && TEMPORARY_ACCESS_METHODS.includes(accessMethod) && (
            <fieldset>
              <legend className={labelClass}>Were the temporary piercing devices removed?</legend>
              <YesNo name={`${uid}-removed`} value={removed} onChange={setRemoved} yes="Yes, removed" no="No, left on" />
              <FieldError id={`${uid}-removed-error`} message={errors.temporaryAccessRemoved} />
            </fieldset>
          )}

          <div>
            <label htmlFor={`${uid}-sent`} className={labelClass}>
              Going to (scrap yard, optional)
            </label>
            <input id={`${uid}-sent`} value={sentTo} onChange={(e) => setSentTo(e.target.value)} className={inputClass} />
          </div>

          <div>
            <label className="flex min-h-14 cursor-pointer items-start gap-3 rounded-lg border border-ink-300 bg-white px-4 py-3">
              <input
                type="checkbox"
                checked={confirm}
                onChange={(e) => setConfirm(e.target.checked)}
                className="mt-1 size-6 shrink-0 accent-fjord-600"
                aria-invalid={errors.confirmStatement ? true : undefined}
                aria-describedby={errors.confirmStatement ? `${uid}-confirm-error` : undefined}
              />
              <span>
                I recovered the refrigerant from these units before they go for scrap. For small appliances this is my signed statement,
                with my name, the branch&apos;s address and today&apos;s date.
              </span>
            </label>
            <FieldError id={`${uid}-confirm-error`} message={errors.confirmStatement} />
          </div>
          {overFillAsk && (
            <OverFillConfirm
              id={`${uid}-confirm-over-fill`}
              message={overFillAsk}
              checked={confirmOverFill}
              onChange={setConfirmOverFill}
            />
          )}

          <div className="sticky bottom-0 -mx-4 border-t border-ink-200 bg-white/95 px-4 py-3 backdrop-blur">
            <button type="submit" disabled={save.isPending} className={primaryButton}>
              {save.isPending
                ? "Saving…"
                : order.length
                  ? `Save ${order.length} disposal${order.length === 1 ? "" : "s"}`
                  : "Save the scrap run"}
            </button>
          </div>
        </>
      )}
    </form>
  );
}
