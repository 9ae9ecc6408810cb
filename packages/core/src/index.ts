export * from "./vocabulary";
