/**
 * Time traces in an exported page (Debian's chromium): a plot whose x axis is time gets a scrubber.
 * Moving it marks that time on the plot and reads every curve there; the values read are those
 * @helicoid/lib computes in Node for the same inputs; Play runs through the trace to its end.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, buildTestWidgets, outputDir, type Browser } from "./harness";
import { NotebookBuilder } from "../widgets/fixtures/notebook";
import { exportNotebook } from "../../kernel-ext/src/notebook/export";
import { getCalculator, runCalculator, formatQuantity } from "../../lib/src/index";

let browser: Browser;
let page: Page;
const root = `.hx-explorer[data-calculator="wall-trace"][data-mode="browser"]`;

beforeAll(async () => {
  const bundle = await buildTestWidgets();
  const nb = new NotebookBuilder();
  nb.markdown("# A wall trace\n\nInvented film; values are estimates.");
  const spec = getCalculator("wall-trace");
  const inputs = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
  nb.widget(
    "ExplorerModel",
    { calculator: "wall-trace", spec: null, inputs, sweep: null, result: null, error: "", compute_in: "browser", kernel_version: "0.1.0" },
    {},
    'explore("wall-trace")',
  );
  const html = exportNotebook(nb.build(), { bundle, sourceName: "time-scrub-test.ipynb" });
  mkdirSync(join(outputDir, "export"), { recursive: true });
  const pagePath = join(outputDir, "export", "time-scrub-test.html");
  writeFileSync(pagePath, html);
  browser = await launchBrowser();
  page = await browser.newPage();
  await page.route(/^(?!file:).*/, (route) => route.abort());
  await page.goto(`file://${pagePath}`);
  await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
  await page.waitForFunction((s) => !!document.querySelector(`${s} .hx-plot[data-drawn]`), root, { timeout: 60_000 });
}, 240_000);

afterAll(async () => {
  await browser?.close();
});

describe("time traces: scrub and play", () => {
  it("every time plot has a scrubber; moving it marks the time and reads the curves as the library computes them", async () => {
    const spec = getCalculator("wall-trace");
    const timePlots = spec.plots.filter((p) => spec.outputs.find((o) => o.name === p.x)?.unit === "s");
    expect(timePlots.length).toBeGreaterThan(0);
    expect(await page.locator(`${root} .hx-scrub`).count()).toBe(timePlots.length);
    const plot = timePlots[0]!;
    const bar = `${root} .hx-scrub[data-scrub="${plot.id}"]`;
    // half-way along the trace
    await page.locator(`${bar} .hx-scrub-range`).fill("500");
    await page.waitForFunction((b) => !!(document.querySelector(b) as HTMLElement | null)?.dataset.index, bar);
    const index = Number(await page.locator(bar).getAttribute("data-index"));
    const readout = (await page.locator(`${bar} .hx-scrub-readout`).textContent()) ?? "";
    // the same inputs in Node
    const r = runCalculator(spec, Object.fromEntries(spec.inputs.map((i) => [i.name, i.default])));
    const ts = r.outputs[plot.x]!.value as number[];
    const tMid = ts[0]! + 0.5 * (ts[ts.length - 1]! - ts[0]!);
    const nearest = ts.reduce((best, t, i) => (Math.abs(t - tMid) < Math.abs(ts[best]! - tMid) ? i : best), 0);
    expect(Math.abs(index - nearest)).toBeLessThanOrEqual(1);
    expect(readout).toContain(`t = ${formatQuantity(ts[index]!, "s")}`);
    for (const y of plot.y) {
      const o = spec.outputs.find((x) => x.name === y)!;
      expect(readout).toContain(formatQuantity((r.outputs[y]!.value as number[])[index]!, o.unit));
    }
    // the plot carries a vertical mark at that time, in the axis unit of the plot
    const mark = await page.evaluate((s) => {
      const gd = document.querySelector(s) as unknown as { layout: { shapes?: Array<{ x0: number; type: string }> }; data: Array<{ meta: { xFactor: number } }> };
      const sh = (gd.layout.shapes ?? []).find((x) => x.type === "line");
      return sh ? sh.x0 * gd.data[0]!.meta.xFactor : null;
    }, `${root} .hx-plot[data-plot="${plot.id}"]`);
    expect(mark).not.toBeNull();
    expect(Math.abs(mark! - tMid) / (ts[ts.length - 1]! - ts[0]!)).toBeLessThan(1e-6);
    await screenshot(page, "time-scrub", root);
  });

  it("Play runs through the trace to its end", async () => {
    const spec = getCalculator("wall-trace");
    const plot = spec.plots.find((p) => spec.outputs.find((o) => o.name === p.x)?.unit === "s")!;
    const bar = `${root} .hx-scrub[data-scrub="${plot.id}"]`;
    await page.locator(`${bar} .hx-scrub-range`).fill("0");
    await page.locator(`${bar} .hx-scrub-play`).click();
    // it ends at the trace's end and the button offers Play again
    await page.waitForFunction(
      (b) => (document.querySelector(`${b} .hx-scrub-range`) as HTMLInputElement).value === "1000" && document.querySelector(`${b} .hx-scrub-play`)!.textContent === "Play",
      bar,
      { timeout: 20_000 },
    );
    const spec2 = getCalculator("wall-trace");
    const r = runCalculator(spec2, Object.fromEntries(spec2.inputs.map((i) => [i.name, i.default])));
    const ts = r.outputs[plot.x]!.value as number[];
    expect(Number(await page.locator(bar).getAttribute("data-index"))).toBe(ts.length - 1);
  });
});
