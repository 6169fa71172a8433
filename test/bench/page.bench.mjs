/* global PerformanceObserver */
// Exported page, load to a drawn, live explorer, in Debian's chromium: a page of two catalogue
// explorers (skyrmion, wall) with their saved results, exported by helicoid export, against the floor
// of any page that draws with the same plotly bundle: plotly alone, inline, drawing one line plot.
// Interleaved (ours, floor, ours, floor, ...), each load in a fresh browser context: time from
// navigation to the first drawn explorer plot (ours) or plot (floor), the longest main-thread task
// (PerformanceObserver "longtask"), and the page size. HELICOID_BENCH_PAGE_RUNS (default 7).
import { createRequire } from "node:module";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import lib from "../../lib/dist/internal.js";
import { summary, verdict } from "./util.mjs";

const require = createRequire(import.meta.url);
const root = join(dirname(fileURLToPath(import.meta.url)), "..", "..");
const { exportNotebook } = require(join(root, "kernel-ext", "dist", "notebook", "export.js"));
const { chromium } = require("playwright-core");
const RUNS = Number(process.env.HELICOID_BENCH_PAGE_RUNS ?? 7);
const M = "@helicoid/widgets",
  V = "^0.1.0";

function explorerNotebook(ids) {
  const state = {};
  const cells = [];
  ids.forEach((calc, k) => {
    const id = `p${k}`.padEnd(32, "0");
    const spec = lib.getCalculator(calc);
    const sweep = lib.defaultSweep(spec, {});
    const result = JSON.parse(JSON.stringify(lib.runCalculator(spec, {}, sweep ? { sweep } : {})));
    state[id] = {
      model_name: "ExplorerModel",
      model_module: M,
      model_module_version: V,
      state: {
        _model_name: "ExplorerModel",
        _model_module: M,
        _model_module_version: V,
        _view_name: "ExplorerView",
        _view_module: M,
        _view_module_version: V,
        calculator: calc,
        spec: null,
        inputs: {},
        sweep,
        result,
        error: "",
        compute_in: "browser",
        kernel_version: "0.1.0",
      },
    };
    cells.push({
      cell_type: "code",
      metadata: {},
      execution_count: k + 1,
      source: `explorer("${calc}")`,
      outputs: [
        {
          output_type: "display_data",
          metadata: {},
          data: { "text/plain": "Explorer", "application/vnd.jupyter.widget-view+json": { version_major: 2, version_minor: 0, model_id: id } },
        },
      ],
    });
  });
  return { nbformat: 4, nbformat_minor: 5, metadata: { widgets: { "application/vnd.jupyter.widget-state+json": { version_major: 2, version_minor: 0, state } } }, cells };
}

function floorPage() {
  const plotly = readFileSync(require.resolve("plotly.js-cartesian-dist-min"))
    .toString()
    .replace(/<\/script/gi, "<\\/script");
  const x = Array.from({ length: 200 }, (_, i) => i),
    y = x.map((v) => Math.sin(v / 20));
  return (
    `<!DOCTYPE html><html><head><meta charset="utf-8"></head><body><div id="p" style="width:800px;height:400px"></div><script>${plotly}</script>` +
    `<script>Plotly.newPlot("p", [{ x: ${JSON.stringify(x)}, y: ${JSON.stringify(y)}, mode: "lines" }], { title: { text: "floor" } }).then(() => document.getElementById("p").dataset.drawn = "1");</script></body></html>`
  );
}

export default async () => {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-bench-page-"));
  const ours = join(dir, "explorers.html"),
    floor = join(dir, "floor.html");
  writeFileSync(ours, exportNotebook(explorerNotebook(["skyrmion", "wall"])));
  writeFileSync(floor, floorPage());
  const browser = await chromium.launch({
    executablePath: process.env.HELICOID_CHROMIUM ?? "/usr/bin/chromium",
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
  const load = async (file, selector) => {
    const context = await browser.newContext({ viewport: { width: 1200, height: 900 } });
    try {
      const page = await context.newPage();
      await page.addInitScript(() => {
        window.__hxLong = [];
        new PerformanceObserver((l) => {
          for (const e of l.getEntries()) window.__hxLong.push(e.duration);
        }).observe({ type: "longtask", buffered: true });
      });
      await page.goto(`file://${file}`, { waitUntil: "commit" });
      await page.waitForSelector(selector, { timeout: 120_000 });
      return await page.evaluate(() => ({ ms: performance.now(), longest: Math.max(0, ...window.__hxLong), workers: 0 }));
    } finally {
      await context.close();
    }
  };
  const o = [],
    f = [];
  try {
    for (let k = 0; k < RUNS; k++) {
      o.push(await load(ours, ".hx-explorer .hx-plot[data-drawn]"));
      f.push(await load(floor, "#p[data-drawn]"));
    }
  } finally {
    await browser.close();
    rmSync(dir, { recursive: true, force: true });
  }
  const so = summary(o.map((x) => x.ms)),
    sf = summary(f.map((x) => x.ms));
  const lo = summary(o.map((x) => x.longest)),
    lf = summary(f.map((x) => x.longest));
  const mb = Buffer.byteLength(exportNotebook(explorerNotebook(["skyrmion", "wall"]))) / 1e6,
    fmb = Buffer.byteLength(floorPage()) / 1e6;
  return [
    {
      group: "page",
      name: `exported page, 2 explorers with saved results: load -> first explorer plot drawn, fresh context, interleaved x${RUNS}`,
      ours_ms: so.median,
      ours_spread: so.spread,
      reference: "plotly alone drawing one plot (floor)",
      reference_ms: sf.median,
      reference_spread: sf.spread,
      ratio: so.median / sf.median,
      goal: verdict(so.median <= 800, "<= 800 ms"),
    },
    {
      group: "page",
      name: "  longest main-thread task during that load",
      ours_ms: lo.median,
      ours_spread: lo.spread,
      reference: "plotly alone (floor)",
      reference_ms: lf.median,
      reference_spread: lf.spread,
      ratio: lo.median / lf.median,
      goal: verdict(lo.median <= 200, "<= 200 ms"),
    },
    { group: "page", name: "  page size (MB, not ms)", ours_ms: mb, reference: "plotly alone (floor)", reference_ms: fmb, ratio: mb / fmb, goal: verdict(mb <= 1.5, "<= 1.5 MB") },
  ];
};
