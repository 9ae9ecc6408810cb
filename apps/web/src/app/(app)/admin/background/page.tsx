import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { listTasks, listUndeliveredMail, taskCounts, type BackgroundTask } from "@coldtrail/db";
import { currentActor } from "@/lib/auth/current-actor";
import { db } from "@/lib/db";
import { NoAccess } from "../_components/no-access";
import { RetryTaskButton } from "./retry-task-button";

export const metadata: Metadata = { title: "Background work" };
export const dynamic = "force-dynamic";

const KIND_LABELS: Record<string, string> = {
  audit: "Audit",
  import_check: "Spreadsheet check",
  import_commit: "Spreadsheet import",
  recheck: "Branch re-check after a change",
  digest: "Daily digest",
  mail: "E-mail",
  housekeeping: "Housekeeping",
};

const STATE_LABELS: Record<BackgroundTask["state"], string> = {
  queued: "Waiting",
  running: "Running",
  done: "Done",
  failed: "Failed",
};

const when = (iso: string | null) => (iso ? `${iso.slice(0, 16).replace("T", " ")} UTC` : "—");

function describe(task: BackgroundTask): string {
  const p = task.payload;
  if (task.kind === "audit") return `Audit #${String(p.auditId)}`;
  if (task.kind === "import_check" || task.kind === "import_commit") return `Import #${String(p.importId)}`;
  if (task.kind === "recheck") return `Branch #${String(p.branchId)}`;
  if (task.kind === "digest") return `Digest of ${String(p.day)}`;
  if (task.kind === "mail") return `Outbox mail #${String(p.outboxId)}`;
  return "";
}

const th = "px-3 py-2 text-left text-xs font-semibold uppercase tracking-wide text-ink-600";
const td = "px-3 py-2 align-top text-sm text-ink-900";

