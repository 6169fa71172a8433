/**
 * `saveFigure(fig, "r-vs-b.svg", { width, height })`: a figure written to a file for a paper.
 *
 * Rendering is server-side with no browser: the SVG is written by our own writer for 2D line and
 * scatter figures (`figureSvg` in @helicoid/lib) — the figures of the calculators and of most
 * notebooks. Why not plotly in a headless browser: plotly needs a DOM, and starting chromium from
 * the kernel process needs a browser installed beside every kernel (CI machines, servers, clusters
 * often have none), takes seconds per figure and can hang; our writer is deterministic, fast and
 * has no dependency. A PNG is made from that same SVG by Debian's chromium through playwright-core
 * when both are present (raster output needs a rasterizer); otherwise saving a .png says so.
 *
 * `fig` is a `figure(...)`, a plain {data, layout}, or a calculator result (its first plot, or
 * `options.plot` by id). Sizes: numbers in CSS px (96 per inch) or strings with a unit
 * ("8.5cm", "85mm", "3.35in", "321px"); default one journal column (8.5 cm x 6.4 cm), text 9 pt.
 */
import { writeFileSync } from "node:fs";
import { execFileSync } from "node:child_process";
import { extname } from "node:path";
import { figureSvg, getCalculator, plotFigure, currentMarkFor, type CalculatorResult } from "@helicoid/lib";
import { COLUMN_WIDTH_PX } from "@helicoid/lib/internal";
import { Figure, type FigureSpec } from "./figure.js";

export interface SaveFigureOptions {
  width?: number | string;
  height?: number | string;
  /** Text size in pt (default 9). */
  fontPt?: number;
  /** PNG resolution in dots per inch (default 600). */
  dpi?: number;
  /** For a calculator result: the id of the plot to save (default its first). */
  plot?: string;
}

/** A length as CSS px: numbers are px; strings take cm, mm, in, pt or px. */
export function lengthPx(v: number | string | undefined, name: string, fallback: number): number {
  if (v === undefined) return fallback;
  let px: number;
  if (typeof v === "number") px = v;
  else {
    const m = /^\s*([0-9]*\.?[0-9]+)\s*(cm|mm|in|pt|px)?\s*$/.exec(v);
    if (!m) throw new Error(`saveFigure: ${name} = ${JSON.stringify(v)}: expected a number of px or a length such as "8.5cm", "85mm", "3.35in"`);
    const f = { cm: 96 / 2.54, mm: 96 / 25.4, in: 96, pt: 96 / 72, px: 1 }[(m[2] ?? "px") as "cm"];
    px = Number(m[1]) * f;
  }
  if (!(px >= 50 && px <= 20000)) throw new Error(`saveFigure: ${name} = ${JSON.stringify(v)}: expected 50 to 20000 px (about 1.3 cm to 5 m)`);
  return Math.round(px);
}

function isResult(x: unknown): x is CalculatorResult {
  return !!x && typeof x === "object" && typeof (x as CalculatorResult).id === "string" && typeof (x as CalculatorResult).outputs === "object";
}

/** The {data, layout} to draw for `fig`. */
export function figureOf(fig: Figure | FigureSpec | CalculatorResult, plotId?: string): FigureSpec {
  if (fig instanceof Figure) return fig.spec;
  if (isResult(fig)) {
    const spec = getCalculator(fig.id);
    if (spec.plots.length === 0) throw new Error(`saveFigure: '${fig.id}' has no plots`);
    const plot = plotId ? spec.plots.find((p) => p.id === plotId) : spec.plots[0];
    if (!plot) throw new Error(`saveFigure: plot ${JSON.stringify(plotId)}: expected one of ${spec.plots.map((p) => p.id).join(", ")}`);
    const values = Object.fromEntries(Object.entries(fig.inputs).map(([k, e]) => [k, e.value]));
    const f = plotFigure(plot, spec.outputs, fig, currentMarkFor(plot, spec, fig, values));
    if (f.data.length === 0) throw new Error(`saveFigure: plot '${plot.id}' of '${fig.id}': ${f.problem}`);
    const layout = { ...f.layout, xaxis: { ...(f.layout.xaxis as object), ...(f.sweptRange ? { range: plot.xLog ? f.sweptRange.map(Math.log10) : f.sweptRange } : {}) } };
    return { data: f.data, layout };
  }
  if (fig && Array.isArray((fig as FigureSpec).data)) return fig as FigureSpec;
  throw new Error("saveFigure: expected a figure(...), a {data, layout} object or a calculator result");
}

/** The SVG text of `fig` at the options' size. */
export function figureToSvg(fig: Figure | FigureSpec | CalculatorResult, options: SaveFigureOptions = {}): string {
  const width = lengthPx(options.width, "width", COLUMN_WIDTH_PX);
  const height = lengthPx(options.height, "height", Math.round(width * 0.75));
  const fontPt = options.fontPt ?? 9;
  if (!(fontPt >= 5 && fontPt <= 48)) throw new Error(`saveFigure: fontPt = ${fontPt}: expected 5 to 48 pt (8 pt or more reads well in print)`);
  return figureSvg(figureOf(fig, options.plot), { width, height, fontSize: (fontPt * 96) / 72 });
}

function chromiumPath(): string | null {
  try {
    return execFileSync("sh", ["-c", "command -v chromium"], { encoding: "utf8" }).trim() || null;
  } catch {
    return null;
  }
}

/** PNG bytes of an SVG document, rasterized by chromium (playwright-core) at `scale`. */
async function svgToPng(svg: string, width: number, height: number, scale: number): Promise<Buffer> {
  const exe = chromiumPath();
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- playwright-core is loaded lazily, untyped here
  let pw: { chromium: { launch: (o: unknown) => Promise<any> } };
  try {
    pw = require("playwright-core");
  } catch {
    throw new Error("saveFigure: a PNG needs playwright-core (npm i playwright-core) and Debian's chromium; save as .svg instead");
  }
  if (!exe) throw new Error("saveFigure: a PNG needs chromium on PATH (apt-get install chromium); save as .svg instead");
  const browser = await pw.chromium.launch({
    executablePath: exe,
    args: ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
  try {
    const page = await browser.newPage({ viewport: { width, height }, deviceScaleFactor: scale });
    await page.setContent(`<html><body style="margin:0">${svg.replace(/^<\?xml[^>]*>\s*/, "")}</body></html>`);
    return await page.screenshot({ clip: { x: 0, y: 0, width, height }, type: "png" });
  } finally {
    await browser.close();
  }
}

/** Write `fig` to `path` (.svg, or .png through chromium); returns the path. */
export async function saveFigure(fig: Figure | FigureSpec | CalculatorResult, path: string, options: SaveFigureOptions = {}): Promise<string> {
  const ext = extname(path).toLowerCase();
  if (ext !== ".svg" && ext !== ".png") throw new Error(`saveFigure: ${JSON.stringify(path)}: expected a file name ending in .svg or .png`);
  const svg = figureToSvg(fig, options);
  if (ext === ".svg") {
    writeFileSync(path, svg);
    return path;
  }
  const width = lengthPx(options.width, "width", COLUMN_WIDTH_PX);
  const height = lengthPx(options.height, "height", Math.round(width * 0.75));
  const dpi = options.dpi ?? 600;
  if (!(dpi >= 72 && dpi <= 2400)) throw new Error(`saveFigure: dpi = ${dpi}: expected 72 to 2400`);
  writeFileSync(path, await svgToPng(svg, width, height, dpi / 96));
  return path;
}
