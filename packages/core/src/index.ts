// Lead-owned lines (keep): vocabulary, input schemas, permissions.
export * from "./vocabulary";
export * from "./schemas";
export * from "./permissions";
// Rules core (units, refrigerants, classification, leak rate, cylinders, audit engine …):
export * from "./rules-core";
