/**
 * The widget manager `helicoid install` puts in place (npm @jupyter-widgets/jupyterlab-manager built as
 * a prebuilt extension by @jupyterlab/builder) is a federated module that provides
 * @jupyter-widgets/base 6 in JupyterLab's default share scope, which Helicoid's own extension consumes
 * and does not bring. Checked the way JupyterLab's bootstrap loads prebuilt extensions: in chromium, a
 * script tag for each remoteEntry of the INSTALLED copies, then `container.init(shareScope)`.
 */
import { afterAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { helicoidBin } from "../../helpers/paths.js";
import { launchBrowser, type Browser } from "../../e2e/harness.js";

let browser: Browser | undefined;
afterAll(async () => {
  await browser?.close();
});

describe("the installed widget manager", () => {
  it("provides @jupyter-widgets/base 6 in the default share scope, which Helicoid's extension consumes", async () => {
    const home = mkdtempSync(join(tmpdir(), "helicoid-manager-"));
    const env = { ...process.env, HOME: home, JUPYTER_DATA_DIR: join(home, "data") };
    delete env.JUPYTER_PATH;
    const prefix = join(home, "prefix");
    const r = spawnSync(process.execPath, [helicoidBin, "install", "--prefix", prefix], { encoding: "utf8", env });
    expect(r.status, r.stderr).toBe(0);
    const labext = join(prefix, "share", "jupyter", "labextensions");
    const entry = (name: string) => {
      const dir = join(labext, ...name.split("/"));
      const meta = JSON.parse(readFileSync(join(dir, "package.json"), "utf8"));
      return { url: pathToFileURL(join(dir, meta.jupyterlab._build.load)).href, meta };
    };
    const manager = entry("@jupyter-widgets/jupyterlab-manager");
    const ours = entry("@helicoid/widgets");
    expect(manager.meta.jupyterlab.sharedPackages["@jupyter-widgets/base"]).toEqual({ bundled: true, singleton: true });
    const html = join(home, "host.html");
    writeFileSync(html, `<!doctype html><html><body><script src="${manager.url}"></script><script src="${ours.url}"></script></body></html>`);
    browser = await launchBrowser();
    const page = await browser.newPage();
    await page.goto(pathToFileURL(html).href);
    const scope = await page.evaluate(async () => {
      const lab = (window as unknown as { _JUPYTERLAB: Record<string, { init(s: unknown): Promise<void> }> })._JUPYTERLAB;
      const shareScope: Record<string, Record<string, { from: string }>> = {};
      await lab["@jupyter-widgets/jupyterlab-manager"]!.init(shareScope);
      const afterManager = Object.fromEntries(Object.entries(shareScope).map(([k, v]) => [k, Object.keys(v)]));
      const before = new Set(Object.keys(shareScope["@jupyter-widgets/base"] ?? {}));
      await lab["@helicoid/widgets"]!.init(shareScope);
      const addedBase = Object.keys(shareScope["@jupyter-widgets/base"] ?? {}).filter((v) => !before.has(v));
      return { containers: Object.keys(lab).sort(), afterManager, addedBase };
    });
    expect(scope.containers).toEqual(["@helicoid/widgets", "@jupyter-widgets/jupyterlab-manager"]);
    const base = scope.afterManager["@jupyter-widgets/base"] ?? [];
    expect(base.length, JSON.stringify(scope.afterManager)).toBe(1);
    expect(base[0]).toMatch(/^6\.\d+\.\d+$/);
    expect(scope.afterManager["@jupyter-widgets/controls"]?.[0]).toMatch(/^5\./);
    // Ours brings no copy of its own: it uses the manager's (a singleton).
    expect(scope.addedBase).toEqual([]);
  }, 180_000);
});
