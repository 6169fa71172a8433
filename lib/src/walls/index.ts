export {};
export * from "./wall180.js";
export * from "./wall360.js";
export * from "./wallType.js";
export * from "./magnetostatics.js";
export * from "./demagFft.js";
export * from "./skyrmionEnergy.js";
export * from "./skyrmionAnsatz.js";
export * from "./skyrmionExact.js";
