import { NextResponse } from "next/server";
import { ForbiddenError, subject } from "@casl/ability";
import { certificationCardInput, certificationListQuery } from "@coldtrail/core";
import { DomainError, createCertification, listCertifications, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { UPLOAD_BODY_LIMIT } from "@/lib/api/body";
import { checkCardFile, refuseWith, storeCard } from "./_lib/card-files";

/** Cards the signed-in person may read: the officer's queue, a manager's branch, a technician's own. */
export const GET = route({ can: ["read", "Certification"], query: certificationListQuery }, async ({ actor, ability, db, query }) => {
  return listCertifications(db, {
    scope: scopeByAbility(ability, "read", "Certification", "certifications"),
    query,
    actorUserId: actor.userId,
  });
});

/**
 * Upload one's own card (multipart: `card` = the photo or PDF, `types` (repeated), `certifyingOrganisation`,
 * `certificateNumber`, `issuedOn`). Fields and file are checked together; nothing is stored unless both pass.
 */
export const POST = route(
  { can: ["create", "Certification"], accepts: "multipart", maxBody: UPLOAD_BODY_LIMIT },
  async ({ req, actor, ability, db }) => {
    ForbiddenError.from(ability).throwUnlessCan(
      "create",
      subject("Certification", { organisationId: actor.organisationId, userId: actor.userId }),
    );
    let form: FormData;
    try {
      form = await req.formData();
    } catch {
      throw new DomainError("invalid", "Send the card as a file upload with its details", "card");
    }
    const text = (name: string) => {
      const v = form.get(name);
      return typeof v === "string" ? v : undefined;
    };
    const fields = certificationCardInput.safeParse({
      types: form.getAll("types").filter((v): v is string => typeof v === "string"),
      certifyingOrganisation: text("certifyingOrganisation"),
      certificateNumber: text("certificateNumber"),
      issuedOn: text("issuedOn"),
    });
    const file = await checkCardFile(form.get("card"));
    const issues = [
      ...(fields.success
        ? []
        : fields.error.issues.map((i) => ({ code: "custom" as const, path: i.path.map(String), message: i.message }))),
      ...file.issues,
    ];
    if (issues.length > 0 || !fields.success || !file.card) refuseWith(issues);

    const keys = await storeCard(file.card, { organisationId: actor.organisationId, userId: actor.userId });
    const id = await createCertification(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      input: fields.data,
      card: { fileKey: keys.fileKey, mime: file.card.mime, thumbnailKey: keys.thumbnailKey },
    });
    return NextResponse.json({ id }, { status: 201 });
  },
);
