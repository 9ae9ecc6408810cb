import { NextResponse } from "next/server";
import { createAudit, DomainError, getAuditRun, writeTransaction } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { kickAuditRunner, queueAudit } from "@/lib/server/audit-runner";
import { pathId } from "../../../findings/_lib/access";

/** Run an audit again with the same branches, period and rule packs; findings keep their identity. */
export const POST = route<undefined, undefined, { id: string }>(
  { idempotent: true, can: ["run", "Audit"] },
  async ({ actor, db, params }) => {
    const run = await getAuditRun(db, { organisationId: actor.organisationId, id: pathId(params.id, "audit") });
    if (!run) throw new DomainError("not_found", "No such audit");
    const id = await writeTransaction(db, async (trx) => {
      const created = await createAudit(trx, {
        actor: { userId: actor.userId, organisationId: actor.organisationId },
        input: { branchIds: run.branchIds, periodFrom: run.periodFrom, periodTo: run.periodTo, packs: run.packs },
      });
      await queueAudit(trx, { auditId: created, organisationId: actor.organisationId });
      return created;
    });
    kickAuditRunner();
    return NextResponse.json({ id }, { status: 201 });
  },
);
