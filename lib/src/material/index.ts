export * from "./film.js";
export * from "./demo.js";
