import type { Knex } from "knex";

/** A correction of one of a finding's own records, made since the rules last saw the gap. */
export interface GapAmendment {
  id: number;
  subjectType: string;
  subjectId: number;
  subjectLabel: string;
  actorId: number;
  actorName: string;
  at: string;
  reason: string;
  fields: string[];
}

export type GapAmendments =
  /** Nobody but reviewers corrected the finding's records: the gap vanished for other reasons. */
  | { kind: "none" }
  /** Someone who cannot accept fixes corrected them: the fix goes to review. */
  | { kind: "amended"; amendments: GapAmendment[] }
  /** Those corrections were already offered as the fix, or the officer reopened the finding after them: it stays as it is. */
  | { kind: "reviewed" };

/** Who may accept a fix; their own corrections need no review. */
const REVIEWER_ROLES = ["compliance_officer", "owner"];

const SUBJECT_WORDS: Record<string, string> = {
  Job: "job",
  Appliance: "appliance",
  appliance: "appliance",
  Cylinder: "cylinder",
  RecoveryEquipment: "recovery equipment",
  Certification: "certification card",
  DisposalRecord: "disposal record",
  DisposalStatement: "disposal statement",
};

/** The amendment subjects that are a finding's own records, by the finding's record type. */
const OWN_SUBJECTS: Record<string, string[]> = {
  job: ["Job"],
  appliance: ["Appliance", "appliance"],
  cylinder: ["Cylinder"],
  equipment: ["RecoveryEquipment"],
  certification: ["Certification"],
};

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type StoredFindingRow = Record<string, any>;

/**
 * Why a finding's gap is gone, as far as corrections tell: the corrections of its own records (the
 * record it names; for a finding about an appliance, also the appliance's jobs) made after the rules
 * last saw the gap by someone who is neither a compliance officer nor an owner.
 */
export async function amendmentsBehindGap(
  trx: Knex | Knex.Transaction,
  opts: { organisationId: number; finding: StoredFindingRow },
): Promise<GapAmendments> {
  const f = opts.finding;
  const recordId = f.record_id === null || f.record_id === undefined ? null : Number(f.record_id);
  const applianceId = f.appliance_id === null || f.appliance_id === undefined ? null : Number(f.appliance_id);
  const own = OWN_SUBJECTS[f.record_type as string] ?? [];
  if ((own.length === 0 || recordId === null) && applianceId === null) return { kind: "none" };

  const rows = await trx("amendments as a")
    .join("users as u", "u.id", "a.actor_id")
    .where("a.organisation_id", opts.organisationId)
    .where("a.at", ">", f.last_seen_at)
    .where((w) => {
      if (own.length && recordId !== null) w.orWhere((x) => x.whereIn("a.subject_type", own).andWhere("a.subject_id", recordId));
      if (applianceId !== null) {
        w.orWhere((x) => x.whereIn("a.subject_type", OWN_SUBJECTS.appliance!).andWhere("a.subject_id", applianceId));
        w.orWhere((x) =>
          x.where("a.subject_type", "Job").whereIn("a.subject_id", trx("jobs").where({ appliance_id: applianceId }).select("id")),
        );
      }
    })
    .whereNotExists((sub) => {
      sub
        .select(1)
        .from("memberships as m")
        .whereRaw("m.user_id = a.actor_id")
        .where("m.organisation_id", opts.organisationId)
        .whereIn("m.role", REVIEWER_ROLES);
    })
    .orderBy([{ column: "a.at" }, { column: "a.id" }])
    .select("a.id", "a.subject_type", "a.subject_id", "a.actor_id", "u.name as actor_name", "a.at", "a.reason", "a.next");
  if (rows.length === 0) return { kind: "none" };
  // Corrections already offered as this finding's fix are not offered again: the fix waits for the
  // officer, or the officer reopened the finding after seeing them.
  const cited = new Set<number>();
  for (const e of await trx("finding_events")
    .where({ finding_id: f.id })
    .whereIn("action", ["fix_proposed", "correction_added"])
    .select("data")) {
    try {
      const data = JSON.parse(e.data ?? "null") as { amendments?: { id: number }[] } | null;
      for (const a of data?.amendments ?? []) cited.add(Number(a.id));
    } catch {
      // an event without readable data cites nothing
    }
  }
  const fresh = rows.filter((r) => !cited.has(Number(r.id)));
  if (fresh.length === 0) return { kind: "reviewed" };
  // An open finding changed state after the rules last saw it only by being reopened; corrections
  // older than that reopening were already reviewed.
  if (f.state === "open" && f.state_changed_at > f.last_seen_at && fresh.every((r) => r.at < f.state_changed_at))
    return { kind: "reviewed" };
  return {
    kind: "amended",
    amendments: fresh.map((r) => {
      let fields: string[];
      try {
        fields = Object.keys(JSON.parse(r.next ?? "{}") as object);
      } catch {
        fields = [];
      }
      return {
        id: Number(r.id),
        subjectType: r.subject_type,
        subjectId: Number(r.subject_id),
        subjectLabel: `${SUBJECT_WORDS[r.subject_type] ?? r.subject_type} #${r.subject_id}`,
        actorId: Number(r.actor_id),
        actorName: r.actor_name,
        at: r.at,
        reason: r.reason,
        fields,
      };
    }),
  };
}
