export * from "./bundle.js";
export * from "./display.js";
export * from "./figure.js";
export * from "./table.js";
export { currentContext, runInContext, type MimeBundle, type OutputSink, type OutputContext } from "./output.js";
export * from "./saveFigure.js";
