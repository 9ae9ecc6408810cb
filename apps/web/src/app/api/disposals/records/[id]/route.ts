import { ForbiddenError, subject } from "@casl/ability";
import { disposalRecordAmendmentInput } from "@coldtrail/core";
import { amendDisposalRecord, DomainError, getDisposalRecord, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { recordId } from "../../../jobs/_lib/record-route-helpers";

export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "Disposal"] }, async ({ ability, db, params }) => {
  const id = recordId(params.id, "No such disposal record");
  const record = await getDisposalRecord(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), id });
  if (!record) throw new DomainError("not_found", "No such disposal record");
  return record;
});

/** Correct a disposal record by amendment (reason required; previous values kept). */
export const PATCH = route<undefined, typeof disposalRecordAmendmentInput, { id: string }>(
  { can: ["update", "Disposal"], body: disposalRecordAmendmentInput },
  async ({ actor, ability, db, params, body }) => {
    const id = recordId(params.id, "No such disposal record");
    const record = await getDisposalRecord(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), id });
    if (!record) throw new DomainError("not_found", "No such disposal record");
    ForbiddenError.from(ability).throwUnlessCan(
      "update",
      subject("Disposal", { organisationId: record.organisationId, branchId: record.branchId }),
    );
    const amendmentId = await amendDisposalRecord(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      id,
      input: body,
    });
    return { id, amendmentId };
  },
);
