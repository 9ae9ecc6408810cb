import { recordId as parseRecordId } from "@/lib/api/params";

/** A record id from the path; anything else is a record that does not exist. */
export function recordId(value: string | undefined, what: string): number {
  return parseRecordId(value, `No such ${what}`);
}
