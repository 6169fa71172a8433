/** `helicoid install/uninstall` write and remove the kernelspec and the JupyterLab extension; Jupyter sees them. */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin } from "../../helpers/paths.js";

const helicoid = (...args: string[]) => spawnSync(process.execPath, [helicoidBin, ...args], { encoding: "utf8" });

describe("helicoid install", () => {
  it("writes a kernelspec Jupyter lists, with the lab extension, and removes them", () => {
    const prefix = mkdtempSync(join(tmpdir(), "helicoid-install-"));
    const r = helicoid("install", "--prefix", prefix);
    expect(r.status, r.stderr).toBe(0);
    const data = join(prefix, "share", "jupyter");
    const spec = JSON.parse(readFileSync(join(data, "kernels", "helicoid", "kernel.json"), "utf8"));
    expect(spec.display_name).toBe("TypeScript (Helicoid)");
    expect(spec.language).toBe("typescript");
    expect(spec.argv).toContain("{connection_file}");
    // Jupyter's own kernelspec listing (Debian's jupyter-client) finds it.
    const list = spawnSync("jupyter", ["kernelspec", "list", "--json"], { encoding: "utf8", env: { ...process.env, JUPYTER_PATH: data } });
    expect(JSON.parse(list.stdout).kernelspecs.helicoid.spec.display_name).toBe("TypeScript (Helicoid)");
    const ext = join(data, "labextensions", "@helicoid", "widgets", "package.json");
    expect(existsSync(ext)).toBe(true);
    expect(JSON.parse(readFileSync(ext, "utf8")).jupyterlab?._build?.load).toMatch(/remoteEntry/);
    const u = helicoid("uninstall", "--prefix", prefix);
    expect(u.status).toBe(0);
    expect(existsSync(join(data, "kernels", "helicoid"))).toBe(false);
    expect(existsSync(join(data, "labextensions", "@helicoid", "widgets"))).toBe(false);
  });

  it("puts in the widget manager when the user's Jupyter has none, and uninstall removes only that one", () => {
    const home = mkdtempSync(join(tmpdir(), "helicoid-install-home-"));
    const env = { ...process.env, HOME: home, JUPYTER_DATA_DIR: join(home, "data") };
    delete env.JUPYTER_PATH;
    const prefix = join(home, "prefix");
    const r = spawnSync(process.execPath, [helicoidBin, "install", "--prefix", prefix], { encoding: "utf8", env });
    expect(r.status, r.stderr).toBe(0);
    const manager = join(prefix, "share", "jupyter", "labextensions", "@jupyter-widgets", "jupyterlab-manager");
    expect(r.stdout).toContain(`installed the one Helicoid built from the npm package @jupyter-widgets/jupyterlab-manager`);
    const pkg = JSON.parse(readFileSync(join(manager, "package.json"), "utf8"));
    expect(pkg.version).toMatch(/^5\./);
    expect(existsSync(join(manager, pkg.jupyterlab._build.load))).toBe(true);
    const u = spawnSync(process.execPath, [helicoidBin, "uninstall", "--prefix", prefix], { encoding: "utf8", env });
    expect(u.stdout).toContain(`removed ${manager}`);
    expect(existsSync(manager)).toBe(false);
    // One we did not install stays.
    mkdirSync(manager, { recursive: true });
    writeFileSync(join(manager, "package.json"), JSON.stringify({ name: "@jupyter-widgets/jupyterlab-manager", version: "5.0.0" }));
    mkdirSync(join(prefix, "share", "jupyter", "kernels", "helicoid"), { recursive: true });
    spawnSync(process.execPath, [helicoidBin, "uninstall", "--prefix", prefix], { encoding: "utf8", env });
    expect(existsSync(join(manager, "package.json"))).toBe(true);
  });

  it("says how to get Jupyter when none is found", () => {
    const r = spawnSync(process.execPath, [helicoidBin, "lab"], { encoding: "utf8", env: { ...process.env, PATH: "/nonexistent" } });
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/no Jupyter found/);
    expect(r.stderr).toMatch(/apt-get install jupyter-server/);
  });

  it("prints usage for no command and refuses an unknown one", () => {
    expect(helicoid().stdout).toMatch(/usage: helicoid COMMAND/);
    const r = helicoid("frobnicate");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/unknown command 'frobnicate'/);
  });
});
