/**
 * Plotly traces and layouts for a calculator's plots, from a result. Each axis has ONE unit, chosen
 * for all the data on it (the largest magnitude of every curve on the axis picks the customary
 * prefix), so R = 0.76 nm and w = 2.4 nm are both drawn in nm. Axis titles are the quantities'
 * symbols and the unit ("R, w (nm)"); legends are symbols, never output ids. Each trace keeps its
 * scale factors in `meta` so that the plotted numbers can be mapped back to SI exactly (the browser
 * tests do this).
 */
import { customaryUnit, displayUnit } from "../quantity/index.js";
import type { CalculatorResult, OutputSpec, PlotSpec } from "../calculators/spec.js";
import { symbolHtml, withoutArgument } from "./symbols.js";

export interface PlotFigure {
  data: Array<Record<string, unknown>>;
  layout: Record<string, unknown>;
  /** Why nothing can be drawn (missing outputs, no state anywhere on the curve), else null. */
  problem: string | null;
  /** Set when the x axis is the swept input: the sweep's ends in plotted units (the x range). */
  sweptRange?: [number, number];
}

/** Where the swept input's current value is marked, in SI (the x axis's SI unit). */
export interface CurrentMark {
  /** The input's SI value. */
  value: number;
  /** Symbol of the input ("B"). */
  symbol: string;
}

/** Fixed margins, so that stacked plots' x axes line up whatever their tick labels. */
export const PLOT_MARGIN = { l: 72, r: 16, t: 12, b: 46 };

function arrayOf(result: CalculatorResult, name: string): number[] | null {
  const v = name in result.outputs ? result.outputs[name]!.value : undefined; // `in`: reading an absent output throws
  return Array.isArray(v) ? (v as number[]) : null;
}

/**
 * The unit of an axis showing all `series` (SI values in `siUnit`): the customary unit picked by
 * the largest finite magnitude of all of them, and its factor (plotted = SI / factor).
 */
export function axisUnit(series: Array<ArrayLike<number | null>>, siUnit: string): [string, number] {
  let peak = 0;
  for (const values of series) {
    for (let i = 0; i < values.length; i++) {
      const v = values[i];
      if (v !== null && v !== undefined && Number.isFinite(v) && Math.abs(v) > peak) peak = Math.abs(v);
    }
  }
  const chosen = customaryUnit(peak, siUnit);
  // A unit with no customary prefixes of its own (W/K, ...): an SI prefix on its first symbol.
  if (
    chosen[1] === 1 &&
    siUnit &&
    /^[A-Za-z]/.test(siUnit) &&
    peak > 0 &&
    Number.isFinite(peak) &&
    (peak < 1e-2 || peak >= 1e4) &&
    customaryUnit(1e-12, siUnit)[1] === 1 &&
    customaryUnit(1e12, siUnit)[1] === 1
  ) {
    const e = Math.max(-18, Math.min(18, 3 * Math.floor(Math.log10(peak) / 3)));
    const prefix: Record<number, string> = { [-18]: "a", [-15]: "f", [-12]: "p", [-9]: "n", [-6]: "µ", [-3]: "m", 3: "k", 6: "M", 9: "G", 12: "T", 15: "P", 18: "E" };
    if (prefix[e]) return [prefix[e] + siUnit, 10 ** e];
  }
  return chosen;
}

/** "R, w (nm)": symbols joined, one unit in parentheses (none for a pure number). */
export function axisTitle(symbols: string[], unit: string): string {
  const unique = [...new Set(symbols.filter((s) => s.length > 0))];
  const names = unique.join(", ");
  return unit && unit !== "1" ? `${names} (${displayUnit(unit)})` : names;
}

function symbolOf(o: OutputSpec | undefined, name: string): string {
  return o?.symbol ? o.symbol : name;
}

