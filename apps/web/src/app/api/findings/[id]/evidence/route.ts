import { NextResponse } from "next/server";
import { z } from "zod";
import { addFindingEvidence, DomainError, getFinding, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { UPLOAD_BODY_LIMIT } from "@/lib/api/body";
import { pathId } from "../../_lib/access";
import { checkEvidenceFile, readForm, refuseWith, storeEvidence } from "../../_lib/evidence-files";

const note = z.preprocess(
  (v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
  z.string().trim().max(500, "Keep the note under 500 characters").optional(),
);

/** Attach a photo or PDF to a finding (multipart `file`, optional `note`), for anyone who may comment on it. */
export const POST = route<undefined, undefined, { id: string }>(
  { can: ["comment", "Finding"], accepts: "multipart", maxBody: UPLOAD_BODY_LIMIT },
  async ({ req, actor, ability, db, params }) => {
    const id = pathId(params.id, "finding");
    const scope = scopeByAbility(ability, "comment", "Finding", "findings");
    // Refuse before reading the upload when the finding is not there for this person.
    if (!(await getFinding(db, { organisationId: actor.organisationId, scope, id }))) throw new DomainError("not_found", "No such finding");
    const form = await readForm(req, "file");
    const parsedNote = note.safeParse(form.get("note") ?? undefined);
    const checked = form.get("file")
      ? await checkEvidenceFile(form.get("file"))
      : { issues: [{ code: "custom" as const, path: ["file"], message: "Choose a photo or a PDF" }] };
    const issues = [
      ...checked.issues,
      ...(parsedNote.success ? [] : [{ code: "custom" as const, path: ["note"], message: parsedNote.error.issues[0]!.message }]),
    ];
    if (issues.length > 0 || !("file" in checked) || !checked.file) refuseWith(issues);
    const file = await storeEvidence(
      checked.file,
      { organisationId: actor.organisationId, findingId: id },
      parsedNote.success ? (parsedNote.data ?? null) : null,
    );
    const evidenceId = await addFindingEvidence(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      scope,
      id,
      file,
    });
    return NextResponse.json({ id: evidenceId }, { status: 201 });
  },
);
