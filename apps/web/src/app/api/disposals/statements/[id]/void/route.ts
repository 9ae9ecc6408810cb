import { ForbiddenError, subject } from "@casl/ability";
import { voidRecordInput } from "@coldtrail/core";
import { DomainError, getDisposalStatement, scopeByAbility, voidDisposal } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../../../jobs/_lib/record-route-helpers";

export const POST = route<undefined, typeof voidRecordInput, { id: string }>(
  { can: ["void", "Disposal"], body: voidRecordInput },
  async ({ actor, ability, db, params, body }) => {
    const id = recordId(params.id, "No such signed statement");
    const statement = await getDisposalStatement(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), id });
    if (!statement) throw new DomainError("not_found", "No such signed statement");
    ForbiddenError.from(ability).throwUnlessCan(
      "void",
      subject("Disposal", { organisationId: statement.organisationId, branchId: statement.branchId }),
    );
    await voidDisposal(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      type: "statement",
      id,
      reason: body.reason,
    });
    return { id, voided: true };
  },
);
