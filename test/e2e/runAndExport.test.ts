/**
 * The whole path a user takes: a notebook using our widgets is executed by `helicoid run` (in
 * process, widget state saved in the notebook), exported by `helicoid export`, and opened in
 * chromium with no network. Moving the skyrmion explorer's D slider replots R(B) with values equal
 * (1e-9 relative) to @helicoid/lib in Node for the same inputs.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, repoRoot, outputDir, type Browser } from "./harness";
import { getCalculator, runCalculator } from "../../lib/src/index";

const bin = join(repoRoot, "kernel-ext", "bin", "helicoid.js");
const built = existsSync(join(repoRoot, "kernel-ext", "dist", "cli", "main.js")) && existsSync(join(repoRoot, "widgets", "dist", "export.js"));
const dir = join(outputDir, "run-export");
let browser: Browser;
let page: Page;

const code = (source: string) => ({ cell_type: "code", metadata: {}, execution_count: null, outputs: [], source });

describe("helicoid run + helicoid export + browser", () => {
  it("has the build it tests (npm run build; npm test builds first)", () => {
    // a missing build fails here, by name, instead of skipping the browser checks below
    expect(built, "kernel-ext/dist and widgets/dist: run npm run build").toBe(true);
  });

  beforeAll(async () => {
    mkdirSync(dir, { recursive: true });
    const nb = {
      nbformat: 4,
      nbformat_minor: 5,
      metadata: { kernelspec: { name: "helicoid", display_name: "TypeScript (Helicoid)", language: "typescript" } },
      cells: [
        { cell_type: "markdown", metadata: {}, source: "# Skyrmion radius on an invented film\n\nAll parameters are **invented**; results are estimates." },
        code('import { explore, textureView, figureWidget, fitPanel } from "@helicoid/kernel";\nconst ex = explore("skyrmion", { D: "2.6 mJ/m^2" });\nex'),
        code(
          'const n = 64; const f = new Float32Array(3 * n * n);\nfor (let j = 0; j < n; j++) for (let i = 0; i < n; i++) { const x = i - 31.5, y = j - 31.5, r = Math.hypot(x, y), th = 2 * Math.atan(Math.exp((10 - r) / 3)), p = Math.atan2(y, x), k = 3 * (j * n + i); f[k] = Math.sin(th) * Math.cos(p); f[k + 1] = Math.sin(th) * Math.sin(p); f[k + 2] = Math.cos(th); }\ntextureView(f, n, n, { title: "invented skyrmion", overlay: "charge" })',
        ),
        code('figureWidget({ data: [{ type: "scatter", y: [1, 4, 9] }], layout: { title: { text: "live figure" } } })'),
        code(
          'fitPanel({ title: "invented fit", x: [0, 1, 2], y: [0, 1.1, 1.9], modelY: [0, 1, 2], residuals: [0, 0.1, -0.1], status: "done", parameters: [{ name: "slope", value: 0.98, uncertainty: 0.05 }] })',
        ),
        code("ex.result.outputs.radius.value"),
      ],
    };
    const src = join(dir, "skyrmion.ipynb");
    writeFileSync(src, JSON.stringify(nb));
    const run = spawnSync(process.execPath, [bin, "run", src, "-o", join(dir, "skyrmion.run.ipynb")], { encoding: "utf8", timeout: 170_000 });
    if (run.status !== 0) throw new Error(`helicoid run failed:\n${run.stdout}\n${run.stderr}`);
    const exp = spawnSync(process.execPath, [bin, "export", join(dir, "skyrmion.run.ipynb"), "-o", join(dir, "skyrmion.html")], { encoding: "utf8" });
    if (exp.status !== 0) throw new Error(`helicoid export failed:\n${exp.stdout}\n${exp.stderr}`);
    browser = await launchBrowser();
    page = await browser.newPage();
    // No network: every request other than the page itself fails.
    await page.route(/^(?!file:).*/, (route) => route.abort());
    await page.goto(`file://${join(dir, "skyrmion.html")}`);
    await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
  });

  it("shows all four widgets from the state the runner saved", async () => {
    expect(await page.evaluate(() => document.body.dataset.helicoidWidgets)).toBe("4");
    const executed = JSON.parse(readFileSync(join(dir, "skyrmion.run.ipynb"), "utf8"));
    const state = executed.metadata.widgets["application/vnd.jupyter.widget-state+json"].state;
    const names = Object.values(state).map((m: any) => m.model_name);
    expect(names).toEqual(expect.arrayContaining(["ExplorerModel", "TextureModel", "FigureModel", "FitPanelModel"]));
    await screenshot(page, "run-export-page");
  });

  it("moving the skyrmion explorer's D slider replots R(B) as @helicoid/lib computes it in Node (1e-9 relative)", async () => {
    const sk = '.hx-explorer[data-calculator="skyrmion"]';
    const settled = () =>
      page.waitForFunction(
        (sel) => {
          const r = document.querySelector(sel) as HTMLElement;
          return r.dataset.busy === "" && r.dataset.drawing === "" && !!r.querySelector(".hx-plot[data-drawn]");
        },
        sk,
        { timeout: 60_000 },
      );
    await settled();
    const read = () =>
      page.evaluate((sel) => {
        const root = document.querySelector(sel)!;
        const inputs: Record<string, number> = {};
        root.querySelectorAll(".hx-control").forEach((r) => {
          inputs[(r as HTMLElement).dataset.input!] = Number((r as HTMLElement).dataset.value);
        });
        let trace: { x: number[]; y: Array<number | null> } | null = null;
        root.querySelectorAll(".hx-plot").forEach((gd) => {
          for (const t of (gd as any).data ?? [])
            if (t.meta.output === "radiusSweep")
              trace = { x: t.x.map((v: number) => v * t.meta.xFactor), y: t.y.map((v: number | null) => (v === null ? null : v * t.meta.yFactor)) };
        });
        const sweep = JSON.parse((root as HTMLElement).dataset.sweep || "null");
        return { inputs, sweep, trace: trace! };
      }, sk);
    const before = await read();
    expect(before.inputs.D).toBeCloseTo(2.6e-3, 12);
    await page.evaluate((sel) => {
      const s = document.querySelector(`${sel} .hx-control[data-input="D"] input.hx-slider`) as HTMLInputElement;
      s.value = String(Number(s.value) + 120);
      s.dispatchEvent(new Event("input", { bubbles: true }));
    }, sk);
    await page.waitForFunction((sel) => Number((document.querySelector(`${sel} .hx-control[data-input="D"]`) as HTMLElement).dataset.value) !== 2.6e-3, sk);
    await settled();
    const after = await read();
    expect(after.inputs.D).not.toBe(before.inputs.D);
    const spec = getCalculator("skyrmion");
    // The same inputs and the same sweep as the page.
    expect(after.sweep.over).toBe("B");
    const node = runCalculator(spec, after.inputs, { sweep: after.sweep });
    const ys = node.outputs.radiusSweep!.value as number[];
    const xs = node.outputs.fieldSweep!.value as number[];
    expect(after.trace.y.length).toBe(ys.length);
    expect(after.trace.y).not.toEqual(before.trace.y);
    // Source: @helicoid/lib's skyrmion calculator run in Node on the inputs the page shows.
    // Chromium's and Node's V8 differ in the last ulp of Math.exp/log/pow/sin/atan2 for some
    // arguments, so 1e-9 agreement also asks the calculator's solvers to converge well below 1e-9.
    let worst = 0;
    after.trace.y.forEach((v, i) => {
      const e = ys[i]!;
      if (v === null) {
        if (Number.isFinite(e)) worst = Infinity;
        return;
      }
      worst = Math.max(worst, Math.abs(v - e) / Math.max(Math.abs(v), Math.abs(e)));
    });
    expect(worst).toBeLessThanOrEqual(1e-9);
    after.trace.x.forEach((v, i) => expect(Math.abs(v - xs[i]!)).toBeLessThanOrEqual(1e-9 * Math.abs(xs[i]!) + 1e-18));
    await screenshot(page, "run-export-skyrmion", sk);
  });
});
