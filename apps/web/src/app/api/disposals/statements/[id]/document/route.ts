import { ForbiddenError, subject } from "@casl/ability";
import { statementDocumentInput } from "@coldtrail/core";
import { amendDisposalStatement, DomainError, getDisposalStatement, getStatementDocument, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { UPLOAD_BODY_LIMIT } from "@/lib/api/body";
import { getFile } from "@/lib/server/storage";
import { readMultipart, recordId, storeSignedDocument } from "../../../../jobs/_lib/record-route-helpers";

/** The signed document of a statement, for people who may read the statement. */
export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "Disposal"] }, async ({ ability, db, params }) => {
  const id = recordId(params.id, "No such signed document");
  const doc = await getStatementDocument(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), id });
  if (!doc) throw new DomainError("not_found", "No such signed document");
  const file = await getFile(doc.key);
  const ext = doc.mime === "application/pdf" ? "pdf" : (doc.mime.split("/")[1] ?? "bin");
  return new Response(Buffer.from(file.bytes), {
    headers: {
      "content-type": doc.mime,
      "content-disposition": `inline; filename="signed-statement-${id}.${ext}"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});

/** Attach (or replace) the signed document of a statement on record: an amendment with a reason. */
export const POST = route<undefined, undefined, { id: string }>(
  { can: ["update", "Disposal"], accepts: "multipart", maxBody: UPLOAD_BODY_LIMIT },
  async ({ req, actor, ability, db, params }) => {
    const id = recordId(params.id, "No such signed statement");
    const statement = await getDisposalStatement(db, { scope: scopeByAbility(ability, "read", "Disposal", "d"), id });
    if (!statement) throw new DomainError("not_found", "No such signed statement");
    ForbiddenError.from(ability).throwUnlessCan(
      "update",
      subject("Disposal", { organisationId: statement.organisationId, branchId: statement.branchId }),
    );
    const { fields, file } = await readMultipart(req);
    const { reason } = statementDocumentInput.parse(fields);
    if (!file) throw new DomainError("invalid", "Choose the signed document to upload", "document");
    const document = await storeSignedDocument(file, actor.organisationId);
    const amendmentId = await amendDisposalStatement(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      id,
      input: { reason, changes: {} },
      document,
    });
    return { id, amendmentId };
  },
);
