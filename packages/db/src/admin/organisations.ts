import type { Knex } from "knex";
import { invitationInput } from "@coldtrail/core";
import { appendActivity, rowId } from "../activity";
import { RecordConflictError } from "../errors";
import { issueInvitation } from "./invitations";

export interface NewOrganisation {
  organisationId: number;
  ownerId: number;
  token: string;
  expiresAt: string;
}

/**
 * Starts a company on Coldtrail: the organisation and its first owner, who gets a single-use link to
 * set a password. Everything after that (branches, people, inspectors, settings) happens in the browser.
 */
export async function createOrganisationWithOwner(
  db: Knex,
  opts: { name: string; ownerName: string; ownerEmail: string; now?: Date },
): Promise<NewOrganisation> {
  const now = opts.now ?? new Date();
  const at = now.toISOString();
  const owner = invitationInput.parse({ email: opts.ownerEmail, name: opts.ownerName, roles: ["owner"], branchIds: [] });
  const name = opts.name.trim();
  if (name.length < 2) throw new RecordConflictError("Give the organisation a name", "name");
  return db.transaction(async (trx) => {
    if (await trx("users").where({ email: owner.email }).first("id")) {
      throw new RecordConflictError("That e-mail address already belongs to a Coldtrail account", "email");
    }
    const [orgRow] = await trx("organisations")
      .insert({ name, rule_packs: JSON.stringify(["us_federal"]), settings: "{}", created_at: at })
      .returning("id");
    const organisationId = rowId(orgRow);
    const [userRow] = await trx("users")
      .insert({
        organisation_id: organisationId,
        email: owner.email,
        name: owner.name,
        password_hash: null,
        active: true,
        created_at: at,
        deactivated_at: null,
      })
      .returning("id");
    const ownerId = rowId(userRow);
    await trx("memberships").insert({ organisation_id: organisationId, user_id: ownerId, branch_id: null, role: "owner", created_at: at });
    const issued = await issueInvitation(trx, {
      organisationId,
      invitedBy: ownerId,
      user: { id: ownerId, email: owner.email, name: owner.name },
      memberships: [{ role: "owner", branchId: null }],
      now,
    });
    await appendActivity(trx, {
      organisationId,
      actorId: null,
      action: "organisation.created",
      subjectType: "Organisation",
      subjectId: organisationId,
      summary: `Opened ${name} on Coldtrail with ${owner.name} <${owner.email}> as owner`,
      at,
    });
    return { organisationId, ownerId, token: issued.token, expiresAt: issued.expiresAt };
  });
}
