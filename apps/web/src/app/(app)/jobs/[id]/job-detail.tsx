"use client";

import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { ACCESS_METHOD_LABELS, APPLIANCE_CATEGORY_LABELS, EVACUATION_UNIT_LABELS, JOB_KIND_LABELS, formatMass } from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { jobMassG, type JobDetail as Job } from "@/lib/client/types";

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="grid grid-cols-[10rem_1fr] gap-3 py-2">
      <dt className="text-sm font-medium text-ink-600">{label}</dt>
      <dd className="text-ink-950">{children}</dd>
    </div>
  );
}

export function JobDetail({ id }: { id: string }) {
  const job = useQuery({ queryKey: ["job", id], queryFn: () => fetchJson<Job>(`/api/jobs/${encodeURIComponent(id)}`), retry: false });
  if (job.isLoading) return <p className="text-ink-600">Loading the job…</p>;
  if (job.isError) {
    const notFound = job.error instanceof ApiError && job.error.status === 404;
    return (
      <div role="alert" className="rounded-lg border border-ink-200 bg-white p-6">
        <p className="font-semibold">{notFound ? "No such job, or it is not one you may see." : "The job could not be loaded."}</p>
        <Link href="/jobs" className="mt-2 inline-block text-fjord-700 underline">
          Back to jobs
        </Link>
      </div>
    );
  }
  const j = job.data!;
  const g = jobMassG(j);
  const mass = g === null ? "—" : formatMass(g, j.branchMassUnit);
  return (
    <article className="mx-auto max-w-2xl space-y-4">
      <Link href="/jobs" className="text-sm text-fjord-700 underline">
        ← All jobs
      </Link>
      <header>
        <p className="text-sm font-medium uppercase tracking-wide text-ink-600">
          {JOB_KIND_LABELS[j.kind]} · {j.performedOn}
        </p>
        <h1 className="text-2xl font-semibold text-ink-950">
          {j.kind === "recovery" ? `Recovered ${mass} ${j.refrigerant ?? ""} from ${j.applianceTag ?? "an appliance"}` : `${JOB_KIND_LABELS[j.kind]} on ${j.applianceTag ?? "an appliance"}`}
          {j.cylinderSerial && j.kind === "recovery" && ` into cylinder ${j.cylinderSerial}`}
        </h1>
      </header>
      <dl className="divide-y divide-ink-100 rounded-lg border border-ink-200 bg-white px-4">
        <Row label="Appliance">
          {j.applianceTag} {j.applianceDescription && <span className="text-ink-600">— {j.applianceDescription}</span>}
          {j.applianceCategory && <span className="block text-sm text-ink-600">{APPLIANCE_CATEGORY_LABELS[j.applianceCategory]}</span>}
        </Row>
        <Row label="Branch">{j.branchName}</Row>
        <Row label="Technician">{j.technicianName}</Row>
        <Row label="Refrigerant">{j.refrigerant ?? "—"}</Row>
        <Row label="Amount">
          <span className="tabular">{mass}</span>
        </Row>
        <Row label="Cylinder">{j.cylinderSerial ?? "—"}</Row>
        <Row label="Recovery equipment">{j.equipmentSerial ?? "—"}</Row>
        <Row label="Evacuation reached">
          {j.evacuationValue === null || !j.evacuationUnit ? "—" : <span className="tabular">{`${j.evacuationValue} ${EVACUATION_UNIT_LABELS[j.evacuationUnit]}`}</span>}
        </Row>
        <Row label="Access">
          {j.accessMethod ? ACCESS_METHOD_LABELS[j.accessMethod] : "—"}
          {j.temporaryAccessRemoved === true && <span className="block text-sm">✓ Temporary device removed</span>}
          {j.temporaryAccessRemoved === false && <span className="block text-sm font-medium text-sev-major">⚠ Temporary device left in place</span>}
        </Row>
        {j.compressorOperating !== null && <Row label="Compressor">{j.compressorOperating ? "Running" : "Not running"}</Row>}
        {j.notes && <Row label="Notes">{j.notes}</Row>}
        <Row label="Recorded">{new Date(j.createdAt).toLocaleString("en-US")}</Row>
      </dl>
    </article>
  );
}
