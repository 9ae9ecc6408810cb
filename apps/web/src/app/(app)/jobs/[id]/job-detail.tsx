"use client";

import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { subject } from "@casl/ability";
import {
  formatEnteredAmount,
  ACCESS_METHOD_LABELS,
  ACCESS_METHODS,
  ADDITION_EXCLUSION_LABELS,
  ADDITION_EXCLUSIONS,
  APPLIANCE_CATEGORY_LABELS,
  EVACUATION_UNIT_LABELS,
  EVACUATION_UNITS,
  JOB_KIND_LABELS,
  VERIFICATION_STAGE_LABELS,
  VERIFICATION_STAGES,
  formatLeakPercent,
  formatMass,
  type LeakRateVerdict,
} from "@coldtrail/core";
import { fetchJson } from "@/lib/client/fetch-json";
import { DetailRow, LoadError } from "@/components/detail";
import type { CylinderOption, EquipmentOption, JobDetail as Job } from "@/lib/client/types";
import { useAbility } from "@/components/providers";
import { SavedNotice } from "../_components/form-bits";
import { JobFindings } from "./job-findings";
import { AmendPanel, AmendmentHistory, VoidPanel, VoidedBanner, type AmendField } from "../_components/record-history";

/** Plain words for the job's fields in its correction history. */
const FIELD_WORDS: Record<string, string> = {
  performed_on: "Date of the work",
  recovered_g: "Amount recovered",
  charged_g: "Amount added",
  cylinder_id: "Cylinder",
  equipment_id: "Recovery equipment",
  evacuation_value: "Evacuation level",
  evacuation_unit: "Evacuation unit",
  access_method: "Access",
  temporary_access_removed: "Temporary device removed",
  compressor_operating: "Compressor running",
  addition_exclusion: "Left out of the leak rate",
  leak_location: "Leak location",
  repair_description: "Repair",
  shutdown_needed: "Industrial shutdown needed",
  verification_stage: "Test",
  verification_passed: "Test passed",
  verification_method: "Test method",
  notes: "Notes",
};
const VALUE_WORDS: Record<string, Record<string, string>> = {
  evacuation_unit: EVACUATION_UNIT_LABELS,
  access_method: ACCESS_METHOD_LABELS,
  addition_exclusion: ADDITION_EXCLUSION_LABELS,
  verification_stage: VERIFICATION_STAGE_LABELS,
};

function headline(j: Job): string {
  const g = j.kind === "charge" ? j.chargedG : j.recoveredG;
  const mass = formatMass(g, j.branchMassUnit);
  switch (j.kind) {
    case "recovery":
      return `Recovered ${mass} ${j.refrigerant ?? ""} from ${j.applianceTag}${j.cylinderSerial ? ` into cylinder ${j.cylinderSerial}` : ""}`;
    case "disposal":
      return `Disposed of ${j.applianceTag}: ${mass} ${j.refrigerant ?? ""} recovered${j.cylinderSerial ? ` into cylinder ${j.cylinderSerial}` : ""}`;
    case "charge":
      return `Added ${mass} ${j.refrigerant ?? ""} to ${j.applianceTag}${j.chargeSource === "cylinder" && j.cylinderSerial ? ` from cylinder ${j.cylinderSerial}` : ""}`;
    case "leak_repair":
      return `Repaired a leak on ${j.applianceTag}`;
    case "verification_test":
      return `${j.verificationStage === "follow_up" ? "Follow-up" : "Initial"} verification test ${j.verificationPassed ? "passed" : "failed"} on ${j.applianceTag}`;
  }
}

