export * from "./widget.js";
export * from "./controls.js";
export * from "./link.js";
export * from "./panel.js";
export * from "./factories.js";
