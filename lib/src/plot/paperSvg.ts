/**
 * Figures for papers. Two ways, one look (sizes for one journal column: 8.5 cm wide, text >= 8 pt,
 * lines about 1 pt):
 * - `paperLayout` restyles a plotly layout and traces for export by plotly itself (the page's
 *   SVG/PNG buttons: Plotly.toImage).
 * - `figureSvg` writes the SVG of a 2D line/scatter figure ({data, layout} as plotly takes it) with
 *   no browser: the kernel's `saveFigure` and `helicoid calc --plot`. It draws scatter traces
 *   (lines, markers, gaps at null), linear and log axes with ticks at 1-2-5 steps, axis titles,
 *   a legend, vertical line shapes, and the HTML subset plotly text uses (<sub>, <sup>, entities).
 * Pure string building (no DOM, no Node). Common practice, no source.
 */

/** One journal column: 8.5 cm at 96 px per inch. */
export const COLUMN_WIDTH_PX = Math.round((8.5 / 2.54) * 96);
/** Text size of exported figures: 9 pt (12 px at 96 px per inch). */
export const PAPER_FONT_PX = 12;
export const PAPER_LINE_PX = 1.5;

export interface PaperSize {
  /** Width in CSS px (1/96 inch); default one journal column (321 px = 8.5 cm). */
  width?: number;
  /** Height in CSS px; default 3/4 of the width. */
  height?: number;
  /** Text size in CSS px; default 12 (9 pt). */
  fontSize?: number;
}

type Trace = Record<string, unknown>;
type Layout = Record<string, unknown>;

const PALETTE = ["#1f4e9c", "#c0392b", "#2e8b57", "#8e44ad", "#d68910", "#17808a", "#555555"];

/** A layout and traces restyled for export at `size` (plotly draws them). */
export function paperLayout(data: Trace[], layout: Layout, size: PaperSize = {}): { data: Trace[]; layout: Layout } {
  const width = size.width ?? COLUMN_WIDTH_PX;
  const height = size.height ?? Math.round(width * 0.75);
  const font = size.fontSize ?? PAPER_FONT_PX;
  const axis = (a: unknown) => ({
    ...((a as Layout) ?? {}),
    automargin: true,
    linewidth: 1,
    linecolor: "#000",
    mirror: true,
    ticks: "outside",
    ticklen: 3,
    showgrid: false,
    zeroline: false,
    tickfont: { size: font },
    title: { ...(((a as Layout)?.title as Layout) ?? {}), font: { size: font } },
  });
  return {
    data: data.map((t, i) => ({
      ...t,
      line: { ...((t.line as Layout) ?? {}), width: PAPER_LINE_PX, color: (t.line as Layout)?.color ?? PALETTE[i % PALETTE.length] },
      marker: { ...((t.marker as Layout) ?? {}), size: 5, color: (t.marker as Layout)?.color ?? PALETTE[i % PALETTE.length] },
    })),
    layout: {
      ...layout,
      width,
      height,
      autosize: false,
      font: { family: "Arial, Helvetica, sans-serif", size: font, color: "#000" },
      margin: { l: 4.5 * font, r: font, t: (layout.showlegend ? 2.2 : 0.8) * font, b: 3.4 * font },
      paper_bgcolor: "#fff",
      plot_bgcolor: "#fff",
      xaxis: axis(layout.xaxis),
      yaxis: axis(layout.yaxis),
      legend: { orientation: "h", x: 0, y: 1.02, yanchor: "bottom", bgcolor: "rgba(0,0,0,0)", font: { size: font } },
    },
  };
}

// ---------------------------------------------------------------- own SVG writer

