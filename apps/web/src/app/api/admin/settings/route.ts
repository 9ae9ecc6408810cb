import { ForbiddenError, subject } from "@casl/ability";
import { organisationSettingsInput } from "@coldtrail/core";
import { getOrganisationSettings, updateOrganisationSettings } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/** The organisation's name, rule packs and the tolerances the rules leave to the company. */
export const GET = route({ can: ["read", "Settings"] }, async ({ actor, ability, db }) => {
  ForbiddenError.from(ability).throwUnlessCan("read", subject("Settings", { organisationId: actor.organisationId }));
  return getOrganisationSettings(db, actor.organisationId);
});

export const PUT = route({ can: ["update", "Settings"], body: organisationSettingsInput }, async ({ actor, ability, db, body }) => {
  ForbiddenError.from(ability).throwUnlessCan("update", subject("Settings", { organisationId: actor.organisationId }));
  await updateOrganisationSettings(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
  return getOrganisationSettings(db, actor.organisationId);
});
