/**
 * Plain plotly outputs of a notebook (application/vnd.plotly.v1+json) in an exported page, in
 * Debian's chromium: the page carries a plotly build of its own (widgets/src/pagePlotly.js), so a
 * user's figure with any trace type JupyterLab's cartesian plotly draws must draw in the page too,
 * and a trace type outside it must be named in a message instead of failing silently.
 * Common practice, no source: plotly draws each trace of a cartesian figure as a `.trace` group or a
 * pie slice; the expected counts follow from the figure given.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { launchBrowser, type Browser } from "./harness";
import { NotebookBuilder } from "../widgets/fixtures/notebook";
import { exportNotebook } from "../../kernel-ext/src/notebook/export";

const dir = mkdtempSync(join(tmpdir(), "helicoid-page-traces-"));
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
}, 60_000);
afterAll(async () => {
  await browser?.close();
  rmSync(dir, { recursive: true, force: true });
});

const figure = (data: unknown[]) => ({
  output_type: "display_data",
  metadata: {},
  data: { "application/vnd.plotly.v1+json": { data, layout: { width: 400, height: 300 } }, "text/plain": "figure" },
});

describe("exported page: users' own plotly figures", () => {
  it("draws every cartesian trace type JupyterLab draws and names the ones it cannot", async () => {
    const nb = new NotebookBuilder();
    nb.code("box and violin", [
      figure([
        { type: "box", y: [1, 2, 3, 4, 8], name: "b" },
        { type: "violin", y: [1, 2, 2, 3, 5], name: "v" },
      ]),
    ]);
    nb.code("pie", [figure([{ type: "pie", values: [3, 2, 1], labels: ["a", "b", "c"] }])]);
    nb.code("ternary", [figure([{ type: "scatterternary", a: [0.2, 0.5], b: [0.3, 0.2], c: [0.5, 0.3], mode: "markers" }])]);
    nb.code("heatmap and bars", [
      figure([
        {
          type: "heatmap",
          z: [
            [1, 2],
            [3, 4],
          ],
        },
        { type: "bar", x: [1, 2], y: [3, 1] },
      ]),
    ]);
    nb.code("3d", [figure([{ type: "scatter3d", x: [1], y: [2], z: [3] }])]);
    const file = join(dir, "page.html");
    writeFileSync(file, exportNotebook(nb.build() as never));
    const page = await browser.newPage();
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(String(e)));
    await page.route(/^(?!file:|data:|blob:).*/, (route) => route.abort());
    await page.goto(`file://${file}`);
    await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
    const got = await page.evaluate(() => {
      const outs = Array.from(document.querySelectorAll(".hx-plotly-output"));
      return outs.map((o) => ({
        boxes: o.querySelectorAll(".boxlayer .trace").length,
        violins: o.querySelectorAll(".violinlayer .trace").length,
        slices: o.querySelectorAll(".slice").length,
        ternary: o.querySelectorAll(".ternary .trace").length,
        heatmaps: o.querySelectorAll(".heatmaplayer image, .heatmaplayer .hm").length,
        bars: o.querySelectorAll(".barlayer .trace").length,
        message: o.previousElementSibling?.classList.contains("hx-error") ? o.previousElementSibling.textContent : "",
      }));
    });
    expect(errors).toEqual([]);
    expect(got).toHaveLength(5);
    expect(got[0]).toMatchObject({ boxes: 1, violins: 1, message: "" });
    expect(got[1]).toMatchObject({ slices: 3, message: "" });
    expect(got[2]).toMatchObject({ ternary: 1, message: "" });
    expect(got[3]!.heatmaps).toBeGreaterThanOrEqual(1);
    expect(got[3]).toMatchObject({ bars: 1, message: "" });
    expect(got[4]!.message).toContain("scatter3d");
    await page.close();
  }, 120_000);
});
