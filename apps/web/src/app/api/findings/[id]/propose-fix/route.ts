import { proposeFixInput } from "@coldtrail/core";
import { proposeFindingFix, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { UPLOAD_BODY_LIMIT } from "@/lib/api/body";
import { deliverFindingMailLater } from "@/lib/server/finding-mail";
import { pathId } from "../../_lib/access";
import { checkEvidenceFile, readForm, refuseWith, storeEvidence } from "../../_lib/evidence-files";

/**
 * The branch proposes the finding as fixed: a note (what was done) and, optionally, one evidence file.
 * JSON `{ note }`, or multipart with `note` and `file`. Note and file are checked together; nothing is
 * stored unless both pass.
 */
export const POST = route<undefined, undefined, { id: string }>(
  { can: ["propose_fix", "Finding"], accepts: "json-or-multipart", maxBody: UPLOAD_BODY_LIMIT },
  async ({ req, actor, ability, db, params }) => {
    const id = pathId(params.id, "finding");
    const multipart = (req.headers.get("content-type") ?? "").includes("multipart/form-data");
    let note: unknown;
    let filePart: FormDataEntryValue | null = null;
    if (multipart) {
      const form = await readForm(req, "file");
      note = form.get("note");
      filePart = form.get("file");
    } else {
      const json: unknown = await req.json().catch(() => null);
      note = json !== null && typeof json === "object" ? (json as { note?: unknown }).note : undefined;
    }
    const parsed = proposeFixInput.safeParse({ note });
    const checked = await checkEvidenceFile(filePart);
    const issues = [
      ...(parsed.success
        ? []
        : parsed.error.issues.map((i) => ({ code: "custom" as const, path: i.path.map(String), message: i.message }))),
      ...checked.issues,
    ];
    if (issues.length > 0 || !parsed.success) refuseWith(issues);
    const scope = scopeByAbility(ability, "propose_fix", "Finding", "findings");
    const evidence = checked.file
      ? await storeEvidence(checked.file, { organisationId: actor.organisationId, findingId: id }, "Evidence of the fix")
      : null;
    const res = await proposeFindingFix(db, {
      actor: { userId: actor.userId, organisationId: actor.organisationId },
      scope,
      id,
      note: parsed.data.note,
      evidence,
    });
    deliverFindingMailLater(db, res.notificationIds);
    return { id: res.id, state: res.state };
  },
);
