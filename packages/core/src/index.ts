// Before any schema is built: zod without code generation in the browser (see the module).
import "./schemas/zod-config";
// Vocabulary, input schemas, permissions.
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
// Where each rule pack applies (branch country and region → packs).
export * from "./places/rule-pack-places";
// Sign-in security (pure): password policy, safe redirects after sign-in, session idle timeouts.
export * from "./security";
