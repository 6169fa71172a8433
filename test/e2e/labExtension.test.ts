/**
 * The prebuilt JupyterLab 4 extension (widgets/labextension, built by `npm run build`): it has the
 * metadata and entry files JupyterLab loads, and in a page that provides the shared packages the
 * way JupyterLab does, its plugin registers the module "@helicoid/widgets" and the views render.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { existsSync, mkdtempSync, readFileSync, rmSync, statSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { tmpdir } from "node:os";
import { join, extname } from "node:path";
import { launchBrowser, buildPage, screenshot, repoRoot, type Browser } from "./harness";
import { skyrmionField } from "../widgets/fixtures/notebook";
import { testWallSpec } from "../widgets/fixtures/testSpecs";
import { runCalculator } from "../../lib/src/index";

const built = join(repoRoot, "widgets", "labextension");
let browser: Browser;

/**
 * Where JupyterLab would find the extension: `helicoid install --prefix` copies it to
 * <prefix>/share/jupyter/labextensions/@helicoid/widgets (used when the command is built),
 * else the build output itself.
 */
function installedExtension(): string {
  const bin = join(repoRoot, "kernel-ext", "bin", "helicoid.js");
  if (!existsSync(join(repoRoot, "kernel-ext", "dist", "cli", "main.js"))) return built;
  const prefix = mkdtempSync(join(tmpdir(), "helicoid-labext-"));
  const r = spawnSync(process.execPath, [bin, "install", "--prefix", prefix], { encoding: "utf8" });
  if (r.status !== 0) throw new Error(`helicoid install failed: ${r.stderr}`);
  return join(prefix, "share", "jupyter", "labextensions", "@helicoid", "widgets");
}
const ext = installedExtension();
afterAll(() => { if (ext !== built) rmSync(join(ext, "..", "..", "..", "..", ".."), { recursive: true, force: true }); });

const types: Record<string, string> = { ".js": "text/javascript", ".json": "application/json", ".html": "text/html" };

describe("prebuilt JupyterLab extension", () => {
  it("has the metadata and entry files JupyterLab 4 loads", () => {
    const meta = JSON.parse(readFileSync(join(ext, "package.json"), "utf8"));
    expect(meta.name).toBe("@helicoid/widgets");
    expect(meta.version).toBe(JSON.parse(readFileSync(join(repoRoot, "widgets", "package.json"), "utf8")).version);
    expect(meta.jupyterlab.extension).toBe(true);
    expect(meta.jupyterlab._build.extension).toBe("./extension");
    expect(meta.jupyterlab._build.load).toMatch(/^static\/remoteEntry\.[0-9a-f]+\.js$/);
    expect(existsSync(join(ext, meta.jupyterlab._build.load))).toBe(true);
    expect(meta.jupyterlab.sharedPackages["@jupyter-widgets/base"]).toEqual({ bundled: false, singleton: true });
    const entry = readFileSync(join(ext, meta.jupyterlab._build.load), "utf8");
    expect(entry).toMatch(/_JUPYTERLAB\)\["@helicoid\/widgets"\] =/);
    // The shared @jupyter-widgets/base is consumed, not bundled.
    expect(entry).toContain("@jupyter-widgets/base");
    expect(statSync(join(ext, meta.jupyterlab._build.load)).size).toBeLessThan(200_000);
  });

  describe("in a page that provides the shared packages", () => {
    beforeAll(async () => { browser = await launchBrowser(); }, 60_000);
    afterAll(async () => { await browser?.close(); });

    it("registers @helicoid/widgets with the widget registry and renders its views", async () => {
      const host = await buildPage(join(__dirname, "pages", "labHost.ts"));
      const page = await browser.newPage();
      await page.route("http://lab.helicoid.test/**", async (route) => {
        const url = new URL(route.request().url());
        if (url.pathname === "/" || url.pathname === "/index.html") {
          return route.fulfill({ contentType: "text/html", body: `<!DOCTYPE html><html><head><meta charset="utf-8"></head><body><script>${host.replace(/<\/script/g, "<\\/script")}</script></body></html>` });
        }
        const prefix = "/labextensions/@helicoid/widgets/";
        if (url.pathname.startsWith(prefix)) {
          const file = join(ext, url.pathname.slice(prefix.length));
          if (existsSync(file)) return route.fulfill({ contentType: types[extname(file)] ?? "application/octet-stream", body: readFileSync(file) });
        }
        return route.fulfill({ status: 404, body: "not found" });
      });
      await page.goto("http://lab.helicoid.test/");
      const n = 48;
      const { compute: _c, ...spec } = testWallSpec;
      const states = [
        { model: "ExplorerModel", state: { calculator: "", spec, inputs: { Ms: 1e6, A: 1e-11, Ku: 1e6 }, result: runCalculator(testWallSpec, { Ms: 1e6, A: 1e-11, Ku: 1e6 }), compute_in: "kernel", kernel_version: "0.2.0", _view_name: "ExplorerView", _view_module: "@helicoid/widgets", _view_module_version: "^0.1.0" } },
        { model: "TextureModel", state: { nx: n, ny: n, dx: 1e-9, dy: 1e-9, title: "lab host", _view_name: "TextureView", _view_module: "@helicoid/widgets", _view_module_version: "^0.1.0" }, buffers: { field: Array.from(skyrmionField(n)) } },
        { model: "FigureModel", state: { figure: { data: [{ type: "scatter", y: [1, 3, 2] }] }, _view_name: "FigureView", _view_module: "@helicoid/widgets", _view_module_version: "^0.1.0" } },
      ];
      await page.evaluate((s) => { (window as any).helicoidTestStates = s; }, states);
      const info = await page.evaluate(() => (window as any).helicoidBoot());
      expect(info.pluginId).toBe("@helicoid/widgets:plugin");
      expect(info.autoStart).toBe(true);
      // The plugin asked for the very IJupyterWidgetRegistry token of the page's @jupyter-widgets/base:
      // the shared singleton was consumed from the share scope.
      expect(info.sameToken).toBe(true);
      expect(info.registered).toEqual(["@helicoid/widgets@0.1.0"]);
      expect(info.exportsNames).toEqual(expect.arrayContaining(["ExplorerModel", "ExplorerView", "FigureModel", "FigureView", "FitPanelModel", "FitPanelView", "TextureModel", "TextureView"]));
      expect(info.shown).toEqual(["ExplorerModel", "TextureModel", "FigureModel"]);
      await page.waitForSelector(".hx-figure[data-draws]");
      expect(Math.abs(Number(await page.locator(".hx-texture").getAttribute("data-charge")) + 1)).toBeLessThan(0.03);
      // The kernel said 0.2.0, this front end is 0.1.0: the view says so.
      expect(await page.locator(".hx-notice").textContent()).toContain("Version mismatch");
      expect(await page.locator(".hx-notice").textContent()).toContain("0.2.0");
      expect(await page.locator("style[data-source]").count()).toBeGreaterThan(0);
      await screenshot(page, "labextension-host");
    });
  });
});
