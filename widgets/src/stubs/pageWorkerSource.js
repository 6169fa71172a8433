// Exported pages: the worker's source text, made on demand from the library factory (see pageLib.cjs).
export default () => (typeof globalThis.__helicoidWorkerSource === "function" ? globalThis.__helicoidWorkerSource() : "");
