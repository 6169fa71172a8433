/**
 * The texture view and the texture explorer in a real browser (Debian chromium + playwright-core,
 * an exported page, no kernel): crisp cells (every cell one block of one colour, two adjacent cells
 * differ with no blended pixel between them, both in the canvas and in a screenshot), m_z colours
 * from Moreland's diverging map, colour bars with ticks and units, axes in nm whose ticks sit at the
 * cells they name, a scale bar, object markers and their table; the `texture` explorer shows the
 * field preview, its charge density and the objects @helicoid/lib finds in Node.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdirSync, writeFileSync, copyFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, outputDir, type Browser } from "./harness";
import { NotebookBuilder, skyrmionField } from "../widgets/fixtures/notebook";
import { exportNotebook } from "../../kernel-ext/src/notebook/export";
import { getCalculator, runCalculator } from "../../lib/src/index";
import { MZ_TABLE } from "../../widgets/src/views/textureColors";

let browser: Browser;
let page: Page;
const n = 32;
const field = skyrmionField(n);
const view = '.hx-texture[data-testid="view"]';
const explorerSel = '.hx-explorer[data-calculator="texture"]';

/** Save a screenshot for reviewers (test-output/screenshots and /tmp). */
async function shot(name: string, selector: string): Promise<void> {
  const path = await screenshot(page, name, selector);
  copyFileSync(path, `/tmp/helicoid-${name}.png`);
}

beforeAll(async () => {
  const nb = new NotebookBuilder();
  nb.markdown("# Texture view\n\nAn **invented** skyrmion texture.");
  // The skyrmion fixture is centred at ((n - 1)/2, (n - 1)/2) cells = 15.5 nm for 1 nm cells.
  nb.widget(
    "TextureModel",
    {
      nx: n,
      ny: n,
      dx: 1e-9,
      dy: 1e-9,
      title: "Invented skyrmion (32 x 32)",
      arrows: true,
      overlay: "charge",
      field: null,
      objects: { x: [15.5e-9], y: [15.5e-9], charge: [-1] },
      display_size: 480,
    },
    { field },
  );
  const spec = getCalculator("texture");
  const inputs = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
  nb.widget(
    "ExplorerModel",
    { calculator: "texture", spec: null, inputs, sweep: null, result: null, error: "", compute_in: "browser", kernel_version: "0.1.0" },
    {},
    'explore("texture")',
  );
  const html = exportNotebook(nb.build(), { sourceName: "texture-test.ipynb" });
  mkdirSync(join(outputDir, "export"), { recursive: true });
  const path = join(outputDir, "export", "texture-test.html");
  writeFileSync(path, html);
  browser = await launchBrowser();
  page = await browser.newPage();
  await page.goto(`file://${path}`);
  await page.waitForSelector(".hx-texture[data-charge]", { timeout: 60_000 });
  await page.evaluate(() => {
    (document.querySelectorAll(".hx-texture:not(.hx-explorer-texture)")[0] as HTMLElement).dataset.testid = "view";
  });
}, 180_000);

afterAll(async () => {
  await browser?.close();
});

/** Expected RGB of m_z from the colour table (Node side). */
function mzColour(mz: number): number[] {
  const t = Math.min(255, Math.max(0, Math.round(((mz + 1) / 2) * 255)));
  return [MZ_TABLE[3 * t]!, MZ_TABLE[3 * t + 1]!, MZ_TABLE[3 * t + 2]!];
}

