import { registerHistoryQuery } from "@coldtrail/core";
import { listApplianceJobs, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeRegisterRecord } from "../../_shared/register-access";

/** The refrigerant history of an appliance: the jobs on it the person may read, with what each moved. */
export const GET = route<typeof registerHistoryQuery, undefined, { id: string }>(
  { can: ["read", "Appliance"], query: registerHistoryQuery },
  async ({ actor, ability, db, query, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "appliance", params.id, "read");
    return listApplianceJobs(db, { scope: scopeByAbility(ability, "read", "Job", "jobs"), applianceId: ref.id, query });
  },
);
