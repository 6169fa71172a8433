// Exported pages: @helicoid/lib as the page's one copy, made by the library factory that
// widgets/build.mjs puts before the page bundle in dist/export.js (the Web Worker starts from the
// same factory's source text, so the page carries the library once).
const lib = globalThis.__helicoidLib;
if (!lib) throw new Error("@helicoid/lib is missing from this page (dist/export.js must begin with the library factory)");
module.exports = lib;
