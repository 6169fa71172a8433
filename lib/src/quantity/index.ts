export * from "./constants.js";
export * from "./units.js";
