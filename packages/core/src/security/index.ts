export * from "./password-policy";
export * from "./safe-redirect";
export * from "./sessions";
