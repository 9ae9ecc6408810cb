import { ForbiddenError, subject } from "@casl/ability";
import { voidRecordInput } from "@coldtrail/core";
import { DomainError, getDisposalRecord, scopeByAbility, voidDisposal } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../../../jobs/_lib/record-route-helpers";

export const POST = route<undefined, typeof voidRecordInput, { id: string }>(
  { can: ["void", "Disposal"], body: voidRecordInput },
  async ({ actor, ability, db, params, body }) => {
    const id = recordId(params.id, "No such disposal record");
    const record = await getDisposalRecord(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), id });
    if (!record) throw new DomainError("not_found", "No such disposal record");
    ForbiddenError.from(ability).throwUnlessCan(
      "void",
      subject("Disposal", { organisationId: record.organisationId, branchId: record.branchId }),
    );
    await voidDisposal(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      type: "record",
      id,
      reason: body.reason,
    });
    return { id, voided: true };
  },
);
