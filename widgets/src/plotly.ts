/**
 * The plotly.js bundle every view uses: in JupyterLab the cartesian distribution (scatter, bar,
 * heatmap, contour, histogram; about 1.4 MB minified against 4.7 MB for the full one); in exported
 * pages a smaller build of plotly's core with the trace types it lists in `Plotly.traceTypes`
 * (src/pagePlotly.js). Figures with other trace types show a message naming the type.
 */
import Plotly from "plotly.js-cartesian-dist-min";

export { Plotly };

/** Trace types the bundle draws: the page build's own list, else the cartesian distribution's. */
export const supportedTraceTypes = new Set(
  (Plotly as { traceTypes?: string[] }).traceTypes ?? [
    "scatter",
    "scattergl",
    "bar",
    "box",
    "heatmap",
    "histogram",
    "histogram2d",
    "histogram2dcontour",
    "contour",
    "pie",
    "image",
    "violin",
    "scatterternary",
  ],
);

/** Names of trace types in `data` that this bundle cannot draw. */
export function unsupportedTraces(data: Array<{ type?: string }>): string[] {
  const out = new Set<string>();
  for (const t of data ?? []) {
    const type = t?.type ?? "scatter";
    if (!supportedTraceTypes.has(type)) out.add(type);
  }
  return [...out];
}
