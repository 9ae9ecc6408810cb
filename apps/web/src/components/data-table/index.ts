export * from "./data-table";
export * from "./filters";
export * from "./table-view";
export * from "./void-tag";
