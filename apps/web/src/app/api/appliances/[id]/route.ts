import { subject } from "@casl/ability";
import { applianceUpdateInput } from "@coldtrail/core";
import {
  DomainError,
  getAppliance,
  listAmendments,
  listRegisterActivity,
  plannedSiteRecords,
  reviewApplianceLeaks,
  scopeByAbility,
  updateAppliance,
} from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeCreateInBranch, authorizeRegisterRecord, parseId, registerPermissions } from "../_shared/register-access";

type Params = { id: string };

/**
 * One appliance with what the rules derive from it: classification, leak-rate history and open
 * deadlines (computed by the rules core), its corrections and, for those who may read it, its activity.
 */
export const GET = route<undefined, undefined, Params>({ can: ["read", "Appliance"] }, async ({ actor, ability, db, params }) => {
  const id = parseId(params.id, "appliance");
  const appliance = await getAppliance(db, { scope: scopeByAbility(ability, "read", "Appliance", "appliances"), id });
  if (!appliance) throw new DomainError("not_found", "No such appliance");
  const ref = { organisationId: appliance.organisationId, branchId: appliance.branchId };
  // Leak events and deadlines are shown for the dates on which the reader may read this appliance's jobs
  // (everyone who reads the branch's jobs; an inspector only inside the granted window).
  const visibleOn = (date: string) => ability.can("read", subject("Job", { ...ref, technicianId: actor.userId, performedOn: date }));
  const permissions = registerPermissions(ability, "appliance", ref);
  const [leaks, amendments, activity] = await Promise.all([
    reviewApplianceLeaks(db, { organisationId: appliance.organisationId, applianceId: id, visibleOn }),
    listAmendments(db, { organisationId: appliance.organisationId, subjectType: "Appliance", subjectId: id }),
    permissions.readActivity
      ? listRegisterActivity(db, { organisationId: appliance.organisationId, subjectType: "Appliance", subjectId: id })
      : null,
  ]);
  return { appliance, leaks, amendments, activity, permissions };
});

/** Edits an appliance; a new refrigerant, full charge or category is a correction kept as an amendment. */
export const PATCH = route<undefined, typeof applianceUpdateInput, Params>(
  { can: ["update", "Appliance"], body: applianceUpdateInput },
  async ({ actor, ability, db, body, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "appliance", params.id, "update");
    const planned = plannedSiteRecords(body);
    if (planned.site) authorizeCreateInBranch(ability, actor, "Site", ref.branchId);
    if (planned.customer) authorizeCreateInBranch(ability, actor, "Customer", ref.branchId);
    return updateAppliance(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, id: ref.id, input: body });
  },
);
