"use client";

import Link from "next/link";
import { useId, useMemo, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { JOB_KIND_LABELS, REGISTER_LABELS, celsiusToFahrenheit, formatMass, roundTo, type JobKind } from "@coldtrail/core";
import type { CylinderMovementRow, CylinderRow, CylinderWeighingRow, RegisterActivity, RegisterAmendment } from "@coldtrail/db";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { DetailRow, LoadError } from "@/components/detail";
import { Notice } from "@/components/form";
import { DataTable, serverColumnHelper } from "@/components/data-table";
import { RequalificationBadge, StatusBadge } from "@/components/registers/badges";
import { FillGauge } from "@/components/registers/fill-gauge";
import { CylinderCautions } from "@/components/registers/cylinder-cautions";
import { ActivityPanel, AmendmentsPanel } from "@/components/registers/history-panels";
import { Field, FormAlert, buttonPrimary, buttonSecondary, describedBy, inputClass } from "@/components/registers/form-fields";
import { WeighingForm } from "./weighing-form";

interface CylinderResponse {
  cylinder: CylinderRow;
  amendments: RegisterAmendment[];
  activity: RegisterActivity[] | null;
  permissions: { update: boolean; readActivity: boolean };
}

const MOVEMENT_WORDS: Record<string, { words: string; sign: string }> = {
  recovered_into_cylinder: { words: "Filled (recovery)", sign: "+" },
  charged_from_cylinder: { words: "Drawn to charge", sign: "−" },
  shipped_for_reclaim: { words: "Shipped for reclaim", sign: "−" },
  cylinder_adjustment: { words: "Adjustment", sign: "±" },
};

function VoidWeighing({ cylinderId, weighing, onDone }: { cylinderId: number; weighing: CylinderWeighingRow; onDone: () => void }) {
  const uid = useId();
  const queryClient = useQueryClient();
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | undefined>();
  const [formError, setFormError] = useState<string | null>(null);
  const save = useMutation({
    mutationFn: () =>
      fetchJson(`/api/cylinders/${cylinderId}/weighings/${weighing.id}/void`, { method: "POST", body: JSON.stringify({ reason }) }),
    onSuccess: async () => {
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: ["cylinder", String(cylinderId)] }),
        queryClient.invalidateQueries({ queryKey: ["cylinder-weighings"] }),
        queryClient.invalidateQueries({ queryKey: ["cylinders"] }),
      ]);
      onDone();
    },
    onError: (e) => {
      if (e instanceof ApiError) {
        setError(e.fieldErrors.reason?.[0]);
        setFormError(e.message);
      } else setFormError("Nothing was saved; try again.");
    },
  });
  return (
    <form
      noValidate
      className="space-y-3 rounded-lg border border-ink-200 bg-white p-4"
      aria-label="Void a weighing"
      onSubmit={(e) => {
        e.preventDefault();
        if (reason.trim().length < 3) {
          setError("Say why the record is voided");
          return;
        }
        save.mutate();
      }}
    >
      <h2 className="text-lg font-semibold">Void the weighing of {weighing.weighedOn}</h2>
      <p className="text-sm text-ink-600">For a weighing entered in error. It stays in the history, marked as void.</p>
      <FormAlert message={formError} />
      <Field id={`${uid}-reason`} label="Why" error={error}>
        <textarea
          id={`${uid}-reason`}
          rows={2}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          className={inputClass}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(`${uid}-reason`, { error })}
        />
      </Field>
      <div className="flex gap-2">
        <button type="submit" className={buttonPrimary} disabled={save.isPending}>
          Void the weighing
        </button>
        <button type="button" className={buttonSecondary} onClick={onDone}>
          Cancel
        </button>
      </div>
    </form>
  );
}

function temperatureText(w: CylinderWeighingRow, unit: CylinderRow["massUnit"]): string {
  if (w.temperatureC === null) return "—";
  return unit === "kg" ? `${roundTo(w.temperatureC, 1)} °C` : `${roundTo(celsiusToFahrenheit(w.temperatureC), 1)} °F`;
}

function WeighingState({ w }: { w: CylinderWeighingRow }) {
  if (w.voidedAt) return <span className="text-sm text-ink-600">✕ Void: {w.voidReason}</span>;
  return (
    <span className="text-sm">
      {w.amendmentCount > 0 ? `✎ Corrected ${w.amendmentCount}×` : "Original"}
      {w.notes && <span className="block text-xs text-ink-600">{w.notes}</span>}
    </span>
  );
}

