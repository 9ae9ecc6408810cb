import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { defineAbilityFor, findingListQuery, type Action } from "@coldtrail/core";
import {
  acceptFindingFix,
  addFindingComment,
  assignFindings,
  claimAudit,
  createAudit,
  deleteSavedView,
  getFinding,
  listAssignableUsers,
  listFindings,
  listSavedViews,
  listUnsentFindingMail,
  loadActor,
  proposeFindingFix,
  reopenFinding,
  runAuditBranches,
  saveView,
  scopeByAbility,
  waiveFinding,
} from "@coldtrail/db";
import { createSeededTestDb, type TestDb } from "@coldtrail/db/testing";

const NOW = new Date("2026-12-01T15:00:00Z");
let t: TestDb;
const ids: Record<string, number> = {};
let findingCol: number; // an open Columbus finding
let findingTuc: number; // an open Tucson finding

async function actorOf(email: string) {
  const user = await t.db("users").where({ email }).first("id");
  const actor = (await loadActor(t.db, Number(user.id)))!;
  return { actor, ability: defineAbilityFor(actor, NOW), ref: { userId: actor.userId, organisationId: actor.organisationId } };
}
const scope = (a: Awaited<ReturnType<typeof actorOf>>, action: Action) => scopeByAbility(a.ability, action, "Finding", "findings");

beforeAll(async () => {
  t = await createSeededTestDb();
  for (const [key, email] of Object.entries({
    officer: "teodora.vasquez-lind@kestrelmoor.example",
    managerCol: "grant.oyelaran@kestrelmoor.example",
    managerTuc: "lucia.baptiste-moreno@kestrelmoor.example",
    techCol: "marcus.delacroix-byrd@kestrelmoor.example",
  })) {
    ids[key] = Number((await t.db("users").where({ email }).first("id")).id);
  }
  const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
  const branchIds = (await t.db("branches").where({ organisation_id: 1 }).select("id")).map((b) => Number(b.id));
  const id = await createAudit(t.db, {
    actor: officer.ref,
    input: { branchIds, periodFrom: "2024-12-01", periodTo: "2026-12-01", packs: ["us_federal"] },
    now: NOW,
  });
  await claimAudit(t.db, { id, now: NOW });
  await runAuditBranches(t.db, { id, now: () => NOW });
  const col = Number((await t.db("branches").where({ code: "COL" }).first("id")).id);
  const tuc = Number((await t.db("branches").where({ code: "TUC" }).first("id")).id);
  findingCol = Number((await t.db("findings").where({ branch_id: col, rule_id: "CT-EVAC-01", state: "open" }).first("id")).id);
  findingTuc = Number((await t.db("findings").where({ branch_id: tuc, rule_id: "CT-ACCESS-01", state: "open" }).first("id")).id);
}, 120_000);

afterAll(async () => {
  await t?.destroy();
});

