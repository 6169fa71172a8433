export {};
export * from "./wall180.js";
export * from "./wall360.js";
