import { z } from "zod";
import { DomainError, getCertificationFileKeys } from "@coldtrail/db";
import { route } from "@/lib/api/route";
import { getFile } from "@/lib/server/storage";
import { cardFor } from "../../../certifications/_lib/card-access";

const variantQuery = z.object({ variant: z.enum(["card", "thumbnail"]).default("card") });
const EXTENSIONS: Record<string, string> = {
  "image/jpeg": "jpg",
  "image/png": "png",
  "image/webp": "webp",
  "image/heic": "heic",
  "application/pdf": "pdf",
};

/**
 * A card's stored file (or its thumbnail), served only after the same permission check as the card
 * itself. The type sent is the one checked at upload; the browser is told not to guess another.
 */
export const GET = route<typeof variantQuery, undefined, { id: string }>(
  { can: ["read", "Certification"], query: variantQuery },
  async ({ actor, ability, db, params, query }) => {
    const ref = await cardFor(db, actor, ability, params.id, "read");
    const keys = await getCertificationFileKeys(db, { organisationId: actor.organisationId, id: ref.id });
    const key = query.variant === "thumbnail" ? keys?.thumbnailKey : keys?.cardKey;
    const mime = query.variant === "thumbnail" ? "image/jpeg" : (keys?.cardMime ?? "application/octet-stream");
    if (!key) throw new DomainError("not_found", query.variant === "thumbnail" ? "This card has no thumbnail" : "This card has no file");
    let file: { bytes: Uint8Array };
    try {
      file = await getFile(key);
    } catch (err) {
      const name = (err as { name?: string })?.name;
      if (name === "NoSuchKey" || name === "NotFound") throw new DomainError("not_found", "The card's file is not in storage");
      throw err;
    }
    const filename = `certification-card-${ref.id}${query.variant === "thumbnail" ? "-thumbnail" : ""}.${query.variant === "thumbnail" ? "jpg" : (EXTENSIONS[mime] ?? "bin")}`;
    return new Response(Buffer.from(file.bytes), {
      status: 200,
      headers: {
        "content-type": mime,
        "content-length": String(file.bytes.byteLength),
        "content-disposition": `inline; filename="${filename}"`,
        "x-content-type-options": "nosniff",
        "cache-control": "private, max-age=300",
      },
    });
  },
);
