import { NextResponse } from "next/server";
import { ForbiddenError, subject } from "@casl/ability";
import { disposalStatementInput } from "@coldtrail/core";
import { createDisposalStatement, DomainError, getApplianceRef } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { readMultipart, storeSignedDocument } from "../../jobs/_lib/record-route-helpers";

/**
 * Keep a small appliance's signed statement (40 CFR 82.155(b)): the form fields, and optionally the
 * signed document (photo or PDF, checked by its bytes). Sent as multipart/form-data or JSON.
 */
export const POST = route({ can: ["create", "Disposal"] }, async ({ req, actor, ability, db }) => {
  const isJson = req.headers.get("content-type")?.includes("application/json");
  const { fields, file } = isJson ? { fields: (await req.json().catch(() => ({}))) as unknown, file: null } : await readMultipart(req);
  const input = disposalStatementInput.parse(fields); // a ZodError becomes a 400 naming each field
  const appliance = await getApplianceRef(db, { organisationId: actor.organisationId, id: input.applianceId });
  if (!appliance) throw new DomainError("invalid", "That appliance is not in your organisation's register", "applianceId");
  ForbiddenError.from(ability).throwUnlessCan(
    "create",
    subject("Disposal", { organisationId: actor.organisationId, branchId: appliance.branchId }),
  );
  const document = file ? await storeSignedDocument(file.bytes, actor.organisationId) : undefined;
  const id = await createDisposalStatement(db, { actor: { userId: actor.userId, organisationId: actor.organisationId }, input, document });
  return NextResponse.json({ id, document: Boolean(document) }, { status: 201 });
});
