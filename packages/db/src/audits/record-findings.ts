import type { Knex } from "knex";
import type { FindingState, Severity } from "@coldtrail/core";
import type { ScopeFn } from "../types";

/** What a saved record did to a finding. */
export type RecordFindingEffect = "raised" | "closed";

export interface RecordFindingRow {
  id: number;
  ruleId: string;
  title: string;
  severity: Severity;
  /** The finding's state now. */
  state: FindingState;
  dueOn: string | null;
  /** True when the finding is about this record itself (its rule names the record). */
  aboutRecord: boolean;
  /** What the continuous re-checks after this record's writes (creation, corrections, void) did to it, oldest first. */
  effects: { effect: RecordFindingEffect; at: string }[];
}

const EFFECT_OF: Record<string, RecordFindingEffect> = { opened: "raised", found_again: "raised", no_longer_found: "closed" };

/**
 * The findings a record raised or closed: those whose rule names the record, and those whose
 * "opened", "found again" or "no longer found" event came from the continuous re-check that answered
 * one of the record's writes (its creation, corrections, void). Only findings `scope` lets the
 * reader see are returned (the findings table, scoped like the findings list).
 */
export async function listFindingsOfRecord(
  db: Knex,
  opts: { scope: ScopeFn; organisationId: number; recordType: "job"; recordId: number; subjectTypes: readonly string[]; limit?: number },
): Promise<RecordFindingRow[]> {
  const limit = opts.limit ?? 50;
  const scoped = (qb: Knex.QueryBuilder) =>
    qb.where(function inScope(this: Knex.QueryBuilder) {
      opts.scope(this);
    });

  const about = await scoped(
    db("findings").where({
      "findings.organisation_id": opts.organisationId,
      "findings.record_type": opts.recordType,
      "findings.record_id": opts.recordId,
    }),
  )
    .orderBy("findings.id")
    .limit(limit)
    .select("findings.id", "findings.rule_id", "findings.title", "findings.severity", "findings.state", "findings.due_on");

  const events = await scoped(
    db("finding_events as fe")
      .join("findings", "findings.id", "fe.finding_id")
      .join("activity as a", function causedBy(this: Knex.JoinClause) {
        this.on("a.id", ">", "fe.cause_after_activity_id").andOn("a.id", "<=", "fe.cause_to_activity_id");
      })
      .where("fe.organisation_id", opts.organisationId)
      .where("a.organisation_id", opts.organisationId)
      .whereIn("a.subject_type", [...opts.subjectTypes])
      .where("a.subject_id", opts.recordId)
      .whereIn("fe.action", Object.keys(EFFECT_OF)),
  )
    .distinct(
      "fe.id as event_id",
      "fe.action",
      "fe.at",
      "findings.id",
      "findings.rule_id",
      "findings.title",
      "findings.severity",
      "findings.state",
      "findings.due_on",
    )
    .orderBy("fe.id")
    .limit(limit * 4);

  const out = new Map<number, RecordFindingRow>();
  const rowOf = (r: { id: number; rule_id: string; title: string; severity: Severity; state: FindingState; due_on: string | null }) => {
    const id = Number(r.id);
    let row = out.get(id);
    if (!row) {
      row = {
        id,
        ruleId: r.rule_id,
        title: r.title,
        severity: r.severity,
        state: r.state,
        dueOn: r.due_on ?? null,
        aboutRecord: false,
        effects: [],
      };
      out.set(id, row);
    }
    return row;
  };
  for (const r of about) rowOf(r).aboutRecord = true;
  for (const e of events) rowOf(e).effects.push({ effect: EFFECT_OF[e.action as string]!, at: e.at });
  return [...out.values()].slice(0, limit);
}