/** The leak rate a charge gave, in a number, a word and an icon. */
function LeakRatePanel({ leak }: { leak: LeakRateVerdict }) {
  const tone = leak.exceeds
    ? "border-sev-critical/50 bg-red-50"
    : leak.percent === null
      ? "border-ink-300 bg-ink-50"
      : "border-ok/40 bg-green-50";
  const word = leak.exceeds
    ? "Over the threshold"
    : leak.excluded
      ? "Not counted"
      : leak.covered
        ? "Under the threshold"
        : leak.percent === null
          ? "Not calculated"
          : "No threshold applies";
  const icon = leak.exceeds ? "⚠" : leak.covered && leak.percent !== null ? "✓" : "ⓘ";
  return (
    <section aria-labelledby="leak-h" className={`rounded-lg border-2 p-4 ${tone}`} data-testid="leak-rate">
      <h2 id="leak-h" className="text-sm font-semibold uppercase tracking-wide text-ink-700">
        Leak rate with this addition
      </h2>
      <p className="mt-1 flex flex-wrap items-baseline gap-x-3 gap-y-1">
        <span className="tabular whitespace-nowrap text-4xl font-bold text-ink-950">
          {leak.percent === null ? "—" : formatLeakPercent(leak.percent)}
        </span>
        <span className="font-semibold text-ink-900">
          <span aria-hidden="true">{icon} </span>
          {word}
          {leak.threshold !== null && ` (${leak.threshold} %)`}
        </span>
      </p>
      <p className="mt-1 text-ink-800">{leak.reason}.</p>
      <p className="mt-1 text-xs text-ink-600">
        Method: {leak.method === "annualizing" ? "annualizing" : "rolling average"} (40 CFR 82.152; the company uses one method for every
        appliance).
      </p>
    </section>
  );
}

