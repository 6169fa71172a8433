export * from "./dormandPrince.js";
export * from "./trig2.js";
export * from "./wallMotion.js";
export * from "./skyrmionDrift.js";
export * from "./precessingSkyrmion.js";
