import type { APIRequestContext } from "@playwright/test";
import { expect } from "./fixtures";

/** What GET /api/findings returns per row (the fields these tests read). */
export interface FindingRow {
  id: number;
  branchId: number;
  branchName: string;
  ruleId: string;
  title: string;
  detail: string;
  severity: "critical" | "major" | "minor";
  state: "open" | "fix_proposed" | "closed" | "waived" | "no_longer_found";
  recordType: string;
  recordId: number | null;
  recordLabel: string;
  applianceTag: string | null;
  technicianId: number | null;
  technicianName: string | null;
  assigneeName: string | null;
  dueOn: string | null;
  occurredOn: string | null;
  updatedAt: string;
}

export interface AuditRow {
  id: number;
  state: "queued" | "running" | "done" | "failed";
  progress: number;
  branchIds: number[];
  periodFrom: string;
  periodTo: string;
  summary: { totals: { found: number; created: number; noLongerFound: number } } | null;
}

export const todayUtc = () => new Date().toISOString().slice(0, 10);
/** Today's calendar date in a branch's time zone (a job's date is the branch's date, not UTC's). */
export const todayIn = (timeZone: string) =>
  new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(new Date());

/** Waits for an audit to finish (the run is in the background) and returns it. */
export async function waitForAudit(request: APIRequestContext, id: number): Promise<AuditRow> {
  let audit: AuditRow | undefined;
  await expect
    .poll(
      async () => {
        audit = (await (await request.get(`/api/audits/${id}`)).json()) as AuditRow;
        return audit.state;
      },
      { timeout: 90_000, intervals: [500, 1000, 2000] },
    )
    .toMatch(/done|failed/);
  expect(audit!.state).toBe("done");
  return audit!;
}

/** Every finding a person may read with the given filters, all pages. */
export async function allFindings(request: APIRequestContext, filters: Record<string, string | number> = {}): Promise<FindingRow[]> {
  const rows: FindingRow[] = [];
  for (let page = 1; ; page++) {
    const params = new URLSearchParams({
      state: "all",
      pageSize: "200",
      page: String(page),
      sort: "due",
      ...Object.fromEntries(Object.entries(filters).map(([k, v]) => [k, String(v)])),
    });
    const res = await request.get(`/api/findings?${params}`);
    expect(res.ok(), `GET /api/findings?${params} → ${res.status()}`).toBeTruthy();
    const body = (await res.json()) as { rows: FindingRow[]; total: number };
    rows.push(...body.rows);
    if (body.rows.length < 200) return rows;
  }
}

/** Starts an audit of the organisation's branches through the API and waits for it. */
export async function runAuditApi(
  request: APIRequestContext,
  input: { branchIds?: number[]; periodFrom?: string; periodTo?: string } = {},
): Promise<AuditRow> {
  const branchIds =
    input.branchIds ?? ((await (await request.get("/api/lookup/branches")).json()) as { rows: { id: number }[] }).rows.map((b) => b.id);
  const res = await request.post("/api/audits", {
    data: { branchIds, periodFrom: input.periodFrom ?? "2024-12-01", periodTo: input.periodTo ?? todayUtc(), packs: ["us_federal"] },
  });
  expect(res.status()).toBe(201);
  const { id } = (await res.json()) as { id: number };
  return waitForAudit(request, id);
}

/** A 1×1 PNG, a real image by its bytes (for evidence uploads). */
export const TINY_PNG = Buffer.from(
  "iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==",
  "base64",
);
