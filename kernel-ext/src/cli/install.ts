/**
 * `helicoid install [--user|--prefix DIR]`: write the `helicoid` kernelspec (display name
 * "TypeScript (Helicoid)") and copy the prebuilt JupyterLab extension of @helicoid/widgets into the
 * Jupyter data directory (no Python packaging). `helicoid uninstall` removes both.
 */
import { cpSync, existsSync, mkdirSync, realpathSync, rmSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { KERNEL_VERSION } from "../version.js";
import { parseArgs, type CommandIO } from "./args.js";
import { candidateDataDirs, dataDirFor } from "./jupyterPaths.js";
import { widgetsDir } from "../notebook/export.js";

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
    interrupt_mode: "signal",
    env: {},
    metadata: { helicoid_version: KERNEL_VERSION, debugger: false },
  };
}

export interface InstallReport {
  dataDir: string;
  kernelDir: string;
  labExtensionDir: string | null;
}

export function install(opts: { user?: boolean; prefix?: string }): InstallReport {
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
  return { dataDir, kernelDir, labExtensionDir };
}

export function uninstall(opts: { prefix?: string }): string[] {
  const removed: string[] = [];
  for (const d of candidateDataDirs(opts.prefix)) {
    for (const p of [join(d, "kernels", KERNEL_NAME), join(d, "labextensions", ...LAB_EXTENSION_NAME.split("/"))]) {
      if (existsSync(p)) {
        rmSync(p, { recursive: true, force: true });
        removed.push(p);
      }
    }
  }
  return removed;
}

export async function installCommand(args: string[], io: CommandIO): Promise<number> {
  const a = parseArgs(args, ["--prefix"]);
  if (a.positional.length > 0) {
    io.stderr("usage: helicoid install [--user | --prefix DIR]\n");
    return 2;
  }
  const r = install({ user: a.flags.has("--user"), prefix: a.options.get("--prefix") });
  io.stdout(`installed kernelspec '${KERNEL_NAME}' ("${DISPLAY_NAME}") in ${r.kernelDir}\n`);
  io.stdout(r.labExtensionDir ? `installed JupyterLab extension ${LAB_EXTENSION_NAME} in ${r.labExtensionDir}\n` : `JupyterLab extension not built yet (run npm run build); only the kernelspec was installed\n`);
  return 0;
}

export async function uninstallCommand(args: string[], io: CommandIO): Promise<number> {
  const a = parseArgs(args, ["--prefix"]);
  const removed = uninstall({ prefix: a.options.get("--prefix") });
  io.stdout(removed.length ? removed.map((p) => `removed ${p}\n`).join("") : "nothing to remove: no helicoid kernelspec or extension found\n");
  return 0;
}
