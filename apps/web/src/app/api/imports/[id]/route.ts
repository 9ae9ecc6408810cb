import { route } from "@/lib/api/route";
import { importFor } from "../_lib/import-access";
import { isRunning, liveProgress, settleAbandoned } from "../_lib/import-worker";

/** One import with its state; while a step runs, the live progress of this server's worker. */
export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "Import"] }, async ({ actor, ability, db, params }) => {
  let detail = await importFor(db, actor, ability, params.id);
  if ((detail.state === "checking" || detail.state === "importing") && !isRunning(detail.id)) {
    await settleAbandoned(db, detail.id);
    detail = await importFor(db, actor, ability, params.id);
  }
  const live = liveProgress(detail.id);
  if (live && live.state === detail.state) {
    return {
      ...detail,
      progress: live.progress,
      totalRows: live.rowsRead,
      validRows: live.validRows,
      invalidRows: live.invalidRows,
      running: true,
    };
  }
  return { ...detail, running: isRunning(detail.id) };
});
