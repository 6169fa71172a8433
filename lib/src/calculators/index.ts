export * from "./spec.js";
export * from "./uncertainty.js";
export * from "./catalogue.js";
export { textureSpec, textureFromInputs } from "./topology.js";
export { fieldPreview, TEXTURE_PREVIEW_MAX } from "./topology.js";
