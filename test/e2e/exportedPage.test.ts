/**
 * Exported pages in a real browser (Debian chromium + playwright-core): the widget state saved in
 * a notebook renders offline; catalogue explorers recompute in the page, and the plotted numbers
 * equal what @helicoid/lib computes in Node for the same inputs; bad entries are refused in the
 * control; calculator errors are shown; kernel-only widgets say they need the kernel.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, buildTestWidgets, outputDir, type Browser } from "./harness";
import { NotebookBuilder, skyrmionField } from "../widgets/fixtures/notebook";
import { testWallSpec } from "../widgets/fixtures/testSpecs";
import { exportNotebook } from "../../kernel-ext/src/notebook/export";
import { getCalculator, runCalculator, defaultSweep } from "../../lib/src/index";

// The skyrmion explorer is part of every page below: getCalculator throws (and the suite fails) if it is renamed.

let browser: Browser;
let page: Page;
let pagePath: string;

/** The traces of an explorer's plots, mapped back to SI with the factors each trace carries. */
async function tracesOf(page: Page, explorer: string): Promise<Array<{ output: string; xOutput: string; x: number[]; y: Array<number | null> }>> {
  return page.evaluate((sel) => {
    const root = document.querySelector(sel)!;
    const out: Array<{ output: string; xOutput: string; x: number[]; y: Array<number | null> }> = [];
    root.querySelectorAll(".hx-plot").forEach((gd) => {
      for (const t of (gd as unknown as { data?: Array<{ x: number[]; y: Array<number | null>; meta: { output: string; xOutput: string; xFactor: number; yFactor: number } }> })
        .data ?? []) {
        out.push({ output: t.meta.output, xOutput: t.meta.xOutput, x: t.x.map((v) => v * t.meta.xFactor), y: t.y.map((v) => (v === null ? null : v * t.meta.yFactor)) });
      }
    });
    return out;
  }, explorer);
}

/** Move a range slider of an explorer to `position` (0..1000) as a person dragging it would. */
async function moveSlider(page: Page, explorer: string, input: string, position: number): Promise<void> {
  await page.evaluate(
    ([sel, name, pos]) => {
      const s = document.querySelector(`${sel} .hx-control[data-input="${name}"] input.hx-slider`) as HTMLInputElement;
      s.value = String(pos);
      s.dispatchEvent(new Event("input", { bubbles: true }));
    },
    [explorer, input, position] as const,
  );
}

/** Wait until an explorer's plot reflects its current inputs (the worker answered and plotly drew). */
async function settled(page: Page, explorer: string): Promise<void> {
  const state = await page.waitForFunction(
    (sel) => {
      const root = document.querySelector(sel) as HTMLElement | null;
      if (!root || root.dataset.busy !== "") return false;
      const err = root.querySelector(".hx-results > .hx-error") as HTMLElement | null;
      if (err && !err.hidden) return `error: ${err.textContent}`;
      return root.dataset.drawing === "" && !!root.querySelector(".hx-plot[data-drawn]") ? "ok" : false;
    },
    explorer,
    { timeout: 30_000 },
  );
  const outcome = await state.jsonValue();
  if (outcome !== "ok") throw new Error(`explorer ${explorer} shows a calculator ${outcome}`);
  await page.waitForTimeout(50);
}

async function inputsOf(page: Page, explorer: string): Promise<Record<string, number>> {
  return page.evaluate((sel) => {
    const o: Record<string, number> = {};
    document.querySelectorAll(`${sel} .hx-control`).forEach((r) => {
      o[(r as HTMLElement).dataset.input!] = Number((r as HTMLElement).dataset.value);
    });
    return o;
  }, explorer);
}

