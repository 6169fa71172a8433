export * from "./readResult.js";
export * from "./text.js";
export * from "./npy.js";
export * from "./delimited.js";
export * from "./jsonField.js";
export * from "./readVectorField.js";
export * from "./budget.js";