export function plotFigure(plot: PlotSpec, outputs: OutputSpec[], result: CalculatorResult, current?: CurrentMark | null): PlotFigure {
  const xs = arrayOf(result, plot.x);
  const byName = new Map(outputs.map((o) => [o.name, o]));
  if (!xs) return { data: [], layout: {}, problem: `output '${plot.x}' (x of '${plot.title}') is not in the result` };
  const xo = byName.get(plot.x);
  const xSym = symbolOf(xo, plot.x);
  const missing: string[] = [];
  const present: Array<{ name: string; o: OutputSpec | undefined; ys: number[] }> = [];
  for (const yName of plot.y) {
    const ys = arrayOf(result, yName);
    if (!ys) missing.push(yName);
    else present.push({ name: yName, o: byName.get(yName), ys });
  }
  if (present.length === 0) return { data: [], layout: {}, problem: `outputs ${missing.join(", ")} of '${plot.title}' are not in the result` };
  if (!present.some((p) => p.ys.some((v) => Number.isFinite(v)))) {
    return { data: [], layout: {}, problem: "no state exists anywhere on this curve for the present inputs (every point has no value)" };
  }
  // The x axis: a sweep's ends decide the unit (the axis spans exactly the sweep).
  const sweep = result.sweep;
  const swept = !!sweep && !!current && xs.length > 0;
  // a mark without a sweep: a time scrubbed along a trace (any x value the caller marks)
  const marked = !!current && xs.length > 0;
  const [xu, xf] = axisUnit(swept ? [xs, [sweep!.from, sweep!.to]] : [xs], xo?.unit ?? "");
  // The y axis: curves grouped by SI unit; one customary unit per SI unit, decided by all of them.
  const bySi = new Map<string, Array<{ name: string; o: OutputSpec | undefined; ys: number[] }>>();
  for (const p of present) {
    const u = p.o?.unit ?? "";
    if (!bySi.has(u)) bySi.set(u, []);
    bySi.get(u)!.push(p);
  }
  const yUnits = new Map<string, [string, number]>();
  for (const [si, group] of bySi)
    yUnits.set(
      si,
      axisUnit(
        group.map((g) => g.ys),
        si,
      ),
    );
  const data: PlotFigure["data"] = present.map(({ name, o, ys: ysIn }) => {
    const [yu, yf] = yUnits.get(o?.unit ?? "")!;
    // A periodic quantity (a phase): break the line where it wraps, with a gap point between.
    let xsOf = xs,
      ys = ysIn;
    if (plot.yPeriod && plot.mode !== "markers") [xsOf, ys] = breakAtWraps(xs, ysIn, plot.yPeriod);
    const legend = symbolHtml(withoutArgument(symbolOf(o, name), xSym));
    return {
      type: "scatter",
      mode: plot.mode === "markers" ? "markers" : "lines",
      // markers at the ends of an axis that spans exactly the sweep are drawn whole
      ...(plot.mode === "markers" ? { cliponaxis: false } : {}),
      name: legend,
      x: xsOf.map((v) => v / xf),
      y: ys.map((v) => (Number.isFinite(v) ? v / yf : null)),
      meta: { output: name, xOutput: plot.x, xFactor: xf, yFactor: yf, xUnit: xu, yUnit: yu },
      hovertemplate: `%{x:.4g} ${displayUnit(xu)}, %{y:.4g} ${displayUnit(yu)}<extra>${legend}</extra>`,
    };
  });
  const yTitle = [...bySi]
    .map(([si, group]) =>
      axisTitle(
        group.map((g) => symbolHtml(withoutArgument(symbolOf(g.o, g.name), xSym))),
        yUnits.get(si)![0],
      ),
    )
    .join("; ");
  const layout: Record<string, unknown> = {
    // The plot's title is drawn by the view above the plot (cheaper for plotly to redraw).
    margin: { ...PLOT_MARGIN },
    height: 300,
    autosize: true,
    showlegend: data.length > 1,
    legend: { orientation: "h", x: 0, y: 1.02, yanchor: "bottom" },
    // exponents as powers of ten, never plotly's SI letters (a "p" beside a unit reads as a prefix)
    xaxis: { title: { text: axisTitle([symbolHtml(xSym)], xu) }, type: plot.xLog ? "log" : "linear", automargin: false, exponentformat: "power" },
    yaxis: { title: { text: yTitle }, type: plot.yLog ? "log" : "linear", automargin: false, exponentformat: "power" },
  };
  if (data.length > 1) layout.margin = { ...PLOT_MARGIN, t: 30 };
  const fig: PlotFigure = { data, layout, problem: missing.length ? `not in the result: ${missing.join(", ")}` : null };
  if (marked) {
    if (swept) fig.sweptRange = [Math.min(sweep!.from, sweep!.to) / xf, Math.max(sweep!.from, sweep!.to) / xf];
    const x = current!.value / xf;
    layout.shapes = [{ type: "line", xref: "x", yref: "paper", x0: x, x1: x, y0: 0, y1: 1, line: { color: "#b2182b", width: 1.5, dash: "dot" }, name: "current" }];
    layout.annotations = [
      {
        // inside the plot at its foot, right of the line: clear of the legend above the plot
        // (plotly places annotations on a log axis by log10 of the value, shapes by the value)
        xref: "x",
        yref: "paper",
        x: plot.xLog ? Math.log10(x) : x,
        y: 0,
        yanchor: "bottom",
        xanchor: "left",
        xshift: 3,
        yshift: 2,
        showarrow: false,
        font: { size: 11, color: "#b2182b" },
        bgcolor: "rgba(255,255,255,0.85)",
        text: `${symbolHtml(current!.symbol)} = ${Number(x.toPrecision(4))}${xu && xu !== "1" ? " " + displayUnit(xu) : ""}`,
        name: "current",
      },
    ];
  }
  return fig;
}

