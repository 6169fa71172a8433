/**
 * `helicoid doctor` reports what it finds of the user's Jupyter (Debian's here) and says what to do:
 * versions agree with what Jupyter's own Python packages say, the kernelspec `helicoid install`
 * wrote is found and its kernel answers kernel_info, the extension and the widget manager are found;
 * without the widget manager, with a kernelspec whose command is gone, and with no Jupyter at all it
 * names what is missing. Each case runs in its own HOME and JUPYTER_DATA_DIR, so the user's own
 * Jupyter folders do not count.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin } from "../../helpers/paths.js";
import { systemPython } from "../../helpers/python.js";

interface Check {
  name: string;
  status: "ok" | "warning" | "problem";
  found: string;
  advice: string;
}
interface Report {
  jupyter: { command: string | null; versions: Record<string, string | null>; dataDirsFrom: string };
  checks: Check[];
  problems: number;
}

function sandbox() {
  const home = mkdtempSync(join(tmpdir(), "helicoid-doctor-"));
  const env: NodeJS.ProcessEnv = { ...process.env, HOME: home, JUPYTER_DATA_DIR: join(home, "jupyter-data") };
  delete env.JUPYTER_PATH;
  delete env.XDG_DATA_HOME;
  const prefix = join(home, "prefix");
  const helicoid = (args: string[], extra: NodeJS.ProcessEnv = {}) =>
    spawnSync(process.execPath, [helicoidBin, ...args], { encoding: "utf8", env: { ...env, ...extra }, timeout: 170_000 });
  return { home, env, prefix, helicoid };
}

const check = (r: Report, name: string) => {
  const c = r.checks.find((x) => x.name === name);
  if (!c) throw new Error(`no '${name}' check in ${JSON.stringify(r.checks.map((x) => x.name))}`);
  return c;
};

/** A Python package's version as its own module says (Debian's python3), or null when not installed. */
function pythonVersion(module: string): string | null {
  const r = spawnSync(systemPython, ["-c", `import importlib.metadata as m\ntry:\n print(m.version(${JSON.stringify(module)}))\nexcept m.PackageNotFoundError:\n print('')`], {
    encoding: "utf8",
  });
  return r.stdout.trim() || null;
}

