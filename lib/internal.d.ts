// @helicoid/lib/internal for Node10 module resolution (see src/internal.ts): the built internal entry.
export * from "./dist/internal.js";