describe("texture view in chromium", () => {
  it("draws each cell as one block of one colour (whole pixels per cell), with Moreland's colours for m_z", async () => {
    // The page reports each cell's colour (its top-left pixel) and how many pixels of its block differ from it.
    const got = await page.evaluate(
      ([sel, nn]) => {
        const c = document.querySelector(`${sel} .hx-texture-canvas`) as HTMLCanvasElement;
        const s = Number((document.querySelector(`${sel} .hx-texture-picture`) as HTMLElement).dataset.scale);
        const d = c.getContext("2d")!.getImageData(0, 0, c.width, c.height).data;
        const w = c.width;
        const cells: number[] = [];
        let nonUniform = 0;
        for (let j = 0; j < nn; j++) {
          for (let i = 0; i < nn; i++) {
            const row = nn - 1 - j; // y up
            const p0 = 4 * (row * s * w + i * s);
            cells.push(d[p0]!, d[p0 + 1]!, d[p0 + 2]!);
            for (let b = 0; b < s; b++)
              for (let a = 0; a < s; a++) {
                const p = 4 * ((row * s + b) * w + i * s + a);
                if (d[p] !== d[p0] || d[p + 1] !== d[p0 + 1] || d[p + 2] !== d[p0 + 2]) nonUniform++;
              }
          }
        }
        return { w, h: c.height, cssW: c.getBoundingClientRect().width, rendering: getComputedStyle(c).imageRendering, s, cells, nonUniform };
      },
      [view, n] as const,
    );
    // Common practice, no source: a crisp picture has an integer number of pixels per cell.
    expect(got.s).toBe(Math.round(480 / n));
    expect(got.w).toBe(n * got.s);
    expect(got.cssW).toBe(n * got.s);
    expect(got.rendering).toBe("pixelated");
    const nonUniform = got.nonUniform;
    let worstColour = 0;
    for (let k = 0; k < n * n; k++) {
      const want = mzColour(field[3 * k + 2]!);
      for (let c = 0; c < 3; c++) worstColour = Math.max(worstColour, Math.abs(got.cells[3 * k + c]! - want[c]!));
    }
    expect(nonUniform).toBe(0);
    expect(worstColour).toBeLessThanOrEqual(1);
    // The core (m_z = -1) is Moreland's blue end, the background (m_z = +1) his red end.
    // Source: K. Moreland, Diverging Color Maps for Scientific Visualization (ISVC 2009): cool-warm ends (59, 76, 192), (180, 4, 38).
    const centre = 3 * ((n / 2) * n + n / 2),
      corner = 0;
    expect(Math.abs(got.cells[centre + 2]! - 192)).toBeLessThan(12);
    expect(got.cells[corner]).toBeGreaterThan(170);
    expect(got.cells[corner + 2]).toBeLessThan(50);
  });

  it("on screen, two adjacent cells of different colour meet with no blended pixel (screenshot)", async () => {
    await page.evaluate((sel) => {
      (document.querySelector(`${sel} .hx-texture-arrows`) as HTMLElement).style.visibility = "hidden";
    }, view);
    const canvas = page.locator(`${view} .hx-texture-canvas`);
    const png = await canvas.screenshot();
    await page.evaluate((sel) => {
      (document.querySelector(`${sel} .hx-texture-arrows`) as HTMLElement).style.visibility = "";
    }, view);
    // Decode the screenshot with the browser's own PNG decoder.
    const s = Math.round(480 / n);
    // The middle row of cells j = 16 crosses the wall; take cells i = 20, 21 (m_z changes fast there).
    const jRow = 16,
      yPix = (n - 1 - jRow) * s + Math.floor(s / 2);
    const px = await page.evaluate(
      async ([b64, y]) => {
        const img = new Image();
        img.src = `data:image/png;base64,${b64}`;
        await img.decode();
        const c = document.createElement("canvas");
        c.width = img.width;
        c.height = img.height;
        const ctx = c.getContext("2d")!;
        ctx.drawImage(img, 0, 0);
        return { w: img.width, h: img.height, d: Array.from(ctx.getImageData(0, y, img.width, 1).data) };
      },
      [png.toString("base64"), yPix] as const,
    );
    expect(px.w).toBe(n * s);
    const colourAt = (x: number) => px.d.slice(4 * x, 4 * x + 3);
    const left = colourAt(20 * s + 1),
      right = colourAt(21 * s + s - 2);
    const dist = (a: number[], b: number[]) => Math.max(...a.map((v, k) => Math.abs(v - b[k]!)));
    expect(dist(left, right)).toBeGreaterThan(10);
    for (let x = 20 * s; x < 22 * s; x++) {
      const c = colourAt(x);
      // Every pixel is one of the two cell colours (a blur would leave values in between).
      expect(Math.min(dist(c, left), dist(c, right))).toBeLessThanOrEqual(1);
      expect(dist(c, x < 21 * s ? left : right)).toBeLessThanOrEqual(1);
    }
  });

  it("shows colour bars with ticks and units, axes in nm with ticks at the cells they name, and a scale bar", async () => {
    const info = await page.evaluate((sel) => {
      const root = document.querySelector(sel)!;
      const bars = Array.from(root.querySelectorAll(".hx-colourbar")).map((b) => ({
        symbol: b.getAttribute("data-symbol"),
        unit: b.getAttribute("data-unit"),
        ticks: Array.from(b.querySelectorAll("text.hx-tick")).map((t) => t.textContent),
        title: b.querySelector("text.hx-axis-title")?.textContent,
      }));
      const titles = Array.from(root.querySelectorAll('[data-panel="mz"] .hx-axis-title')).map((t) => t.textContent);
      const canvas = root.querySelector(".hx-texture-canvas")!.getBoundingClientRect();
      const xTicks = Array.from(root.querySelectorAll('[data-panel="mz"] [data-axis="x"] line')).map((l, k) => ({
        x: l.getBoundingClientRect().left + l.getBoundingClientRect().width / 2 - canvas.left,
        label: root.querySelectorAll('[data-panel="mz"] [data-axis="x"] text.hx-tick')[k]!.textContent,
      }));
      const sb = root.querySelector(".hx-scalebar")!;
      const bar = sb.querySelectorAll("rect")[1]!.getBoundingClientRect();
      return {
        bars,
        titles,
        xTicks,
        subs: root.querySelectorAll("tspan[baseline-shift=sub], sub").length,
        text: root.textContent,
        scale: { nm: Number(sb.getAttribute("data-length-nm")), px: bar.width, label: sb.querySelector("text")!.textContent },
        legend: root.querySelector(".hx-legend")!.textContent,
      };
    }, view);
    expect(info.bars.map((b) => b.symbol)).toEqual(["m_z", "ρ_Q"]);
    expect(info.bars[0]!.ticks).toEqual(["−1", "−0.5", "0", "0.5", "1"]);
    expect(info.bars[1]!.unit).toBe("nm⁻²");
    expect(info.bars[1]!.title).toBe("ρQ (nm⁻²)"); // Q is a subscript (a tspan), not "_Q" markup
    expect(info.subs).toBeGreaterThanOrEqual(4);
    expect(info.text).not.toContain("_");
    expect(info.bars[1]!.ticks).toContain("0");
    // Symmetric about zero: the charge bar's ticks come in +- pairs.
    const qt = info.bars[1]!.ticks.map((t) => Number(t!.replace("−", "-")));
    expect(qt.map((v) => -v + 0).sort((a, b) => a - b)).toEqual([...qt].sort((a, b) => a - b));
    expect(info.titles).toContain("x (nm)");
    expect(info.titles).toContain("y (nm)");
    // Cell i sits at x = i dx: the tick "t" is at (t / 1 nm + 1/2) s pixels from the image's left edge.
    const s = Math.round(480 / n);
    expect(info.xTicks.length).toBeGreaterThanOrEqual(3);
    for (const t of info.xTicks) expect(Math.abs(t.x - (Number(t.label) + 0.5) * s)).toBeLessThan(1.5);
    expect(info.scale.label).toBe(`${info.scale.nm} nm`);
    expect(Math.abs(info.scale.px - info.scale.nm * s)).toBeLessThan(1);
    expect(info.legend).toContain("Moreland");
    await shot("texture-view", view);
  });

  it("marks the objects at their centres with their charge, lists them, and the charge panel shows Q < 0 at the core", async () => {
    const info = await page.evaluate((sel) => {
      const root = document.querySelector(sel)!;
      const canvas = root.querySelector(".hx-texture-canvas")!.getBoundingClientRect();
      const markers = Array.from(root.querySelectorAll('[data-panel="mz"] .hx-object-marker')).map((m) => {
        const r = m.querySelector("circle")!.getBoundingClientRect();
        return { x: r.left + r.width / 2 - canvas.left, y: r.top + r.height / 2 - canvas.top, label: m.querySelector("text")!.textContent };
      });
      const rows = Array.from(root.querySelectorAll("table.hx-objects tr")).map((r) => Array.from(r.children).map((c) => c.textContent));
      const cc = root.querySelector(".hx-charge-canvas") as HTMLCanvasElement;
      const mid = Array.from(cc.getContext("2d")!.getImageData(cc.width / 2, cc.height / 2, 1, 1).data);
      return { markers, all: root.querySelectorAll(".hx-object-marker").length, rows, mid, Q: Number((root as HTMLElement).dataset.charge) };
    }, view);
    const s = Math.round(480 / n);
    expect(info.all).toBe(2); // one ring on each panel
    expect(info.markers).toHaveLength(1);
    expect(Math.abs(info.markers[0]!.x - 16 * s)).toBeLessThan(1);
    expect(Math.abs(info.markers[0]!.y - 16 * s)).toBeLessThan(1);
    expect(info.markers[0]!.label).toBe("1: Q = −1.00");
    expect(info.rows[0]).toEqual(["#", "Qi", "xc (nm)", "yc (nm)"]);
    expect(info.rows[1]).toEqual(["1", "−1.000", "15.5", "15.5"]); // 1 nm cells: positions to 0.1 nm
    // Source: a core-down skyrmion of vorticity 1 has Q = -1 (theta: pi -> 0); negative density is the green end.
    expect(Math.abs(info.Q + 1)).toBeLessThan(0.02);
    expect(info.mid[1]!).toBeGreaterThan(info.mid[0]! + 30);
  });
});