describe("helicoid doctor", () => {
  it("after helicoid install: kernelspec, kernel, extension and widget manager are found; versions are Jupyter's own", () => {
    const s = sandbox();
    const inst = s.helicoid(["install", "--prefix", s.prefix]);
    expect(inst.status, inst.stderr).toBe(0);
    expect(inst.stdout).toMatch(/widget manager .* (found|installed)/);
    const d = s.helicoid(["doctor", "--json", "--start-kernel", "--prefix", s.prefix]);
    const r = JSON.parse(d.stdout) as Report;
    expect(r.jupyter.command).toBe("/usr/bin/jupyter");
    expect(r.jupyter.dataDirsFrom).toBe("jupyter --paths");
    // Versions against Debian's Python package metadata.
    expect(r.jupyter.versions.jupyter_server).toBe(pythonVersion("jupyter_server"));
    expect(r.jupyter.versions.nbconvert).toBe(pythonVersion("nbconvert"));
    expect(r.jupyter.versions.notebook ?? null).toBe(pythonVersion("notebook"));
    expect(r.jupyter.versions.jupyterlab ?? null).toBe(pythonVersion("jupyterlab"));
    expect(check(r, "kernelspec")).toMatchObject({ status: "ok" });
    expect(check(r, "kernelspec").found).toContain(join(s.prefix, "share", "jupyter", "kernels", "helicoid"));
    expect(check(r, "kernel")).toMatchObject({ status: "ok" });
    expect(check(r, "kernel").found).toMatch(/kernel_info answered: helicoid/);
    expect(check(r, "extension").status).toBe("ok");
    expect(check(r, "widget manager").status).toBe("ok");
    expect(check(r, "widget manager").found).toMatch(/@jupyter-widgets\/jupyterlab-manager 5\./);
    // The classic Notebook (6.x on Debian) is named as a front end that shows no Helicoid widget.
    const nb = pythonVersion("notebook");
    const lab = pythonVersion("jupyterlab");
    if (nb && Number(nb.split(".")[0]) < 7 && !(lab && lab.startsWith("4."))) {
      expect(check(r, "front end")).toMatchObject({ status: "warning" });
      expect(check(r, "front end").found).toMatch(new RegExp(`classic Notebook ${nb.replace(/\./g, "\\.")}, which renders no Helicoid widget`));
    } else {
      expect(check(r, "front end").status).toBe("ok");
    }
    expect(r.problems).toBe(0);
    expect(d.status).toBe(0);
  });

  it("without the widget manager: says what is missing and what to do, exit 1", () => {
    const s = sandbox();
    expect(s.helicoid(["install", "--prefix", s.prefix, "--no-widget-manager"]).status).toBe(0);
    const d = s.helicoid(["doctor", "--prefix", s.prefix]);
    expect(d.status).toBe(1);
    expect(d.stdout).toMatch(/PROBLEM {2}widget manager: no widget manager \(@jupyter-widgets\/jupyterlab-manager/);
    expect(d.stdout).toMatch(/shows every widget as text/);
    expect(d.stdout).toMatch(/what to do: run `npx helicoid install`.*pip install jupyterlab_widgets/);
    expect(d.stdout).toMatch(/1 problem/);
    // and helicoid install then puts one in place, which doctor finds
    const inst = s.helicoid(["install", "--prefix", s.prefix]);
    expect(inst.stdout).toMatch(/installed the one Helicoid built from the npm package @jupyter-widgets\/jupyterlab-manager 5\./);
    const r = JSON.parse(s.helicoid(["doctor", "--json", "--prefix", s.prefix]).stdout) as Report;
    expect(check(r, "widget manager")).toMatchObject({ status: "ok" });
    expect(check(r, "widget manager").found).toMatch(/installed by helicoid install/);
  });

  it("a widget manager already in the user's Jupyter is found, not replaced", () => {
    const s = sandbox();
    // A first install puts ours in a prefix; a copy without our marker plays the user's own one.
    const other = join(s.home, "other");
    expect(s.helicoid(["install", "--prefix", other]).status).toBe(0);
    const src = join(other, "share", "jupyter", "labextensions", "@jupyter-widgets", "jupyterlab-manager");
    spawnSync("rm", ["-f", join(src, "installed-by-helicoid.json")]);
    const inst = s.helicoid(["install", "--prefix", s.prefix], { JUPYTER_PATH: join(other, "share", "jupyter") });
    expect(inst.stdout).toContain(`found in ${src} (compatible)`);
  });

  it("a kernelspec whose command is gone is a problem, with the fix", () => {
    const s = sandbox();
    expect(s.helicoid(["install", "--prefix", s.prefix, "--no-widget-manager"]).status).toBe(0);
    const file = join(s.prefix, "share", "jupyter", "kernels", "helicoid", "kernel.json");
    const spec = JSON.parse(readFileSync(file, "utf8"));
    spec.argv[1] = join(s.home, "gone", "bin", "helicoid.js");
    writeFileSync(file, JSON.stringify(spec));
    const r = JSON.parse(s.helicoid(["doctor", "--json", "--prefix", s.prefix]).stdout) as Report;
    expect(check(r, "kernelspec").status).toBe("problem");
    expect(check(r, "kernelspec").found).toContain(`${spec.argv[1]}, which does not exist`);
    expect(check(r, "kernelspec").advice).toMatch(/npx helicoid install/);
  });

  it("with no Jupyter: standard folders, and it says how to get one", () => {
    const s = sandbox();
    mkdirSync(s.prefix);
    const d = s.helicoid(["doctor", "--json"], { HELICOID_JUPYTER: join(s.home, "no-jupyter") });
    const r = JSON.parse(d.stdout) as Report;
    expect(r.jupyter.command).toBeNull();
    expect(r.jupyter.dataDirsFrom).toBe("standard locations");
    expect(check(r, "jupyter")).toMatchObject({ status: "warning" });
    expect(check(r, "jupyter").advice).toMatch(/pipx install jupyterlab/);
    expect(check(r, "kernelspec").status).toBe("problem");
  });
});
