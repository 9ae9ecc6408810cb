"use client";

import Link from "next/link";
import { useQuery } from "@tanstack/react-query";
import { subject } from "@casl/ability";
import { APPLIANCE_CATEGORY_LABELS, DISPOSAL_PATH_LABELS, disposalRecordCompleteness, formatMass } from "@coldtrail/core";
import type { DisposalRecordDetail } from "@coldtrail/db";
import { fetchJson } from "@/lib/client/fetch-json";
import { DetailRow, LoadError, CompletenessLine } from "@/components/detail";
import { useAbility } from "@/components/providers";
import { SavedNotice } from "../../../jobs/_components/form-bits";
import { AmendPanel, AmendmentHistory, VoidPanel, VoidedBanner } from "../../../jobs/_components/record-history";

const FIELD_WORDS: Record<string, string> = {
  disposed_on: "Date of disposal",
  company_name: "Company name",
  appliance_location: "Location of the appliance",
  recovered_on: "Date of recovery",
  refrigerant: "Refrigerant",
  recovered_g: "Quantity recovered",
  sent_to: "Sent to",
};

export function DisposalRecordView({ id, saved }: { id: string; saved: boolean }) {
  const ability = useAbility();
  const q = useQuery({
    queryKey: ["disposal-record", id],
    queryFn: () => fetchJson<DisposalRecordDetail>(`/api/disposals/records/${encodeURIComponent(id)}`),
    retry: false,
  });
  if (q.isLoading) return <p className="text-ink-600">Loading the disposal record…</p>;
  if (q.isError || !q.data) {
    return <LoadError error={q.error} noun="disposal record" />;
  }
  const r = q.data;
  const where = subject("Disposal", { organisationId: r.organisationId, branchId: r.branchId });
  const complete = disposalRecordCompleteness({
    id: r.id,
    applianceId: r.applianceId,
    companyName: r.companyName,
    applianceLocation: r.applianceLocation,
    recoveredOn: r.recoveredOn,
    refrigerant: r.refrigerant,
    recoveredG: r.recoveredG,
  });
  const invalidate = [["disposal-record", id], ["disposals"]];
  return (
    <article className="mx-auto max-w-2xl space-y-4">
      <Link href="/disposals" className="text-sm text-fjord-700 underline">
        ← All disposals
      </Link>
      {saved && <SavedNotice>Disposal record saved.</SavedNotice>}
      <header>
        <p className="text-sm font-medium text-ink-600">Disposal record #{r.id} · 40 CFR 82.155(c)</p>
        <h1 className="text-2xl font-semibold text-ink-950">
          {r.applianceTag} disposed of on {r.disposedOn}
        </h1>
      </header>
      <VoidedBanner at={r.voidedAt} reason={r.voidReason} />
      <CompletenessLine
        complete={complete.complete}
        missing={complete.missing}
        completeText="Every field the rule asks for is on the record."
        testId="record-completeness"
      />
      <dl className="divide-y divide-ink-100 rounded-lg border border-ink-200 bg-white px-4">
        <DetailRow layout="stacked" label="Appliance">
          {r.applianceTag} — {r.applianceDescription}
          <span className="block text-sm text-ink-600">
            {APPLIANCE_CATEGORY_LABELS[r.applianceCategory]} · full charge {formatMass(r.applianceFullChargeG, r.branchMassUnit)}
          </span>
        </DetailRow>
        <DetailRow layout="stacked" label="Company name">
          {r.companyName ?? "—"}
        </DetailRow>
        <DetailRow layout="stacked" label="Location">
          {r.applianceLocation ?? "—"}
        </DetailRow>
        <DetailRow layout="stacked" label="Date of recovery">
          {r.recoveredOn ?? "—"}
        </DetailRow>
        <DetailRow layout="stacked" label="Refrigerant">
          {r.refrigerant ?? "—"}
        </DetailRow>
        <DetailRow layout="stacked" label="Quantity recovered">
          <span className="tabular">{r.recoveredG === null ? "—" : formatMass(r.recoveredG, r.branchMassUnit)}</span>
        </DetailRow>
        <DetailRow layout="stacked" label="Recovered by">
          {r.recoveredByName ?? "—"}
        </DetailRow>
        <DetailRow layout="stacked" label="Taken apart">
          {DISPOSAL_PATH_LABELS[r.disposalPath] ?? r.disposalPath}
        </DetailRow>
        <DetailRow layout="stacked" label="Sent to">
          {r.sentTo ?? "—"}
        </DetailRow>
        <DetailRow layout="stacked" label="Branch">
          {r.branchName}
        </DetailRow>
        {r.jobId && (
          <DetailRow layout="stacked" label="Disposal job">
            <Link href={`/jobs/${r.jobId}`} className="text-fjord-700 underline">
              Job #{r.jobId}
            </Link>
          </DetailRow>
        )}
        <DetailRow layout="stacked" label="Recorded">
          {new Date(r.createdAt).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short" })} by {r.createdByName}
        </DetailRow>
      </dl>
      {!r.voidedAt && (
        <div className="flex flex-wrap items-start gap-3">
          {ability.can("update", where) && (
            <AmendPanel
              url={`/api/disposals/records/${r.id}`}
              invalidate={invalidate}
              fields={[
                { name: "companyName", label: "Company name", type: "text", value: r.companyName },
                { name: "applianceLocation", label: "Location of the appliance", type: "textarea", value: r.applianceLocation },
                { name: "recoveredOn", label: "Date of recovery", type: "date", value: r.recoveredOn },
                { name: "disposedOn", label: "Date of disposal", type: "date", value: r.disposedOn },
                { name: "refrigerant", label: "Refrigerant", type: "text", value: r.refrigerant },
                {
                  name: "recoveredAmount",
                  label: "Quantity recovered",
                  type: "mass",
                  value: r.recoveredG,
                  unitField: "recoveredUnit",
                  massUnit: r.branchMassUnit,
                  entered: r.recoveredEntered,
                },
                { name: "sentTo", label: "Sent to", type: "text", value: r.sentTo },
              ]}
            />
          )}
          {ability.can("void", where) && <VoidPanel url={`/api/disposals/records/${r.id}/void`} invalidate={invalidate} what="record" />}
        </div>
      )}
      <AmendmentHistory amendments={r.amendments} fieldWords={FIELD_WORDS} massUnit={r.branchMassUnit} />
    </article>
  );
}
