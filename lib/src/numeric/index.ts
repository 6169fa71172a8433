export {};
export * from "./ellipticIntegrals.js";
export * from "./tanhSinhQuadrature.js";
export * from "./minimize2d.js";
export * from "./denseLinalg.js";
export * from "./fft.js";
export * from "./gaussLegendre.js";
export * from "./bessel.js";
export * from "./brentMinimize.js";
