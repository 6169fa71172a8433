export * from "./spec.js";
export * from "./catalogue.js";
export { textureSpec, textureFromInputs } from "./topology.js";