export function JobDetail({ id, saved }: { id: string; saved: boolean }) {
  const ability = useAbility();
  const job = useQuery({ queryKey: ["job", id], queryFn: () => fetchJson<Job>(`/api/jobs/${encodeURIComponent(id)}`), retry: false });
  const j = job.data;
  const recovering = j?.kind === "recovery" || j?.kind === "disposal";
  const usesCylinder = recovering || j?.chargeSource === "cylinder";
  const cylinders = useQuery({
    queryKey: ["lookup-cylinders", j?.branchId],
    queryFn: () => fetchJson<{ rows: CylinderOption[] }>(`/api/lookup/cylinders?branchId=${j!.branchId}`),
    enabled: Boolean(j && usesCylinder && !j.voidedAt),
  });
  const equipment = useQuery({
    queryKey: ["lookup-equipment", j?.branchId],
    queryFn: () => fetchJson<{ rows: EquipmentOption[] }>(`/api/lookup/equipment?branchId=${j!.branchId}`),
    enabled: Boolean(j && recovering && !j.voidedAt),
  });

  if (job.isLoading) return <p className="text-ink-600">Loading the job…</p>;
  if (job.isError || !j) {
    return <LoadError error={job.error} noun="job" back={{ href: "/jobs", label: "Back to jobs" }} />;
  }

  const record = subject("Job", {
    organisationId: j.organisationId,
    branchId: j.branchId,
    technicianId: j.technicianId,
    performedOn: j.performedOn,
  });
  const canAmend = !j.voidedAt && ability.can("update", record);
  const canVoid = !j.voidedAt && ability.can("void", record);
  const g = j.kind === "charge" ? j.chargedG : j.recoveredG;
  const small = j.applianceCategory === "small_appliance";
  const massField: AmendField = {
    name: "amount",
    label: j.kind === "charge" ? "Amount added" : "Amount recovered",
    type: "mass",
    value: g,
    unitField: "amountUnit",
    massUnit: j.branchMassUnit,
    entered: j.enteredAmount,
  };

  const fields: AmendField[] = [{ name: "performedOn", label: "Date of the work", type: "date", value: j.performedOn }];
  if (recovering || j.kind === "charge") fields.push(massField);
  if (usesCylinder) {
    const options = (cylinders.data?.rows ?? []).map((c) => ({
      value: String(c.id),
      label: `${c.serial}${c.refrigerant ? ` — holds ${formatMass(c.contentsG, j.branchMassUnit)} ${c.refrigerant}` : " — empty"}`,
    }));
    if (j.cylinderId !== null && !options.some((o) => o.value === String(j.cylinderId)))
      options.unshift({ value: String(j.cylinderId), label: j.cylinderSerial ?? `#${j.cylinderId}` });
    fields.push({
      name: "cylinderId",
      label: "Cylinder",
      type: "select",
      value: j.cylinderId === null ? null : String(j.cylinderId),
      options,
      numeric: true,
    });
  }
  if (recovering) {
    const options = (equipment.data?.rows ?? []).map((e) => ({
      value: String(e.id),
      label: `${e.serial}${e.makeModel ? ` — ${e.makeModel}` : ""}`,
    }));
    if (j.equipmentId !== null && !options.some((o) => o.value === String(j.equipmentId)))
      options.unshift({ value: String(j.equipmentId), label: j.equipmentSerial ?? `#${j.equipmentId}` });
    fields.push(
      {
        name: "equipmentId",
        label: "Recovery equipment",
        type: "select",
        value: j.equipmentId === null ? null : String(j.equipmentId),
        options,
        numeric: true,
      },
      { name: "evacuationValue", label: "Evacuation level reached", type: "number", value: j.evacuationValue },
      {
        name: "evacuationUnit",
        label: "Unit of the evacuation level",
        type: "select",
        value: j.evacuationUnit,
        options: EVACUATION_UNITS.map((u) => ({ value: u, label: EVACUATION_UNIT_LABELS[u] })),
      },
    );
  }
  if (j.kind !== "verification_test") {
    fields.push(
      {
        name: "accessMethod",
        label: "How the circuit was accessed",
        type: "select",
        value: j.accessMethod,
        options: ACCESS_METHODS.map((m) => ({ value: m, label: ACCESS_METHOD_LABELS[m] })),
        ...(recovering ? {} : { allowEmpty: "Not recorded" }),
      },
      { name: "temporaryAccessRemoved", label: "Temporary piercing device removed?", type: "yesno", value: j.temporaryAccessRemoved },
    );
  }
  if (recovering && small)
    fields.push({ name: "compressorOperating", label: "Compressor running during recovery?", type: "yesno", value: j.compressorOperating });
  if (j.kind === "charge") {
    fields.push({
      name: "additionExclusion",
      label: "Left out of the leak rate",
      type: "select",
      value: j.additionExclusion,
      allowEmpty: "No, it counts",
      options: ADDITION_EXCLUSIONS.map((x) => ({ value: x, label: ADDITION_EXCLUSION_LABELS[x] })),
    });
  }
  if (j.kind === "leak_repair") {
    fields.push(
      { name: "leakLocation", label: "Where the leak was", type: "text", value: j.leakLocation },
      { name: "repairDescription", label: "What was repaired", type: "textarea", value: j.repairDescription },
      { name: "shutdownNeeded", label: "Industrial-process shutdown needed?", type: "yesno", value: j.shutdownNeeded },
    );
  }
  if (j.kind === "verification_test") {
    fields.push(
      {
        name: "verificationStage",
        label: "Which test",
        type: "select",
        value: j.verificationStage,
        options: VERIFICATION_STAGES.map((s) => ({ value: s, label: VERIFICATION_STAGE_LABELS[s] })),
      },
      { name: "verificationPassed", label: "Did the repair pass?", type: "yesno", value: j.verificationPassed },
      { name: "verificationMethod", label: "How it was tested", type: "text", value: j.verificationMethod },
    );
  }
  fields.push({ name: "notes", label: "Notes", type: "textarea", value: j.notes });

  return (
    <article className="mx-auto max-w-2xl space-y-4">
      <Link href="/jobs" className="text-sm text-fjord-700 underline">
        ← All jobs
      </Link>
      {saved && <SavedNotice>Job saved.</SavedNotice>}
      <header>
        <p className="text-sm font-medium uppercase tracking-wide text-ink-600">
          {JOB_KIND_LABELS[j.kind]} · {j.performedOn} · job #{j.id}
        </p>
        <h1 className="text-2xl font-semibold text-ink-950">{headline(j)}</h1>
      </header>
      <VoidedBanner at={j.voidedAt} reason={j.voidReason} by={j.voidedByName} />

      {j.leakRate && <LeakRatePanel leak={j.leakRate} />}

      <JobFindings jobId={j.id} saved={saved} />

      {j.kind === "disposal" && !j.voidedAt && (
        <section aria-labelledby="disposal-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="disposal-proof">
          <h2 id="disposal-h" className="text-lg font-semibold text-ink-950">
            {small ? "Signed statement" : "Disposal record"}
          </h2>
          {j.disposalStatementId || j.disposalRecordId ? (
            <p className="mt-1 flex items-center gap-2 text-ok">
              <span aria-hidden="true">✓</span>
              <Link
                className="font-medium underline"
                href={j.disposalStatementId ? `/disposals/statements/${j.disposalStatementId}` : `/disposals/records/${j.disposalRecordId}`}
              >
                {j.disposalStatementId ? "Signed statement on file" : "Disposal record on file"}
              </Link>
            </p>
          ) : (
            <>
              <p className="mt-1 flex items-start gap-2 text-sev-major">
                <span aria-hidden="true">⚠</span>
                <span>
                  {small
                    ? "A small appliance needs a signed statement that its refrigerant was recovered."
                    : "This disposal needs its disposal record."}
                </span>
              </p>
              {ability.can("create", subject("Disposal", { organisationId: j.organisationId, branchId: j.branchId })) && (
                <Link
                  href={`/disposals/new?jobId=${j.id}`}
                  className="mt-2 inline-block rounded-md bg-fjord-600 px-4 py-2.5 font-semibold text-white hover:bg-fjord-700"
                >
                  {small ? "Add the signed statement" : "Add the disposal record"}
                </Link>
              )}
            </>
          )}
        </section>
      )}

      <dl className="divide-y divide-ink-100 rounded-lg border border-ink-200 bg-white px-4">
        <DetailRow layout="stacked" label="Appliance">
          {j.applianceTag} {j.applianceDescription && <span className="text-ink-600">— {j.applianceDescription}</span>}
          <span className="block text-sm text-ink-600">
            {APPLIANCE_CATEGORY_LABELS[j.applianceCategory]} · full charge {formatMass(j.applianceFullChargeG, j.branchMassUnit)} ·{" "}
            {j.siteName}
          </span>
        </DetailRow>
        <DetailRow layout="stacked" label="Branch">
          {j.branchName}
        </DetailRow>
        <DetailRow layout="stacked" label="Technician">
          {j.technicianName}
        </DetailRow>
        {j.refrigerant && (
          <DetailRow layout="stacked" label="Refrigerant">
            {j.refrigerant}
          </DetailRow>
        )}
        {(recovering || j.kind === "charge") && (
          <DetailRow layout="stacked" label={j.kind === "charge" ? "Amount added" : "Amount recovered"}>
            <span className="tabular">{formatMass(g, j.branchMassUnit)}</span>
            {j.enteredAmount && <span className="tabular text-sm text-ink-600"> (entered as {formatEnteredAmount(j.enteredAmount)})</span>}
          </DetailRow>
        )}
        {j.kind === "charge" && (
          <DetailRow layout="stacked" label="From">
            {j.chargeSource === "cylinder" ? `Recovery cylinder ${j.cylinderSerial ?? ""}` : "The branch's stock"}
          </DetailRow>
        )}
        {j.kind === "charge" && j.additionExclusion && (
          <DetailRow layout="stacked" label="Leak rate">
            Left out: {ADDITION_EXCLUSION_LABELS[j.additionExclusion as keyof typeof ADDITION_EXCLUSION_LABELS] ?? j.additionExclusion}
          </DetailRow>
        )}
        {j.kind === "charge" && j.sameLeakAsJobId !== null && (
          <DetailRow layout="stacked" label="Same leak as">
            <Link href={`/jobs/${j.sameLeakAsJobId}`} className="underline">
              Charge job #{j.sameLeakAsJobId}
            </Link>{" "}
            (added together for one leak rate)
          </DetailRow>
        )}
        {recovering && (
          <DetailRow layout="stacked" label="Cylinder">
            {j.cylinderSerial ?? "—"}
          </DetailRow>
        )}
        {recovering && (
          <DetailRow layout="stacked" label="Recovery equipment">
            {j.equipmentSerial ?? "—"}
          </DetailRow>
        )}
        {recovering && (
          <DetailRow layout="stacked" label="Evacuation reached">
            {j.evacuationValue === null || !j.evacuationUnit ? (
              "—"
            ) : (
              <span className="tabular">{`${j.evacuationValue} ${EVACUATION_UNIT_LABELS[j.evacuationUnit]}`}</span>
            )}
          </DetailRow>
        )}
        {j.kind === "leak_repair" && (
          <>
            <DetailRow layout="stacked" label="Leak location">
              {j.leakLocation}
            </DetailRow>
            <DetailRow layout="stacked" label="Repair">
              {j.repairDescription}
            </DetailRow>
            {j.shutdownNeeded !== null && (
              <DetailRow layout="stacked" label="Industrial shutdown">
                {j.shutdownNeeded ? "Needed" : "Not needed"}
              </DetailRow>
            )}
          </>
        )}
        {j.kind === "verification_test" && (
          <>
            <DetailRow layout="stacked" label="Test">
              {j.verificationStage ? VERIFICATION_STAGE_LABELS[j.verificationStage as keyof typeof VERIFICATION_STAGE_LABELS] : "—"}
            </DetailRow>
            <DetailRow layout="stacked" label="Result">
              {j.verificationPassed ? "✓ Passed" : "✕ Failed"}
            </DetailRow>
            <DetailRow layout="stacked" label="Method">
              {j.verificationMethod ?? "—"}
            </DetailRow>
            <DetailRow layout="stacked" label="Repair tested">
              {j.relatedJobId ? (
                <Link className="text-fjord-700 underline" href={`/jobs/${j.relatedJobId}`}>
                  Job #{j.relatedJobId}
                </Link>
              ) : (
                "No repair on record"
              )}
            </DetailRow>
          </>
        )}
        {j.kind !== "verification_test" && (
          <DetailRow layout="stacked" label="Access">
            {j.accessMethod ? ACCESS_METHOD_LABELS[j.accessMethod] : "—"}
            {j.temporaryAccessRemoved === true && <span className="block text-sm">✓ Temporary device removed</span>}
            {j.temporaryAccessRemoved === false && (
              <span className="block text-sm font-medium text-sev-major">⚠ Temporary device left in place</span>
            )}
          </DetailRow>
        )}
        {j.compressorOperating !== null && (
          <DetailRow layout="stacked" label="Compressor">
            {j.compressorOperating ? "Running" : "Not running"}
          </DetailRow>
        )}
        {j.notes && (
          <DetailRow layout="stacked" label="Notes">
            {j.notes}
          </DetailRow>
        )}
        {j.movements.length > 0 && (
          <DetailRow layout="stacked" label="Refrigerant moved">
            <ul className="text-sm">
              {j.movements.map((m) => (
                <li key={m.id} className="tabular">
                  {formatMass(m.massG, j.branchMassUnit)} {m.refrigerant}{" "}
                  {m.direction === "recovered_into_cylinder"
                    ? `into cylinder ${m.cylinderSerial}`
                    : m.direction === "charged_from_cylinder"
                      ? `from cylinder ${m.cylinderSerial}`
                      : "from stock"}{" "}
                  on {m.movedOn}
                </li>
              ))}
            </ul>
          </DetailRow>
        )}
        <DetailRow layout="stacked" label="Recorded">
          {new Date(j.createdAt).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short", timeZone: j.branchTimeZone })} by{" "}
          {j.createdByName}
        </DetailRow>
      </dl>

      {(canAmend || canVoid) && (
        <div className="flex flex-wrap items-start gap-3">
          {canAmend && (
            <AmendPanel url={`/api/jobs/${j.id}`} fields={fields} invalidate={[["job", id], ["jobs"]]} title="Correct this job" />
          )}
          {canVoid && <VoidPanel url={`/api/jobs/${j.id}/void`} invalidate={[["job", id], ["jobs"]]} what="job" />}
        </div>
      )}

      <AmendmentHistory
        amendments={j.amendments}
        fieldWords={FIELD_WORDS}
        massUnit={j.branchMassUnit}
        valueWords={VALUE_WORDS}
        timeZone={j.branchTimeZone}
      />
    </article>
  );
}
