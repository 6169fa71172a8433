/**
 * The user's Jupyter as it is: the `jupyter` command, the versions of its parts, its data folders
 * (from `jupyter --paths --json` when there is a `jupyter`, else the standard locations) and the
 * JupyterLab extensions in them, the widget manager above all. Used by `helicoid install` and
 * `helicoid doctor`.
 */
import { spawnSync } from "node:child_process";
import { accessSync, constants, existsSync, readFileSync } from "node:fs";
import { delimiter, join } from "node:path";
import { systemDataDir, userDataDir } from "./jupyterPaths.js";

/** The widget manager's npm name (the Python package jupyterlab_widgets ships the same extension). */
export const WIDGET_MANAGER = "@jupyter-widgets/jupyterlab-manager";
/** Major versions of the widget manager that provide @jupyter-widgets/base 6 in JupyterLab 4 (ipywidgets 8). */
export const WIDGET_MANAGER_MAJOR = 5;
/** The JupyterLab major version our prebuilt extension is built for (Notebook 7 is built on it). */
export const JUPYTERLAB_MAJOR = 4;

/** The full path of a command on PATH (or the path given), or null. */
export function which(cmd: string): string | null {
  const isExec = (p: string) => {
    try {
      accessSync(p, constants.X_OK);
      return true;
    } catch {
      return false;
    }
  };
  if (cmd.includes("/")) return isExec(cmd) ? cmd : null;
  for (const d of (process.env.PATH ?? "").split(delimiter).filter(Boolean)) {
    const p = join(d, cmd);
    if (isExec(p)) return p;
  }
  return null;
}

/** The `jupyter` command (HELICOID_JUPYTER overrides the one on PATH), or null. */
export function jupyterCommand(): string | null {
  return which(process.env.HELICOID_JUPYTER || "jupyter");
}

export function majorOf(version: string | null | undefined): number | null {
  const m = /^(\d+)\./.exec(version ?? "");
  return m ? Number(m[1]) : null;
}

/** `jupyter --version` as {package: version | null (not installed)}. */
export function jupyterVersions(jupyter: string | null = jupyterCommand()): Record<string, string | null> {
  if (!jupyter) return {};
  const r = spawnSync(jupyter, ["--version"], { encoding: "utf8", timeout: 60_000 });
  if (r.error || r.status !== 0) return {};
  const out: Record<string, string | null> = {};
  for (const line of r.stdout.split("\n")) {
    const m = /^\s*([A-Za-z0-9_.-]+)\s*:\s*(.+?)\s*$/.exec(line);
    if (m) out[m[1]!] = /not installed/i.test(m[2]!) ? null : m[2]!;
  }
  return out;
}

export interface JupyterDataDirs {
  dirs: string[];
  /** Where the list came from. */
  from: "jupyter --paths" | "standard locations";
}

/** Jupyter's data folders, in its order of precedence; `extra` (a --prefix's share/jupyter) first. */
export function jupyterDataDirs(extra: string[] = [], jupyter: string | null = jupyterCommand()): JupyterDataDirs {
  let dirs: string[] | null = null;
  if (jupyter) {
    const r = spawnSync(jupyter, ["--paths", "--json"], { encoding: "utf8", timeout: 60_000 });
    try {
      if (!r.error && r.status === 0) dirs = (JSON.parse(r.stdout) as { data: string[] }).data;
    } catch {
      dirs = null;
    }
  }
  const from = dirs ? "jupyter --paths" : "standard locations";
  if (!dirs) {
    const fromEnv = (process.env.JUPYTER_PATH ?? "").split(delimiter).filter(Boolean);
    dirs = [...fromEnv, userDataDir(), systemDataDir, "/usr/share/jupyter"];
  }
  const all = [...extra, ...dirs];
  return { dirs: all.filter((d, i) => all.indexOf(d) === i), from };
}

export interface LabExtension {
  name: string;
  dir: string;
  version: string | null;
  /** The federated module's entry file exists. */
  loadable: boolean;
}

/** A prebuilt extension `name` in the labextensions folders of `dataDirs`, in precedence order. */
export function findLabExtensions(name: string, dataDirs: string[]): LabExtension[] {
  const found: LabExtension[] = [];
  for (const d of dataDirs) {
    const dir = join(d, "labextensions", ...name.split("/"));
    const pj = join(dir, "package.json");
    if (!existsSync(pj)) continue;
    try {
      const pkg = JSON.parse(readFileSync(pj, "utf8")) as { version?: string; jupyterlab?: { _build?: { load?: string } } };
      const load = pkg.jupyterlab?._build?.load;
      found.push({ name, dir, version: pkg.version ?? null, loadable: !!load && existsSync(join(dir, load)) });
    } catch {
      found.push({ name, dir, version: null, loadable: false });
    }
  }
  return found;
}

/** Is this widget manager one our extension works with? null when it is, else the reason. */
export function widgetManagerProblem(ext: LabExtension): string | null {
  if (!ext.loadable) return `${ext.dir} has no loadable prebuilt extension (package.json without a built remoteEntry)`;
  const major = majorOf(ext.version);
  if (major !== WIDGET_MANAGER_MAJOR)
    return `version ${ext.version ?? "unknown"} at ${ext.dir}; Helicoid's widgets need ${WIDGET_MANAGER_MAJOR}.x (ipywidgets 8, @jupyter-widgets/base 6)`;
  return null;
}
