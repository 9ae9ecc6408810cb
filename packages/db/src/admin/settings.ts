import type { Knex } from "knex";
import {
  DEFAULT_SETTINGS,
  SESSION_IDLE_DEFAULTS,
  RULE_PACKS,
  RULE_PACK_LABELS,
  resolveSettings,
  type AuditSettings,
  type OrganisationSettingsInput,
  type RulePack,
  type SessionIdleSettings,
} from "@coldtrail/core";
import { appendActivity } from "../activity";
import { RecordNotFoundError } from "../errors";
import type { ActorRef } from "../types";

export interface OrganisationSettings {
  organisationId: number;
  name: string;
  rulePacks: RulePack[];
  /** Every setting the rules read: what the company chose, else the rules core's default. */
  settings: AuditSettings;
  /** Only what the company chose (missing keys follow the defaults). */
  chosen: Partial<AuditSettings>;
  /** Idle timeouts of sign-in sessions, in minutes (core security/sessions.ts). */
  sessionIdle: SessionIdleSettings;
}

const KEYS = Object.keys(DEFAULT_SETTINGS) as (keyof AuditSettings)[];

/** Keeps the known keys whose type matches the default's; anything else in the stored JSON is ignored. */
export function parseStoredSettings(json: unknown): Partial<AuditSettings> {
  let value: unknown = json;
  if (typeof json === "string") {
    try {
      value = JSON.parse(json);
    } catch {
      return {};
    }
  }
  if (!value || typeof value !== "object") return {};
  const out: Record<string, unknown> = {};
  for (const key of KEYS) {
    const v = (value as Record<string, unknown>)[key];
    if (v !== undefined && typeof v === typeof DEFAULT_SETTINGS[key]) out[key] = v;
  }
  return out;
}

export function parseRulePacks(json: unknown): RulePack[] {
  try {
    const value = typeof json === "string" ? JSON.parse(json) : json;
    if (Array.isArray(value)) return RULE_PACKS.filter((p) => value.includes(p));
  } catch {
    // fall through
  }
  return ["us_federal"];
}

/** The organisation's name, rule packs and audit settings (defaults from the rules core filled in). */
export async function getOrganisationSettings(db: Knex | Knex.Transaction, organisationId: number): Promise<OrganisationSettings> {
  const row = await db("organisations")
    .where({ id: organisationId })
    .first("id", "name", "rule_packs", "settings", "session_idle_minutes_officers", "session_idle_minutes_others");
  if (!row) throw new RecordNotFoundError("No such organisation");
  const chosen = parseStoredSettings(row.settings);
  return {
    organisationId: Number(row.id),
    name: row.name,
    rulePacks: parseRulePacks(row.rule_packs),
    settings: resolveSettings(chosen),
    chosen,
    sessionIdle: {
      officers: Number(row.session_idle_minutes_officers ?? SESSION_IDLE_DEFAULTS.officers),
      others: Number(row.session_idle_minutes_others ?? SESSION_IDLE_DEFAULTS.others),
    },
  };
}

const WORDS: Record<keyof AuditSettings, string> = {
  ptTolerancePsi: "pressure–temperature tolerance (psi)",
  massBalanceTolerancePercent: "mass-balance tolerance (%)",
  massBalanceToleranceG: "smallest mass-balance gap flagged (g)",
  requalificationYears: "cylinder requalification period (years)",
  strictFill130F: "stricter cylinder fill at 130 °F",
  leakRateMethod: "leak-rate method",
  disposalRecordGraceDays: "days a disposal record may follow the disposal",
  cardVerificationGraceDays: "days a new card may wait for verification",
};

const show = (v: unknown) => (typeof v === "boolean" ? (v ? "on" : "off") : String(v));

/**
 * Saves the organisation's name, rule packs and settings. Every setting is stored as chosen, so a later
 * change of a default in the rules core does not silently change what a company decided.
 */
export async function updateOrganisationSettings(
  db: Knex,
  opts: { actor: ActorRef; input: OrganisationSettingsInput; now?: Date },
): Promise<void> {
  const { actor, input } = opts;
  const at = (opts.now ?? new Date()).toISOString();
  await db.transaction(async (trx) => {
    const before = await getOrganisationSettings(trx, actor.organisationId);
    const next: AuditSettings = {
      ptTolerancePsi: input.ptTolerancePsi,
      massBalanceTolerancePercent: input.massBalanceTolerancePercent,
      massBalanceToleranceG: input.massBalanceToleranceG,
      requalificationYears: input.requalificationYears,
      strictFill130F: input.strictFill130F,
      leakRateMethod: input.leakRateMethod,
      disposalRecordGraceDays: input.disposalRecordGraceDays,
      cardVerificationGraceDays: input.cardVerificationGraceDays,
    };
    const rulePacks = RULE_PACKS.filter((p) => input.rulePacks.includes(p));

    const changes: string[] = [];
    if (before.name !== input.name) changes.push(`name from ${before.name} to ${input.name}`);
    if (before.rulePacks.join() !== rulePacks.join()) {
      changes.push(
        `rules from ${before.rulePacks.map((p) => RULE_PACK_LABELS[p]).join(" + ")} to ${rulePacks.map((p) => RULE_PACK_LABELS[p]).join(" + ")}`,
      );
    }
    for (const key of KEYS) {
      if (before.settings[key] !== next[key]) changes.push(`${WORDS[key]} from ${show(before.settings[key])} to ${show(next[key])}`);
    }
    const sessionIdle: SessionIdleSettings = {
      officers: input.sessionIdleMinutesOfficers ?? before.sessionIdle.officers,
      others: input.sessionIdleMinutesOthers ?? before.sessionIdle.others,
    };
    if (sessionIdle.officers !== before.sessionIdle.officers)
      changes.push(`idle sign-out for owners and officers from ${before.sessionIdle.officers} to ${sessionIdle.officers} minutes`);
    if (sessionIdle.others !== before.sessionIdle.others)
      changes.push(`idle sign-out for everyone else from ${before.sessionIdle.others} to ${sessionIdle.others} minutes`);
    const storedSame = KEYS.every((k) => before.chosen[k] === next[k]);
    if (changes.length === 0 && storedSame) return;

    await trx("organisations")
      .where({ id: actor.organisationId })
      .update({
        name: input.name,
        rule_packs: JSON.stringify(rulePacks),
        settings: JSON.stringify(next),
        session_idle_minutes_officers: sessionIdle.officers,
        session_idle_minutes_others: sessionIdle.others,
      });
    await appendActivity(trx, {
      organisationId: actor.organisationId,
      actorId: actor.userId,
      action: "settings.updated",
      subjectType: "Settings",
      subjectId: actor.organisationId,
      summary: changes.length
        ? `Changed the settings: ${changes.join("; ")}`
        : "Saved the settings as they were (defaults now kept as chosen)",
      data: {
        before: { name: before.name, rulePacks: before.rulePacks, settings: before.chosen, sessionIdle: before.sessionIdle },
        after: { name: input.name, rulePacks, settings: next, sessionIdle },
      },
      at,
    });
  });
}
