/**
 * Helicoid in a real JupyterLab 4 front end: the notebook front end of lab-frontend/ (JupyterLab
 * 4's application, notebook, services, rendermime, docmanager and codemirror packages, and the four
 * plugins of @jupyter-widgets/jupyterlab-manager 5) served by Debian's jupyter-server, the real
 * Helicoid kernel from a kernelspec that `helicoid install --prefix` wrote, and Helicoid's
 * INSTALLED prebuilt extension loaded as a federated module (remoteEntry, container.init with a
 * share scope offering @jupyter-widgets/base, container.get("./extension")), in Debian's chromium.
 *
 * The front end's npm packages live in lab-frontend/node_modules (not in the root install); this
 * test installs and builds them when they are missing (`npm ci --prefix lab-frontend`, then
 * `node lab-frontend/build.mjs`), and fails with the reason when that is impossible.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { spawnSync } from "node:child_process";
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, startJupyterServer, screenshot, repoRoot, chromiumPath, type Browser, type JupyterServer } from "./harness";
import { ensureLabFrontend, prepareLabSite, type LabSite } from "../../kernel-ext/src/cli/labFrontend";
import { getCalculator, runCalculator } from "../../lib/src/index";

const bin = join(repoRoot, "kernel-ext", "bin", "helicoid.js");
const examples = readdirSync(join(repoRoot, "notebooks"))
  .filter((f) => f.endsWith(".ipynb"))
  .sort();

let prefix: string;
let work: string;
let site: LabSite;
let server: JupyterServer;
let browser: Browser;

/** Chromium on a loaded machine sometimes fails to start: one retry, then the error. */
async function launchWithRetry(): Promise<Browser> {
  try {
    return await launchBrowser();
  } catch (first) {
    console.error(`chromium did not start (${(first as Error).message.split("\n")[0]}); retrying once`);
    return launchBrowser();
  }
}

/** A notebook of the checks below (nbformat 4), written by the test into the served folder. */
function checksNotebook(): string {
  const code = (source: string) => ({ cell_type: "code", execution_count: null, metadata: {}, outputs: [], source });
  return JSON.stringify(
    {
      nbformat: 4,
      nbformat_minor: 5,
      metadata: { kernelspec: { name: "helicoid", display_name: "TypeScript (Helicoid)", language: "typescript" }, language_info: { name: "typescript" } },
      cells: [
        code(`import { slider, html, vbox, explore, controlPanel, fitPanel, textureView } from "@helicoid/kernel";
import { textureOfObjects } from "@helicoid/lib";
const s = slider({ min: 0, max: 10, value: 1, step: 1, description: "x" });
const sq = html("x squared = 1");
s.onChange("value", (v) => sq.set({ value: "x squared = " + (v * v) }));
vbox([s, sq])`),
        code(`const ex = explore("wall");
ex`),
        code(`const panelRuns: number[] = [];
controlPanel(({ k }) => { panelRuns.push(k); return "k cubed = " + k * k * k; }, { k: [0, 10, 1] }, { title: "cube" })`),
        code(`const heard: string[] = [];
const fp = fitPanel({ title: "invented profile", x: [0, 1, 2], y: [0, 1, 4] });
fp.onStart((p) => { heard.push("start"); p.update({ status: "running", progress: 0.5, message: "iterating" }); });
fp`),
        code(`const nm = 1e-9;
const one = textureOfObjects({ nx: 64, ny: 64, dx: 1 * nm, periodic: false }, [{ x: 32 * nm, y: 32 * nm, R: 10 * nm, w: 3 * nm, helicity: 0 }]);
textureView(one.m, 64, 64, { dx: nm, dy: nm, title: "one skyrmion" })`),
      ],
    },
    null,
    1,
  );
}

async function openNotebook(path: string, extra = ""): Promise<Page> {
  const page = await browser.newPage();
  const url = `${server.url}${site.pagePath}?token=${server.token}&path=${encodeURIComponent(path)}${extra}`;
  await page.goto(url);
  await page.waitForFunction(() => (window as any).helicoidLab?.panel !== undefined, undefined, { timeout: 60_000 });
  return page;
}