/**
 * The mark for plot `plot` when its x axis is the swept input: the result has a sweep, the x output
 * has the swept input's unit and all its values lie within the sweep. Null otherwise.
 */
export function currentMarkFor(
  plot: PlotSpec,
  spec: { inputs: Array<{ name: string; symbol: string; unit: string }>; outputs: OutputSpec[] },
  result: CalculatorResult,
  values: Record<string, number>,
): CurrentMark | null {
  const sweep = result.sweep;
  if (!sweep) return null;
  const input = spec.inputs.find((i) => i.name === sweep.over);
  const xo = spec.outputs.find((o) => o.name === plot.x);
  const xs = arrayOf(result, plot.x);
  if (!input || !xo || !xs || xs.length === 0 || xo.unit !== input.unit) return null;
  const lo = Math.min(sweep.from, sweep.to),
    hi = Math.max(sweep.from, sweep.to);
  const tol = 1e-9 * Math.max(Math.abs(lo), Math.abs(hi), 1e-300);
  if (!xs.every((x) => !Number.isFinite(x) || (x >= lo - tol && x <= hi + tol))) return null;
  const v = values[input.name];
  return typeof v === "number" && Number.isFinite(v) ? { value: v, symbol: input.symbol } : null;
}

/**
 * Insert a gap (x midway, y NaN) between neighbours whose values differ by more than half of
 * `period`: there the curve wrapped (a phase jumping from pi to -pi), it did not pass through.
 */
export function breakAtWraps(xs: number[], ys: number[], period: number): [number[], number[]] {
  const ox: number[] = [],
    oy: number[] = [];
  for (let k = 0; k < Math.min(xs.length, ys.length); k++) {
    if (k > 0 && Number.isFinite(ys[k]!) && Number.isFinite(ys[k - 1]!) && Math.abs(ys[k]! - ys[k - 1]!) > period / 2) {
      ox.push((xs[k]! + xs[k - 1]!) / 2);
      oy.push(NaN);
    }
    ox.push(xs[k]!);
    oy.push(ys[k]!);
  }
  return [ox, oy];
}
