/**
 * @helicoid/kernel: what notebook code imports.
 *
 *   import { slider, controlPanel, figure, table, display } from "@helicoid/kernel";
 *
 * Widgets (standard controls, boxes, output areas, links, control panels for plain functions),
 * rich display (plotly figures with an offline HTML fallback, result tables with units), and the
 * comm layer for widgets of your own.
 */
export * from "./widgets/index.js";
export * from "./display/index.js";
export { comms, Comm, CommManager } from "./comm/comms.js";
export { KERNEL_VERSION } from "./version.js";
export { readVectorFieldFile, type FileReadOptions } from "./io/readFieldFile.js";
export { parallelSkyrmionNumber, closeChargeWorkers, type ParallelChargeResult } from "./parallel/parallelSkyrmionNumber.js";
export { runNotebookFile, type RunResult } from "./notebook/runner.js";
export { parallelChernNumbers, closeChernWorkers, type ParallelChernOptions } from "./parallel/parallelChernNumbers.js";
export { computeInWorker, type WorkerComputeOptions } from "./parallel/computeInWorker.js";
