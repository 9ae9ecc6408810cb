import type { Knex } from "knex";
import { RULE_PACKS, resolveSettings, type AuditSettings, type RulePack } from "@coldtrail/core";
import { RecordNotFoundError } from "../errors";

export interface OrganisationAuditSettings {
  name: string;
  packs: RulePack[];
  settings: AuditSettings;
}

function parseJson(text: unknown, fallback: unknown): unknown {
  if (typeof text !== "string" || text.trim() === "") return fallback;
  try {
    return JSON.parse(text);
  } catch {
    return fallback;
  }
}

/**
 * The rule packs the organisation switched on and the tolerances the rules leave to the company
 * (defaults from core). Packs the law imposes on a place apply to the branches there whatever this
 * says (core `packsForPlace`); the switched-on packs matter for optional, stricter local packs.
 */
export async function getOrganisationAuditSettings(db: Knex, organisationId: number): Promise<OrganisationAuditSettings> {
  const row = await db("organisations").where({ id: organisationId }).first("name", "rule_packs", "settings");
  if (!row) throw new RecordNotFoundError("No such organisation");
  const packs = parseJson(row.rule_packs, ["us_federal"]);
  const settings = parseJson(row.settings, {});
  return {
    name: row.name,
    packs: (Array.isArray(packs) ? packs : ["us_federal"]).filter((p): p is RulePack => (RULE_PACKS as readonly string[]).includes(p)),
    settings: resolveSettings(settings && typeof settings === "object" ? settings : {}),
  };
}