/** Largest relative difference of plotted values (null = gap) against Node's values (NaN = gap). */
function maxRelativeDifference(plotted: Array<number | null>, node: number[]): number {
  let worst = 0;
  plotted.forEach((v, i) => {
    const e = node[i]!;
    if (v === null) {
      if (Number.isFinite(e)) worst = Infinity;
      return;
    }
    worst = Math.max(worst, Math.abs(v - e) / Math.max(Math.abs(v), Math.abs(e)));
  });
  return worst;
}

function relClose(a: number, b: number, rel: number): boolean {
  return Math.abs(a - b) <= rel * Math.max(Math.abs(a), Math.abs(b));
}

beforeAll(async () => {
  const bundle = await buildTestWidgets();
  const nb = new NotebookBuilder();
  nb.markdown("# Exported explorers\n\nAn **invented** film; values are estimates.\n\n| a | b |\n|---|---|\n| 1 | 2 |");
  const wallSweep = defaultSweep(testWallSpec, {})!;
  nb.widget(
    "ExplorerModel",
    { calculator: "test-wall-width", spec: null, inputs: {}, sweep: wallSweep, result: null, error: "", compute_in: "browser", kernel_version: "0.1.0" },
    {},
    'explore("test-wall-width")',
  );
  {
    const spec = getCalculator("skyrmion");
    const sweep = defaultSweep(spec, {})!;
    const inputs = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
    // No saved result: the page computes the first one itself.
    nb.widget(
      "ExplorerModel",
      { calculator: "skyrmion", spec: null, inputs, sweep, result: null, error: "", compute_in: "browser", kernel_version: "0.1.0" },
      {},
      'explore("skyrmion")',
    );
  }
  const { compute: _c, ...specData } = testWallSpec;
  nb.widget(
    "ExplorerModel",
    {
      calculator: "",
      spec: specData,
      function_name: "myWidth",
      inputs: { Ms: 1e6, A: 1e-11, Ku: 1e6 },
      sweep: null,
      result: runCalculator(testWallSpec, { Ms: 1e6, A: 1e-11, Ku: 1e6 }),
      error: "",
      compute_in: "kernel",
      kernel_version: "0.1.0",
    },
    {},
    "explore(myWidth)",
  );
  nb.widget("FigureModel", { figure: { data: [{ type: "scatter", x: [0, 1, 2, 3], y: [0, 1, 4, 9], name: "invented" }], layout: { title: { text: "Figure widget" } } } });
  const n = 64;
  nb.widget("TextureModel", { nx: n, ny: n, dx: 1e-9, dy: 1e-9, title: "Invented skyrmion (64 x 64)", arrows: true, overlay: "charge", field: null }, { field: skyrmionField(n) });
  nb.widget("FitPanelModel", {
    title: "Invented wall profile fit",
    x: [0, 1, 2, 3, 4],
    y: [0.1, 0.9, 2.1, 2.9, 4.2],
    model_y: [0, 1, 2, 3, 4],
    residuals: [0.1, -0.1, 0.1, -0.1, 0.2],
    parameters: [{ name: "slope", unit: "", value: 1.02, uncertainty: 0.03 }],
    status: "done",
    progress: 1,
    iterations: 7,
    reduced_chi2: 1.1,
    message: "converged",
  });
  nb.code("figure({...})", [
    {
      output_type: "display_data",
      metadata: {},
      data: {
        "application/vnd.plotly.v1+json": { data: [{ type: "bar", x: ["a", "b"], y: [2, 3] }], layout: { title: { text: "plotly output" } } },
        "text/plain": "Figure(1 trace)",
      },
    },
  ]);
  const sliderId = nb.model("FloatSliderModel", "@jupyter-widgets/controls", "2.0.0", {
    _model_name: "FloatSliderModel",
    _model_module: "@jupyter-widgets/controls",
    _model_module_version: "2.0.0",
    _view_name: "FloatSliderView",
    _view_module: "@jupyter-widgets/controls",
    _view_module_version: "2.0.0",
    value: 3,
    min: 0,
    max: 10,
    step: 0.5,
    description: "x",
  });
  nb.code("slider({ value: 3 })", [nb.viewOutput(sliderId, "FloatSlider(value=3)")]);
  const outputId = nb.model("OutputModel", "@jupyter-widgets/output", "1.0.0", {
    _model_name: "OutputModel",
    _model_module: "@jupyter-widgets/output",
    _model_module_version: "1.0.0",
    _view_name: "OutputView",
    _view_module: "@jupyter-widgets/output",
    _view_module_version: "1.0.0",
    outputs: [
      { output_type: "display_data", metadata: {}, data: { "text/markdown": "width **5.5 nm** (invented)", "text/plain": "width 5.5 nm" } },
      {
        output_type: "display_data",
        metadata: {},
        data: { "application/vnd.plotly.v1+json": { data: [{ type: "scatter", y: [3, 1, 2] }], layout: { height: 250 } }, "text/plain": "Figure(1 trace)" },
      },
    ],
  });
  nb.code("controlPanel(...)", [nb.viewOutput(outputId, "Output()")]);
  nb.code('console.log("hello")', [{ output_type: "stream", name: "stdout", text: ["hello\n"] }]);
  const html = exportNotebook(nb.build(), { bundle, sourceName: "exported-test.ipynb" });
  mkdirSync(join(outputDir, "export"), { recursive: true });
  pagePath = join(outputDir, "export", "widgets-test.html");
  writeFileSync(pagePath, html);
  browser = await launchBrowser();
  page = await browser.newPage();
  // No network: any request that is not the page file itself fails.
  await page.route(/^(?!file:).*/, (route) => route.abort());
  await page.goto(`file://${pagePath}`);
  await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
}, 180_000);

