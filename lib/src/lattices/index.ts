export * from "./dipolar.js";
export * from "./meanField.js";
