// Exported page, load to a drawn, live explorer, in Debian's chromium (`command -v chromium`):
// - notebook 01 (run by `helicoid run`, exported by `helicoid export`) against the floor of any page
//   that draws with the same plotly bundle: plotly alone, inline, drawing one line plot. Interleaved
//   (ours, floor, ours, floor, ...), each load in a fresh browser context: time from navigation to
//   the first plotly SVG in the explorer (ours) or the plot (floor), the longest main-thread task
//   (PerformanceObserver "longtask"), the page size; then, on our page, the explorer's first slider
//   moved SLIDER_MOVES times: slider -> next animation frame after the plot changed in the DOM,
//   p50 and p90 (pageProbe.mjs), with the worker's compute time of the same moves;
// - a page of two catalogue explorers with saved results (skyrmion, wall), as before.
// HELICOID_BENCH_PAGE_RUNS (default 5).
import { createRequire } from "node:module";
import { mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { gunzipSync } from "node:zlib";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import lib from "../../lib/dist/internal.js";
import { summary, verdict } from "./util.mjs";
import { launch, probe, quantile } from "./pageProbe.mjs";

const require = createRequire(import.meta.url);
const root = join(dirname(fileURLToPath(import.meta.url)), "..", "..");
const { exportNotebook, BUNDLE_PART_MARK, BUNDLE_PART_TYPE } = require(join(root, "kernel-ext", "dist", "notebook", "export.js"));
const RUNS = Number(process.env.HELICOID_BENCH_PAGE_RUNS ?? 5);
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
  // the page's own plotly: its parts of the export bundle (widgets/build.mjs)
  const plotly = readFileSync(join(root, "widgets", "dist", "export.js"), "utf8")
    .split(BUNDLE_PART_MARK)
    .filter((p) => p.includes("__hxPlotlyFactory"))
    .join("\n")
    .replace(/<\/script/gi, "<\\/script");
  if (!plotly.includes("__hxPlotlyFactory()")) throw new Error("widgets/dist/export.js has no plotly part: run npm run build");
  const x = Array.from({ length: 200 }, (_, i) => i),
    y = x.map((v) => Math.sin(v / 20));
  return (
    `<!DOCTYPE html><html><head><meta charset="utf-8"></head><body><div id="p" style="width:800px;height:400px"></div><script>${plotly}</script>` +
    `<script>Plotly.newPlot("p", [{ x: ${JSON.stringify(x)}, y: ${JSON.stringify(y)}, mode: "lines" }], { title: { text: "floor" } }).then(() => { document.getElementById("p").dataset.drawn = "1"; document.body.dataset.helicoidReady = "1"; });</script></body></html>`
  );
}

/** Notebook 01 run by the CLI (`helicoid run`) and exported (`exportNotebook`, as `helicoid export`). */
function notebook01Page(dir) {
  const out = join(dir, "01.ipynb");
  const r = spawnSync(
    process.execPath,
    [join(root, "kernel-ext", "bin", "helicoid.js"), "run", join(root, "notebooks", "01-walls-and-skyrmions.ipynb"), "-o", out, "--quiet", "--no-trust"],
    {
      encoding: "utf8",
    },
  );
  if (r.status !== 0) throw new Error(`helicoid run of notebook 01 failed (status ${r.status}): ${r.stderr}`);
  const page = join(dir, "01.html");
  writeFileSync(page, exportNotebook(readFileSync(out, "utf8"), { sourceName: "01-walls-and-skyrmions.ipynb" }));
  return page;
}