describe("texture explorer in chromium", () => {
  it("shows the field preview, its charge density and the objects found by @helicoid/lib", async () => {
    const root = `${explorerSel} .hx-explorer-texture`;
    await page.waitForSelector(`${root} .hx-texture-canvas`, { timeout: 60_000 });
    await page.waitForFunction((sel) => (document.querySelector(sel) as HTMLElement | null)?.dataset.previewSize, root, { timeout: 60_000 });
    const spec = getCalculator("texture");
    const inputs = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
    const node = runCalculator(spec, inputs);
    const xs = node.outputs.objectX!.value as number[],
      ys = node.outputs.objectY!.value as number[],
      qs = node.outputs.objectCharge!.value as number[];
    const size = node.outputs.previewSize!.value as number;
    const info = await page.evaluate((sel) => {
      const r = document.querySelector(sel) as HTMLElement;
      return {
        size: Number(r.dataset.previewSize),
        canvasW: (r.querySelector(".hx-texture-canvas") as HTMLCanvasElement).width,
        chargeShown: !(r.querySelector('[data-panel="charge"]') as HTMLElement).hidden,
        markers: r.querySelectorAll('[data-panel="mz"] .hx-object-marker').length,
        rows: Array.from(r.querySelectorAll("table.hx-objects tr"))
          .slice(1)
          .map((t) => Array.from(t.children).map((c) => c.textContent)),
        axes: Array.from(r.querySelectorAll(".hx-axis-title")).map((t) => t.textContent),
        plots: Array.from(document.querySelectorAll(`${sel.split(" ")[0]} .hx-plot-title`)).map((t) => t.textContent),
      };
    }, root);
    expect(info.size).toBe(size);
    expect(info.canvasW % size).toBe(0);
    expect(info.chargeShown).toBe(true);
    expect(xs.length).toBeGreaterThan(0);
    expect(info.markers).toBe(xs.length);
    // Positions to 0.1 nm at the default 1 nm cell (the table rounds to about a tenth of the preview cell, 2 nm).
    const fmt = (v: number, d: number) => v.toFixed(d).replace("-", "−");
    expect(info.rows).toEqual(xs.map((x, k) => [String(k + 1), fmt(qs[k]!, 3), fmt(x * 1e9, 1), fmt(ys[k]! * 1e9, 1)]));
    expect(info.axes).toContain("x (nm)");
    expect(info.axes).toContain("ρQ (nm⁻²)");
    expect(info.plots.some((t) => t!.startsWith("texture (preview"))).toBe(true);
    expect(info.plots).not.toContain("object centres");
    await shot("texture-explorer", explorerSel);
  });

  it("follows the inputs: a skyrmion lattice shows every object @helicoid/lib finds, with its charge and centre", async () => {
    const root = `${explorerSel} .hx-explorer-texture`;
    await page.selectOption(`${explorerSel} .hx-control[data-input="kind"] select`, { label: "skyrmion lattice" });
    const spec = getCalculator("texture");
    const inputs = { ...Object.fromEntries(spec.inputs.map((i) => [i.name, i.default])), kind: 3 };
    const node = runCalculator(spec, inputs);
    const xs = node.outputs.objectX!.value as number[],
      ys = node.outputs.objectY!.value as number[],
      qs = node.outputs.objectCharge!.value as number[];
    expect(xs.length).toBeGreaterThan(3);
    const fmt = (v: number, d: number) => v.toFixed(d).replace("-", "−");
    const want = xs.map((x, k) => [String(k + 1), fmt(qs[k]!, 3), fmt(x * 1e9, 1), fmt(ys[k]! * 1e9, 1)]);
    await page.waitForFunction(([sel, count]) => document.querySelectorAll(`${sel} table.hx-objects tr`).length === count + 1, [root, xs.length] as const, { timeout: 60_000 });
    const rows = await page.evaluate(
      (sel) =>
        Array.from(document.querySelectorAll(`${sel} table.hx-objects tr`))
          .slice(1)
          .map((t) => Array.from(t.children).map((c) => c.textContent)),
      root,
    );
    expect(rows).toEqual(want);
    const markers = await page.locator(`${root} [data-panel="charge"] .hx-object-marker`).count();
    expect(markers).toBe(xs.length);
    // Orientation check on a picture without mirror symmetry about the marker: the colour under each
    // marker's centre is the colour of the preview cell nearest to that object's (x_c, y_c).
    const size = node.outputs.previewSize!.value as number,
      cell = node.outputs.previewCell!.value as number;
    const m = node.outputs.fieldPreview!.value as number[];
    const under = await page.evaluate((sel) => {
      const r = document.querySelector(sel)!;
      const c = r.querySelector(".hx-texture-canvas") as HTMLCanvasElement;
      const box = c.getBoundingClientRect(),
        ctx = c.getContext("2d")!;
      return Array.from(r.querySelectorAll('[data-panel="mz"] .hx-object-marker circle:first-child')).map((circle) => {
        const b = circle.getBoundingClientRect();
        const x = Math.floor(b.left + b.width / 2 - box.left),
          y = Math.floor(b.top + b.height / 2 - box.top);
        return Array.from(ctx.getImageData(x, y, 1, 1).data.slice(0, 3));
      });
    }, root);
    expect(under).toHaveLength(xs.length);
    let matched = 0;
    xs.forEach((x, k) => {
      const i = Math.round(x / cell),
        j = Math.round(ys[k]! / cell);
      if (i >= size || j >= size) return;
      const want = mzColour(m[3 * (j * size + i) + 2]!);
      if (Math.max(...want.map((v, c) => Math.abs(v - under[k]![c]!))) <= 1) matched++;
    });
    expect(matched).toBe(xs.filter((x, k) => Math.round(x / cell) < size && Math.round(ys[k]! / cell) < size).length);
    await shot("texture-explorer-lattice", root);
  });
});
