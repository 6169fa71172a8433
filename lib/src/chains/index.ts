export * from "./model.js";
export * from "./basis.js";
export * from "./operator.js";
export * from "./lanczos.js";
export * from "./spectrum.js";
export * from "./closedForms.js";
export * from "./dynamics.js";
export * from "./wallBand.js";
