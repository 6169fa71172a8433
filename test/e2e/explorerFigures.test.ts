/**
 * Explorer figures in an exported page, in Debian's chromium: every plot's axis titles and legends
 * are symbols with one unit per axis (no output id, no raw markup); the swept input stays editable
 * and its value is marked on the curves; the swept axis spans exactly the sweep; Reset refits.
 * Screenshots go to test-output/screenshots/figures-*.png.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdirSync, writeFileSync, readFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, buildTestWidgets, outputDir, type Browser } from "./harness";
import { NotebookBuilder } from "../widgets/fixtures/notebook";
import { exportNotebook } from "../../kernel-ext/src/notebook/export";
import { getCalculator, defaultSweep } from "../../lib/src/index";

const EXPLORERS = ["skyrmion", "berry-loop", "chern", "magnon-hall", "spin-tunnel", "easy-plane", "wall360"];

let browser: Browser;
let page: Page;

const sel = (id: string) => `.hx-explorer[data-calculator="${id}"][data-mode="browser"]`;

async function settled(page: Page, explorer: string): Promise<void> {
  await page.waitForFunction(
    (s) => {
      const root = document.querySelector(s) as HTMLElement | null;
      return !!root && root.dataset.busy === "" && root.dataset.drawing === "" && !!root.querySelector(".hx-plot[data-drawn]");
    },
    explorer,
    { timeout: 60_000 },
  );
  await page.waitForTimeout(50);
}

interface PlotInfo {
  id: string;
  xTitle: string;
  yTitle: string;
  xTitleShown: string;
  yTitleShown: string;
  legend: string[];
  traces: Array<{ output: string; xOutput: string; xUnit: string; yUnit: string; xFactor: number }>;
  xRange: [number, number];
  shapes: Array<{ x0: number }>;
}

async function plotsOf(page: Page, explorer: string): Promise<PlotInfo[]> {
  return page.evaluate((s) => {
    const out: PlotInfo[] = [];
    document.querySelectorAll(`${s} .hx-plot[data-drawn]`).forEach((gd) => {
      const g = gd as unknown as {
        data: Array<{ name: string; meta: { output: string; xOutput: string; xUnit: string; yUnit: string; xFactor: number } }>;
        layout: { xaxis: { title: { text: string }; range: [number, number] }; yaxis: { title: { text: string } }; shapes?: Array<{ x0: number }> };
      };
      out.push({
        id: (gd as HTMLElement).dataset.plot!,
        xTitle: g.layout.xaxis.title.text,
        yTitle: g.layout.yaxis.title.text,
        // what the page shows (plotly's rendered SVG text)
        xTitleShown: gd.querySelector(".g-xtitle")?.textContent ?? "",
        yTitleShown: gd.querySelector(".g-ytitle")?.textContent ?? "",
        legend: [...gd.querySelectorAll(".legendtext")].map((t) => t.textContent ?? ""),
        traces: g.data.map((t) => ({ ...t.meta })),
        xRange: [...g.layout.xaxis.range] as [number, number],
        shapes: (g.layout.shapes ?? []).map((x) => ({ x0: x.x0 })),
      });
    });
    return out as never;
  }, explorer) as Promise<PlotInfo[]>;
}

beforeAll(async () => {
  const bundle = await buildTestWidgets();
  const nb = new NotebookBuilder();
  nb.markdown("# Explorer figures\n\nInvented materials; values are estimates.");
  for (const id of EXPLORERS) {
    const spec = getCalculator(id);
    const inputs = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
    // skyrmion: a sweep that ends at 300 mT (the x axis must end there too)
    const sweep = id === "skyrmion" ? { over: "B", from: 0.01, to: 0.3, points: 40 } : (defaultSweep(spec, inputs) ?? null);
    nb.widget("ExplorerModel", { calculator: id, spec: null, inputs, sweep, result: null, error: "", compute_in: "browser", kernel_version: "0.1.0" }, {}, `explore("${id}")`);
  }
  const html = exportNotebook(nb.build(), { bundle, sourceName: "figures-test.ipynb" });
  mkdirSync(join(outputDir, "export"), { recursive: true });
  const pagePath = join(outputDir, "export", "figures-test.html");
  writeFileSync(pagePath, html);
  browser = await launchBrowser();
  page = await browser.newPage();
  await page.route(/^(?!file:).*/, (route) => route.abort());
  await page.goto(`file://${pagePath}`);
  await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
}, 240_000);

