"use client";

import Link from "next/link";
import { useState } from "react";
import { keepPreviousData, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import {
  CERTIFICATION_TYPE_LABELS,
  JOB_KIND_LABELS,
  ROLE_LABELS,
  formatMass,
  personAccessInput,
  type AssignableRole,
} from "@coldtrail/core";
import type { ActivityPage, AdminBranchPage, InspectorGrantPage, PersonCertification, PersonDetail as Person } from "@coldtrail/db";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { jobMassG, type JobListPage } from "@/lib/client/types";
import { AccessFields, accessPayload, type AccessValue } from "../../_components/access-fields";
import { CertificationStateBadge, GrantStateBadge, PersonStatusBadge } from "../../_components/badges";
import { FormAlert, Notice, Pager, dangerButton, errorMessage, primaryButton, secondaryButton, when } from "../../_components/form-bits";

export interface PersonPermissions {
  editAccess: boolean;
  activate: boolean;
  invite: boolean;
  readCertifications: boolean;
  readJobs: boolean;
  readHistory: boolean;
  readGrants: boolean;
}

function Section({ title, children, id }: { title: string; children: React.ReactNode; id: string }) {
  return (
    <section aria-labelledby={id} className="space-y-3 rounded-lg border border-ink-200 bg-white p-5">
      <h2 id={id} className="text-lg font-semibold text-ink-950">
        {title}
      </h2>
      {children}
    </section>
  );
}

export function PersonDetail({ id, selfId, can, mailFailed }: { id: string; selfId: number; can: PersonPermissions; mailFailed: boolean }) {
  const person = useQuery({
    queryKey: ["person", id],
    queryFn: () => fetchJson<Person>(`/api/admin/people/${encodeURIComponent(id)}`),
    retry: false,
  });
  if (person.isLoading) return <p className="text-ink-600">Loading…</p>;
  if (person.isError) {
    const notFound = person.error instanceof ApiError && person.error.status === 404;
    return (
      <div role="alert" className="rounded-lg border border-ink-200 bg-white p-6">
        <p className="font-semibold">{notFound ? "No such person, or not one you may see." : "This person could not be loaded."}</p>
      </div>
    );
  }
  const p = person.data!;
  const isSelf = p.id === selfId;
  const isInspector = p.roles.includes("inspector");
  const isTechnician = p.roles.includes("technician");
  return (
    <div className="space-y-5">
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold text-ink-950">{p.name}</h1>
          <p className="break-all text-ink-700">{p.email}</p>
          <p className="mt-1 text-sm text-ink-600">
            {p.roles.length ? p.roles.map((r) => ROLE_LABELS[r]).join(", ") : "No role"}
            {p.branches.length > 0 && <> · {p.branches.map((b) => b.name).join(", ")}</>}
          </p>
        </div>
        <PersonStatusBadge status={p.status} />
      </header>
      {mailFailed && <FormAlert message="The invitation was saved but the e-mail could not be sent. Send a new link below." />}

      {p.status === "invited" && can.invite && <InvitationPanel person={p} />}
      {can.editAccess && !isInspector && <AccessPanel person={p} isSelf={isSelf} />}
      {isInspector && can.readGrants && <InspectorGrants userId={p.id} />}
      {can.readCertifications && isTechnician && <Certifications personId={p.id} />}
      {can.readJobs && isTechnician && <Jobs technicianId={p.id} />}
      {can.readHistory && <History personId={p.id} />}
      {can.activate && !isSelf && p.status !== "invited" && <ActivationPanel person={p} />}
    </div>
  );
}

function useRefreshPerson(id: number) {
  const queryClient = useQueryClient();
  return async () => {
    await queryClient.invalidateQueries({ queryKey: ["person", String(id)] });
    await queryClient.invalidateQueries({ queryKey: ["people"] });
    await queryClient.invalidateQueries({ queryKey: ["person-history", id] });
  };
}

function InvitationPanel({ person }: { person: Person }) {
  const refresh = useRefreshPerson(person.id);
  const [notice, setNotice] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const resend = useMutation({
    mutationFn: () => fetchJson<{ mailSent: boolean; expiresAt: string }>(`/api/admin/people/${person.id}/invitation`, { method: "POST" }),
    onSuccess: async (res) => {
      setError(res.mailSent ? null : "A new link was made but the e-mail could not be sent. Try again in a moment.");
      setNotice(
        res.mailSent
          ? `A new link is on its way to ${person.email}; it expires ${when(res.expiresAt)}. Earlier links no longer work.`
          : null,
      );
      await refresh();
    },
    onError: (err) => setError(errorMessage(err, "The link could not be sent.")),
  });
  const withdraw = useMutation({
    mutationFn: () => fetchJson(`/api/admin/people/${person.id}/invitation`, { method: "DELETE" }),
    onSuccess: async () => {
      setNotice("Invitation withdrawn: the link no longer works.");
      await refresh();
    },
    onError: (err) => setError(errorMessage(err, "The invitation could not be withdrawn.")),
  });
  const inv = person.invitation;
  return (
    <Section title="Invitation" id="invitation-h">
      <p className="text-ink-700">
        {inv ? (
          inv.expired ? (
            <>
              <span aria-hidden="true">◷ </span>The link sent by {inv.invitedByName} on {when(inv.createdAt)} expired on{" "}
              {when(inv.expiresAt)}.
            </>
          ) : (
            <>
              <span aria-hidden="true">✉ </span>Sent by {inv.invitedByName} on {when(inv.createdAt)}; the link works until{" "}
              {when(inv.expiresAt)}.
            </>
          )
        ) : (
          "No link is open for this person."
        )}
      </p>
      <Notice message={notice} />
      <FormAlert message={error} />
      <div className="flex flex-wrap gap-2">
        <button type="button" className={secondaryButton} disabled={resend.isPending} onClick={() => resend.mutate()}>
          {resend.isPending ? "Sending…" : "Send a new link"}
        </button>
        <button type="button" className={dangerButton} disabled={withdraw.isPending} onClick={() => withdraw.mutate()}>
          Withdraw the invitation
        </button>
      </div>
    </Section>
  );
}

function AccessPanel({ person, isSelf }: { person: Person; isSelf: boolean }) {
  const refresh = useRefreshPerson(person.id);
  const branches = useQuery({
    queryKey: ["admin-branches", "all"],
    queryFn: () => fetchJson<AdminBranchPage>("/api/admin/branches?archived=include&pageSize=200"),
  });
  const initial: AccessValue = {
    roles: person.roles.filter((r): r is AssignableRole => r !== "inspector"),
    branchIds: person.branches.map((b) => b.id),
  };
  const [value, setValue] = useState<AccessValue>(initial);
  const [errors, setErrors] = useState<{ roles?: string; branchIds?: string }>({});
  const [formError, setFormError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const save = useMutation({
    mutationFn: (v: AccessValue) => fetchJson<Person>(`/api/admin/people/${person.id}`, { method: "PATCH", body: JSON.stringify(v) }),
    onSuccess: async () => {
      setNotice("Roles and branches saved. The change applies at once, and it is in the history below.");
      await refresh();
    },
    onError: (err) => {
      if (err instanceof ApiError) setErrors({ roles: err.fieldErrors.roles?.[0], branchIds: err.fieldErrors.branchIds?.[0] });
      setFormError(errorMessage(err, "The change could not be saved; nothing was changed."));
    },
  });
  const submit = (e: React.FormEvent) => {
    e.preventDefault();
    setNotice(null);
    setFormError(null);
    const payload = accessPayload(value);
    const parsed = personAccessInput.safeParse(payload);
    if (!parsed.success) {
      const flat = parsed.error.flatten().fieldErrors as Record<string, string[] | undefined>;
      setErrors({ roles: flat.roles?.[0], branchIds: flat.branchIds?.[0] });
      setFormError("Some fields need attention.");
      return;
    }
    setErrors({});
    save.mutate(parsed.data);
  };
  return (
    <Section title="Roles and branches" id="access-h">
      {isSelf && (
        <p className="text-sm text-ink-600">
          <span aria-hidden="true">ℹ </span>This is you: you can remove your own roles or step down, not add. Another owner can raise you.
        </p>
      )}
      <form onSubmit={submit} noValidate className="space-y-4">
        <FormAlert message={formError} />
        <Notice message={notice} />
        <AccessFields value={value} onChange={setValue} branches={branches.data?.rows ?? []} errors={errors} lockUnticked={isSelf} />
        <button type="submit" className={primaryButton} disabled={save.isPending}>
          {save.isPending ? "Saving…" : "Save roles and branches"}
        </button>
      </form>
    </Section>
  );
}

function ActivationPanel({ person }: { person: Person }) {
  const refresh = useRefreshPerson(person.id);
  const [confirming, setConfirming] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const active = person.status === "active";
  const change = useMutation({
    mutationFn: () => fetchJson<Person>(`/api/admin/people/${person.id}/${active ? "deactivate" : "reactivate"}`, { method: "POST" }),
    onSuccess: async () => {
      setConfirming(false);
      setError(null);
      await refresh();
    },
    onError: (err) => setError(errorMessage(err, "The change could not be saved.")),
  });
  return (
    <Section title={active ? "Deactivate" : "Let them sign in again"} id="activation-h">
      <p className="text-ink-700">
        {active
          ? `${person.name} will no longer be able to sign in, from their next click. Their jobs, certifications and history stay in the records.`
          : `${person.name} cannot sign in. Letting them in again restores the roles and branches shown above.`}
      </p>
      <FormAlert message={error} />
      {active && confirming ? (
        <div className="flex flex-wrap items-center gap-2" role="group" aria-label="Confirm deactivation">
          <span className="font-medium text-ink-900">Deactivate {person.name}?</span>
          <button type="button" className={dangerButton} disabled={change.isPending} onClick={() => change.mutate()} autoFocus>
            Yes, deactivate
          </button>
          <button type="button" className={secondaryButton} onClick={() => setConfirming(false)}>
            Cancel
          </button>
        </div>
      ) : (
        <button
          type="button"
          className={active ? dangerButton : primaryButton}
          disabled={change.isPending}
          onClick={() => (active ? setConfirming(true) : change.mutate())}
        >
          {active ? "Deactivate…" : "Let them sign in again"}
        </button>
      )}
    </Section>
  );
}

function Certifications({ personId }: { personId: number }) {
  const certs = useQuery({
    queryKey: ["person-certifications", personId],
    queryFn: () => fetchJson<{ rows: PersonCertification[] }>(`/api/admin/people/${personId}/certifications`),
  });
  const rows = certs.data?.rows ?? [];
  return (
    <Section title="Certifications" id="certs-h">
      {certs.isLoading && <p className="text-ink-600">Loading certifications…</p>}
      {certs.isError && <FormAlert message="Certifications could not be loaded." />}
      {!certs.isLoading && rows.length === 0 && <p className="text-ink-600">No certification card on record.</p>}
      {rows.length > 0 && (
        <ul className="divide-y divide-ink-100" aria-label="Certifications">
          {rows.map((c) => (
            <li key={c.id} className="flex flex-wrap items-start justify-between gap-3 py-3" data-testid="certification">
              <div>
                <p className="font-medium text-ink-950">
                  {c.types.length ? c.types.map((t) => CERTIFICATION_TYPE_LABELS[t]).join(" + ") : "Type not given"}
                  <span className="font-normal text-ink-600"> · no. {c.certificateNumber}</span>
                </p>
                <p className="text-sm text-ink-600">
                  {c.certifyingOrganisation}
                  {c.issuedOn && <> · issued {c.issuedOn}</>}
                  {c.verifiedAt && c.verifiedByName && (
                    <>
                      {" "}
                      · {c.state === "rejected" ? "rejected" : "verified"} by {c.verifiedByName} on {c.verifiedAt.slice(0, 10)}
                    </>
                  )}
                </p>
                {c.rejectionReason && <p className="text-sm text-ink-700">Reason: {c.rejectionReason}</p>}
              </div>
              <CertificationStateBadge state={c.state} />
            </li>
          ))}
        </ul>
      )}
    </Section>
  );
}

function Jobs({ technicianId }: { technicianId: number }) {
  const [page, setPage] = useState(1);
  const pageSize = 10;
  const jobs = useQuery({
    queryKey: ["jobs", `technician-${technicianId}-${page}`],
    queryFn: () =>
      fetchJson<JobListPage>(`/api/jobs?technicianId=${technicianId}&page=${page}&pageSize=${pageSize}&sort=performedOn&dir=desc`),
    placeholderData: keepPreviousData,
  });
  const rows = jobs.data?.rows ?? [];
  return (
    <Section title="Jobs" id="jobs-h">
      {jobs.isError && <FormAlert message="Jobs could not be loaded." />}
      <div className="overflow-x-auto">
        <table className="min-w-full text-sm" aria-labelledby="jobs-h" aria-busy={jobs.isFetching}>
          <thead className="bg-ink-100 text-left text-xs uppercase tracking-wide text-ink-600">
            <tr>
              <th scope="col" className="px-3 py-2">
                Date
              </th>
              <th scope="col" className="px-3 py-2">
                Job
              </th>
              <th scope="col" className="px-3 py-2">
                Appliance
              </th>
              <th scope="col" className="px-3 py-2">
                Branch
              </th>
              <th scope="col" className="px-3 py-2">
                Refrigerant
              </th>
              <th scope="col" className="px-3 py-2">
                Amount
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {rows.map((j) => {
              const g = jobMassG(j);
              return (
                <tr key={j.id} data-testid="person-job-row">
                  <td className="tabular whitespace-nowrap px-3 py-2">{j.performedOn}</td>
                  <td className="px-3 py-2">{JOB_KIND_LABELS[j.kind]}</td>
                  <td className="px-3 py-2">
                    <Link href={`/jobs/${j.id}`} className="font-medium text-fjord-700 underline-offset-2 hover:underline">
                      {j.applianceTag}
                    </Link>
                  </td>
                  <td className="px-3 py-2">{j.branchName}</td>
                  <td className="px-3 py-2">{j.refrigerant ?? "—"}</td>
                  <td className="tabular whitespace-nowrap px-3 py-2">{g === null ? "—" : formatMass(g, j.branchMassUnit)}</td>
                </tr>
              );
            })}
            {!jobs.isLoading && rows.length === 0 && (
              <tr>
                <td colSpan={6} className="px-3 py-6 text-center text-ink-600">
                  No jobs you may see.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      <Pager page={page} pageSize={pageSize} total={jobs.data?.total ?? 0} noun="jobs" onPage={setPage} />
    </Section>
  );
}

function InspectorGrants({ userId }: { userId: number }) {
  const grants = useQuery({
    queryKey: ["inspector-grants", `user-${userId}`],
    queryFn: () => fetchJson<InspectorGrantPage>(`/api/admin/inspector-grants?userId=${userId}&pageSize=50`),
  });
  return (
    <Section title="Inspector access" id="grants-h">
      <p className="text-sm text-ink-600">
        Inspectors read only the branches and dates they are given.{" "}
        <Link href="/admin/inspectors" className="text-fjord-700 underline">
          Manage inspector access
        </Link>
      </p>
      <ul className="divide-y divide-ink-100">
        {(grants.data?.rows ?? []).map((g) => (
          <li key={g.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
            <span>
              {g.branches.map((b) => b.name).join(", ")} · records {g.recordsFrom} to {g.recordsTo} · until {g.expiresAt.slice(0, 10)}
            </span>
            <GrantStateBadge state={g.state} />
          </li>
        ))}
      </ul>
    </Section>
  );
}

function History({ personId }: { personId: number }) {
  const [page, setPage] = useState(1);
  const history = useQuery({
    queryKey: ["person-history", personId, page],
    queryFn: () => fetchJson<ActivityPage>(`/api/admin/people/${personId}/history?page=${page}&pageSize=10`),
    placeholderData: keepPreviousData,
  });
  const rows = history.data?.rows ?? [];
  return (
    <Section title="History" id="history-h">
      {rows.length === 0 && !history.isLoading && <p className="text-ink-600">No changes recorded yet.</p>}
      <ol className="space-y-2" aria-label="Changes, newest first">
        {rows.map((a) => (
          <li key={a.id} className="text-sm" data-testid="history-entry">
            <span className="tabular text-ink-600">{when(a.at)}</span> · <span className="font-medium">{a.actorName ?? "Coldtrail"}</span>:{" "}
            {a.summary}
          </li>
        ))}
      </ol>
      <Pager page={page} pageSize={10} total={history.data?.total ?? 0} noun="changes" onPage={setPage} />
    </Section>
  );
}