describe("the findings workflow", () => {
  it("offers only the branch's managers and owners as assignees", async () => {
    const col = Number((await t.db("branches").where({ code: "COL" }).first("id")).id);
    const names = (await listAssignableUsers(t.db, { organisationId: 1, branchIds: [col] })).map((u) => u.name);
    expect(names).toContain("Grant Oyelaran");
    expect(names).toContain("Marguerite Halvorsen");
    expect(names).not.toContain("Lucia Baptiste-Moreno");
  });

  it("refuses to assign a finding to a manager of another branch, naming the field, and writes nothing", async () => {
    const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
    const before = await t.db("activity").count({ n: "*" }).first();
    await expect(
      assignFindings(t.db, {
        actor: officer.ref,
        scope: scope(officer, "assign"),
        findingIds: [findingCol, findingTuc],
        assigneeId: ids.managerCol!,
        now: NOW,
      }),
    ).rejects.toMatchObject({
      code: "invalid",
      field: "assigneeId",
      message: expect.stringContaining("does not manage Tucson"),
    });
    expect((await t.db("findings").where({ id: findingCol }).first("assignee_id")).assignee_id).toBeNull();
    expect(Number((await t.db("activity").count({ n: "*" }).first())!.n)).toBe(Number(before!.n));
  });

  it("a branch manager cannot assign", async () => {
    const manager = await actorOf("grant.oyelaran@kestrelmoor.example");
    await expect(
      assignFindings(t.db, {
        actor: manager.ref,
        scope: scope(manager, "assign"),
        findingIds: [findingCol],
        assigneeId: ids.managerCol!,
        now: NOW,
      }),
    ).rejects.toMatchObject({ code: "not_found" });
  });

  it("assigns, notifies the assignee, and records the history", async () => {
    const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
    const res = await assignFindings(t.db, {
      actor: officer.ref,
      scope: scope(officer, "assign"),
      findingIds: [findingCol],
      assigneeId: ids.managerCol!,
      now: NOW,
    });
    expect(res.assigned).toBe(1);
    const mail = await listUnsentFindingMail(t.db, { ids: res.notificationIds });
    expect(mail).toHaveLength(1);
    expect(mail[0]).toMatchObject({
      email: "grant.oyelaran@kestrelmoor.example",
      kind: "finding_assigned",
      link: `/findings/${findingCol}`,
    });
    expect(mail[0]!.body).toContain("Teodora Vasquez-Lind assigned a finding to you");
    const events = await t.db("finding_events").where({ finding_id: findingCol, action: "assigned" }).select("actor_id", "note");
    expect(events).toEqual([{ actor_id: ids.officer, note: "Assigned to Grant Oyelaran" }]);
  });

  it("the other branch's manager cannot see or propose a fix for it", async () => {
    const other = await actorOf("lucia.baptiste-moreno@kestrelmoor.example");
    expect(await getFinding(t.db, { organisationId: 1, scope: scope(other, "read"), id: findingCol })).toBeUndefined();
    await expect(
      proposeFindingFix(t.db, { actor: other.ref, scope: scope(other, "propose_fix"), id: findingCol, note: "Not mine to fix", now: NOW }),
    ).rejects.toMatchObject({ code: "not_found" });
  });

  it("the officer cannot accept before a fix is proposed", async () => {
    const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
    await expect(
      acceptFindingFix(t.db, { actor: officer.ref, scope: scope(officer, "accept"), id: findingCol, now: NOW }),
    ).rejects.toMatchObject({
      code: "conflict",
      message: "Only a finding with a proposed fix can be accepted; this one is open",
    });
  });

  it("the manager proposes a fix with evidence; the officer who assigned it hears of it and accepts", async () => {
    const manager = await actorOf("grant.oyelaran@kestrelmoor.example");
    const proposed = await proposeFindingFix(t.db, {
      actor: manager.ref,
      scope: scope(manager, "propose_fix"),
      id: findingCol,
      note: "Re-evacuated the condenser bundle to 20 in Hg and logged the new reading",
      evidence: { fileKey: "findings/1/abc.png", fileName: "gauge-reading.png", mime: "image/png", sizeBytes: 1234 },
      now: NOW,
    });
    expect(proposed.state).toBe("fix_proposed");
    const mail = await listUnsentFindingMail(t.db, { ids: proposed.notificationIds });
    expect(mail.map((m) => [m.email, m.kind])).toEqual([["teodora.vasquez-lind@kestrelmoor.example", "finding_fix_proposed"]]);
    const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
    const accepted = await acceptFindingFix(t.db, {
      actor: officer.ref,
      scope: scope(officer, "accept"),
      id: findingCol,
      note: "Reading checked",
      now: NOW,
    });
    expect(accepted.state).toBe("closed");
    const detail = (await getFinding(t.db, { organisationId: 1, scope: scope(officer, "read"), id: findingCol }))!;
    expect(detail.state).toBe("closed");
    expect(detail.evidence.map((e) => e.fileName)).toEqual(["gauge-reading.png"]);
    expect(detail.events.map((e) => e.action)).toEqual(["opened", "assigned", "fix_proposed", "accepted"]);
    expect(detail.events[2]!.note).toContain("Re-evacuated");
  });

  it("reopens a closed finding with a reason and tells the people who worked on it", async () => {
    const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
    const res = await reopenFinding(t.db, {
      actor: officer.ref,
      scope: scope(officer, "reopen"),
      id: findingCol,
      reason: "The new reading was taken on the wrong unit",
      now: NOW,
    });
    expect(res.state).toBe("open");
    const mail = await listUnsentFindingMail(t.db, { ids: res.notificationIds });
    expect(mail.map((m) => [m.email, m.kind])).toEqual([["grant.oyelaran@kestrelmoor.example", "finding_reopened"]]);
  });

  it("waiving needs a reason of at least 10 characters, and then tells the branch", async () => {
    const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
    await expect(
      waiveFinding(t.db, { actor: officer.ref, scope: scope(officer, "waive"), id: findingTuc, reason: "ok", now: NOW }),
    ).rejects.toMatchObject({ code: "invalid", field: "reason" });
    expect((await t.db("findings").where({ id: findingTuc }).first("state")).state).toBe("open");
    const res = await waiveFinding(t.db, {
      actor: officer.ref,
      scope: scope(officer, "waive"),
      id: findingTuc,
      reason: "The unit was scrapped the same week with the tap on it",
      now: NOW,
    });
    expect(res.state).toBe("waived");
    const row = await t.db("findings").where({ id: findingTuc }).first("waiver_reason", "closed_at");
    expect(row.waiver_reason).toBe("The unit was scrapped the same week with the tap on it");
    const mail = await listUnsentFindingMail(t.db, { ids: res.notificationIds });
    expect(mail.map((m) => m.email)).toContain("lucia.baptiste-moreno@kestrelmoor.example");
  });

  it("a technician comments only on findings that name them", async () => {
    const tech = await actorOf("marcus.delacroix-byrd@kestrelmoor.example");
    const own = await t.db("findings").where({ technician_id: ids.techCol }).first("id");
    expect(own).toBeTruthy();
    const commentId = await addFindingComment(t.db, {
      actor: tech.ref,
      scope: scope(tech, "comment"),
      id: Number(own.id),
      body: "I will go back on Monday",
      now: NOW,
    });
    expect(commentId).toBeGreaterThan(0);
    const notMine = await t.db("findings").whereNot({ technician_id: ids.techCol }).orWhereNull("technician_id").first("id");
    await expect(
      addFindingComment(t.db, { actor: tech.ref, scope: scope(tech, "comment"), id: Number(notMine.id), body: "Hello", now: NOW }),
    ).rejects.toMatchObject({ code: "not_found" });
  });
});