afterAll(async () => {
  await browser?.close();
});

describe("explorer figures", () => {
  it("every plot: symbols and one unit per axis, no output id, no raw markup", async () => {
    for (const id of EXPLORERS) {
      const spec = getCalculator(id);
      await settled(page, sel(id));
      const plots = await plotsOf(page, sel(id));
      expect(plots.length, id).toBeGreaterThan(0);
      const ids = spec.outputs.map((o) => o.name).filter((n) => n.length > 2);
      for (const p of plots) {
        const where = `${id}/${p.id}`;
        for (const text of [p.xTitle, p.yTitle, p.xTitleShown, p.yTitleShown, ...p.legend]) {
          expect(text, where).not.toMatch(/[\\{}]/);
          for (const n of ids) expect(text.split(/[^A-Za-z0-9]+/), `${where}: '${text}' names output ${n}`).not.toContain(n);
        }
        expect(p.xTitleShown.length, where).toBeGreaterThan(0);
        // one unit per axis: every trace on the plot has the same x unit, and the same y unit per SI unit
        expect(new Set(p.traces.map((t) => t.xUnit)).size, where).toBe(1);
        const bySi = new Map<string, Set<string>>();
        for (const t of p.traces) {
          const si = spec.outputs.find((o) => o.name === t.output)!.unit;
          if (!bySi.has(si)) bySi.set(si, new Set());
          bySi.get(si)!.add(t.yUnit);
        }
        for (const [si, units] of bySi) expect(units.size, `${where} (${si})`).toBe(1);
        // the shown title carries that unit (rendered µ, ², ...), or none for pure numbers
        const xu = p.traces[0]!.xUnit;
        if (xu && xu !== "1") expect(p.xTitleShown, where).toMatch(/\)$/);
      }
      // the swept input's mark: a line at its value, labelled right beside it (log axes too)
      const marks = await page.evaluate(
        (s) =>
          [...document.querySelectorAll(`${s} .hx-plot[data-drawn]`)].flatMap((gd) => {
            const line = gd.querySelector(".shapelayer path"),
              label = gd.querySelector(".annotation");
            if (!line) return [];
            const a = line.getBoundingClientRect(),
              b = label?.getBoundingClientRect();
            return [{ line: a.left + a.width / 2, label: b ? b.left : null, text: label?.textContent ?? "" }];
          }),
        sel(id),
      );
      const sweptInput = getCalculator(id).sweep?.over[0];
      if (sweptInput) expect(marks.length, `${id}: no mark of ${sweptInput}`).toBeGreaterThan(0);
      for (const m of marks) {
        expect(m.label, id).not.toBeNull();
        expect(Math.abs(m.label! - m.line), `${id}: label ${m.text} at ${m.label}, line at ${m.line}`).toBeLessThan(12);
        expect(m.text, id).toMatch(/=/);
      }
      await screenshot(page, `figures-${id}`, sel(id));
    }
  }, 240_000);

  it("the skyrmion's swept field stays editable, its value is marked, and the axis spans the sweep", async () => {
    const s = sel("skyrmion");
    await settled(page, s);
    const slider = page.locator(`${s} .hx-control[data-input="B"] input.hx-slider`);
    const entry = page.locator(`${s} .hx-control[data-input="B"] input.hx-entry`);
    expect(await slider.isDisabled()).toBe(false);
    expect(await entry.isDisabled()).toBe(false);
    const plots = await plotsOf(page, s);
    const swept = plots.filter((p) => p.traces[0]!.xOutput && p.shapes.length > 0);
    expect(swept.length).toBeGreaterThan(0);
    for (const p of swept) {
      expect(p.traces[0]!.xUnit).toBe("mT");
      // Common practice, no source: the swept axis spans exactly 10 mT .. 300 mT.
      expect(p.xRange[0]).toBeCloseTo(10, 9);
      expect(p.xRange[1]).toBeCloseTo(300, 9);
    }
    await entry.fill("120 mT");
    await entry.press("Enter");
    await page.waitForFunction((q) => Number((document.querySelector(`${q} .hx-control[data-input="B"]`) as HTMLElement).dataset.value) > 0.119, s);
    await settled(page, s);
    const after = await plotsOf(page, s);
    for (const p of after.filter((q) => q.shapes.length > 0)) {
      expect(p.shapes[0]!.x0).toBeCloseTo(120, 6);
      expect(p.xRange[1]).toBeCloseTo(300, 9);
    }
    // the mark is drawn (a dotted line of plotly's shape layer)
    expect(await page.locator(`${s} .hx-plot .shapelayer path`).count()).toBeGreaterThan(0);
    await screenshot(page, "figures-skyrmion-120mT", s);
  }, 120_000);

  it("'no sweep' is offered and says why the swept plots are empty", async () => {
    const s = sel("easy-plane");
    await settled(page, s);
    const options = await page.locator(`${s} select.hx-sweep option`).allTextContents();
    expect(options).toContain("no sweep");
    await page.locator(`${s} select.hx-sweep`).selectOption({ label: "no sweep" });
    await page.waitForSelector(`${s} .hx-plot-message`, { timeout: 30_000 });
    expect(await page.locator(`${s} .hx-plot-message`).first().textContent()).toMatch(/no sweep chosen/);
    // the table still shows the values at the input's value
    expect(await page.locator(`${s} .hx-table tr[data-output="szExact"]`).count()).toBe(1);
  }, 60_000);
});

