import { importIssuesQuery } from "@coldtrail/core";
import { listImportIssues } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { importFor } from "../../_lib/import-access";

/** The problems found in the import's rows (row, field, why), a page at a time. */
export const GET = route<typeof importIssuesQuery, undefined, { id: string }>(
  { can: ["read", "Import"], query: importIssuesQuery },
  async ({ actor, ability, db, params, query }) => {
    const detail = await importFor(db, actor, ability, params.id);
    return listImportIssues(db, { organisationId: actor.organisationId, importId: detail.id, kind: detail.kind, query });
  },
);
