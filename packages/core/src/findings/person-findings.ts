import type { FindingRecordType } from "../audit/finding";

/**
 * Findings about a person rather than about one branch's records: a technician, or one of their
 * certification cards. A person may work in several branches; such a finding is one finding for the
 * organisation, shown in every branch whose audit finds it, because every branch would find the same
 * gap in the same card.
 */
export const PERSON_LEVEL_RECORD_TYPES: readonly FindingRecordType[] = ["technician", "certification"];

export function isPersonLevelRecordType(recordType: string): boolean {
  return (PERSON_LEVEL_RECORD_TYPES as readonly string[]).includes(recordType);
}