export default async () => {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-bench-page-"));
  const ours = join(dir, "explorers.html"),
    floor = join(dir, "floor.html");
  writeFileSync(ours, exportNotebook(explorerNotebook(["skyrmion", "wall"])));
  writeFileSync(floor, floorPage());
  const nb01 = notebook01Page(dir);
  const browser = await launch();
  const o = [],
    f = [],
    n = [],
    nf = [];
  let moves = [];
  try {
    for (let k = 0; k < RUNS; k++) {
      n.push(await probe(browser, nb01));
      nf.push(await probe(browser, floor, { selector: "#p[data-drawn]" }));
    }
    moves = (await probe(browser, nb01, { slider: true })).slider;
    for (let k = 0; k < RUNS; k++) {
      o.push(await probe(browser, ours));
      f.push(await probe(browser, floor, { selector: "#p[data-drawn]" }));
    }
  } finally {
    await browser.close();
  }
  const nbMb = statSync(nb01).size / 1e6;
  // The worker carries no second copy: the page's bundle parts hold the library once (the worker
  // starts from the library factory's own source text); count a catalogue title in the unpacked parts.
  const partType = BUNDLE_PART_TYPE.replace(/[+.]/g, "\\$&");
  const unpacked = [...readFileSync(nb01, "utf8").matchAll(new RegExp(`<script type="${partType}">([A-Za-z0-9+/=]*)</script>`, "g"))]
    .map((m) => gunzipSync(Buffer.from(m[1], "base64")).toString("utf8"))
    .join("\n");
  const title = lib.getCalculator("skyrmion").title;
  const copies = unpacked.split(title).length - 1;
  rmSync(dir, { recursive: true, force: true });
  const sn = summary(n.map((x) => x.ms)),
    snf = summary(nf.map((x) => x.ms)),
    ln = summary(n.map((x) => x.longest)),
    lnf = summary(nf.map((x) => x.longest));
  const ms = moves.map((m) => m.ms),
    compute = moves.map((m) => m.compute);
  const p50 = quantile(ms, 0.5),
    p90 = quantile(ms, 0.9);
  const so = summary(o.map((x) => x.ms)),
    sf = summary(f.map((x) => x.ms));
  const lo = summary(o.map((x) => x.longest)),
    lf = summary(f.map((x) => x.longest));
  const mb = Buffer.byteLength(exportNotebook(explorerNotebook(["skyrmion", "wall"]))) / 1e6,
    fmb = Buffer.byteLength(floorPage()) / 1e6;
  return [
    {
      group: "page",
      name: "notebook 01 exported: page size (MB, not ms)",
      ours_ms: nbMb,
      reference: "plotly alone (floor)",
      reference_ms: fmb,
      ratio: nbMb / fmb,
      goal: verdict(nbMb <= 1.5, "<= 1.5 MB"),
    },
    {
      group: "page",
      name: "notebook 01 exported: copies of the library in the page (the worker starts from the factory's source text; count, not ms)",
      ours_ms: copies,
      goal: verdict(copies === 1, "1 copy"),
    },
    {
      group: "page",
      name: `notebook 01 exported: load -> explorer drawn (first plotly SVG in it), fresh context, interleaved x${RUNS}`,
      ours_ms: sn.median,
      ours_spread: sn.spread,
      reference: "plotly alone drawing one plot (floor)",
      reference_ms: snf.median,
      reference_spread: snf.spread,
      ratio: sn.median / snf.median,
      goal: verdict(sn.median <= 800, "<= 800 ms"),
    },
    {
      group: "page",
      name: "  longest main-thread task during that load",
      ours_ms: ln.median,
      ours_spread: ln.spread,
      reference: "plotly alone (floor)",
      reference_ms: lnf.median,
      reference_spread: lnf.spread,
      ratio: ln.median / lnf.median,
      goal: verdict(ln.median <= 200, "<= 200 ms"),
    },
    {
      group: "page",
      name: `notebook 01 exported: explorer slider -> next animation frame after the plot changed, p90 of ${ms.length} moves`,
      ours_ms: p90,
      ours_spread: [Math.min(...ms), Math.max(...ms)],
      reference: "worker compute of the same moves, p90",
      reference_ms: quantile(compute, 0.9),
      ratio: p90 / quantile(compute, 0.9),
      goal: verdict(p90 <= 16.7, "p90 <= 16.7 ms (one frame)"),
    },
    {
      group: "page",
      name: "  same, p50",
      ours_ms: p50,
      reference: "worker compute, p50",
      reference_ms: quantile(compute, 0.5),
      ratio: p50 / quantile(compute, 0.5),
      goal: "informational",
    },
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
