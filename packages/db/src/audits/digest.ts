import type { Knex } from "knex";
import { addDays, buildDigests, DIGEST_WINDOW_DAYS, type DigestLine } from "@coldtrail/core";
import { toNumOrNull } from "../types";
import { findingBranchIds } from "./finding-branches";

export interface DigestForPerson {
  userId: number;
  name: string;
  email: string;
  lines: DigestLine[];
}

/**
 * Today's digests for one organisation: for each active person, the findings due within 7 days or
 * overdue that are theirs (core `buildDigests`), leaving out people who already had today's digest.
 */
export async function collectDigests(db: Knex, opts: { organisationId: number; today: string }): Promise<DigestForPerson[]> {
  const findings = await db("findings as f")
    .join("branches as b", "b.id", "f.branch_id")
    .where("f.organisation_id", opts.organisationId)
    .whereIn("f.state", ["open", "fix_proposed"])
    .whereNotNull("f.due_on")
    .where("f.due_on", "<=", addDays(opts.today, DIGEST_WINDOW_DAYS))
    .select("f.id", "f.branch_id", "b.name as branch_name", "f.rule_id", "f.title", "f.severity", "f.state", "f.due_on", "f.assignee_id");
  if (findings.length === 0) return [];
  const shownIn = await findingBranchIds(
    db,
    findings.map((f) => ({ id: Number(f.id), branchId: Number(f.branch_id) })),
  );
  const people = await db("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where({ "m.organisation_id": opts.organisationId, "u.active": true })
    .whereIn("m.role", ["owner", "compliance_officer", "branch_manager"])
    // Ordered, so the digests come out in the same order on SQLite and PostgreSQL (a join's row order is the planner's).
    .orderBy(["u.id", "m.id"])
    .select("u.id", "u.name", "u.email", "m.role", "m.branch_id");
  const assignees = new Set(findings.map((f) => toNumOrNull(f.assignee_id)).filter((x): x is number => x !== null));
  const extra = assignees.size
    ? await db("users")
        .whereIn("id", [...assignees])
        .where({ organisation_id: opts.organisationId, active: true })
        .select("id", "name", "email")
    : [];
  const recipients = new Map<
    number,
    { userId: number; name: string; email: string; wholeOrganisation: boolean; managedBranchIds: number[] }
  >();
  for (const p of [...people, ...extra.map((u) => ({ ...u, role: "assignee", branch_id: null }))]) {
    const id = Number(p.id);
    const r = recipients.get(id) ?? {
      userId: id,
      name: p.name,
      email: p.email,
      wholeOrganisation: false,
      managedBranchIds: [] as number[],
    };
    if (p.role === "owner" || p.role === "compliance_officer") r.wholeOrganisation = true;
    if (p.role === "branch_manager" && p.branch_id !== null) r.managedBranchIds.push(Number(p.branch_id));
    recipients.set(id, r);
  }
  // One digest a day: people who already had one since midnight (UTC) are left out.
  const sentToday = new Set(
    (
      await db("notifications")
        .where({ organisation_id: opts.organisationId, kind: "finding_digest" })
        .where("created_at", ">=", `${opts.today}T00:00:00.000Z`)
        .distinct("user_id")
    ).map((n) => Number(n.user_id)),
  );
  const digests = buildDigests(
    findings.map((f) => ({
      id: Number(f.id),
      branchId: Number(f.branch_id),
      branchIds: shownIn.get(Number(f.id)) ?? [Number(f.branch_id)],
      branchName: f.branch_name,
      ruleId: f.rule_id,
      title: f.title,
      severity: f.severity,
      state: f.state,
      dueOn: f.due_on,
      assigneeId: toNumOrNull(f.assignee_id),
    })),
    [...recipients.values()],
    opts.today,
  );
  return [...digests.entries()]
    .filter(([userId]) => !sentToday.has(userId))
    .map(([userId, lines]) => {
      const r = recipients.get(userId)!;
      return { userId, name: r.name, email: r.email, lines };
    });
}

/** The organisations to send digests for. */
export async function listOrganisationIds(db: Knex): Promise<number[]> {
  return (await db("organisations").orderBy("id").select("id")).map((r) => Number(r.id));
}
