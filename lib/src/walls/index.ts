export {};
export * from "./wall180.js";