afterAll(async () => {
  await browser?.close();
});

const wall = '.hx-explorer[data-calculator="test-wall-width"][data-mode="browser"]';

describe("exported page", () => {
  it("renders every saved widget and the plotly output, with no network", async () => {
    expect(await page.evaluate(() => document.body.dataset.helicoidWidgets)).toBe("8");
    // An output area (as a control panel leaves it) shows its Markdown and its plotly figure.
    await page.waitForSelector(".widget-output .hx-plotly-output .main-svg", { timeout: 20_000 });
    expect(await page.locator(".widget-output strong").first().textContent()).toBe("5.5 nm");
    // A standard control (driven by kernel code) renders with its saved value and says it needs the kernel.
    expect(await page.locator(".widget-slider .widget-readout").first().textContent()).toBe("3.00");
    expect(await page.locator(".hx-static-note").count()).toBe(1);
    expect(await page.locator(".hx-plotly-output .main-svg").count()).toBeGreaterThan(0);
    expect(await page.locator("main h1").textContent()).toBe("Exported explorers");
    expect(await page.locator(".hx-markdown-cell table td").count()).toBe(2);
    // Catalogue explorers compute in a Web Worker started from the page itself (a Blob URL).
    expect(await page.locator(`${wall} .hx-badge`).textContent()).toContain("Web Worker");
    await screenshot(page, "export-page");
  });

  it("a catalogue explorer recomputes in the page: the plot equals @helicoid/lib in Node", async () => {
    await settled(page, wall);
    await screenshot(page, "explorer", wall);
    const before = await tracesOf(page, wall);
    await moveSlider(page, wall, "Ms", 300);
    await settled(page, wall);
    const inputs = await inputsOf(page, wall);
    expect(inputs.Ms).not.toBe(testWallSpec.inputs[0]!.default);
    const sweep = defaultSweep(testWallSpec, {})!;
    const node = runCalculator(testWallSpec, inputs, { sweep });
    const after = await tracesOf(page, wall);
    const trace = after.find((t) => t.output === "DeltaSweep")!;
    const expected = node.outputs.DeltaSweep!.value as number[];
    expect(trace.y.length).toBe(expected.length);
    // Source: closed form of testSpecs.ts evaluated by @helicoid/lib in Node (the same spec, another runtime).
    // Points without a perpendicular film (K_eff <= 0) are NaN in Node and gaps (null) in the plot.
    const bad = trace.y.map((v, i) => [i, v, expected[i]]).filter(([, v, e]) => (v === null ? Number.isFinite(e as number) : !relClose(v as number, e as number, 1e-9)));
    expect(bad).toEqual([]);
    expect(trace.y).not.toEqual(before.find((t) => t.output === "DeltaSweep")!.y);
    // The outputs table follows too.
    const delta = Number(await page.locator(`${wall} tr[data-output="Delta"]`).getAttribute("data-value"));
    expect(relClose(delta, node.outputs.Delta!.value as number, 1e-12)).toBe(true);
  });

  it("refuses '12 mT' typed into A, says why and keeps the last good value", async () => {
    const before = await inputsOf(page, wall);
    const entry = page.locator(`${wall} .hx-control[data-input="A"] input.hx-entry`);
    await entry.fill("12 mT");
    await entry.press("Enter");
    const msg = page.locator(`${wall} .hx-control[data-input="A"] .hx-entry-error`);
    await expect.poll(() => msg.isVisible()).toBe(true);
    const text = (await msg.textContent())!;
    expect(text).toContain('A = "12 mT"');
    expect(text).toContain("J/m");
    expect((await inputsOf(page, wall)).A).toBe(before.A);
    await screenshot(page, "explorer-bad-entry", wall);
    // A good entry with units is taken.
    await entry.fill("20 pJ/m");
    await entry.press("Enter");
    await settled(page, wall);
    expect((await inputsOf(page, wall)).A).toBeCloseTo(2e-11, 20);
    expect(await msg.isVisible()).toBe(false);
  });

  it("shows a calculator error in the view instead of a blank plot", async () => {
    // Ms = 2 MA/m gives mu0 Ms^2 / 2 = 2.5 MJ/m^3 > Ku: no perpendicular film (the spec throws InputError).
    const entry = page.locator(`${wall} .hx-control[data-input="Ms"] input.hx-entry`);
    await entry.fill("2 MA/m");
    await entry.press("Enter");
    const err = page.locator(`${wall} > .hx-body .hx-results > .hx-error`);
    await expect.poll(() => err.isVisible(), { timeout: 10_000 }).toBe(true);
    expect(await err.textContent()).toContain("Ku");
    await screenshot(page, "explorer-calculator-error", wall);
    await page.locator(`${wall} .hx-reset`).click();
    await expect.poll(() => err.isVisible(), { timeout: 10_000 }).toBe(false);
    expect((await inputsOf(page, wall)).Ms).toBe(1.1e6);
  });

  it("copy as code gives a cell whose inputs reproduce the explorer's result", async () => {
    await page.locator(`${wall} .hx-copy`).click();
    const snippet = (await page.locator(`${wall} .hx-snippet`).textContent())!;
    expect(snippet).toContain('getCalculator("test-wall-width")');
    const body = /\{\n([\s\S]*?)\n\}/.exec(snippet)![1]!;
    const raw = Object.fromEntries(
      body.split("\n").map((l) => {
        const m = /^\s*(\w+): (.*),$/.exec(l)!;
        return [m[1], JSON.parse(m[2]!)];
      }),
    );
    const inputs = await inputsOf(page, wall);
    const fromSnippet = runCalculator(testWallSpec, raw);
    const direct = runCalculator(testWallSpec, inputs);
    expect(relClose(fromSnippet.outputs.Delta!.value as number, direct.outputs.Delta!.value as number, 1e-10)).toBe(true);
  });

  it("a kernel-function explorer shows its last state and says it needs the kernel", async () => {
    const k = '.hx-explorer[data-mode="kernel"]';
    expect(await page.locator(`${k} .hx-badge`).textContent()).toContain("needs the running kernel");
    expect(await page.locator(`${k} input.hx-slider`).first().isDisabled()).toBe(true);
    expect(await page.locator(`${k} tr[data-output="Delta"]`).getAttribute("data-value")).toBe(
      String(runCalculator(testWallSpec, { Ms: 1e6, A: 1e-11, Ku: 1e6 }).outputs.Delta!.value),
    );
    await screenshot(page, "explorer-kernel-function", k);
  });

  it("the texture view draws the field, its topological charge and a hover readout", async () => {
    const t = page.locator(".hx-texture");
    // Source: a skyrmion with the core down in an up background and vorticity 1 has Q = -1
    // (Q = (1/4 pi) ∫ m·(∂x m × ∂y m) = (w/2)(cos theta(0) - cos theta(∞)) = -1 for theta: pi -> 0).
    const q = Number(await t.getAttribute("data-charge"));
    expect(Math.abs(q + 1)).toBeLessThan(0.02);
    await page.locator(".hx-texture-arrows").scrollIntoViewIfNeeded();
    const box = (await page.locator(".hx-texture-arrows").boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.5 + 1, box.y + box.height * 0.5 + 1);
    const readout = (await page.locator(".hx-readout").textContent())!;
    expect(readout).toMatch(/cell \(3[12], 3[12]\)/);
    expect(readout).toMatch(/m = \(-?0\.\d+, -?0\.\d+, -0\.9\d+\)/);
    // The centre (m_z = -1) is the blue end of the m_z map.
    // Source: K. Moreland, Diverging Color Maps for Scientific Visualization (ISVC 2009): cool-warm end (59, 76, 192) at -1.
    const centre = await page.evaluate(() => {
      const c = document.querySelector(".hx-texture-canvas") as HTMLCanvasElement;
      return Array.from(c.getContext("2d")!.getImageData(c.width / 2, c.height / 2, 1, 1).data);
    });
    expect(centre[2]! - centre[0]!).toBeGreaterThan(100);
    await screenshot(page, "texture", ".hx-texture");
  });

  it("the figure and fit panel views render their state", async () => {
    expect(Number(await page.locator(".hx-figure").getAttribute("data-draws"))).toBeGreaterThanOrEqual(1);
    await screenshot(page, "figure", ".hx-figure");
    expect(await page.locator('.hx-fit tr[data-parameter="slope"]').textContent()).toContain("1.02");
    expect(await page.locator(".hx-fit .hx-fit-start").isDisabled()).toBe(true);
    expect(await page.locator(".hx-fit-status").textContent()).toContain("needs the running kernel");
    await screenshot(page, "fit-panel", ".hx-fit");
  });

  it("moving the skyrmion explorer's D slider changes R(B) to what @helicoid/lib computes in Node (1e-9 relative)", async () => {
    const sk = '.hx-explorer[data-calculator="skyrmion"]';
    await settled(page, sk);
    const spec = getCalculator("skyrmion");
    const before = (await tracesOf(page, sk)).find((t) => t.output === "radiusSweep")!;
    await moveSlider(page, sk, "D", 700);
    await settled(page, sk);
    const inputs = await inputsOf(page, sk);
    // The same inputs and the same sweep as the page.
    const sweep = JSON.parse((await page.locator(sk).getAttribute("data-sweep"))!);
    expect(sweep).toEqual(defaultSweep(spec, inputs));
    const node = runCalculator(spec, inputs, { sweep });
    const after = (await tracesOf(page, sk)).find((t) => t.output === "radiusSweep")!;
    const expected = node.outputs.radiusSweep!.value as number[];
    const xs = node.outputs.fieldSweep!.value as number[];
    expect(after.y.length).toBe(expected.length);
    expect(after.y).not.toEqual(before.y);
    // Source: @helicoid/lib's skyrmion calculator run in Node on the inputs the page shows.
    // Chromium's and Node's V8 differ in the last ulp of Math.exp/log/pow/sin/atan2 for some
    // arguments, so 1e-9 agreement also asks the calculator's solvers to converge well below 1e-9.
    expect(maxRelativeDifference(after.y, expected)).toBeLessThanOrEqual(1e-9);
    after.x.forEach((v, i) => expect(relClose(v, xs[i]!, 1e-9)).toBe(true));
    await screenshot(page, "explorer-skyrmion", sk);
  });
  it("small slider steps swap the curves in place as plotly would draw them, then plotly redraws them exactly", async () => {
    const sk = '.hx-explorer[data-calculator="skyrmion"]';
    await settled(page, sk);
    // Several small steps of D: the axes stay, so the view swaps the curves in plotly's SVG lines
    // and redraws with plotly once the slider rests. Each swapped path is recorded on arrival.
    const swapped = await page.evaluate(async (sel) => {
      const root = document.querySelector(sel) as HTMLElement;
      const s = root.querySelector('.hx-control[data-input="D"] input.hx-slider') as HTMLInputElement;
      const gd = root.querySelector(".hx-plot") as HTMLElement;
      const paths = () => Array.from(gd.querySelectorAll(".scatterlayer > .trace path.js-line")).map((p) => p.getAttribute("d") ?? "");
      let last: string[] | null = null;
      for (let k = 0; k < 6; k++) {
        const swaps = Number(gd.dataset.swaps ?? 0);
        const marks = performance.getEntriesByName("hx-slider-to-all-plots").length;
        s.value = String(Number(s.value) + 2);
        s.dispatchEvent(new Event("input", { bubbles: true }));
        const t0 = performance.now();
        while (performance.getEntriesByName("hx-slider-to-all-plots").length === marks && performance.now() - t0 < 20_000) await new Promise((r) => setTimeout(r, 1));
        if (Number(gd.dataset.swaps ?? 0) > swaps) last = paths();
        else last = null;
      }
      return last;
    }, sk);
    // Common practice, no source: with the axes kept, 2 of 1000 slider steps change R(B) far less
    // than the axis span, so at least the last step is a swap.
    expect(swapped).not.toBeNull();
    await settled(page, sk);
    await page.waitForTimeout(200);
    await settled(page, sk);
    const drawn = await page.evaluate(
      (sel) =>
        Array.from(document.querySelector(sel)!.querySelectorAll(".hx-plot")[0]!.querySelectorAll(".scatterlayer > .trace path.js-line")).map((p) => p.getAttribute("d") ?? ""),
      sk,
    );
    // Source: plotly.js's own drawing of the same data and axes (it keeps a subset of the points
    // after its line simplification): every vertex plotly drew is a vertex of the swapped path.
    const vertices = (d: string) =>
      d
        .split(/[ML]/)
        .filter(Boolean)
        .map((p) => p.split(",").map(Number) as [number, number]);
    expect(drawn.length).toBe(swapped!.length);
    drawn.forEach((d, k) => {
      const ours = vertices(swapped![k]!);
      const theirs = vertices(d);
      expect(theirs.length).toBeGreaterThan(2);
      for (const [x, y] of theirs) expect(ours.some(([u, v]) => Math.abs(u - x) <= 0.011 && Math.abs(v - y) <= 0.011)).toBe(true);
    });
    // After the rest, plotly's data are the exact numbers of @helicoid/lib in Node.
    const inputs = await inputsOf(page, sk);
    const spec = getCalculator("skyrmion");
    const node = runCalculator(spec, inputs, { sweep: JSON.parse((await page.locator(sk).getAttribute("data-sweep"))!) });
    const after = (await tracesOf(page, sk)).find((t) => t.output === "radiusSweep")!;
    // Source: @helicoid/lib's skyrmion calculator run in Node on the inputs the page shows.
    expect(maxRelativeDifference(after.y, node.outputs.radiusSweep!.value as number[])).toBeLessThanOrEqual(1e-9);
  });
});
