export {};
export * from "./ellipticIntegrals.js";