describe("Reset", () => {
  it("restores the inputs and refits every plot's ranges", async () => {
    const s = sel("wall360");
    const ranges = () =>
      page.evaluate(
        (q) =>
          [...document.querySelectorAll(`${q} .hx-plot[data-drawn]`)].map((gd) => {
            const l = (gd as unknown as { layout: { xaxis: { range: number[] }; yaxis: { range: number[] } } }).layout;
            return [...l.xaxis.range, ...l.yaxis.range];
          }),
        s,
      );
    await settled(page, s);
    await page.locator(`${s} .hx-reset`).click();
    await settled(page, s);
    const before = await ranges();
    await page.evaluate((q) => {
      const el = document.querySelector(`${q} .hx-control[data-input="Ku"] input.hx-slider`) as HTMLInputElement;
      el.value = "900";
      el.dispatchEvent(new Event("input", { bubbles: true }));
    }, s);
    await page.waitForFunction((q) => Number((document.querySelector(`${q} .hx-control[data-input="Ku"]`) as HTMLElement).dataset.value) > 2e6, s);
    await settled(page, s);
    expect(await ranges()).not.toEqual(before);
    await page.locator(`${s} .hx-reset`).click();
    await page.waitForFunction((q) => Number((document.querySelector(`${q} .hx-control[data-input="Ku"]`) as HTMLElement).dataset.value) < 2e6, s);
    await settled(page, s);
    expect(await ranges()).toEqual(before);
  }, 60_000);
});

describe("figure export from the page", () => {
  it("the SVG and PNG buttons download the plot at the chosen size", async () => {
    const s = sel("wall360");
    await settled(page, s);
    const bar = page.locator(`${s} .hx-export`).first();
    await bar.locator(".hx-export-w").fill("8.5");
    await bar.locator(".hx-export-h").fill("6");
    const [svgDownload] = await Promise.all([page.waitForEvent("download"), bar.locator(".hx-export-svg").click()]);
    const svgPath = join(outputDir, "export", "figures-wall360.svg");
    await svgDownload.saveAs(svgPath);
    const svg = readFileSync(svgPath, "utf8");
    expect(svg).toMatch(/^<svg[^>]*width="321"[^>]*height="227"/);
    expect(svg).toContain('class="scatterlayer');
    expect(svg).not.toMatch(/\\[a-z]/);
    await bar.locator(".hx-export-dpi").fill("300");
    const [pngDownload] = await Promise.all([page.waitForEvent("download"), bar.locator(".hx-export-png").click()]);
    const pngPath = join(outputDir, "export", "figures-wall360.png");
    await pngDownload.saveAs(pngPath);
    const png = readFileSync(pngPath);
    // PNG header: width and height (big-endian) at bytes 16 and 20; 321 px x 300/96 = 1003 px.
    expect(png.subarray(1, 4).toString()).toBe("PNG");
    expect(png.readUInt32BE(16)).toBe(Math.round((321 * 300) / 96));
  }, 60_000);
});
