"use client";

import Link from "next/link";
import { useId, useRef, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { EVACUATION_TABLE_1, PRESSURE_CLASSES, SMALL_APPLIANCE_RECOVERY, type EvacuationLevel } from "@coldtrail/core";
import type { AmendmentRecord, EquipmentRow, RegisterActivity } from "@coldtrail/db";
import { ApiError, fetchJson, readApiResponse } from "@/lib/client/fetch-json";
import { DetailRow, LoadError } from "@/components/detail";
import { Notice } from "@/components/form";
import { CertificationBadge, StatusBadge } from "@/components/registers/badges";
import { ActivityPanel, AmendmentsPanel } from "@/components/registers/history-panels";
import { FieldError, buttonPrimary, buttonSecondary, labelClass } from "@/components/registers/form-fields";
import { ERA_WORDS, PRESSURE_CLASS_WORDS, equipmentKind } from "@/components/registers/words";

interface EquipmentResponse {
  equipment: EquipmentRow;
  amendments: AmendmentRecord[];
  activity: RegisterActivity[] | null;
  permissions: { update: boolean; readActivity: boolean };
}

const level = (l: EvacuationLevel) => (l.unit === "mm_hg_abs" ? `${l.value} mm Hg absolute` : `${l.value} in Hg vacuum`);

/** The evacuation levels a unit may be used to claim, by its era (40 CFR 82.156 Table 1 and 82.156(b)). */
function EvacuationClaims({ e }: { e: EquipmentRow }) {
  const small = SMALL_APPLIANCE_RECOVERY[e.era];
  const smallOnly = e.smallApplianceOnly || e.systemDependent;
  return (
    <section aria-labelledby="claims-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="evacuation-claims">
      <h2 id="claims-h" className="text-lg font-semibold text-ink-950">
        Evacuation levels it may be used to claim
      </h2>
      <p className="text-sm text-ink-600">
        {ERA_WORDS[e.era]}: the {e.era === "before_1993_11_15" ? "“before 15 November 1993”" : "“on or after 15 November 1993”"} column of
        40 CFR 82.156.
        {!e.manufacturedOn && " Without a manufacture date the stricter, later column applies."}
        {e.certificationState !== "certified" && (
          <strong className="mt-1 block font-medium text-sev-critical">
            <span aria-hidden="true">⚠ </span>Only certified recovery equipment may be used; recoveries with this unit will be raised in
            audits until its certification is on file.
          </strong>
        )}
      </p>
      <div className="mt-2 overflow-x-auto">
        <table className="min-w-full text-sm">
          <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
            <tr>
              <th scope="col" className="px-2 py-1.5">
                Appliance
              </th>
              <th scope="col" className="px-2 py-1.5">
                Charge under 200 lb
              </th>
              <th scope="col" className="px-2 py-1.5">
                Charge 200 lb or more
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {!smallOnly &&
              [...PRESSURE_CLASSES].reverse().map((pc) => (
                <tr key={pc} data-testid="claim-row">
                  <th scope="row" className="px-2 py-1.5 text-left font-medium">
                    {PRESSURE_CLASS_WORDS[pc]}
                  </th>
                  <td className="px-2 py-1.5 tabular">{level(EVACUATION_TABLE_1[pc].under_200_lb[e.era])}</td>
                  <td className="px-2 py-1.5 tabular">{level(EVACUATION_TABLE_1[pc].at_least_200_lb[e.era])}</td>
                </tr>
              ))}
            <tr data-testid="claim-row">
              <th scope="row" className="px-2 py-1.5 text-left font-medium">
                Small appliance
              </th>
              <td colSpan={2} className="px-2 py-1.5">
                {small.operatingPercent} % of the charge with the compressor running, {small.notOperatingPercent} % without, or{" "}
                {level(SMALL_APPLIANCE_RECOVERY.alternativeVacuum)}
              </td>
            </tr>
          </tbody>
        </table>
      </div>
      {smallOnly && <p className="mt-1 text-sm text-ink-600">This unit is registered for small appliances only.</p>}
      <p className="mt-1 text-xs text-ink-600">Source: 40 CFR 82.156(a) Table 1 and 82.156(b).</p>
    </section>
  );
}

function EvidenceUpload({ e }: { e: EquipmentRow }) {
  const uid = useId();
  const queryClient = useQueryClient();
  const input = useRef<HTMLInputElement>(null);
  const [error, setError] = useState<string | undefined>();
  const [done, setDone] = useState(false);
  const upload = useMutation({
    mutationFn: async (file: File) => {
      const body = new FormData();
      body.set("file", file);
      const res = await fetch(`/api/equipment/${e.id}/evidence`, { method: "POST", body });
      await readApiResponse(res, `Upload failed (${res.status})`);
    },
    onSuccess: async () => {
      setDone(true);
      setError(undefined);
      if (input.current) input.current.value = "";
      await queryClient.invalidateQueries({ queryKey: ["equipment-unit", String(e.id)] });
    },
    onError: (err) => {
      setDone(false);
      setError(err instanceof ApiError ? (err.fieldErrors.file?.[0] ?? err.message) : "The file could not be sent; nothing was saved.");
    },
  });
  return (
    <form
      className="mt-3 space-y-2"
      onSubmit={(ev) => {
        ev.preventDefault();
        const file = input.current?.files?.[0];
        if (!file) {
          setError("Choose a photo or PDF to upload");
          return;
        }
        upload.mutate(file);
      }}
    >
      <label htmlFor={`${uid}-file`} className={labelClass}>
        {e.hasEvidence ? "Replace the evidence" : "Upload the evidence"}
      </label>
      <p id={`${uid}-hint`} className="text-sm text-ink-600">
        A photo of the unit&apos;s certification label or the certificate as PDF (JPEG, PNG, WebP, HEIC or PDF, up to 10 MB).
      </p>
      <input
        id={`${uid}-file`}
        ref={input}
        type="file"
        accept="image/jpeg,image/png,image/webp,image/heic,application/pdf"
        className="block w-full text-sm file:mr-3 file:min-h-11 file:rounded-lg file:border file:border-ink-300 file:bg-white file:px-4 file:font-medium"
        aria-describedby={`${uid}-hint${error ? ` ${uid}-error` : ""}`}
        aria-invalid={error ? true : undefined}
      />
      <FieldError id={`${uid}-error`} message={error} />
      {done && (
        <p role="status" className="text-sm text-ok">
          <span aria-hidden="true">✓ </span>Evidence uploaded.
        </p>
      )}
      <button type="submit" className={buttonPrimary} disabled={upload.isPending}>
        {upload.isPending ? "Uploading…" : "Upload"}
      </button>
    </form>
  );
}

export function EquipmentDetail({ id, saved }: { id: string; saved?: string }) {
  const query = useQuery({
    queryKey: ["equipment-unit", id],
    queryFn: () => fetchJson<EquipmentResponse>(`/api/equipment/${encodeURIComponent(id)}`),
    retry: false,
  });
  if (query.isLoading) return <p className="text-ink-600">Loading the recovery equipment…</p>;
  if (query.isError) {
    return <LoadError error={query.error} noun="recovery equipment" back={{ href: "/equipment", label: "Back to recovery equipment" }} />;
  }
  const { equipment: e, amendments, activity, permissions } = query.data!;
  const evidenceUrl = `/api/equipment/${e.id}/evidence?v=${encodeURIComponent(e.updatedAt)}`;
  return (
    <article className="space-y-5">
      <Link href="/equipment" className="text-sm text-fjord-700 underline">
        ← All recovery equipment
      </Link>
      {saved && <Notice>{saved === "created" ? "Recovery equipment added to the register." : "Changes saved."}</Notice>}
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm font-medium uppercase tracking-wide text-ink-600">Recovery equipment · {e.branchName}</p>
          <h1 className="text-2xl font-semibold text-ink-950">{e.serial}</h1>
          <p className="text-ink-700">{e.makeModel ?? "Make and model not recorded"}</p>
          <p className="mt-1 flex flex-wrap gap-3">
            <StatusBadge kind="equipment" status={e.status} />
            <CertificationBadge state={e.certificationState} />
          </p>
          {e.unregistered && (
            <p className="mt-1 text-sm font-medium text-sev-major">
              <span aria-hidden="true">⚠ </span>A job named this unit but it was never registered. Complete its details to register it.
            </p>
          )}
        </div>
        {permissions.update && (
          <Link href={`/equipment/${e.id}/edit`} className={buttonSecondary}>
            Edit
          </Link>
        )}
      </header>

      <div className="grid gap-5 lg:grid-cols-2">
        <section aria-labelledby="unit-h" className="rounded-lg border border-ink-200 bg-white p-4">
          <h2 id="unit-h" className="text-lg font-semibold text-ink-950">
            Register entry
          </h2>
          <dl className="divide-y divide-ink-100">
            <DetailRow label="Manufactured">
              {e.manufacturedOn ?? "Unknown"}
              <span className="block text-sm text-ink-600">{ERA_WORDS[e.era]}</span>
            </DetailRow>
            <DetailRow label="Kind">{equipmentKind(e)}</DetailRow>
            <DetailRow label="Certification">
              <CertificationBadge state={e.certificationState} />
              {e.certifiedBy && <span className="block text-sm text-ink-600">by {e.certifiedBy}</span>}
            </DetailRow>
          </dl>
        </section>
        <section aria-labelledby="evidence-h" className="rounded-lg border border-ink-200 bg-white p-4" data-testid="evidence">
          <h2 id="evidence-h" className="text-lg font-semibold text-ink-950">
            Certification evidence
          </h2>
          {!e.hasEvidence && <p className="text-sm text-ink-700">No label photo or certificate is on file.</p>}
          {e.evidenceType === "image" && (
            // eslint-disable-next-line @next/next/no-img-element -- private evidence file behind a permission check; not for the image optimiser
            <img
              src={evidenceUrl}
              alt={`Certification label of recovery equipment ${e.serial}`}
              className="mt-2 max-h-80 rounded-md border border-ink-200"
            />
          )}
          {e.evidenceType === "pdf" && (
            <a href={evidenceUrl} target="_blank" rel="noopener" className="mt-2 inline-block font-medium text-fjord-700 underline">
              Open the certificate (PDF)
            </a>
          )}
          {permissions.update && <EvidenceUpload e={e} />}
        </section>
      </div>

      <EvacuationClaims e={e} />

      <AmendmentsPanel amendments={[...amendments].reverse()} massUnit={e.massUnit} />
      {activity && <ActivityPanel activity={activity} />}
    </article>
  );
}
