import { DomainError, getTask, requeueOutboxMail, retryFailedTask, writeTransaction } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { kickTaskRunner } from "@/lib/server/task-kick";
import { recordId } from "../../../_lib/params";

/**
 * The owner puts a failed background task of the organisation back in the queue (e.g. mail given up
 * while the mail server was down for long). Owner only: `update Settings` is the owner's alone.
 */
export const POST = route<undefined, undefined, { id: string }>({ can: ["update", "Settings"] }, async ({ actor, db, params }) => {
  const id = recordId(params.id, "task");
  const task = await getTask(db, id);
  if (!task || task.organisationId !== actor.organisationId) throw new DomainError("not_found", "No such background task");
  if (task.state !== "failed") throw new DomainError("conflict", "Only a failed task can be tried again");
  await writeTransaction(db, async (trx) => {
    if (!(await retryFailedTask(trx, { id, organisationId: actor.organisationId })))
      throw new DomainError("conflict", "Only a failed task can be tried again");
    if (task.kind === "mail") await requeueOutboxMail(trx, { id: Number(task.payload.outboxId) });
  });
  kickTaskRunner();
  return { id, state: "queued" };
});
