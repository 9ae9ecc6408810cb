import { registerHistoryQuery } from "@coldtrail/core";
import { listCylinderMovements, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { authorizeRegisterRecord } from "../../../appliances/_shared/register-access";

/** What went into and out of a cylinder; jobs are named only to those who may read them. */
export const GET = route<typeof registerHistoryQuery, undefined, { id: string }>(
  { can: ["read", "Cylinder"], query: registerHistoryQuery },
  async ({ actor, ability, db, query, params }) => {
    const ref = await authorizeRegisterRecord({ actor, ability, db }, "cylinder", params.id, "read");
    return listCylinderMovements(db, { cylinderId: ref.id, jobScope: scopeByAbility(ability, "read", "Job", "jobs"), query });
  },
);
