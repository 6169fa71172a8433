/**
 * Plotly traces and layouts for a calculator's plots, from a result. Arrays are shown in the
 * trade's customary units (nm, mT ...); each trace keeps its scale factors in `meta` so that the
 * plotted numbers can be mapped back to SI exactly (the browser tests do this).
 */
import { customaryUnit, displayUnit, type CalculatorResult, type OutputSpec, type PlotSpec } from "@helicoid/lib";

export interface PlotFigure {
  data: Array<Record<string, unknown>>;
  layout: Record<string, unknown>;
  /** Why nothing can be drawn (missing outputs), else null. */
  problem: string | null;
}

function arrayOf(result: CalculatorResult, name: string): number[] | null {
  const v = result.outputs[name]?.value;
  return Array.isArray(v) ? (v as number[]) : null;
}

function scaleFor(values: number[], unit: string): [string, number] {
  let peak = 0;
  for (const v of values) if (Number.isFinite(v) && Math.abs(v) > peak) peak = Math.abs(v);
  return customaryUnit(peak, unit);
}

function axisTitle(o: OutputSpec | undefined, name: string, unitLabel: string): string {
  const label = o ? `${o.name === o.symbol ? o.name : `${o.symbol.replace(/[\\{}]/g, "")}`}` : name;
  return unitLabel && unitLabel !== "1" ? `${label} (${displayUnit(unitLabel)})` : label;
}

function multiTitle(data: PlotFigure["data"], unit: string | null): string {
  const names = data.map((d) => String(d.name)).join(", ");
  return unit && unit !== "(mixed)" && unit !== "1" ? `${names} (${displayUnit(unit)})` : names;
}

export function plotFigure(plot: PlotSpec, outputs: OutputSpec[], result: CalculatorResult): PlotFigure {
  const xs = arrayOf(result, plot.x);
  const byName = new Map(outputs.map((o) => [o.name, o]));
  if (!xs) return { data: [], layout: {}, problem: `output '${plot.x}' (x of '${plot.title}') is not in the result` };
  const xo = byName.get(plot.x);
  const [xu, xf] = scaleFor(xs, xo?.unit ?? "");
  const data: PlotFigure["data"] = [];
  const missing: string[] = [];
  let yTitle = "";
  let yUnitShared: string | null = null;
  for (const yName of plot.y) {
    const ys = arrayOf(result, yName);
    if (!ys) { missing.push(yName); continue; }
    const yo = byName.get(yName);
    const [yu, yf] = scaleFor(ys, yo?.unit ?? "");
    yUnitShared = yUnitShared === null ? yu : yUnitShared === yu ? yu : "(mixed)";
    yTitle = axisTitle(yo, yName, yu);
    data.push({
      type: "scatter",
      mode: plot.mode === "markers" ? "markers" : "lines",
      name: yo?.name ?? yName,
      x: xs.map((v) => v / xf),
      y: ys.map((v) => (Number.isFinite(v) ? v / yf : null)),
      meta: { output: yName, xOutput: plot.x, xFactor: xf, yFactor: yf, xUnit: xu, yUnit: yu },
      hovertemplate: `%{x:.4g} ${displayUnit(xu)}, %{y:.4g} ${displayUnit(yu)}<extra>${yo?.name ?? yName}</extra>`,
    });
  }
  if (data.length === 0) return { data: [], layout: {}, problem: `outputs ${missing.join(", ")} of '${plot.title}' are not in the result` };
  const layout = {
    // The plot's title is drawn by the view above the plot (cheaper for plotly to redraw).
    margin: { l: 60, r: 16, t: 12, b: 44 },
    height: 300,
    autosize: true,
    showlegend: data.length > 1,
    xaxis: { title: { text: axisTitle(xo, plot.x, xu) }, type: plot.xLog ? "log" : "linear" },
    yaxis: { title: { text: data.length > 1 ? multiTitle(data, yUnitShared) : yTitle }, type: plot.yLog ? "log" : "linear" },
  };
  return { data, layout, problem: missing.length ? `not in the result: ${missing.join(", ")}` : null };
}
