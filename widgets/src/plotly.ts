/**
 * The plotly.js bundle every view uses: the cartesian distribution (scatter, bar, heatmap,
 * contour, histogram; about 1.4 MB minified against 4.7 MB for the full one), chosen by size for
 * the exported pages. Figures with other trace types show a message naming the type.
 */
import Plotly from "plotly.js-cartesian-dist-min";

export { Plotly };

/** Trace types the cartesian bundle draws. */
export const supportedTraceTypes = new Set([
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
]);

/** Names of trace types in `data` that this bundle cannot draw. */
export function unsupportedTraces(data: Array<{ type?: string }>): string[] {
  const out = new Set<string>();
  for (const t of data ?? []) {
    const type = t?.type ?? "scatter";
    if (!supportedTraceTypes.has(type)) out.add(type);
  }
  return [...out];
}
