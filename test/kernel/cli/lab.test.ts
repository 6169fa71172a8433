/**
 * `helicoid lab --dry-run`: which front end `helicoid lab` would open on this machine, and why.
 * The expected choice is worked out independently, from the Python packages Debian's python3 can
 * import (jupyterlab, notebook, jupyter_server), not from the command's own probing.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { chmodSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin } from "../../helpers/paths.js";

function lab(args: string[], env?: NodeJS.ProcessEnv) {
  const r = spawnSync(process.execPath, [helicoidBin, "lab", ...args], { encoding: "utf8", timeout: 120_000, env: env ?? process.env });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** The version of a Python package as /usr/bin/python3 sees it, or null. */
function pyVersion(mod: string): string | null {
  const r = spawnSync("/usr/bin/python3", ["-c", `import ${mod}; print(${mod}.__version__)`], { encoding: "utf8" });
  return r.status === 0 ? r.stdout.trim() : null;
}

describe("helicoid lab --dry-run", () => {
  it("reports the front end this machine gets and why", () => {
    const jl = pyVersion("jupyterlab"),
      nb = pyVersion("notebook"),
      srv = pyVersion("jupyter_server");
    const major = (v: string | null) => (v ? Number(v.split(".")[0]) : 0);
    const r = lab(["--dry-run"]);
    if (major(jl) >= 4) {
      expect(r.stdout).toContain("would use: JupyterLab");
      expect(r.stdout).toContain(`JupyterLab ${jl}`);
    } else if (major(nb) >= 7) {
      expect(r.stdout).toContain("would use: Notebook");
    } else if (srv) {
      expect(r.status, r.stderr).toBe(0);
      expect(r.stdout).toContain("would use: Helicoid's JupyterLab-based front end");
      expect(r.stdout).toContain(`jupyter-server ${srv}`);
      if (nb) expect(r.stdout).toContain(`Classic Notebook ${nb} found: it renders no widgets; serving Helicoid's JupyterLab-based front end instead`);
      expect(r.stdout).toMatch(/front end \(lab-frontend\/\): npm packages (installed|not installed yet)/);
    } else {
      expect(r.status).toBe(1);
    }
    // A dry run installs and starts nothing: it only reports.
    expect(r.stdout).not.toContain("kernelspec installed");
  });

  it("prefers JupyterLab 4, then Notebook 7, then the front end on jupyter-server; says when there is nothing", () => {
    const bin = mkdtempSync(join(tmpdir(), "helicoid-lab-path-"));
    try {
      const tool = (name: string, version: string) => {
        writeFileSync(join(bin, name), `#!/bin/sh\necho ${version}\n`);
        chmodSync(join(bin, name), 0o755);
      };
      const env = { ...process.env, PATH: bin };
      expect(lab(["--dry-run"], env)).toMatchObject({ status: 1 });
      expect(lab(["--dry-run"], env).stdout).toContain("no Jupyter found");
      tool("jupyter-server", "2.14.2");
      expect(lab(["--dry-run"], env).stdout).toContain("no JupyterLab 4 or Notebook 7 found; serving Helicoid's JupyterLab-based front end instead, on jupyter-server 2.14.2");
      tool("jupyter-notebook", "6.4.12");
      expect(lab(["--dry-run"], env).stdout).toContain("Classic Notebook 6.4.12 found: it renders no widgets; serving Helicoid's JupyterLab-based front end instead");
      tool("jupyter-lab", "3.6.7");
      expect(lab(["--dry-run"], env).stdout).toContain("JupyterLab 3.6.7 is older than 4");
      tool("jupyter-notebook", "7.2.1");
      expect(lab(["--dry-run"], env).stdout).toContain("would use: Notebook\nNotebook 7.2.1 found (JupyterLab 3.6.7 is older than 4)");
      tool("jupyter-lab", "4.2.5");
      expect(lab(["--dry-run"], env).stdout).toContain("would use: JupyterLab\nJupyterLab 4.2.5 found");
    } finally {
      rmSync(bin, { recursive: true, force: true });
    }
  });
});