function WeighingActions({
  w,
  canUpdate,
  onSelect,
}: {
  w: CylinderWeighingRow;
  canUpdate: boolean;
  onSelect: (mode: "amend" | "void", w: CylinderWeighingRow) => void;
}) {
  if (!canUpdate || w.voidedAt) return null;
  return (
    <span className="flex gap-1">
      <button
        type="button"
        className="min-h-10 rounded-md border border-ink-300 px-3 text-sm"
        onClick={() => onSelect("amend", w)}
        aria-label={`Correct the weighing of ${w.weighedOn}`}
      >
        Correct
      </button>
      <button
        type="button"
        className="min-h-10 rounded-md border border-ink-300 px-3 text-sm"
        onClick={() => onSelect("void", w)}
        aria-label={`Void the weighing of ${w.weighedOn}`}
      >
        Void
      </button>
    </span>
  );
}

function MovementRecord({ m }: { m: CylinderMovementRow }) {
  if (m.jobId) {
    return (
      <Link href={`/jobs/${m.jobId}`} className="text-fjord-700 underline">
        {JOB_KIND_LABELS[m.jobKind as JobKind] ?? "Job"} on {m.applianceTag}
      </Link>
    );
  }
  if (m.reclaimShipmentId) return <span>Shipment to {m.reclaimerName ?? "a reclaimer"}</span>;
  return (
    <span className="text-ink-600">{m.jobKind ? `${JOB_KIND_LABELS[m.jobKind as JobKind] ?? "A job"} (not one you may open)` : "—"}</span>
  );
}

