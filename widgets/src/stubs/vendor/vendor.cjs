// Exported pages: the widget runtime part of dist/export.js (src/pageVendor.ts) is this module.
const v = globalThis.__hxVendor;
if (!v) throw new Error("the widget runtime is missing from this page (dist/export.js must run the runtime part before the page bundle)");
module.exports = v;
