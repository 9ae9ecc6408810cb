"use client";

import Link from "next/link";
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { FINDING_STATE_LABELS } from "@coldtrail/core";
import { ApiError, fetchJson } from "@/lib/client/fetch-json";
import { DueText, SeverityBadge, StateBadge, StateIcon } from "./finding-badges";
import { recordHref, type Assignee, type FindingView } from "./types";
import { useIdempotencyKey } from "@/lib/client/idempotency";

const ACTION_WORDS: Record<string, string> = {
  opened: "Found by the rules",
  found_again: "Found again",
  no_longer_found: "No longer found",
  assigned: "Assigned",
  unassigned: "Assignment removed",
  fix_proposed: "Fix proposed",
  accepted: "Fix accepted",
  reopened: "Reopened",
  waived: "Waived",
  evidence_added: "Evidence attached",
  correction_added: "Another correction added to the proposed fix",
};

interface CorrectionEvidence {
  id: number;
  subjectType: string;
  subjectId: number;
  subjectLabel: string;
  actorName: string;
  at: string;
  reason: string;
  fields: string[];
}

const SUBJECT_RECORD_TYPES: Record<string, string> = {
  Job: "job",
  Appliance: "appliance",
  appliance: "appliance",
  Cylinder: "cylinder",
  RecoveryEquipment: "equipment",
  Certification: "certification",
};

/** The corrections that made the gap disappear, from the events that proposed the fix through them. */
function correctionsOf(f: FindingView): CorrectionEvidence[] {
  const out: CorrectionEvidence[] = [];
  for (const e of f.events) {
    if (e.data?.via !== "amendment" || !Array.isArray(e.data.amendments)) continue;
    for (const a of e.data.amendments as CorrectionEvidence[]) if (!out.some((x) => x.id === a.id)) out.push(a);
  }
  return out;
}