export function CylinderDetail({ id, saved }: { id: string; saved?: string }) {
  const [selected, setSelected] = useState<{ mode: "amend" | "void"; weighing: CylinderWeighingRow } | null>(null);
  const query = useQuery({
    queryKey: ["cylinder", id],
    queryFn: () => fetchJson<CylinderResponse>(`/api/cylinders/${encodeURIComponent(id)}`),
    retry: false,
  });
  const data = query.data;
  const c = data?.cylinder;
  const canUpdate = data?.permissions.update ?? false;

  const weighingColumns = useMemo(() => {
    const helper = serverColumnHelper<CylinderWeighingRow>();
    const unit = c?.massUnit ?? "lb_oz";
    return helper.columns([
      helper.accessor("weighedOn", {
        id: "weighedOn",
        header: "Date",
        cell: (i) => <span className="tabular whitespace-nowrap">{i.getValue()}</span>,
      }),
      helper.accessor("grossG", {
        id: "gross",
        header: "Scale reading",
        cell: (i) => <span className="tabular whitespace-nowrap">{formatMass(i.getValue(), unit)}</span>,
      }),
      helper.accessor("netG", {
        id: "net",
        header: "Net",
        cell: (i) => (
          <span className="tabular whitespace-nowrap">
            {formatMass(i.getValue(), unit)} {i.row.original.refrigerant ?? ""}
          </span>
        ),
      }),
      helper.display({
        id: "pt",
        header: "Pressure / temperature",
        cell: (i) => {
          const w = i.row.original;
          if (w.pressurePsig === null && w.temperatureC === null) return <span className="text-ink-600">—</span>;
          return (
            <span className="tabular whitespace-nowrap">
              {w.pressurePsig ?? "—"} psig · {temperatureText(w, unit)}
            </span>
          );
        },
      }),
      helper.accessor("weighedByName", { id: "by", header: "By" }),
      helper.display({ id: "state", header: "Record", cell: (i) => <WeighingState w={i.row.original} /> }),
      helper.display({
        id: "actions",
        header: () => <span className="sr-only">Actions</span>,
        cell: (i) => (
          <WeighingActions w={i.row.original} canUpdate={canUpdate} onSelect={(mode, weighing) => setSelected({ mode, weighing })} />
        ),
      }),
    ]);
  }, [c?.massUnit, canUpdate]);

  const movementColumns = useMemo(() => {
    const helper = serverColumnHelper<CylinderMovementRow>();
    const unit = c?.massUnit ?? "lb_oz";
    return helper.columns([
      helper.accessor("movedOn", {
        id: "movedOn",
        header: "Date",
        cell: (i) => <span className="tabular whitespace-nowrap">{i.getValue()}</span>,
      }),
      helper.accessor("direction", { id: "direction", header: "What", cell: (i) => MOVEMENT_WORDS[i.getValue()]?.words ?? i.getValue() }),
      helper.accessor("massG", {
        id: "mass",
        header: "Amount",
        cell: (i) => (
          <span className="tabular whitespace-nowrap">
            {MOVEMENT_WORDS[i.row.original.direction]?.sign ?? ""} {formatMass(i.getValue(), unit)} {i.row.original.refrigerant}
          </span>
        ),
      }),
      helper.display({ id: "record", header: "Record", cell: (i) => <MovementRecord m={i.row.original} /> }),
    ]);
  }, [c?.massUnit]);

  if (query.isLoading) return <p className="text-ink-600">Loading the cylinder…</p>;
  if (query.isError || !data || !c) {
    return <LoadError error={query.error} noun="cylinder" back={{ href: "/cylinders", label: "Back to cylinders" }} />;
  }
  const { amendments, activity } = data;
  const difference = c.lastWeighing && c.netSource === "weighing" ? c.lastWeighing.netG - c.recordedContentsG : null;

  return (
    <article className="space-y-5">
      <Link href="/cylinders" className="text-sm text-fjord-700 underline">
        ← All cylinders
      </Link>
      {saved && (
        <Notice>
          {saved === "created"
            ? "Cylinder added to the register. It starts empty: record a weighing to set its contents."
            : "Changes saved."}
        </Notice>
      )}
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm font-medium uppercase tracking-wide text-ink-600">
            {REGISTER_LABELS.cylinderPurpose[c.purpose]} cylinder · {c.branchName}
          </p>
          <h1 className="text-2xl font-semibold text-ink-950">
            {c.serial}
            {c.specification && <span className="font-normal text-ink-700"> · {c.specification}</span>}
          </h1>
          <p className="mt-1 flex flex-wrap items-center gap-3">
            <StatusBadge kind="cylinder" status={c.status} />
            <RequalificationBadge {...c.requalification} />
          </p>
          {c.unregistered && (
            <p className="mt-1 text-sm font-medium text-sev-major">
              <span aria-hidden="true">⚠ </span>A job named this cylinder but it was never registered.
            </p>
          )}
        </div>
        {canUpdate && (
          <Link href={`/cylinders/${c.id}/edit`} className={buttonSecondary}>
            Edit
          </Link>
        )}
      </header>

      <CylinderCautions />

      <div className="grid gap-5 lg:grid-cols-2">
        <FillGauge netG={c.netG} fill={c.fill} massUnit={c.massUnit} />
        <section aria-labelledby="contents-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="contents">
          <h2 id="contents-h" className="text-lg font-semibold text-ink-950">
            Contents
          </h2>
          <dl className="divide-y divide-ink-100">
            <DetailRow label="Holds now">
              <span className="tabular font-medium" data-testid="net-contents">
                {c.netG > 0 ? `${formatMass(c.netG, c.massUnit)} ${c.refrigerant ?? ""}` : "Empty"}
              </span>
              <span className="block text-sm text-ink-600">
                {c.netSource === "weighing" && c.lastWeighing
                  ? `From the weighing of ${c.lastWeighing.on}`
                  : "From the recorded fills, draws and shipments"}
              </span>
            </DetailRow>
            <DetailRow label="By the records">
              <span className="tabular">{formatMass(c.recordedContentsG, c.massUnit)}</span>
              {c.lastMovementOn && <span className="block text-sm text-ink-600">last movement {c.lastMovementOn}</span>}
            </DetailRow>
            <DetailRow label="Last weighing">
              {c.lastWeighing ? (
                <>
                  <span className="tabular">
                    {formatMass(c.lastWeighing.netG, c.massUnit)} net on {c.lastWeighing.on}
                  </span>
                  {difference !== null && difference !== 0 && (
                    <span className="block text-sm text-sev-minor">
                      <span aria-hidden="true">◑ </span>
                      {formatMass(Math.abs(difference), c.massUnit)} {difference > 0 ? "more" : "less"} than the records
                    </span>
                  )}
                </>
              ) : (
                "Never weighed"
              )}
            </DetailRow>
          </dl>
        </section>
      </div>

      <div className="grid gap-5 lg:grid-cols-2">
        <section aria-labelledby="requal-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="requalification">
          <h2 id="requal-h" className="text-lg font-semibold text-ink-950">
            Requalification
          </h2>
          <dl className="divide-y divide-ink-100">
            <DetailRow label="Last requalified">{c.lastRequalifiedOn ?? "Not on record"}</DetailRow>
            <DetailRow label="Next due">
              <span className="tabular" data-testid="requalification-due">
                {c.requalification.dueOn ?? "Unknown"}
              </span>
              <span className="block text-sm text-ink-600">
                Every {c.requalification.years} years (49 CFR 180.209; organisation setting)
              </span>
            </DetailRow>
            <DetailRow label="Today">
              <RequalificationBadge {...c.requalification} />
            </DetailRow>
          </dl>
        </section>
        <section aria-labelledby="stamp-h" className="rounded-lg border border-ink-200 bg-white p-4">
          <h2 id="stamp-h" className="text-lg font-semibold text-ink-950">
            Stamped figures
          </h2>
          <dl className="divide-y divide-ink-100">
            <DetailRow label="Water capacity">
              <span className="tabular">{formatMass(c.waterCapacityG, c.massUnit)}</span>
            </DetailRow>
            <DetailRow label="Tare weight">
              <span className="tabular">{formatMass(c.tareG, c.massUnit)}</span>
            </DetailRow>
            <DetailRow label="Specification">{c.specification ?? "—"}</DetailRow>
            <DetailRow label="Manufactured">{c.manufacturedOn ?? "—"}</DetailRow>
          </dl>
        </section>
      </div>

      {canUpdate && !selected && <WeighingForm cylinder={c} />}
      {canUpdate && selected?.mode === "amend" && (
        <WeighingForm key={selected.weighing.id} cylinder={c} amend={selected.weighing} onDone={() => setSelected(null)} />
      )}
      {canUpdate && selected?.mode === "void" && (
        <VoidWeighing cylinderId={c.id} weighing={selected.weighing} onDone={() => setSelected(null)} />
      )}

      <section aria-labelledby="weighings-h" className="space-y-2">
        <h2 id="weighings-h" className="text-lg font-semibold text-ink-950">
          Weighings
        </h2>
        <DataTable
          label="Weighings"
          url={`/api/cylinders/${c.id}/weighings`}
          queryKey="cylinder-weighings"
          columns={weighingColumns}
          defaultSort={null}
          initialPageSize={10}
          noun="weighings"
          emptyText="This cylinder has not been weighed."
          rowTestId="weighing-row"
          renderCard={(w) => (
            <div className={`rounded-lg border border-ink-200 bg-white px-4 py-3 text-sm ${w.voidedAt ? "opacity-70" : ""}`}>
              <p className="flex justify-between gap-2">
                <span className="font-semibold tabular">{w.weighedOn}</span>
                <span className="text-ink-600">{w.weighedByName}</span>
              </p>
              <p className="tabular">
                Scale {formatMass(w.grossG, c.massUnit)} · net <strong>{formatMass(w.netG, c.massUnit)}</strong> {w.refrigerant ?? ""}
              </p>
              {(w.pressurePsig !== null || w.temperatureC !== null) && (
                <p className="tabular text-ink-700">
                  {w.pressurePsig ?? "—"} psig · {temperatureText(w, c.massUnit)}
                </p>
              )}
              <WeighingState w={w} />
              <div className="mt-2">
                <WeighingActions w={w} canUpdate={canUpdate} onSelect={(mode, weighing) => setSelected({ mode, weighing })} />
              </div>
            </div>
          )}
          pager="pages-when-needed"
        />
      </section>

      <section aria-labelledby="movements-h" className="space-y-2">
        <h2 id="movements-h" className="text-lg font-semibold text-ink-950">
          Fills, draws and shipments
        </h2>
        <DataTable
          label="Refrigerant in and out"
          url={`/api/cylinders/${c.id}/movements`}
          queryKey="cylinder-movements"
          columns={movementColumns}
          defaultSort={null}
          initialPageSize={10}
          noun="movements"
          emptyText="Nothing has gone into or out of this cylinder."
          rowTestId="movement-row"
          renderCard={(m) => (
            <div className="rounded-lg border border-ink-200 bg-white px-4 py-3 text-sm">
              <p className="flex justify-between gap-2">
                <span className="font-semibold">{MOVEMENT_WORDS[m.direction]?.words ?? m.direction}</span>
                <span className="tabular text-ink-600">{m.movedOn}</span>
              </p>
              <p className="tabular">
                {MOVEMENT_WORDS[m.direction]?.sign ?? ""} {formatMass(m.massG, c.massUnit)} {m.refrigerant}
              </p>
              <MovementRecord m={m} />
            </div>
          )}
          pager="pages-when-needed"
        />
      </section>

      <AmendmentsPanel
        amendments={amendments.map((a) => ({
          ...a,
          subjectLabel: a.subjectType === "CylinderWeighing" ? `Weighing no. ${a.subjectId}` : "Cylinder",
        }))}
        massUnit={c.massUnit}
      />
      {activity && <ActivityPanel activity={activity} />}
    </article>
  );
}
