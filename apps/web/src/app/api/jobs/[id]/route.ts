import { z } from "zod";
import { DomainError, getJob, scopeByAbility } from "@coldtrail/db";
import { route } from "@/lib/api/route";

const idParam = z.coerce.number().int().positive();

/** One job, if the signed-in person may read it; otherwise 404 (we do not reveal that it exists). */
export const GET = route<undefined, undefined, { id: string }>({ can: ["read", "Job"] }, async ({ ability, db, params }) => {
  const id = idParam.safeParse(params.id);
  if (!id.success) throw new DomainError("not_found", "No such job");
  const job = await getJob(db, { scope: scopeByAbility(ability, "read", "Job", "jobs"), id: id.data });
  if (!job) throw new DomainError("not_found", "No such job");
  return job;
});
