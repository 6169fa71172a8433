// Exported pages: plotly.js as its own part of dist/export.js (widgets/build.mjs runs the
// distribution file as a script before the page bundle, in a task of its own), read from the global.
const Plotly = globalThis.Plotly;
if (!Plotly) throw new Error("plotly.js is missing from this page (dist/export.js must run the plotly part before the page bundle)");
module.exports = Plotly;
