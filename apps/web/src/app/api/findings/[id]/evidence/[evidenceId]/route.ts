import { DomainError, getFindingEvidence, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { getFile } from "@/lib/server/storage";
import { pathId } from "../../../_lib/access";

/** An evidence file, served only to people who may read its finding, with the type checked at upload. */
export const GET = route<undefined, undefined, { id: string; evidenceId: string }>(
  { can: ["read", "Finding"] },
  async ({ actor, ability, db, params }) => {
    const evidence = await getFindingEvidence(db, {
      organisationId: actor.organisationId,
      scope: scopeByAbility(ability, "read", "Finding", "findings"),
      findingId: pathId(params.id, "finding"),
      evidenceId: pathId(params.evidenceId, "evidence"),
    });
    if (!evidence) throw new DomainError("not_found", "No such evidence");
    let file: { bytes: Uint8Array };
    try {
      file = await getFile(evidence.fileKey);
    } catch (err) {
      const name = (err as { name?: string })?.name;
      if (name === "NoSuchKey" || name === "NotFound") throw new DomainError("not_found", "The file is not in storage");
      throw err;
    }
    return new Response(Buffer.from(file.bytes), {
      headers: {
        "content-type": evidence.mime,
        "content-length": String(file.bytes.byteLength),
        "content-disposition": `inline; filename="${evidence.fileName.replace(/"/g, "")}"`,
        "x-content-type-options": "nosniff",
        "cache-control": "private, max-age=300",
      },
    });
  },
);
