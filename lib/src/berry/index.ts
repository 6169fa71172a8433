export {};
export * from "./spinOperators.js";
export * from "./spinCoherentState.js";
export * from "./loopOnSphere.js";
export * from "./loopSolidAngle.js";
export * from "./spinBerryPhase.js";
export * from "./wilsonLoop.js";
export * from "./blochModel.js";
export * from "./chernNumbers.js";
