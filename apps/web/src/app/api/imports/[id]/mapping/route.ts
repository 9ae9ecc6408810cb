import { importMappingInput } from "@coldtrail/core";
import { setImportMapping } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { importFor } from "../../_lib/import-access";
import { startCheck } from "../../_lib/import-worker";

/** Confirms which column holds which field and starts checking every row in the background. */
export const PUT = route<undefined, typeof importMappingInput, { id: string }>(
  { can: ["create", "Import"], body: importMappingInput },
  async ({ actor, ability, db, params, body }) => {
    const detail = await importFor(db, actor, ability, params.id, "create");
    const ref = { userId: actor.userId, organisationId: actor.organisationId };
    await setImportMapping(db, { actor: ref, id: detail.id, mapping: body.mapping });
    startCheck(detail.id, ref);
    return { id: detail.id, state: "checking" };
  },
);
