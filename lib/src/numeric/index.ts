export {};
export * from "./ellipticIntegrals.js";
export * from "./tanhSinhQuadrature.js";
export * from "./minimize2d.js";
export * from "./denseLinalg.js";
