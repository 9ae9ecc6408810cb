// First: zod settings every schema below is built with (see zod-setup.ts).
import "./zod-setup";
// Lead-owned lines (keep): vocabulary, input schemas, permissions.
export * from "./vocabulary";
export * from "./schemas";
export * from "./permissions";
// Rules core (units, refrigerants, classification, leak rate, cylinders, audit engine …):
export * from "./rules-core";
// Instant feedback on a job being entered (jobs):
export * from "./feedback/check-job-draft";
// Findings workflow (pure): states, due dates, reconciliation, record health, digest.
export * from "./findings";
// Spreadsheet import: fields, column suggestions, row parsing, CSV reading (pure).
export * from "./imports";
// Sign-in security (pure): password policy, safe redirects after sign-in, session idle timeouts.
export * from "./security";
