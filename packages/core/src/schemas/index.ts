export * from "./recovery-job";
