/**
 * A data-only redraw of plotly line traces: when only the y (and x) values of `mode: "lines"`
 * scatter traces change and the axes stay as they are, the new curves are written straight into
 * the SVG paths plotly drew (`path.js-line` of each trace, in trace order), with plotly's own
 * linear axis mapping. This skips plotly's whole pipeline (defaults, calc, axes, layout), which
 * costs 10-20 ms per update for a 200-point plot. The explorer follows such a swap with a full
 * `Plotly.react` once the slider rests, so hover labels and `gd.data` become exact again.
 * Relies on two details of plotly.js 2.x SVG output: `_fullLayout.{x,y}axis` with `range`
 * (log10 units on log axes) and `_length`, and one `path.js-line` per drawn line trace; when
 * either is missing the function answers false and the caller redraws with plotly.
 */

export interface AxisMap {
  range: [number, number];
  length: number;
  log: boolean;
}

interface PlotlyAxis {
  range?: number[];
  _length?: number;
  type?: string;
}

/** The SVG path of a polyline through (x, y), broken at gaps (null or non-finite), or "" if empty. */
export function linePath(x: ArrayLike<number>, y: ArrayLike<number | null>, xa: AxisMap, ya: AxisMap): string {
  const sx = xa.length / (xa.range[1] - xa.range[0]);
  const sy = ya.length / (ya.range[1] - ya.range[0]);
  const parts: string[] = [];
  let pen = false;
  const n = Math.min(x.length, y.length);
  for (let i = 0; i < n; i++) {
    let xv = x[i] as number;
    let yv = y[i];
    if (xa.log) xv = xv > 0 ? Math.log10(xv) : NaN;
    if (yv !== null && ya.log) yv = yv > 0 ? Math.log10(yv) : NaN;
    if (yv === null || !Number.isFinite(xv) || !Number.isFinite(yv)) {
      pen = false;
      continue;
    }
    const px = Math.round((xv - xa.range[0]) * sx * 100) / 100;
    const py = Math.round((ya.range[1] - yv) * sy * 100) / 100;
    parts.push(`${pen ? "L" : "M"}${px},${py}`);
    pen = true;
  }
  return parts.join("");
}

function axisMap(a: PlotlyAxis | undefined): AxisMap | null {
  if (!a || !Array.isArray(a.range) || a.range.length !== 2 || typeof a._length !== "number" || !(a._length > 0)) return null;
  if (a.type !== "linear" && a.type !== "log") return null;
  const range: [number, number] = [Number(a.range[0]), Number(a.range[1])];
  if (!Number.isFinite(range[0]) || !Number.isFinite(range[1]) || range[0] === range[1]) return null;
  return { range, length: a._length, log: a.type === "log" };
}

/**
 * Write the traces' new x/y into the lines plotly drew in `gd` (one x/y axis pair). True when done;
 * false (nothing changed) when the plot is not in the shape this needs.
 */
export function swapLineData(gd: HTMLElement, traces: Array<{ x: ArrayLike<number>; y: ArrayLike<number | null>; mode?: unknown }>): boolean {
  const full = (gd as unknown as { _fullLayout?: { xaxis?: PlotlyAxis; yaxis?: PlotlyAxis } })._fullLayout;
  const xa = axisMap(full?.xaxis),
    ya = axisMap(full?.yaxis);
  if (!xa || !ya) return false;
  if (traces.some((t) => t.mode !== "lines")) return false;
  const groups = gd.querySelectorAll(".scatterlayer > .trace");
  if (groups.length !== traces.length) return false;
  const paths: SVGPathElement[] = [];
  for (const g of groups) {
    const p = g.querySelector("path.js-line");
    if (!p) return false;
    paths.push(p as SVGPathElement);
  }
  const ds = traces.map((t) => linePath(t.x, t.y, xa, ya));
  if (ds.some((d) => d === "")) return false;
  ds.forEach((d, k) => {
    if (paths[k]!.getAttribute("d") !== d) paths[k]!.setAttribute("d", d);
  });
  return true;
}
