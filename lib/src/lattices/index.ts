export * from "./dipolar.js";