function esc(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/** Plotly-style text (<sub>, <sup>, entities) as SVG tspans. */
export function textSpans(html: string, font: number): string {
  const decoded = (s: string) =>
    s
      .replace(/&lt;/g, "<")
      .replace(/&gt;/g, ">")
      .replace(/&quot;/g, '"')
      .replace(/&#39;/g, "'")
      .replace(/&amp;/g, "&");
  let out = "";
  let shift = 0; // current baseline shift in px
  const re = /<(\/?)(sub|sup)>|<br\s*\/?>|<[^>]*>/gi;
  let last = 0;
  let m: RegExpExecArray | null;
  const emit = (t: string) => {
    if (!t) return;
    const attrs = shift !== 0 ? ` dy="0" baseline-shift="${shift > 0 ? "super" : "sub"}" font-size="${(font * 0.7).toFixed(1)}"` : "";
    out += attrs ? `<tspan${attrs}>${esc(decoded(t))}</tspan>` : esc(decoded(t));
  };
  while ((m = re.exec(html))) {
    emit(html.slice(last, m.index));
    last = re.lastIndex;
    if (m[2]) shift = m[1] ? 0 : m[2].toLowerCase() === "sup" ? 1 : -1;
  }
  emit(html.slice(last));
  return out;
}

/** Tick values at 1-2-5 steps over [lo, hi] (about `target` of them). */
export function niceTicks(lo: number, hi: number, target = 5): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / target;
  const mag = 10 ** Math.floor(Math.log10(raw));
  // the 1-2-5 step whose tick count is nearest the target
  const step = [0.5, 1, 2, 5, 10].map((f) => f * mag).reduce((best, s) => (Math.abs((hi - lo) / s - target) < Math.abs((hi - lo) / best - target) ? s : best));
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

function tickLabel(v: number, log: boolean): string {
  if (log) {
    const e = Math.round(v);
    return Math.abs(v - e) < 1e-9 ? (e >= -2 && e <= 3 ? String(Number((10 ** e).toPrecision(3))) : `10<sup>${e < 0 ? "−" : ""}${Math.abs(e)}</sup>`) : "";
  }
  return String(Number(v.toPrecision(6))).replace(/^-/, "−");
}

function finiteExtent(arrays: Array<ArrayLike<unknown>>, log: boolean): [number, number] | null {
  let lo = Infinity,
    hi = -Infinity;
  for (const a of arrays)
    for (let i = 0; i < a.length; i++) {
      const raw = a[i];
      if (typeof raw !== "number" || !Number.isFinite(raw) || (log && raw <= 0)) continue;
      const v = log ? Math.log10(raw) : raw;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  return lo <= hi ? [lo, hi] : null;
}

function titleText(t: unknown): string {
  if (typeof t === "string") return t;
  if (t && typeof t === "object" && typeof (t as Layout).text === "string") return (t as Layout).text as string;
  return "";
}

/**
 * The SVG document of a line/scatter figure at `size`. Only "scatter" traces are drawn (others
 * raise an Error naming them); the axis ranges are the layout's (`range`, in axis units as plotly
 * takes them) or the data's extent (markers padded 5 %).
 */
export function figureSvg(fig: { data: Trace[]; layout?: Layout }, size: PaperSize = {}): string {
  const W = size.width ?? COLUMN_WIDTH_PX;
  const H = size.height ?? Math.round(W * 0.75);
  const F = size.fontSize ?? PAPER_FONT_PX;
  if (!(W > 50 && W < 20000 && H > 50 && H < 20000)) throw new Error(`figure size ${W} x ${H} px: expected widths and heights from 50 to 20000 px`);
  const layout = fig.layout ?? {};
  const traces = (fig.data ?? []).filter((t) => (t.visible ?? true) !== false);
  const bad = traces.filter((t) => (t.type ?? "scatter") !== "scatter").map((t) => String(t.type));
  if (bad.length) throw new Error(`figureSvg draws scatter (line and marker) traces only; this figure has ${[...new Set(bad)].join(", ")}`);
  const xa = (layout.xaxis ?? {}) as Layout,
    ya = (layout.yaxis ?? {}) as Layout;
  const xLog = xa.type === "log",
    yLog = ya.type === "log";
  const named = traces.filter((t) => t.name !== undefined && t.showlegend !== false);
  const legendRows = (layout.showlegend ?? named.length > 1) && named.length ? 1 : 0;
  const m = { l: 4.6 * F, r: 1.2 * F, t: (legendRows ? 2.4 : 0.8) * F, b: 3.6 * F };
  let pw = W - m.l - m.r;
  const ph = H - m.t - m.b;
  const anyMarkers = traces.some((t) => String(t.mode ?? "lines").includes("markers"));
  const rangeOf = (ax: Layout, key: "x" | "y", log: boolean): [number, number] => {
    const r = ax.range as [number, number] | undefined;
    if (Array.isArray(r) && r.length === 2 && Number.isFinite(r[0]) && Number.isFinite(r[1]) && r[1] !== r[0]) return [Math.min(r[0], r[1]), Math.max(r[0], r[1])];
    const e = finiteExtent(
      traces.map((t) => (t[key] ?? []) as ArrayLike<unknown>),
      log,
    ) ?? [0, 1];
    const span = e[1] - e[0] || Math.abs(e[0]) * 0.1 || 1;
    const pad = key === "y" || anyMarkers ? 0.05 * span : 0;
    return e[1] > e[0] ? [e[0] - pad, e[1] + pad] : [e[0] - span / 2, e[1] + span / 2];
  };
  const [x0, x1] = rangeOf(xa, "x", xLog),
    [y0, y1] = rangeOf(ya, "y", yLog);
  // the left margin holds the longest y tick label and the rotated y title
  const ticks = (lo: number, hi: number, log: boolean, n: number) => (log ? niceTicks(lo, hi, n).filter((v) => Number.isInteger(Math.round(v * 1e9) / 1e9)) : niceTicks(lo, hi, n));
  const yTicks = ticks(y0, y1, yLog, Math.max(3, Math.round(ph / (2.5 * F))));
  const longest = Math.max(1, ...yTicks.map((v) => tickLabel(v, yLog).replace(/<[^>]*>/g, "").length));
  m.l = Math.max(3.2 * F, 0.62 * F * longest + 2.2 * F + 6);
  pw = W - m.l - m.r;
  const X = (v: number) => m.l + (((xLog ? Math.log10(v) : v) - x0) / (x1 - x0)) * pw;
  const Y = (v: number) => m.t + ph - (((yLog ? Math.log10(v) : v) - y0) / (y1 - y0)) * ph;
  const f = (v: number) => v.toFixed(2);
  const parts: string[] = [];
  parts.push(`<?xml version="1.0" encoding="UTF-8"?>`);
  parts.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${W}px" height="${H}px" viewBox="0 0 ${W} ${H}" font-family="Arial, Helvetica, sans-serif" font-size="${F}">`);
  parts.push(`<rect x="0" y="0" width="${W}" height="${H}" fill="#ffffff"/>`);
  parts.push(`<defs><clipPath id="plotarea"><rect x="${f(m.l)}" y="${f(m.t)}" width="${f(pw)}" height="${f(ph)}"/></clipPath></defs>`);
  // ticks and labels
  const axisParts: string[] = [];
  for (const v of ticks(x0, x1, xLog, Math.max(3, Math.round(pw / (5 * F))))) {
    const px = m.l + ((v - x0) / (x1 - x0)) * pw;
    axisParts.push(`<line x1="${f(px)}" y1="${f(m.t + ph)}" x2="${f(px)}" y2="${f(m.t + ph + 3)}" stroke="#000" stroke-width="1"/>`);
    axisParts.push(`<text class="xtick" x="${f(px)}" y="${f(m.t + ph + 3 + F)}" text-anchor="middle">${textSpans(tickLabel(v, xLog), F)}</text>`);
  }
  for (const v of yTicks) {
    const py = m.t + ph - ((v - y0) / (y1 - y0)) * ph;
    axisParts.push(`<line x1="${f(m.l - 3)}" y1="${f(py)}" x2="${f(m.l)}" y2="${f(py)}" stroke="#000" stroke-width="1"/>`);
    axisParts.push(`<text class="ytick" x="${f(m.l - 5)}" y="${f(py + F * 0.35)}" text-anchor="end">${textSpans(tickLabel(v, yLog), F)}</text>`);
  }
  // curves
  const curves: string[] = [];
  traces.forEach((t, i) => {
    const colour = String((t.line as Layout)?.color ?? (t.marker as Layout)?.color ?? PALETTE[i % PALETTE.length]);
    const xs = (t.x ?? []) as ArrayLike<unknown>,
      ys = (t.y ?? []) as ArrayLike<unknown>;
    const mode = String(t.mode ?? "lines");
    const ok = (k: number) =>
      typeof xs[k] === "number" &&
      typeof ys[k] === "number" &&
      Number.isFinite(xs[k]) &&
      Number.isFinite(ys[k]) &&
      (!xLog || (xs[k] as number) > 0) &&
      (!yLog || (ys[k] as number) > 0);
    if (mode.includes("lines")) {
      let d = "",
        pen = false;
      for (let k = 0; k < Math.min(xs.length, ys.length); k++) {
        if (!ok(k)) {
          pen = false;
          continue;
        }
        d += `${pen ? "L" : "M"}${f(X(xs[k] as number))},${f(Y(ys[k] as number))}`;
        pen = true;
      }
      if (d)
        curves.push(
          `<path class="curve" data-trace="${i}" d="${d}" fill="none" stroke="${esc(colour)}" stroke-width="${PAPER_LINE_PX}" stroke-linejoin="round" clip-path="url(#plotarea)"/>`,
        );
    }
    if (mode.includes("markers")) {
      // markers are drawn whole (not clipped) when their centre is inside the plot area
      let g = `<g class="markers" data-trace="${i}" fill="${esc(colour)}">`;
      const inside = (px: number, py: number) => px >= m.l - 0.01 && px <= m.l + pw + 0.01 && py >= m.t - 0.01 && py <= m.t + ph + 0.01;
      for (let k = 0; k < Math.min(xs.length, ys.length); k++) {
        if (!ok(k)) continue;
        const px = X(xs[k] as number),
          py = Y(ys[k] as number);
        if (inside(px, py)) g += `<circle cx="${f(px)}" cy="${f(py)}" r="2.5"/>`;
      }
      curves.push(g + "</g>");
    }
  });
  // vertical line shapes (the explorer's "current value" mark)
  for (const s of (layout.shapes ?? []) as Layout[]) {
    if (s.type !== "line" || s.xref !== "x" || s.x0 !== s.x1 || typeof s.x0 !== "number") continue;
    const px = m.l + (((xLog ? Math.log10(s.x0) : s.x0) - x0) / (x1 - x0)) * pw;
    if (px < m.l || px > m.l + pw) continue;
    curves.push(
      `<line class="mark" x1="${f(px)}" y1="${f(m.t)}" x2="${f(px)}" y2="${f(m.t + ph)}" stroke="${esc(String((s.line as Layout)?.color ?? "#888"))}" stroke-width="1" stroke-dasharray="3,2"/>`,
    );
  }
  parts.push(...curves);
  parts.push(`<rect x="${f(m.l)}" y="${f(m.t)}" width="${f(pw)}" height="${f(ph)}" fill="none" stroke="#000" stroke-width="1"/>`);
  parts.push(...axisParts);
  const xt = titleText(xa.title),
    yt = titleText(ya.title);
  if (xt) parts.push(`<text class="xtitle" x="${f(m.l + pw / 2)}" y="${f(H - 0.75 * F)}" text-anchor="middle">${textSpans(xt, F)}</text>`);
  if (yt) parts.push(`<text class="ytitle" transform="translate(${f(0.95 * F)},${f(m.t + ph / 2)}) rotate(-90)" text-anchor="middle">${textSpans(yt, F)}</text>`);
  if (legendRows) {
    let x = m.l;
    const y = m.t - 0.7 * F;
    traces.forEach((t, i) => {
      if (t.name === undefined || t.showlegend === false) return;
      const colour = String((t.line as Layout)?.color ?? (t.marker as Layout)?.color ?? PALETTE[i % PALETTE.length]);
      const label = String(t.name);
      const lines = String(t.mode ?? "lines").includes("lines");
      parts.push(
        lines
          ? `<line x1="${f(x)}" y1="${f(y - F * 0.3)}" x2="${f(x + 1.6 * F)}" y2="${f(y - F * 0.3)}" stroke="${esc(colour)}" stroke-width="${PAPER_LINE_PX}"/>`
          : `<circle cx="${f(x + 0.8 * F)}" cy="${f(y - F * 0.3)}" r="2.5" fill="${esc(colour)}"/>`,
      );
      parts.push(`<text class="legend" x="${f(x + 2 * F)}" y="${f(y)}">${textSpans(label, F)}</text>`);
      x += 2.6 * F + 0.6 * F * label.replace(/<[^>]*>/g, "").length;
    });
  }
  parts.push(`</svg>`);
  return parts.join("\n") + "\n";
}
