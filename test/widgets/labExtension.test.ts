/**
 * The prebuilt JupyterLab 4 extension (widgets/labextension, built by `npm run build`) as
 * `helicoid install --prefix` installs it: the metadata and entry files JupyterLab loads. That it
 * loads and works in a JupyterLab 4 front end, with and without the widget manager, is proven by
 * test/e2e/jupyterlab.test.ts.
 */
import { describe, it, expect, afterAll } from "vitest";
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";

const repoRoot = resolve(__dirname, "..", "..");

const built = join(repoRoot, "widgets", "labextension");

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
afterAll(() => {
  if (ext !== built) rmSync(join(ext, "..", "..", "..", "..", ".."), { recursive: true, force: true });
});

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

  it("loads @jupyter-widgets/base only on activation, so a JupyterLab without the widget manager still runs the plugin", () => {
    const lib = join(repoRoot, "widgets", "lib");
    const entry = readFileSync(join(lib, "plugin.js"), "utf8");
    expect(entry).not.toMatch(/from\s*["']@jupyter-widgets\/base["']/);
    expect(entry).toMatch(/import\(["']\.\/labWidgets-[A-Z0-9]+\.js["']\)/);
    const lazy = readdirSync(lib).filter((f) => /^labWidgets-.*\.js$/.test(f));
    expect(lazy).toHaveLength(1);
    expect(readFileSync(join(lib, lazy[0]!), "utf8")).toMatch(/from\s*["']@jupyter-widgets\/base["']/);
    // The plugin's notice names what is missing and where to look.
    expect(entry).toContain("jupyterlab_widgets");
    expect(entry).toContain("helicoid doctor");
  });
});
