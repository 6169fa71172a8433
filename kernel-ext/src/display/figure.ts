/**
 * `figure(spec)`: a plotly figure as a rich display. The bundle carries
 * - `application/vnd.plotly.v1+json` for front ends with a plotly renderer, and
 * - `text/html` that draws the same figure with plotly.js embedded in the page, so the figure also
 *   shows in an HTML export with no network access. plotly.js is embedded once per page: the first
 *   figure of a kernel session (or notebook run) carries the library, later ones wait for it.
 */
import { readFileSync } from "node:fs";
import { randomUUID } from "node:crypto";
import { mimeBundle, type Displayable } from "./bundle.js";
import type { MimeBundle } from "./output.js";

export interface FigureSpec {
  data: Array<Record<string, unknown>>;
  layout?: Record<string, unknown>;
  config?: Record<string, unknown>;
}

const flagKey = Symbol.for("helicoid.plotlyEmitted");
const g = globalThis as unknown as Record<symbol, boolean>;

/** Forget that plotly.js was embedded (a new page starts: kernel restart, new notebook run). */
export function resetPlotlyEmbedding(): void {
  g[flagKey] = false;
}

let plotlySource: string | null = null;
export function plotlyScript(): string {
  if (plotlySource === null) {
    const path = require.resolve("plotly.js-cartesian-dist-min/plotly-cartesian.min.js");
    // "</script" inside the library would end the script element early.
    plotlySource = readFileSync(path, "utf8").replace(/<\/script/gi, "<\\/script");
  }
  return plotlySource;
}

export class Figure implements Displayable {
  constructor(readonly spec: FigureSpec) {
    if (!spec || !Array.isArray(spec.data)) {
      throw new TypeError(`figure: spec.data is ${spec && typeof spec === "object" ? typeof (spec as FigureSpec).data : typeof spec}; expected an array of plotly traces`);
    }
  }

  [mimeBundle](): { data: MimeBundle } {
    const fig = { data: this.spec.data, layout: normalizeTitles(this.spec.layout ?? {}), config: this.spec.config ?? {} };
    return {
      data: {
        "application/vnd.plotly.v1+json": fig,
        "text/html": this.html(fig),
        "text/plain": `Figure(${this.spec.data.length} trace${this.spec.data.length === 1 ? "" : "s"}${typeof this.spec.layout?.title === "string" ? `, "${this.spec.layout.title}"` : ""})`,
      },
    };
  }

  private html(fig: FigureSpec): string {
    const id = "helicoid-fig-" + randomUUID();
    const json = JSON.stringify(fig).replace(/</g, "\\u003c");
    const library = g[flagKey] ? "" : `<script type="text/javascript">${plotlyScript()}</script>\n`;
    g[flagKey] = true;
    return (
      library +
      `<div id="${id}" class="helicoid-figure" style="width:100%;min-height:360px"></div>\n` +
      `<script type="text/javascript">(function(){var f=${json};var t=0;function draw(){var el=document.getElementById("${id}");` +
      `if(window.Plotly&&el){window.Plotly.newPlot(el,f.data,f.layout,Object.assign({responsive:true},f.config));}` +
      `else if(t++<200){setTimeout(draw,50);}else if(el){el.textContent="This figure needs plotly.js, which the first figure of the page embeds: run the notebook from the top.";}}draw();})();</script>`
    );
  }
}

/**
 * plotly.js 2+ takes titles as {text: ...}; a plain string title (the older form, still common in
 * examples) is silently dropped. Accept both: the layout's own title and every axis title.
 */
export function normalizeTitles(layout: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = { ...layout };
  const fix = (o: Record<string, unknown>) => {
    if (typeof o.title === "string") o.title = { text: o.title };
  };
  fix(out);
  for (const [k, v] of Object.entries(out)) {
    if (/^[xyz]axis\d*$/.test(k) && v && typeof v === "object") {
      out[k] = { ...(v as Record<string, unknown>) };
      fix(out[k] as Record<string, unknown>);
    }
  }
  return out;
}

export function figure(spec: FigureSpec): Figure {
  return new Figure(spec);
}
