export * from "./finding-states";
export * from "./due-dates";
export * from "./reconcile-findings";
export * from "./finding-refs";
export * from "./record-health";
export * from "./digest";
export * from "./person-findings";
