import { ForbiddenError, subject } from "@casl/ability";
import { jobDraftInput } from "@coldtrail/core";
import { checkJobDraftForActor, DomainError, getApplianceRef } from "@coldtrail/db";
import { route } from "@/lib/api/route";

/**
 * Instant feedback: runs the rules on a job still being typed and answers what would become a
 * finding if it were saved as it is. Writes nothing. Only for appliances the person may log jobs on.
 */
export const POST = route({ can: ["create", "Job"], body: jobDraftInput }, async ({ actor, ability, db, body }) => {
  if (body.applianceId !== undefined) {
    const appliance = await getApplianceRef(db, { organisationId: actor.organisationId, id: body.applianceId });
    if (!appliance) throw new DomainError("invalid", "That appliance is not in your organisation's register", "applianceId");
    ForbiddenError.from(ability).throwUnlessCan(
      "create",
      subject("Job", { organisationId: actor.organisationId, branchId: appliance.branchId, technicianId: actor.userId }),
    );
  }
  const result = await checkJobDraftForActor(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, draft: body });
  return {
    warnings: result.warnings,
    evacuationRequired: result.evacuationRequired,
    cylinderAfter: result.cylinderAfter,
    leakRate: result.leakRate,
  };
});
