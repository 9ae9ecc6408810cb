export * from "./completeness-line";
export * from "./detail-row";
export * from "./load-error";