function TaskTable({ tasks, caption, withRetry }: { tasks: BackgroundTask[]; caption: string; withRetry?: boolean }) {
  return (
    <table className="w-full divide-y divide-ink-200 rounded-lg border border-ink-200 bg-white">
      <caption className="sr-only">{caption}</caption>
      <thead className="bg-ink-50">
        <tr>
          <th scope="col" className={th}>
            Work
          </th>
          <th scope="col" className={th}>
            State
          </th>
          <th scope="col" className={th}>
            Attempts
          </th>
          <th scope="col" className={th}>
            Queued / next try
          </th>
          <th scope="col" className={th}>
            Last reason
          </th>
          {withRetry && (
            <th scope="col" className={th}>
              <span className="sr-only">Action</span>
            </th>
          )}
        </tr>
      </thead>
      <tbody className="divide-y divide-ink-100">
        {tasks.map((t) => (
          <tr key={t.id} data-testid="background-task">
            <td className={td}>
              <span className="font-medium">{KIND_LABELS[t.kind] ?? t.kind}</span>
              <span className="block text-xs text-ink-600">{describe(t)}</span>
            </td>
            <td className={td}>
              {t.state === "failed" ? "⚠ " : ""}
              {STATE_LABELS[t.state]}
              {t.attempts > 1 && t.state !== "failed" ? " (retried)" : ""}
            </td>
            <td className={td}>
              {t.attempts} of {t.maxAttempts}
            </td>
            <td className={td}>
              {when(t.createdAt)}
              {t.state === "queued" && t.runAfter > t.createdAt && (
                <span className="block text-xs text-ink-600">next try {when(t.runAfter)}</span>
              )}
            </td>
            <td className={td}>{t.lastError ?? "—"}</td>
            {withRetry && <td className={td}>{t.state === "failed" && <RetryTaskButton id={t.id} />}</td>}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/**
 * The owner's view of the background runner: what waits, what runs, what failed and why (with a
 * "try again"), and e-mail not delivered yet. Owner only (the API refuses others as well).
 */
export default async function BackgroundWorkPage() {
  const signedIn = await currentActor();
  if (!signedIn) redirect("/sign-in");
  const { actor, ability } = signedIn;
  if (!ability.can("update", "Settings")) return <NoAccess what="the background work of the organisation" />;
  const organisationId = actor.organisationId;
  const [counts, active, failed, recent, mail] = await Promise.all([
    taskCounts(db(), { organisationId }),
    listTasks(db(), { organisationId, states: ["queued", "running"], limit: 50 }),
    listTasks(db(), { organisationId, states: ["failed"], limit: 50 }),
    listTasks(db(), { organisationId, states: ["done"], limit: 20 }),
    listUndeliveredMail(db(), { organisationId, limit: 100 }),
  ]);
  return (
    <div className="mx-auto max-w-5xl space-y-6">
      <div>
        <h1 className="text-2xl font-semibold text-ink-950">Background work</h1>
        <p className="text-sm text-ink-600">
          Audits, spreadsheet imports, re-checks after changes, the daily digest and e-mail run in the background. Work that fails is tried
          again with growing pauses; what failed for good stays here with its reason.
        </p>
      </div>
      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-5" aria-label="Background work by state">
        {(
          [
            ["Waiting", counts.queued],
            ["Running", counts.running],
            ["Failed", counts.failed],
            ["Retried", counts.retried],
            ["Done", counts.done],
          ] as const
        ).map(([label, n]) => (
          <div key={label} className="rounded-lg border border-ink-200 bg-white p-3">
            <dt className="text-xs font-semibold uppercase tracking-wide text-ink-600">{label}</dt>
            <dd className="text-2xl font-semibold text-ink-950">{n}</dd>
          </div>
        ))}
      </dl>

      <section aria-labelledby="bg-failed" className="space-y-2">
        <h2 id="bg-failed" className="text-lg font-semibold text-ink-950">
          Failed
        </h2>
        {failed.rows.length === 0 ? (
          <p className="text-sm text-ink-600">Nothing failed.</p>
        ) : (
          <TaskTable tasks={failed.rows} caption="Failed background work" withRetry />
        )}
      </section>

      <section aria-labelledby="bg-mail" className="space-y-2">
        <h2 id="bg-mail" className="text-lg font-semibold text-ink-950">
          E-mail not delivered yet
        </h2>
        {mail.length === 0 ? (
          <p className="text-sm text-ink-600">Every e-mail has been delivered.</p>
        ) : (
          <table className="w-full divide-y divide-ink-200 rounded-lg border border-ink-200 bg-white">
            <caption className="sr-only">E-mail not delivered yet</caption>
            <thead className="bg-ink-50">
              <tr>
                <th scope="col" className={th}>
                  To
                </th>
                <th scope="col" className={th}>
                  Subject
                </th>
                <th scope="col" className={th}>
                  State
                </th>
                <th scope="col" className={th}>
                  Attempts
                </th>
                <th scope="col" className={th}>
                  Why it is waiting
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {mail.map((m) => (
                <tr key={m.id} data-testid="undelivered-mail">
                  <td className={td}>{m.to}</td>
                  <td className={td}>{m.subject}</td>
                  <td className={td}>{m.state === "failed" ? "⚠ Given up" : "Waiting to be sent"}</td>
                  <td className={td}>{m.attempts}</td>
                  <td className={td}>{m.lastError ?? "Not tried yet"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      <section aria-labelledby="bg-active" className="space-y-2">
        <h2 id="bg-active" className="text-lg font-semibold text-ink-950">
          Waiting or running
        </h2>
        {active.rows.length === 0 ? (
          <p className="text-sm text-ink-600">Nothing waiting.</p>
        ) : (
          <TaskTable tasks={active.rows} caption="Waiting or running" />
        )}
      </section>

      <section aria-labelledby="bg-done" className="space-y-2">
        <h2 id="bg-done" className="text-lg font-semibold text-ink-950">
          Recently done
        </h2>
        {recent.rows.length === 0 ? (
          <p className="text-sm text-ink-600">Nothing yet.</p>
        ) : (
          <TaskTable tasks={recent.rows} caption="Recently done" />
        )}
      </section>
    </div>
  );
}
