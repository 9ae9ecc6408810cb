import { z } from "zod";
import { DomainError } from "@coldtrail/db";

/**
 * The one parser of record ids in a URL path: digits only (no sign, exponent, decimals, spaces or
 * leading zeros), a positive safe integer. `1e3`, `0x10`, ` 7`, `007` and `9007199254740993` are not ids.
 */
export const recordIdSchema = z
  .string()
  .regex(/^[1-9][0-9]{0,15}$/, "Not a record id")
  .transform(Number)
  .refine((n) => Number.isSafeInteger(n), "Not a record id");

/** A record id from the path; anything else is a record that does not exist (404). */
export function recordId(raw: string | undefined, notFound: string): number {
  const parsed = recordIdSchema.safeParse(raw);
  if (!parsed.success) throw new DomainError("not_found", notFound);
  return parsed.data;
}

/** A params schema for routes whose path segments are all record ids: `idParams("id", "weighingId")`. */
export function idParams<K extends string>(...names: K[]) {
  return z.object(Object.fromEntries(names.map((n) => [n, recordIdSchema])) as Record<K, typeof recordIdSchema>);
}

/** Path segments the wrapper treats as record ids even without a declared schema. */
export function isIdSegment(name: string): boolean {
  return name === "id" || /[a-z]Id$/.test(name);
}

/**
 * Checks the path params: with a schema, parsed by it; without, every id-like segment must still be a
 * record id (so no route accepts `1e3`). Anything wrong is "not found".
 */
export function parseParams(raw: Record<string, string | string[]>, schema?: z.ZodType): unknown {
  if (schema) {
    const parsed = schema.safeParse(raw);
    if (!parsed.success) throw new DomainError("not_found", "Not found");
    return parsed.data;
  }
  for (const [name, value] of Object.entries(raw)) {
    if (isIdSegment(name) && !recordIdSchema.safeParse(value).success) throw new DomainError("not_found", "Not found");
  }
  return raw;
}
