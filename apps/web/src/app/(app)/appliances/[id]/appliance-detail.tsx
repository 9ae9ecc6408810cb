"use client";

import Link from "next/link";
import { useId, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import {
  APPLIANCE_CATEGORY_LABELS,
  APPLIANCE_STATUSES,
  CERTIFICATION_TYPE_LABELS,
  JOB_KIND_LABELS,
  REGISTER_LABELS,
  applianceStatusInput,
  formatMass,
  getRefrigerant,
  type JobKind,
} from "@coldtrail/core";
import type { AmendmentRecord, ApplianceJobRow, ApplianceLeakReview, ApplianceRow, RegisterActivity } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { DetailRow, LoadError } from "@/components/detail";
import { Notice } from "@/components/form";
import { saveErrorMessage } from "@/lib/client/form-save";
import { DataTable, serverColumnHelper } from "@/components/data-table";
import { DueBadge, StatusBadge } from "@/components/registers/badges";
import { ActivityPanel, AmendmentsPanel } from "@/components/registers/history-panels";
import { LeakRateChart } from "@/components/registers/leak-rate-chart";
import { Field, FormAlert, buttonPrimary, buttonSecondary, describedBy, inputClass, selectClass } from "@/components/registers/form-fields";
import { PRESSURE_CLASS_WORDS, todayIn } from "@/components/registers/words";

interface ApplianceResponse {
  appliance: ApplianceRow;
  leaks: ApplianceLeakReview;
  amendments: AmendmentRecord[];
  activity: RegisterActivity[] | null;
  permissions: { update: boolean; readActivity: boolean };
}

const DIRECTION_WORDS: Record<string, string> = {
  recovered_into_cylinder: "Recovered into",
  charged_from_cylinder: "Charged from",
  charged_from_stock: "Charged from stock",
};

function MovedLines({ j, massUnit }: { j: ApplianceJobRow; massUnit: ApplianceRow["massUnit"] }) {
  if (j.movements.length === 0) {
    if (j.kind === "verification_test")
      return (
        <span>
          {j.verificationStage === "follow_up" ? "Follow-up" : "Initial"} test: {j.verificationPassed ? "✓ passed" : "✕ failed"}
        </span>
      );
    return <span className="text-ink-600">No refrigerant moved</span>;
  }
  return (
    <ul>
      {j.movements.map((m, n) => (
        <li key={n} className="tabular">
          {DIRECTION_WORDS[m.direction] ?? m.direction}
          {m.cylinderSerial ? ` cylinder ${m.cylinderSerial}` : ""}: {formatMass(m.massG, massUnit)} {m.refrigerant}
        </li>
      ))}
      {j.additionExclusion && <li className="text-xs text-ink-600">Not counted in the leak rate ({j.additionExclusion})</li>}
    </ul>
  );
}

function JobCard({ j, massUnit }: { j: ApplianceJobRow; massUnit: ApplianceRow["massUnit"] }) {
  return (
    <div className="rounded-lg border border-ink-200 bg-white px-4 py-3 text-sm">
      <p className="flex justify-between gap-2">
        <Link href={`/jobs/${j.id}`} className="font-semibold text-fjord-700 underline-offset-2 hover:underline">
          {JOB_KIND_LABELS[j.kind as JobKind] ?? j.kind}
        </Link>
        <span className="tabular text-ink-600">{j.performedOn}</span>
      </p>
      <p className="text-ink-700">{j.technicianName}</p>
      <MovedLines j={j} massUnit={massUnit} />
    </div>
  );
}

function historyColumns(massUnit: ApplianceRow["massUnit"]) {
  const helper = serverColumnHelper<ApplianceJobRow>();
  return helper.columns([
    helper.accessor("performedOn", {
      id: "performedOn",
      header: "Date",
      cell: (i) => <span className="tabular whitespace-nowrap">{i.getValue()}</span>,
    }),
    helper.accessor("kind", {
      id: "kind",
      header: "Job",
      cell: (i) => (
        <Link href={`/jobs/${i.row.original.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
          {JOB_KIND_LABELS[i.getValue() as JobKind] ?? i.getValue()}
        </Link>
      ),
    }),
    helper.accessor("technicianName", { id: "technician", header: "Technician" }),
    helper.display({ id: "moved", header: "Refrigerant moved", cell: (i) => <MovedLines j={i.row.original} massUnit={massUnit} /> }),
  ]);
}

type StatusIn = z.input<typeof applianceStatusInput>;
type StatusOut = z.output<typeof applianceStatusInput>;

function StatusChange({ appliance, onDone }: { appliance: ApplianceRow; onDone: () => void }) {
  const uid = useId();
  const queryClient = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<StatusIn, unknown, StatusOut>({
    resolver: zodResolver(applianceStatusInput),
    defaultValues: { status: appliance.status === "in_service" ? "retired" : "in_service", on: todayIn(appliance.timeZone), reason: "" },
  });
  const errors = form.formState.errors;
  const save = useMutation({
    mutationFn: (values: StatusOut) =>
      fetchJson(`/api/appliances/${appliance.id}/status`, { method: "POST", body: JSON.stringify(values) }),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: ["appliance", String(appliance.id)] });
      await queryClient.invalidateQueries({ queryKey: ["appliances"] });
      onDone();
    },
    onError: (e) => {
      setFormError(saveErrorMessage(e, form.setError, "The change could not be sent; nothing was saved."));
    },
  });
  const f = (n: string) => `${uid}-${n}`;
  return (
    <form
      noValidate
      onSubmit={form.handleSubmit((v) => save.mutate(v))}
      className="space-y-3 rounded-lg border border-ink-200 bg-white p-4"
      aria-label="Change the status"
      data-testid="status-form"
    >
      <FormAlert message={formError} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id={f("status")} label="New status" error={errors.status?.message}>
          <select id={f("status")} {...form.register("status")} className={selectClass}>
            {APPLIANCE_STATUSES.filter((s) => s !== appliance.status).map((s) => (
              <option key={s} value={s}>
                {REGISTER_LABELS.applianceStatus[s]}
              </option>
            ))}
          </select>
        </Field>
        <Field id={f("on")} label="On" error={errors.on?.message}>
          <input
            id={f("on")}
            type="date"
            {...form.register("on")}
            className={inputClass}
            aria-invalid={errors.on ? true : undefined}
            aria-describedby={describedBy(f("on"), { error: errors.on?.message })}
          />
        </Field>
      </div>
      <Field id={f("reason")} label="Why" error={errors.reason?.message}>
        <textarea
          id={f("reason")}
          rows={2}
          {...form.register("reason")}
          className={inputClass}
          aria-invalid={errors.reason ? true : undefined}
          aria-describedby={describedBy(f("reason"), { error: errors.reason?.message })}
        />
      </Field>
      <div className="flex gap-2">
        <button type="submit" className={buttonPrimary} disabled={save.isPending}>
          {save.isPending ? "Saving…" : "Change status"}
        </button>
        <button type="button" className={buttonSecondary} onClick={onDone}>
          Cancel
        </button>
      </div>
    </form>
  );
}

export function ApplianceDetail({ id, saved }: { id: string; saved?: string }) {
  const [changingStatus, setChangingStatus] = useState(false);
  const query = useQuery({
    queryKey: ["appliance", id],
    queryFn: () => fetchJson<ApplianceResponse>(`/api/appliances/${encodeURIComponent(id)}`),
    retry: false,
  });
  if (query.isLoading) return <p className="text-ink-600">Loading the appliance…</p>;
  if (query.isError) {
    return <LoadError error={query.error} noun="appliance" back={{ href: "/appliances", label: "Back to appliances" }} />;
  }
  const { appliance: a, leaks, amendments, activity, permissions } = query.data!;
  const refrigerant = getRefrigerant(a.refrigerant);
  return (
    <article className="space-y-5">
      <Link href="/appliances" className="text-sm text-fjord-700 underline">
        ← All appliances
      </Link>
      {saved && <Notice>{saved === "created" ? "Appliance added to the register." : "Changes saved."}</Notice>}
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm font-medium uppercase tracking-wide text-ink-600">
            {APPLIANCE_CATEGORY_LABELS[a.category]} · {a.branchName}
          </p>
          <h1 className="text-2xl font-semibold text-ink-950">
            {a.tag} <span className="font-normal text-ink-700">— {a.description}</span>
          </h1>
          <p className="text-ink-700">
            {a.siteName}
            {a.customerName && a.customerName !== a.siteName && ` · ${a.customerName}`}
            {a.siteAddress && <span className="text-ink-600"> · {a.siteAddress}</span>}
          </p>
          <p className="mt-1">
            <StatusBadge kind="appliance" status={a.status} />
            {a.retiredOn && a.status !== "in_service" && <span className="text-sm text-ink-600"> · retired {a.retiredOn}</span>}
            {a.disposedOn && a.status === "disposed" && <span className="text-sm text-ink-600"> · disposed of {a.disposedOn}</span>}
          </p>
        </div>
        {permissions.update && (
          <div className="flex flex-wrap gap-2">
            <Link href={`/appliances/${a.id}/edit`} className={buttonSecondary}>
              Edit
            </Link>
            {!changingStatus && (
              <button type="button" className={buttonSecondary} onClick={() => setChangingStatus(true)}>
                Change status
              </button>
            )}
          </div>
        )}
      </header>
      {changingStatus && <StatusChange appliance={a} onDone={() => setChangingStatus(false)} />}

      <div className="grid gap-5 lg:grid-cols-2">
        <section aria-labelledby="derived-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="derived">
          <h2 id="derived-h" className="text-lg font-semibold text-ink-950">
            What the rules derive
          </h2>
          <dl className="divide-y divide-ink-100">
            <DetailRow label="Refrigerant">
              {a.refrigerant}
              {refrigerant && <span className="text-ink-600"> · safety group {refrigerant.safetyGroup}</span>}
            </DetailRow>
            <DetailRow label="Pressure class">{a.pressureClass ? PRESSURE_CLASS_WORDS[a.pressureClass] : "Unknown"}</DetailRow>
            <DetailRow label="Small appliance">{a.smallAppliance ? "Yes: factory sealed with 5 lb or less" : "No"}</DetailRow>
            <DetailRow label="Certification needed">
              <span data-testid="certification-needed">
                {a.certificationTypes.map((t) => CERTIFICATION_TYPE_LABELS[t]).join(" or ") || "—"}
              </span>
            </DetailRow>
            <DetailRow label="Leak repair rules">
              {leaks.coverage.regime ? (
                <span>
                  Apply: {leaks.coverage.reason} <span className="text-ink-600">({leaks.coverage.citation})</span>
                </span>
              ) : (
                <span>Do not apply: {leaks.coverage.reason}</span>
              )}
            </DetailRow>
          </dl>
        </section>
        <section aria-labelledby="register-h" className="rounded-lg border border-ink-200 bg-white p-4">
          <h2 id="register-h" className="text-lg font-semibold text-ink-950">
            Register entry
          </h2>
          <dl className="divide-y divide-ink-100">
            <DetailRow label="Full charge">
              <span className="tabular" data-testid="full-charge">
                {formatMass(a.fullChargeG, a.massUnit)}
              </span>
              <span className="block text-sm text-ink-600">{REGISTER_LABELS.fullChargeMethod[a.fullChargeMethod]}</span>
            </DetailRow>
            <DetailRow label="Factory sealed">{a.factorySealed ? "Yes" : "No"}</DetailRow>
            <DetailRow label="Leak detection">{a.hasLeakDetection ? "Fitted" : "None"}</DetailRow>
            <DetailRow label="Make and model">{a.makeModel ?? "—"}</DetailRow>
            <DetailRow label="Serial number">{a.serialNumber ?? "—"}</DetailRow>
            <DetailRow label="Manufactured">{a.manufacturedOn ?? "—"}</DetailRow>
            <DetailRow label="Installed">{a.installedOn ?? "—"}</DetailRow>
          </dl>
        </section>
      </div>

      <section aria-labelledby="deadlines-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="deadlines">
        <h2 id="deadlines-h" className="text-lg font-semibold text-ink-950">
          Open deadlines
        </h2>
        {leaks.deadlines.length === 0 ? (
          <p className="mt-1 text-sm text-ink-700">
            <span aria-hidden="true">✓ </span>No leak-repair deadline is open on this appliance.
          </p>
        ) : (
          <ul className="mt-2 space-y-3">
            {leaks.deadlines.map((d) => (
              <li key={`${d.kind}-${d.dueOn}`} className="space-y-1" data-testid="deadline">
                <DueBadge dueOn={d.dueOn} state={d.state} today={leaks.today} />
                <p className="text-sm">{d.text}</p>
                <p className="text-xs text-ink-600">{d.citation}</p>
              </li>
            ))}
          </ul>
        )}
      </section>

      <LeakRateChart events={leaks.events} massUnit={a.massUnit} method={leaks.method} />

      <section aria-labelledby="history-h" className="space-y-2">
        <h2 id="history-h" className="text-lg font-semibold text-ink-950">
          Refrigerant history
        </h2>
        <p className="text-sm text-ink-600">Jobs on this appliance you may see, newest first, with the refrigerant each moved.</p>
        <DataTable
          label="Jobs on this appliance"
          url={`/api/appliances/${a.id}/history`}
          queryKey="appliance-history"
          columns={historyColumns(a.massUnit)}
          defaultSort={null}
          initialPageSize={10}
          noun="jobs"
          emptyText="No jobs recorded on this appliance."
          rowTestId="appliance-job"
          renderCard={(j) => <JobCard j={j} massUnit={a.massUnit} />}
          pager="pages-when-needed"
        />
      </section>

      <AmendmentsPanel amendments={[...amendments].reverse()} massUnit={a.massUnit} title="Corrections and status changes" />
      {activity && <ActivityPanel activity={activity} />}
    </article>
  );
}
