export * from "./ability";
