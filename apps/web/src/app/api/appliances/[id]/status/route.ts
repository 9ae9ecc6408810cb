import { applianceStatusInput } from "@coldtrail/core";
import { changeApplianceStatus } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeRegisterRecord } from "../../_shared/register-access";

/** Puts an appliance back in service, retires it or records its disposal, with the date and why. */
export const POST = route<undefined, typeof applianceStatusInput, { id: string }>(
  { can: ["update", "Appliance"], body: applianceStatusInput },
  async ({ actor, ability, db, body, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "appliance", params.id, "update");
    const amendmentId = await changeApplianceStatus(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      id: ref.id,
      input: body,
    });
    return { amendmentId };
  },
);
