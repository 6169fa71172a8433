/**
 * The library factory of exported pages (widgets/build.mjs): @helicoid/lib and the compute job
 * runner in one bundle, run once on the page and once in its Web Worker from the same source text.
 */
export * from "@helicoid/lib";
export { runJob as __runJob } from "./runJob.js";