/** Run every cell of the open notebook from the page (JupyterLab's NotebookActions.runAll). */
async function runAll(page: Page): Promise<{ ok: boolean; errors: { cell: number; text: string }[] }> {
  const ok = await page.evaluate(() => (window as any).helicoidLab.runAll());
  const errors = await page.evaluate(() => (window as any).helicoidLab.errors());
  return { ok, errors };
}

async function kernel(page: Page, code: string): Promise<string> {
  const r = await page.evaluate((c) => (window as any).helicoidLab.execute(c), code);
  if (r.status !== "ok") throw new Error(`kernel code failed: ${r.text}`);
  return r.text.trim();
}

describe("Helicoid in a JupyterLab 4 front end from npm, served by jupyter-server", () => {
  beforeAll(async () => {
    for (const [what, path] of [
      ["the kernel build (npm run build)", join(repoRoot, "kernel-ext", "dist", "cli", "main.js")],
      ["the prebuilt extension (npm run build)", join(repoRoot, "widgets", "labextension", "package.json")],
      ["Debian's jupyter-server (apt-get install jupyter-server)", "/usr/bin/jupyter-server"],
      ["Debian's chromium (apt-get install chromium)", chromiumPath],
    ] as const) {
      if (!existsSync(path)) throw new Error(`missing ${what}: ${path}`);
    }
    ensureLabFrontend((s) => process.stderr.write(`[lab-frontend] ${s}`));
    prefix = mkdtempSync(join(tmpdir(), "helicoid-jlab-"));
    const inst = spawnSync(process.execPath, [bin, "install", "--prefix", prefix], { encoding: "utf8" });
    if (inst.status !== 0) throw new Error(`helicoid install --prefix failed: ${inst.stdout}${inst.stderr}`);
    const dataDir = join(prefix, "share", "jupyter");
    expect(existsSync(join(dataDir, "labextensions", "@helicoid", "widgets", "package.json"))).toBe(true);
    work = join(prefix, "work");
    mkdirSync(work);
    cpSync(join(repoRoot, "notebooks"), join(work, "notebooks"), { recursive: true, filter: (src) => !src.includes(".ipynb_checkpoints") });
    writeFileSync(join(work, "notebooks", "widget-checks.ipynb"), checksNotebook());
    site = prepareLabSite({ labextensionsDir: join(dataDir, "labextensions"), siteDir: join(prefix, "site") });
    expect(site.extensions.map((e) => e.name)).toEqual(["@helicoid/widgets"]);
    server = await startJupyterServer({ dataDir, cwd: work, staticPaths: site.staticPaths });
    browser = await launchWithRetry();
  }, 600_000);

  afterAll(async () => {
    await browser?.close();
    await server?.stop();
    if (prefix) rmSync(prefix, { recursive: true, force: true });
  });

  it.each(examples)(
    "runs the example notebook %s with no error output and renders its widgets",
    async (name) => {
      const page = await openNotebook(`notebooks/${name}`);
      try {
        const r = await runAll(page);
        expect(r.errors).toEqual([]);
        expect(r.ok).toBe(true);
        // Every cell with a widget output shows a rendered widget view (not the text fallback, not an error).
        const cells = await page.evaluate(() => {
          const panel = (window as any).helicoidLab.panel;
          const out: { cell: number; rendered: boolean }[] = [];
          panel.content.widgets.forEach((cell: any, i: number) => {
            if (cell.model.type !== "code") return;
            const outputs = cell.model.outputs.toJSON();
            if (!outputs.some((o: any) => o.data && o.data["application/vnd.jupyter.widget-view+json"])) return;
            out.push({ cell: i, rendered: cell.node.querySelector(".jp-OutputArea-output .jupyter-widgets") !== null });
          });
          return out;
        });
        expect(cells.filter((c) => !c.rendered)).toEqual([]);
        expect(await page.getByText("Error displaying widget").count()).toBe(0);
        expect(cells.length).toBeGreaterThan(0); // every example notebook shows widgets
        await expect.poll(() => page.locator(".hx-missing-manager").count()).toBe(0);
        await screenshot(page, `jupyterlab-${name.replace(/\.ipynb$/, "")}`);
      } finally {
        await page.close();
      }
    },
    300_000,
  );

  describe("widgets respond in the page", () => {
    let page: Page;
    beforeAll(async () => {
      page = await openNotebook("notebooks/widget-checks.ipynb");
      const r = await runAll(page);
      expect(r.errors).toEqual([]);
    }, 240_000);
    afterAll(async () => {
      await page?.close();
    });

    it("a standard slider dragged with the mouse runs a kernel observer", async () => {
      const handle = page.locator(".jp-Cell").nth(0).locator(".widget-slider .noUi-handle").first();
      await handle.waitFor({ timeout: 30_000 });
      await handle.scrollIntoViewIfNeeded();
      const box = (await handle.boundingBox())!;
      const track = (await page.locator(".jp-Cell").nth(0).locator(".widget-slider .noUi-target").first().boundingBox())!;
      await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
      await page.mouse.down();
      await page.mouse.move(track.x + track.width * 0.7, box.y + box.height / 2, { steps: 8 });
      await page.mouse.up();
      const html = page.locator(".jp-Cell").nth(0).locator(".widget-html-content").first();
      await expect.poll(() => html.textContent(), { timeout: 20_000 }).not.toBe("x squared = 1");
      // Common practice, no source: the observer squares the slider's value. On a loaded machine the
      // drag's updates can still be arriving: wait until the kernel's value, the observer's output and
      // the page's readout agree.
      let v = NaN;
      await expect
        .poll(
          async () => {
            v = Number(await kernel(page, "s.get('value')"));
            const shown = await html.textContent();
            const readout = Number(await page.locator(".jp-Cell").nth(0).locator(".widget-readout").first().textContent());
            return shown === `x squared = ${v * v}` && readout === v;
          },
          { timeout: 30_000 },
        )
        .toBe(true);
      expect(v).toBeGreaterThan(1);
    });

    it("an explorer input changed in the page recomputes in the page", async () => {
      const root = page.locator(".jp-Cell").nth(1).locator(".hx-explorer");
      await root.locator(".hx-plot[data-drawn]").first().waitFor({ timeout: 30_000 });
      const width = root.locator('tr[data-output="width"]');
      const before = Number(await width.getAttribute("data-value"));
      const entry = root.locator('.hx-control[data-input="A"] input.hx-entry');
      await entry.fill("21 pJ/m");
      await entry.press("Enter");
      // Source: @helicoid/lib's wall calculator run in Node on the same inputs (the page computes with its bundled copy).
      const expected = runCalculator(getCalculator("wall"), { A: 2.1e-11 }).outputs.width!.value as number;
      await expect.poll(async () => Number(await width.getAttribute("data-value")), { timeout: 20_000 }).not.toBe(before);
      const shown = Number(await width.getAttribute("data-value"));
      expect(Math.abs(shown - expected) / expected).toBeLessThan(1e-9);
      await expect.poll(async () => Number(await kernel(page, "ex.inputs.A")), { timeout: 20_000 }).toBeCloseTo(2.1e-11, 20);
      await screenshot(page, "jupyterlab-explorer", ".jp-Cell >> nth=1");
    });

    it("a control panel reruns kernel code when its control changes", async () => {
      const cell = page.locator(".jp-Cell").nth(2);
      const readout = cell.locator(".widget-readout").first();
      await readout.waitFor({ timeout: 30_000 });
      const runsBefore = Number(await kernel(page, "panelRuns.length"));
      await readout.click();
      await page.keyboard.press("Control+A");
      await page.keyboard.type("7");
      await page.keyboard.press("Enter");
      // Common practice, no source: 7^3 = 343.
      await expect.poll(() => cell.locator(".jupyter-widgets .jp-OutputArea-output").last().textContent(), { timeout: 20_000 }).toContain("k cubed = 343");
      expect(Number(await kernel(page, "panelRuns.length"))).toBeGreaterThan(runsBefore);
      expect(await kernel(page, "panelRuns[panelRuns.length - 1]")).toBe("7");
    });

    it("the fit panel's start button runs its kernel callback", async () => {
      const panel = page.locator(".jp-Cell").nth(3).locator(".hx-fit");
      await panel.locator(".hx-fit-start").click();
      await expect.poll(() => panel.getAttribute("data-status"), { timeout: 20_000 }).toBe("running");
      expect(Number(await panel.locator("progress").evaluate((p) => (p as HTMLProgressElement).value))).toBe(0.5);
      expect(await kernel(page, "heard.join(',')")).toContain("start");
    });

    it("the texture view draws the field and its charge", async () => {
      const view = page.locator(".jp-Cell").nth(4).locator(".hx-texture");
      await expect.poll(() => view.getAttribute("data-charge"), { timeout: 30_000 }).not.toBeNull();
      // Source: an isolated skyrmion in a uniform background has topological charge of magnitude 1.
      expect(Math.abs(Math.abs(Number(await view.getAttribute("data-charge"))) - 1)).toBeLessThan(0.05);
      // the m_z panel: one s x s block of one colour per cell (s = the picture's scale)
      const scale = Number(await view.locator(".hx-texture-picture").getAttribute("data-scale"));
      expect(scale).toBeGreaterThanOrEqual(1);
      const pixels = await view
        .locator("canvas.hx-texture-canvas")
        .first()
        .evaluate((c) => {
          const canvas = c as HTMLCanvasElement;
          const d = canvas.getContext("2d")!.getImageData(0, 0, canvas.width, canvas.height).data;
          const at = (i: number, j: number) => Array.from(d.slice(4 * (j * canvas.width + i), 4 * (j * canvas.width + i) + 4));
          return { centre: at(canvas.width >> 1, canvas.height >> 1), corner: at(1, 1), w: canvas.width };
        });
      expect(pixels.w).toBe(64 * scale);
      expect(pixels.corner[3]).toBe(255);
      // The core (m down) and the background (m up) are drawn in different colours.
      expect(pixels.centre).not.toEqual(pixels.corner);
      await screenshot(page, "jupyterlab-widget-checks");
      await page.screenshot({ path: join(tmpdir(), "helicoid-jupyterlab-widget-checks.png"), fullPage: true });
    });
  });

  it("without the widget manager, the page says what is missing", async () => {
    const page = await openNotebook("notebooks/widget-checks.ipynb", "&widgets=off");
    try {
      const notice = page.locator(".hx-missing-manager");
      await notice.waitFor({ timeout: 30_000 });
      const text = (await notice.textContent())!;
      expect(text).toContain("@jupyter-widgets/base");
      expect(text).toContain("jupyterlab_widgets");
      expect(text).toContain("helicoid doctor");
      expect(await notice.isVisible()).toBe(true);
      // Run the first cell: its widget shows as text (the widget-view output has no renderer), no view renders.
      await page.evaluate(async () => {
        const lab = (window as any).helicoidLab;
        await lab.panel.sessionContext.ready;
        lab.panel.content.activeCellIndex = 0;
        return lab.execute("1");
      });
      await page.locator(".jp-Cell").first().click();
      await page.keyboard.press("Shift+Enter");
      await expect.poll(() => page.locator(".jp-Cell").first().locator(".jp-OutputArea-output").count(), { timeout: 60_000 }).toBeGreaterThan(0);
      expect(await page.locator(".jp-Cell").first().locator(".jp-OutputArea-output").first().textContent()).toMatch(/Box|Widget/i);
      expect(await page.locator(".jupyter-widgets").count()).toBe(0);
      await screenshot(page, "jupyterlab-no-widget-manager");
      await page.screenshot({ path: join(tmpdir(), "helicoid-jupyterlab-no-widget-manager.png") });
    } finally {
      await page.close();
    }
  });
});
