import { activityListQuery } from "@coldtrail/core";
import { listRecordActivity, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { visiblePerson } from "../../_shared";

/** Changes to a person's account and access, newest first. */
export const GET = route<typeof activityListQuery, undefined, { id: string }>(
  { can: ["read", "Activity"], query: activityListQuery },
  async ({ ability, db, params, query }) => {
    const person = await visiblePerson(db, ability, params.id);
    return listRecordActivity(db, {
      scope: scopeByAbility(ability, "read", "Activity", "activity"),
      subjectType: "User",
      subjectId: person.id,
      query,
    });
  },
);
