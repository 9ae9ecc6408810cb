export * from "./amount-input";
export * from "./field";
export * from "./form-alert";
export * from "./radio-cards";
export * from "./refrigerant-list";
export * from "./over-fill-confirm";
