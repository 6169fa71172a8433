/**
 * `helicoid install [--user|--prefix DIR] [--no-widget-manager]`: write the `helicoid` kernelspec
 * (display name "TypeScript (Helicoid)") and copy the prebuilt JupyterLab extension of
 * @helicoid/widgets into the Jupyter data directory (no Python packaging). Then make sure JupyterLab
 * has a widget manager our extension works with: look in every labextensions folder of the user's
 * Jupyter (`jupyter --paths`, else the standard locations) for @jupyter-widgets/jupyterlab-manager
 * 5.x (what the Python package jupyterlab_widgets installs); when there is none, put in place the one
 * @helicoid/widgets ships (built from the npm package with @jupyterlab/builder when the package was
 * built). Says which it did, and checks the user's JupyterLab version. `helicoid uninstall` removes
 * what we installed (the widget manager only when we put it there).
 */
import { cpSync, existsSync, mkdirSync, readFileSync, realpathSync, rmSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { KERNEL_VERSION } from "../version.js";
import { parseStrict, shorten, UsageError, type CommandIO } from "./args.js";
import { candidateDataDirs, dataDirFor } from "./jupyterPaths.js";
import { widgetsDir } from "../notebook/export.js";
import { findLabExtensions, JUPYTERLAB_MAJOR, jupyterCommand, jupyterDataDirs, jupyterVersions, majorOf, WIDGET_MANAGER, widgetManagerProblem } from "./jupyterEnv.js";

function realpathOrSelf(p: string): string {
  try {
    return realpathSync(p);
  } catch {
    return p;
  }
}

export const KERNEL_NAME = "helicoid";
export const DISPLAY_NAME = "TypeScript (Helicoid)";
/** This package's own command (dist/cli -> bin), as installed: the kernelspec must point at a file that exists. */
export const binPath = realpathOrSelf(resolve(__dirname, "..", "..", "bin", "helicoid.js"));
/** The prebuilt JupyterLab extension shipped by @helicoid/widgets (resolved from this package). */
export const labExtensionSource = join(widgetsDir(), "labextension");
export const LAB_EXTENSION_NAME = "@helicoid/widgets";

export function kernelSpec(): Record<string, unknown> {
  return {
    argv: [process.execPath, binPath, "kernel", "--connection-file", "{connection_file}"],
    display_name: DISPLAY_NAME,
    language: "typescript",
    // Front ends interrupt with interrupt_request on the control channel (see controlProcess.ts:
    // a signal that reaches a free kernel at the wrong instant would end it).
    interrupt_mode: "message",
    env: {},
    metadata: { helicoid_version: KERNEL_VERSION, debugger: false },
  };
}

export interface WidgetManagerReport {
  action: "found" | "installed" | "missing" | "skipped";
  dir: string | null;
  version: string | null;
  /** One or more sentences for the user. */
  message: string;
}

export interface InstallReport {
  dataDir: string;
  kernelDir: string;
  labExtensionDir: string | null;
  widgetManager?: WidgetManagerReport;
  /** Problems with the user's JupyterLab (version), in words. */
  warnings: string[];
}

/** Marker we leave in a widget manager we installed, so uninstall removes only ours. */
const OURS = "installed-by-helicoid.json";

/** The prebuilt widget manager shipped in @helicoid/widgets (widget-manager/), when built. */
export function shippedWidgetManager(): string | null {
  const dir = join(widgetsDir(), "widget-manager");
  return existsSync(join(dir, "package.json")) ? dir : null;
}

/** Find a compatible widget manager in the user's Jupyter, or install ours into `dataDir`. */
export function ensureWidgetManager(dataDir: string, searchDirs: string[]): WidgetManagerReport {
  const found = findLabExtensions(WIDGET_MANAGER, searchDirs);
  // Jupyter uses the first one in its path order: that one must be compatible.
  const first = found[0];
  if (first && first.dir !== join(dataDir, "labextensions", ...WIDGET_MANAGER.split("/")) && widgetManagerProblem(first) === null) {
    return { action: "found", dir: first.dir, version: first.version, message: `widget manager ${WIDGET_MANAGER} ${first.version} found in ${first.dir} (compatible)` };
  }
  const ownTarget = join(dataDir, "labextensions", ...WIDGET_MANAGER.split("/"));
  const existingThere = found.find((f) => f.dir === ownTarget);
  if (existingThere && !existsSync(join(ownTarget, OURS)) && widgetManagerProblem(existingThere) === null) {
    return {
      action: "found",
      dir: ownTarget,
      version: existingThere.version,
      message: `widget manager ${WIDGET_MANAGER} ${existingThere.version} found in ${ownTarget} (compatible)`,
    };
  }
  const shipped = shippedWidgetManager();
  const problems = found.map((f) => widgetManagerProblem(f)).filter((p): p is string => p !== null);
  if (!shipped) {
    return {
      action: "missing",
      dir: null,
      version: null,
      message:
        `no compatible widget manager found${problems.length ? ` (${problems.join("; ")})` : ""} and this install of @helicoid/widgets has no prebuilt one (widget-manager/). ` +
        "Widgets will show as text in JupyterLab. Install one: `pip install jupyterlab_widgets` (or `ipywidgets>=8`) in the Python environment of your JupyterLab" +
        " (or, in a checkout of Helicoid, build ours with `npm run build:manager -w @helicoid/widgets` and run `helicoid install` again).",
    };
  }
  if (existingThere && !existsSync(join(ownTarget, OURS))) {
    return {
      action: "missing",
      dir: ownTarget,
      version: existingThere.version,
      message: `an incompatible widget manager is in ${ownTarget} (${widgetManagerProblem(existingThere)}); not replaced because Helicoid did not install it. Upgrade it: \`pip install -U jupyterlab_widgets\`.`,
    };
  }
  rmSync(ownTarget, { recursive: true, force: true });
  mkdirSync(ownTarget, { recursive: true });
  cpSync(shipped, ownTarget, { recursive: true });
  const version = (JSON.parse(readFileSync(join(shipped, "package.json"), "utf8")) as { version: string }).version;
  writeFileSync(join(ownTarget, OURS), JSON.stringify({ by: "@helicoid/kernel", version: KERNEL_VERSION, from: shipped }, null, 2) + "\n");
  const shadow =
    first && first.dir !== ownTarget && widgetManagerProblem(first) !== null
      ? `; note: ${first.dir} comes first in Jupyter's path and is incompatible, remove or upgrade it (\`pip install -U jupyterlab_widgets\`)`
      : "";
  return {
    action: "installed",
    dir: ownTarget,
    version,
    message: `no compatible widget manager found${problems.length ? ` (${problems.join("; ")})` : ""}; installed the one Helicoid built from the npm package ${WIDGET_MANAGER} ${version} in ${ownTarget}${shadow}`,
  };
}

export function install(opts: { user?: boolean; prefix?: string; widgetManager?: boolean }): InstallReport {
  const dataDir = dataDirFor(opts);
  const kernelDir = join(dataDir, "kernels", KERNEL_NAME);
  mkdirSync(kernelDir, { recursive: true });
  writeFileSync(join(kernelDir, "kernel.json"), JSON.stringify(kernelSpec(), null, 2) + "\n");
  let labExtensionDir: string | null = null;
  if (existsSync(join(labExtensionSource, "package.json"))) {
    labExtensionDir = join(dataDir, "labextensions", ...LAB_EXTENSION_NAME.split("/"));
    rmSync(labExtensionDir, { recursive: true, force: true });
    mkdirSync(labExtensionDir, { recursive: true });
    cpSync(labExtensionSource, labExtensionDir, { recursive: true });
  }
  const warnings: string[] = [];
  let widgetManager: WidgetManagerReport | undefined;
  if (opts.widgetManager !== false) {
    const jupyter = jupyterCommand();
    const versions = jupyterVersions(jupyter);
    const lab = versions.jupyterlab ?? null;
    if (lab && majorOf(lab) !== JUPYTERLAB_MAJOR)
      warnings.push(
        `JupyterLab ${lab} found: Helicoid's extension and widget manager are built for JupyterLab ${JUPYTERLAB_MAJOR} (or Notebook 7); upgrade JupyterLab to see widgets`,
      );
    widgetManager = ensureWidgetManager(dataDir, jupyterDataDirs([dataDir], jupyter).dirs);
  } else {
    widgetManager = { action: "skipped", dir: null, version: null, message: "widget manager not checked (--no-widget-manager)" };
  }
  return { dataDir, kernelDir, labExtensionDir, widgetManager, warnings };
}

export function uninstall(opts: { prefix?: string }): string[] {
  const removed: string[] = [];
  for (const d of candidateDataDirs(opts.prefix)) {
    const manager = join(d, "labextensions", ...WIDGET_MANAGER.split("/"));
    const ours = existsSync(join(manager, OURS)) ? [manager] : [];
    for (const p of [join(d, "kernels", KERNEL_NAME), join(d, "labextensions", ...LAB_EXTENSION_NAME.split("/")), ...ours]) {
      if (existsSync(p)) {
        rmSync(p, { recursive: true, force: true });
        removed.push(p);
      }
    }
  }
  return removed;
}

export async function installCommand(args: string[], io: CommandIO): Promise<number> {
  let a: ReturnType<typeof parseStrict>;
  try {
    a = parseStrict(args, { flags: ["--user", "--no-widget-manager"], valued: { "--prefix": "a directory" } });
    if (a.positional.length > 0) throw new UsageError(`unexpected argument ${shorten(a.positional[0])}`);
    if (a.flags.has("--user") && a.options.has("--prefix")) throw new UsageError("--user and --prefix both given: give one");
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    io.stderr(`helicoid install: ${err.message}\nusage: helicoid install [--user | --prefix DIR] [--no-widget-manager]\n`);
    return 2;
  }
  const r = install({ user: a.flags.has("--user"), prefix: a.options.get("--prefix"), widgetManager: !a.flags.has("--no-widget-manager") });
  io.stdout(`installed kernelspec '${KERNEL_NAME}' ("${DISPLAY_NAME}") in ${r.kernelDir}\n`);
  io.stdout(
    r.labExtensionDir
      ? `installed JupyterLab extension ${LAB_EXTENSION_NAME} in ${r.labExtensionDir}\n`
      : `JupyterLab extension not built yet (run npm run build); only the kernelspec was installed\n`,
  );
  if (r.widgetManager) io.stdout(`${r.widgetManager.message}\n`);
  for (const w of r.warnings) io.stdout(`warning: ${w}\n`);
  io.stdout("check everything with: helicoid doctor\n");
  return 0;
}

export async function uninstallCommand(args: string[], io: CommandIO): Promise<number> {
  let a: ReturnType<typeof parseStrict>;
  try {
    a = parseStrict(args, { flags: [], valued: { "--prefix": "a directory" } });
    if (a.positional.length > 0) throw new UsageError(`unexpected argument ${shorten(a.positional[0])}`);
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    io.stderr(`helicoid uninstall: ${err.message}\nusage: helicoid uninstall [--prefix DIR]\n`);
    return 2;
  }
  const removed = uninstall({ prefix: a.options.get("--prefix") });
  io.stdout(removed.length ? removed.map((p) => `removed ${p}\n`).join("") : "nothing to remove: no helicoid kernelspec or extension found\n");
  return 0;
}