describe("listing findings", () => {
  it("groups on the server with a count per group, in severity order", async () => {
    const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
    const res = await listFindings(t.db, {
      organisationId: 1,
      scope: scope(officer, "read"),
      query: findingListQuery.parse({ groupBy: "severity", state: "all", pageSize: 200 }),
      today: "2026-12-01",
    });
    expect(res.groups.map((g) => g.key)).toEqual(["critical", "major", "minor"].filter((k) => res.groups.some((g) => g.key === k)));
    expect(res.groups.reduce((n, g) => n + g.count, 0)).toBe(res.total);
    const order = res.rows.map((r) => ["critical", "major", "minor"].indexOf(r.severity));
    expect([...order].sort((a, b) => a - b)).toEqual(order);
  });

  it("every grouping counts each finding once, and the page follows the group order", async () => {
    const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
    for (const groupBy of ["branch", "rule", "severity", "state", "assignee", "due"] as const) {
      const res = await listFindings(t.db, {
        organisationId: 1,
        scope: scope(officer, "read"),
        query: findingListQuery.parse({ groupBy, state: "all", pageSize: 200 }),
        today: "2026-12-01",
      });
      expect(
        res.groups.reduce((n, g) => n + g.count, 0),
        groupBy,
      ).toBe(res.total);
      expect(new Set(res.groups.map((g) => g.key)).size, groupBy).toBe(res.groups.length);
    }
  });

  it("filters by rule, branch, assignee and due date bucket", async () => {
    const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
    const list = (q: Record<string, unknown>) =>
      listFindings(t.db, {
        organisationId: 1,
        scope: scope(officer, "read"),
        query: findingListQuery.parse({ pageSize: 200, state: "all", ...q }),
        today: "2026-12-01",
      });
    const byRule = await list({ ruleId: "CT-CERT-01" });
    expect(byRule.total).toBeGreaterThanOrEqual(2);
    expect(byRule.rows.every((r) => r.ruleId === "CT-CERT-01")).toBe(true);
    const assigned = await list({ assignee: String(ids.managerCol) });
    expect(assigned.rows.map((r) => r.id)).toEqual([findingCol]);
    const overdue = await list({ due: "overdue" });
    expect(overdue.rows.every((r) => r.dueOn! < "2026-12-01" && (r.state === "open" || r.state === "fix_proposed"))).toBe(true);
    expect(overdue.total).toBeGreaterThan(0);
  });
});

describe("saved views", () => {
  it("belong to one person: saving again replaces, others never see them", async () => {
    const officer = await actorOf("teodora.vasquez-lind@kestrelmoor.example");
    const other = await actorOf("anand.krishnaswamy@kestrelmoor.example");
    const view = await saveView(t.db, {
      actor: officer.ref,
      list: "findings",
      name: "Overdue criticals",
      query: { sort: "due", dir: "asc", state: "active", severity: "critical", due: "overdue" },
      now: NOW,
    });
    await saveView(t.db, {
      actor: officer.ref,
      list: "findings",
      name: "Overdue criticals",
      query: { sort: "due", dir: "asc", state: "active", severity: "major", due: "overdue" },
      now: NOW,
    });
    const mine = await listSavedViews(t.db, { actor: officer.ref, list: "findings" });
    expect(mine.map((v) => [v.name, v.query.severity])).toEqual([["Overdue criticals", "major"]]);
    expect(await listSavedViews(t.db, { actor: other.ref, list: "findings" })).toEqual([]);
    await expect(deleteSavedView(t.db, { actor: other.ref, id: view.id })).rejects.toMatchObject({ code: "not_found" });
    await deleteSavedView(t.db, { actor: officer.ref, id: view.id });
    expect(await listSavedViews(t.db, { actor: officer.ref, list: "findings" })).toEqual([]);
  });
});