const when = (iso: string) => `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;

function errorText(err: unknown): { message: string; fields: Record<string, string[]> } {
  if (err instanceof ApiError) return { message: err.message, fields: err.fieldErrors };
  return { message: "Something went wrong; nothing was saved", fields: {} };
}

function FieldError({ id, messages }: { id: string; messages?: string[] }) {
  if (!messages?.length) return null;
  return (
    <p id={id} className="mt-1 text-sm text-sev-critical">
      <span aria-hidden="true">⚠ </span>
      {messages.join(" ")}
    </p>
  );
}

function Section({ title, children, id }: { title: string; children: React.ReactNode; id: string }) {
  return (
    <section aria-labelledby={id} className="rounded-lg border border-ink-200 bg-white p-4">
      <h2 id={id} className="mb-2 text-base font-semibold text-ink-950">
        {title}
      </h2>
      {children}
    </section>
  );
}

/** Sends a form to a finding route (JSON, or multipart when it holds a file) and refreshes the finding. */
function useFindingAction(id: number, path: string, onDone: (text: string) => void, doneText: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: Record<string, unknown> | FormData) =>
      body instanceof FormData
        ? fetch(`/api/findings/${id}/${path}`, { method: "POST", body, headers: { accept: "application/json" } }).then(async (res) => {
            const json = await res.json().catch(() => null);
            if (!res.ok)
              throw new ApiError(res.status, json?.error?.message ?? `Request failed (${res.status})`, json?.error?.fieldErrors ?? {});
            return json;
          })
        : fetchJson(`/api/findings/${id}/${path}`, { method: "POST", body: JSON.stringify(body) }),
    onSuccess: () => {
      onDone(doneText);
      void queryClient.invalidateQueries({ queryKey: ["finding", id] });
      void queryClient.invalidateQueries({ queryKey: ["findings"] });
    },
  });
}

export function FindingDetailView({ id, today }: { id: number; today: string }) {
  const [notice, setNotice] = useState<string | null>(null);
  const finding = useQuery({ queryKey: ["finding", id], queryFn: () => fetchJson<FindingView>(`/api/findings/${id}`) });
  const f = finding.data;

  if (finding.isLoading) return <p className="text-ink-600">Loading the finding…</p>;
  if (finding.isError || !f)
    return (
      <p role="alert" className="rounded-md border border-sev-critical/40 bg-red-50 px-3 py-2 text-sev-critical">
        ⚠{" "}
        {finding.error instanceof ApiError && finding.error.status === 404
          ? "There is no such finding, or you may not see it."
          : "The finding could not be loaded."}
      </p>
    );

  const active = f.state === "open" || f.state === "fix_proposed";
  const href = recordHref(f.recordType, f.recordId, f.branchId);

  return (
    <div className="space-y-4">
      <header className="space-y-2">
        <p className="text-sm text-ink-600">
          <Link href="/findings" className="text-fjord-700 underline">
            Findings
          </Link>{" "}
          › Finding #{f.id} · {f.branches.length > 1 ? f.branches.map((b) => b.name).join(", ") : f.branchName}
        </p>
        <h1 className="text-2xl font-semibold text-ink-950">
          <span className="tabular text-ink-600">{f.ruleId}</span> {f.title}
        </h1>
        <div className="flex flex-wrap items-center gap-2 text-sm" data-testid="finding-status">
          <SeverityBadge severity={f.severity} />
          <StateBadge state={f.state} />
          <span className="text-ink-700">
            Due: <DueText dueOn={f.dueOn} today={today} active={active} />
          </span>
          <span className="text-ink-700">· Assignee: {f.assigneeName ?? "not assigned"}</span>
          {f.technicianName && <span className="text-ink-700">· Names {f.technicianName}</span>}
        </div>
        {f.branches.length > 1 && (
          <p className="text-sm text-ink-700" data-testid="finding-branches">
            About a person who works in several branches: one finding, shown in {f.branches.map((b) => b.name).join(" and ")}.
          </p>
        )}
      </header>

      {notice && (
        <p role="status" className="rounded-md border border-ok/40 bg-green-50 px-3 py-2 text-sm text-ok">
          <span aria-hidden="true">✓ </span>
          {notice}
        </p>
      )}

      <div className="grid gap-4 lg:grid-cols-3">
        <div className="space-y-4 lg:col-span-2">
          <Section title="What is wrong" id="wrong-h">
            <p className="text-ink-950" data-testid="finding-detail">
              {f.detail}
            </p>
            <p className="mt-2 text-sm text-ink-700">
              Record:{" "}
              {href ? (
                <Link href={href} className="font-medium text-fjord-700 underline" data-testid="finding-record-link">
                  {f.recordLabel}
                </Link>
              ) : (
                f.recordLabel
              )}
              {f.occurredOn && <> · event on {f.occurredOn}</>}
            </p>
            {f.state === "waived" && f.waiverReason && (
              <p className="mt-2 rounded-md bg-ink-100 px-3 py-2 text-sm text-ink-800">
                <strong>Waived:</strong> {f.waiverReason}
              </p>
            )}
          </Section>

          <Corrections finding={f} />

          <Section title="The rule" id="rule-h">
            <p className="text-ink-900">{f.rule?.explanation ?? "This rule is no longer in the rule set."}</p>
            <p className="mt-2 text-sm text-ink-700">
              <strong>Citation:</strong> {f.citation}
            </p>
          </Section>

          <Section title="How to fix it" id="fix-h">
            <p className="text-ink-900">{f.fix}</p>
          </Section>

          <Comments finding={f} onDone={setNotice} />
          <History finding={f} />
        </div>

        <div className="space-y-4">
          <Actions finding={f} onDone={setNotice} />
          <Evidence finding={f} onDone={setNotice} />
          {f.audits.length > 0 && (
            <Section title="Seen by audits" id="audits-h">
              <ul className="space-y-1 text-sm">
                {f.audits.map((a) => (
                  <li key={a.id}>
                    <Link href={`/audits/${a.id}`} className="text-fjord-700 underline">
                      Audit #{a.id}
                    </Link>{" "}
                    <span className="text-ink-600">
                      ({a.periodFrom} to {a.periodTo}, run {a.createdAt.slice(0, 10)})
                    </span>
                  </li>
                ))}
              </ul>
            </Section>
          )}
        </div>
      </div>
    </div>
  );
}

function Actions({ finding: f, onDone }: { finding: FindingView; onDone: (t: string) => void }) {
  const state = f.state;
  const active = state === "open" || state === "fix_proposed";
  const possible =
    (f.allowed.assign && active) ||
    (f.allowed.proposeFix && active) ||
    (f.allowed.accept && state === "fix_proposed") ||
    (f.allowed.reopen && (state === "fix_proposed" || state === "closed" || state === "waived")) ||
    (f.allowed.waive && active);
  if (!possible) {
    if (active) return null;
    return (
      <Section title="What to do next" id="actions-h">
        <p className="text-sm text-ink-700">
          {state === "no_longer_found"
            ? "Nothing: the records no longer show this gap. If a later audit finds it again, it opens again."
            : state === "closed"
              ? "Nothing: the fix was accepted."
              : "Nothing: the compliance officer waived this finding."}
        </p>
      </Section>
    );
  }
  return (
    <Section title="What to do next" id="actions-h">
      <div className="space-y-4">
        {f.allowed.assign && (state === "open" || state === "fix_proposed") && <AssignForm finding={f} onDone={onDone} />}
        {f.allowed.proposeFix && state === "open" && <ProposeFixForm finding={f} onDone={onDone} />}
        {f.allowed.accept && state === "fix_proposed" && <AcceptForm finding={f} onDone={onDone} />}
        {f.allowed.reopen && (state === "fix_proposed" || state === "closed" || state === "waived") && (
          <ReasonForm
            finding={f}
            path="reopen"
            field="reason"
            label="Why reopen it"
            button="Reopen"
            done="The finding is open again; the people on it have been e-mailed."
            onDone={onDone}
          />
        )}
        {f.allowed.waive && (state === "open" || state === "fix_proposed") && (
          <ReasonForm
            finding={f}
            path="waive"
            field="reason"
            label="Why no fix is needed (required)"
            button="Waive"
            done="The finding is waived; the branch has been e-mailed."
            onDone={onDone}
          />
        )}
        {f.allowed.proposeFix && state === "fix_proposed" && (
          <p className="text-sm text-ink-700">A fix is proposed; the compliance officer will accept it or reopen the finding.</p>
        )}
      </div>
    </Section>
  );
}

function AssignForm({ finding: f, onDone }: { finding: FindingView; onDone: (t: string) => void }) {
  const queryClient = useQueryClient();
  const people = useQuery({
    queryKey: ["assignees", f.branchId],
    queryFn: () => fetchJson<{ rows: Assignee[] }>(`/api/findings/assignees?branchIds=${f.branchId}`),
  });
  const [to, setTo] = useState(f.assigneeId ? String(f.assigneeId) : "");
  const assign = useMutation({
    mutationFn: () =>
      fetchJson("/api/findings/assign", {
        method: "POST",
        body: JSON.stringify({ findingIds: [f.id], assigneeId: to === "none" ? null : Number(to) }),
      }),
    onSuccess: () => {
      onDone(to === "none" ? "The assignment was removed." : "Assigned; they have been e-mailed.");
      void queryClient.invalidateQueries({ queryKey: ["finding", f.id] });
      void queryClient.invalidateQueries({ queryKey: ["findings"] });
    },
  });
  const err = assign.error ? errorText(assign.error) : null;
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        assign.mutate();
      }}
      className="space-y-2"
    >
      <label className="block text-sm">
        <span className="font-medium text-ink-700">Assign to</span>
        <select
          value={to}
          onChange={(e) => setTo(e.target.value)}
          className="mt-1 w-full rounded-md border border-ink-300 bg-white px-2 py-2"
          aria-describedby="assign-error"
        >
          <option value="">Choose a person…</option>
          {(people.data?.rows ?? []).map((p) => (
            <option key={p.id} value={p.id}>
              {p.name} ({p.role === "owner" ? "owner" : "branch manager"})
            </option>
          ))}
          {f.assigneeId && <option value="none">Nobody (remove the assignment)</option>}
        </select>
      </label>
      <FieldError id="assign-error" messages={err ? (err.fields.assigneeId ?? [err.message]) : undefined} />
      <button
        type="submit"
        disabled={!to || assign.isPending}
        className="rounded-md bg-fjord-600 px-4 py-2 text-sm font-semibold text-white hover:bg-fjord-700 disabled:opacity-40"
      >
        {assign.isPending ? "Assigning…" : "Assign"}
      </button>
    </form>
  );
}

function ProposeFixForm({ finding: f, onDone }: { finding: FindingView; onDone: (t: string) => void }) {
  const action = useFindingAction(f.id, "propose-fix", onDone, "Fix proposed; the compliance officer has been e-mailed.");
  const err = action.error ? errorText(action.error) : null;
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        action.mutate(new FormData(e.currentTarget));
      }}
      className="space-y-2"
      aria-label="Propose a fix"
    >
      <label className="block text-sm">
        <span className="font-medium text-ink-700">What was done to fix it</span>
        <textarea
          name="note"
          rows={4}
          required
          minLength={5}
          maxLength={4000}
          className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2"
          aria-describedby="note-error"
        />
      </label>
      <FieldError id="note-error" messages={err?.fields.note} />
      <label className="block text-sm">
        <span className="font-medium text-ink-700">Evidence (optional): a photo or PDF</span>
        <input
          name="file"
          type="file"
          accept="image/jpeg,image/png,image/webp,image/heic,application/pdf"
          capture="environment"
          className="mt-1 block w-full text-sm"
          aria-describedby="file-error"
        />
      </label>
      <FieldError id="file-error" messages={err?.fields.file} />
      {err && !err.fields.note && !err.fields.file && <FieldError id="propose-error" messages={[err.message]} />}
      <button
        type="submit"
        disabled={action.isPending}
        className="rounded-md bg-fjord-600 px-4 py-2 text-sm font-semibold text-white hover:bg-fjord-700 disabled:opacity-40"
      >
        {action.isPending ? "Sending…" : "Propose as fixed"}
      </button>
    </form>
  );
}

function AcceptForm({ finding: f, onDone }: { finding: FindingView; onDone: (t: string) => void }) {
  const action = useFindingAction(f.id, "accept", onDone, "Fix accepted; the finding is closed.");
  const [note, setNote] = useState("");
  const proposal = [...f.events].reverse().find((e) => e.action === "fix_proposed");
  const err = action.error ? errorText(action.error) : null;
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        action.mutate(note.trim() ? { note } : {});
      }}
      className="space-y-2"
      aria-label="Accept the fix"
    >
      {proposal && (
        <p className="rounded-md bg-fjord-50 px-3 py-2 text-sm text-ink-900">
          <strong>{proposal.actorName ?? "The branch"} proposed:</strong> {proposal.note}
        </p>
      )}
      <label className="block text-sm">
        <span className="font-medium text-ink-700">Note on acceptance (optional)</span>
        <input
          value={note}
          onChange={(e) => setNote(e.target.value)}
          maxLength={4000}
          className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2"
        />
      </label>
      {err && <FieldError id="accept-error" messages={err.fields.note ?? [err.message]} />}
      <button
        type="submit"
        disabled={action.isPending}
        className="rounded-md bg-fjord-600 px-4 py-2 text-sm font-semibold text-white hover:bg-fjord-700 disabled:opacity-40"
      >
        {action.isPending ? "Accepting…" : "Accept the fix"}
      </button>
    </form>
  );
}

function ReasonForm(props: {
  finding: FindingView;
  path: string;
  field: string;
  label: string;
  button: string;
  done: string;
  onDone: (t: string) => void;
}) {
  const action = useFindingAction(props.finding.id, props.path, props.onDone, props.done);
  const [value, setValue] = useState("");
  const err = action.error ? errorText(action.error) : null;
  const errorId = `${props.path}-error`;
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        action.mutate({ [props.field]: value });
      }}
      className="space-y-2 border-t border-ink-100 pt-3"
    >
      <label className="block text-sm">
        <span className="font-medium text-ink-700">{props.label}</span>
        <textarea
          value={value}
          onChange={(e) => setValue(e.target.value)}
          rows={2}
          maxLength={4000}
          className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2"
          aria-describedby={errorId}
        />
      </label>
      {err && <FieldError id={errorId} messages={err.fields[props.field] ?? [err.message]} />}
      <button
        type="submit"
        disabled={action.isPending}
        className="rounded-md border border-ink-400 bg-white px-4 py-2 text-sm font-semibold text-ink-900 hover:bg-ink-50 disabled:opacity-40"
      >
        {props.button}
      </button>
    </form>
  );
}

function Evidence({ finding: f, onDone }: { finding: FindingView; onDone: (t: string) => void }) {
  const queryClient = useQueryClient();
  const [key, setKey] = useState(0);
  const idem = useIdempotencyKey();
  const upload = useMutation({
    mutationFn: async (form: FormData) => {
      const res = await fetch(`/api/findings/${f.id}/evidence`, {
        method: "POST",
        body: form,
        headers: { accept: "application/json", ...idem.headers },
      });
      const json = await res.json().catch(() => null);
      if (!res.ok) throw new ApiError(res.status, json?.error?.message ?? "Upload failed", json?.error?.fieldErrors ?? {});
      return json;
    },
    onSuccess: () => {
      idem.renew();
      onDone("Evidence attached.");
      setKey((k) => k + 1);
      void queryClient.invalidateQueries({ queryKey: ["finding", f.id] });
    },
  });
  const err = upload.error ? errorText(upload.error) : null;
  return (
    <Section title="Evidence" id="evidence-h">
      {f.evidence.length === 0 ? (
        <p className="text-sm text-ink-600">No evidence attached yet.</p>
      ) : (
        <ul className="space-y-1 text-sm" data-testid="evidence-list">
          {f.evidence.map((e) => (
            <li key={e.id}>
              <a
                href={`/api/findings/${f.id}/evidence/${e.id}`}
                className="font-medium text-fjord-700 underline"
                target="_blank"
                rel="noreferrer"
              >
                {e.fileName}
              </a>{" "}
              <span className="text-ink-600">
                ({Math.max(1, Math.round(e.sizeBytes / 1024))} KB, {e.uploadedByName}, {e.uploadedAt.slice(0, 10)})
              </span>
              {e.note && <span className="block text-ink-700">{e.note}</span>}
            </li>
          ))}
        </ul>
      )}
      {f.allowed.comment && (
        <form
          key={key}
          onSubmit={(e) => {
            e.preventDefault();
            upload.mutate(new FormData(e.currentTarget));
          }}
          className="mt-3 space-y-2 border-t border-ink-100 pt-3"
          aria-label="Attach evidence"
        >
          <label className="block text-sm">
            <span className="font-medium text-ink-700">Attach a photo or PDF</span>
            <input
              name="file"
              type="file"
              required
              accept="image/jpeg,image/png,image/webp,image/heic,application/pdf"
              className="mt-1 block w-full text-sm"
              aria-describedby="evidence-error"
            />
          </label>
          <label className="block text-sm">
            <span className="font-medium text-ink-700">What it shows (optional)</span>
            <input name="note" maxLength={500} className="mt-1 w-full rounded-md border border-ink-300 px-2 py-1.5" />
          </label>
          {err && <FieldError id="evidence-error" messages={err.fields.file ?? err.fields.note ?? [err.message]} />}
          <button
            type="submit"
            disabled={upload.isPending}
            className="rounded-md border border-fjord-600 px-3 py-1.5 text-sm font-medium text-fjord-700 hover:bg-fjord-50 disabled:opacity-40"
          >
            {upload.isPending ? "Uploading…" : "Attach"}
          </button>
        </form>
      )}
    </Section>
  );
}

function Comments({ finding: f, onDone }: { finding: FindingView; onDone: (t: string) => void }) {
  const queryClient = useQueryClient();
  const [body, setBody] = useState("");
  const idem = useIdempotencyKey();
  const add = useMutation({
    mutationFn: () =>
      fetchJson(`/api/findings/${f.id}/comments`, { method: "POST", headers: idem.headers, body: JSON.stringify({ body }) }),
    onSuccess: () => {
      idem.renew();
      setBody("");
      onDone("Comment added.");
      void queryClient.invalidateQueries({ queryKey: ["finding", f.id] });
    },
  });
  const err = add.error ? errorText(add.error) : null;
  return (
    <Section title="Comments" id="comments-h">
      {f.comments.length === 0 ? (
        <p className="text-sm text-ink-600">No comments yet.</p>
      ) : (
        <ul className="space-y-3">
          {f.comments.map((c) => (
            <li key={c.id} className="text-sm">
              <p className="font-medium text-ink-900">
                {c.authorName} <span className="font-normal text-ink-600">· {when(c.createdAt)}</span>
              </p>
              <p className="whitespace-pre-wrap text-ink-900">{c.body}</p>
            </li>
          ))}
        </ul>
      )}
      {f.allowed.comment && (
        <form
          onSubmit={(e) => {
            e.preventDefault();
            add.mutate();
          }}
          className="mt-3 space-y-2 border-t border-ink-100 pt-3"
        >
          <label className="block text-sm">
            <span className="font-medium text-ink-700">Add a comment</span>
            <textarea
              value={body}
              onChange={(e) => setBody(e.target.value)}
              rows={2}
              maxLength={4000}
              className="mt-1 w-full rounded-md border border-ink-300 px-2 py-2"
              aria-describedby="comment-error"
            />
          </label>
          {err && <FieldError id="comment-error" messages={err.fields.body ?? [err.message]} />}
          <button
            type="submit"
            disabled={!body.trim() || add.isPending}
            className="rounded-md border border-fjord-600 px-3 py-1.5 text-sm font-medium text-fjord-700 hover:bg-fjord-50 disabled:opacity-40"
          >
            Comment
          </button>
        </form>
      )}
    </Section>
  );
}

/** A fix proposed through corrections of the finding's records: what was changed, by whom and why. */
function Corrections({ finding: f }: { finding: FindingView }) {
  const corrections = correctionsOf(f);
  if (corrections.length === 0) return null;
  const waiting = f.state === "fix_proposed";
  return (
    <Section title={waiting ? "Corrections waiting for review" : "Corrections behind the proposed fix"} id="corrections-h">
      <p className="text-sm text-ink-700">
        {waiting
          ? "The records no longer show this gap because they were corrected. The corrections are the evidence of the fix; accept it if they are right, or reopen the finding."
          : "These corrections were offered as the fix."}
      </p>
      <ul className="mt-2 space-y-2" data-testid="amendment-evidence">
        {corrections.map((a) => {
          const href = recordHref(SUBJECT_RECORD_TYPES[a.subjectType] ?? "", a.subjectId, f.branchId);
          return (
            <li key={a.id} className="rounded-md border border-ink-200 bg-ink-50 px-3 py-2 text-sm">
              <p className="text-ink-900">
                <strong>{a.actorName}</strong> corrected{" "}
                {href ? (
                  <Link href={href} className="font-medium text-fjord-700 underline">
                    {a.subjectLabel}
                  </Link>
                ) : (
                  a.subjectLabel
                )}{" "}
                <span className="text-ink-600">· {when(a.at)}</span>
              </p>
              <p className="text-ink-800">
                <span className="text-ink-600">Reason:</span> {a.reason}
              </p>
              {a.fields.length > 0 && (
                <p className="text-ink-700">
                  <span className="text-ink-600">Changed:</span> {a.fields.map((x) => x.replace(/_/g, " ")).join(", ")}
                </p>
              )}
            </li>
          );
        })}
      </ul>
    </Section>
  );
}

function History({ finding: f }: { finding: FindingView }) {
  return (
    <Section title="History" id="history-h">
      <ol className="space-y-2 text-sm" data-testid="finding-history">
        {f.events.map((e) => (
          <li key={e.id} className="flex gap-2">
            {e.toState ? (
              <StateIcon state={e.toState} className="mt-0.5 h-4 w-4 shrink-0 text-ink-600" />
            ) : (
              <span aria-hidden="true">•</span>
            )}
            <div>
              <p className="text-ink-900">
                <strong>
                  {e.action === "fix_proposed" && e.data?.via === "amendment"
                    ? "Fix proposed by correcting the records"
                    : (ACTION_WORDS[e.action] ?? e.action)}
                </strong>
                {e.fromState && e.toState && e.fromState !== e.toState && (
                  <span className="text-ink-700">
                    {" "}
                    ({FINDING_STATE_LABELS[e.fromState]} → {FINDING_STATE_LABELS[e.toState]})
                  </span>
                )}{" "}
                <span className="text-ink-600">
                  · {e.actorName ?? "Coldtrail's rules"} · {when(e.at)}
                </span>
              </p>
              {e.note && <p className="whitespace-pre-wrap text-ink-800">{e.note}</p>}
            </div>
          </li>
        ))}
      </ol>
    </Section>
  );
}
