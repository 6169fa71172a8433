/**
 * @helicoid/lib: physics of magnetic textures. SI inside, units at the edges.
 * Pure TypeScript: no Node or DOM imports, so it runs in the kernel and in the browser.
 */
export * from "./errors.js";
export * from "./quantity/index.js";
export * from "./plot/index.js";
export * from "./material/index.js";
export * from "./numeric/index.js";
export * from "./walls/index.js";
export * from "./dynamics/index.js";
export * from "./topology/index.js";
export * from "./berry/index.js";
export * from "./fit/index.js";
export * from "./io/index.js";
export * from "./calculators/index.js";
export * from "./result.js";
export { report } from "./report.js";
export * from "./chains/index.js";
export * from "./ions/index.js";
export * from "./lattices/index.js";
