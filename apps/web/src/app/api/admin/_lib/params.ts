import { z } from "zod";
import { DomainError } from "@coldtrail/db";

const idParam = z.coerce.number().int().positive();

/** A record id from the path; anything else is a record that does not exist. */
export function recordId(value: string | undefined, what: string): number {
  const parsed = idParam.safeParse(value);
  if (!parsed.success) throw new DomainError("not_found", `No such ${what}`);
  return parsed.data;
}
