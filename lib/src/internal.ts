/**
 * @helicoid/lib/internal: every name of the library, the supported API of ./index.ts and the
 * internals besides (numerics, tables, helpers of the calculators). For our tests and our own
 * packages; names here may change or go without notice. Users import "@helicoid/lib".
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
