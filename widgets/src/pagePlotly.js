// plotly.js of exported pages (widgets/build.mjs bundles this as its own part of dist/export.js):
// the core (scatter, the components) and the trace types of the cartesian distribution that
// JupyterLab draws (not scattergl: WebGL; not image: it needs a Buffer polyfill), from plotly.js's own
// modules. Against the cartesian distribution (1.42 MB) it is
// 1.2 MB and runs in about half the time at page start (test/bench/page.bench.mjs). Other trace
// types get the figure's "cannot draw" message (src/plotly.ts reads `traceTypes`).
var Plotly = require("plotly.js/lib/core");
var traces = {
  heatmap: require("plotly.js/lib/heatmap"),
  contour: require("plotly.js/lib/contour"),
  bar: require("plotly.js/lib/bar"),
  histogram: require("plotly.js/lib/histogram"),
  histogram2d: require("plotly.js/lib/histogram2d"),
  histogram2dcontour: require("plotly.js/lib/histogram2dcontour"),
  // the rest of the cartesian distribution's trace types (what JupyterLab's figures draw), so a
  // user's own plotly figure draws the same in JupyterLab and in the exported page
  box: require("plotly.js/lib/box"),
  violin: require("plotly.js/lib/violin"),
  pie: require("plotly.js/lib/pie"),
  scatterternary: require("plotly.js/lib/scatterternary"),
};
Plotly.register(Object.values(traces));
Plotly.traceTypes = ["scatter"].concat(Object.keys(traces));
globalThis.Plotly = Plotly;
