import { importMappingInput } from "@coldtrail/core";
import { setImportMapping, writeTransaction } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { importFor } from "../../_lib/import-access";
import { queueCheck } from "../../_lib/import-worker";

/** Confirms which column holds which field and starts checking every row in the background. */
export const PUT = route<undefined, typeof importMappingInput, { id: string }>(
  { can: ["create", "Import"], body: importMappingInput },
  async ({ actor, ability, db, params, body }) => {
    const detail = await importFor(db, actor, ability, params.id, "create");
    const ref = { userId: actor.userId, organisationId: actor.organisationId };
    await writeTransaction(db, async (trx) => {
      await setImportMapping(trx, { actor: ref, id: detail.id, mapping: body.mapping });
      await queueCheck(trx, detail.id, ref);
    });
    return { id: detail.id, state: "checking" };
  },
);
