export * from "./spec.js";
export * from "./catalogue.js";
