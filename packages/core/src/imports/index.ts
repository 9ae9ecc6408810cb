// Spreadsheet import: what each record kind's columns mean, how columns are suggested, and how a
// row becomes a record (pure; the database layer checks what needs the stored records).
export * from "./import-fields";
export * from "./suggest-mapping";
export * from "./parse-import-row";
export * from "./csv-rows";
