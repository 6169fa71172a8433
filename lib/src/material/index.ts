export * from "./film.js";
