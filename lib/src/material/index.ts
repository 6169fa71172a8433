export * from "./film.js";
export * from "./demo.js";
export * from "./filmFile.js";
export * from "./filmFileSystem.js";
