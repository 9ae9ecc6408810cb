import { ForbiddenError, subject } from "@casl/ability";
import { disposalStatementAmendmentInput } from "@coldtrail/core";
import { amendDisposalStatement, DomainError, getDisposalStatement, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../../jobs/_lib/record-route-helpers";

export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "Disposal"] }, async ({ ability, db, params }) => {
  const id = recordId(params.id, "No such signed statement");
  const statement = await getDisposalStatement(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), id });
  if (!statement) throw new DomainError("not_found", "No such signed statement");
  return statement;
});

/** Correct a signed statement by amendment (reason required; previous values kept). */
export const PATCH = route<undefined, typeof disposalStatementAmendmentInput, { id: string }>(
  { can: ["update", "Disposal"], body: disposalStatementAmendmentInput },
  async ({ actor, ability, db, params, body }) => {
    const id = recordId(params.id, "No such signed statement");
    const statement = await getDisposalStatement(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), id });
    if (!statement) throw new DomainError("not_found", "No such signed statement");
    ForbiddenError.from(ability).throwUnlessCan(
      "update",
      subject("Disposal", { organisationId: statement.organisationId, branchId: statement.branchId }),
    );
    const amendmentId = await amendDisposalStatement(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      id,
      input: body,
    });
    return { id, amendmentId };
  },
);
