import { NextResponse } from "next/server";
import { auditInput, auditListQuery } from "@coldtrail/core";
import { createAudit, listAudits, writeTransaction } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { kickAuditRunner, queueAudit } from "@/lib/server/audit-runner";
import { readableFindingBranches, visibleAudit } from "./_visible";

/** The organisation's audits, newest first, with the summary of the branches the person may read. */
export const GET = route({ can: ["read", "Audit"], query: auditListQuery }, async ({ actor, ability, db, query }) => {
  const page = await listAudits(db, { organisationId: actor.organisationId, page: query.page, pageSize: query.pageSize });
  const readable = await readableFindingBranches(db, actor, ability);
  return { ...page, rows: page.rows.map((r) => visibleAudit(r, readable)) };
});

/** Start an audit: branches, period, rule packs. It runs in the background; poll GET /api/audits/:id. */
export const POST = route({ idempotent: true, can: ["run", "Audit"], body: auditInput }, async ({ actor, db, body }) => {
  // The audit and its background task commit together.
  const id = await writeTransaction(db, async (trx) => {
    const created = await createAudit(trx, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input: body });
    await queueAudit(trx, { auditId: created, organisationId: actor.organisationId });
    return created;
  });
  kickAuditRunner();
  return NextResponse.json({ id }, { status: 201 });
});
