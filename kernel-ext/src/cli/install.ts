/**
 * `helicoid install [--user|--prefix DIR]`: write the `helicoid` kernelspec (display name
 * "TypeScript (Helicoid)") and copy the prebuilt JupyterLab extension of @helicoid/widgets into the
 * Jupyter data directory (no Python packaging). `helicoid uninstall` removes both.
 */
import { cpSync, existsSync, mkdirSync, rmSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { KERNEL_VERSION } from "../version.js";
import { parseStrict, shorten, UsageError, type CommandIO } from "./args.js";
import { candidateDataDirs, dataDirFor } from "./jupyterPaths.js";

export const KERNEL_NAME = "helicoid";
export const DISPLAY_NAME = "TypeScript (Helicoid)";
const repoRoot = resolve(__dirname, "..", "..", "..");
export const binPath = join(repoRoot, "kernel-ext", "bin", "helicoid.js");
export const labExtensionSource = join(repoRoot, "widgets", "labextension");
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
  let a: ReturnType<typeof parseStrict>;
  try {
    a = parseStrict(args, { flags: ["--user"], valued: { "--prefix": "a directory" } });
    if (a.positional.length > 0) throw new UsageError(`unexpected argument ${shorten(a.positional[0])}`);
    if (a.flags.has("--user") && a.options.has("--prefix")) throw new UsageError("--user and --prefix both given: give one");
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    io.stderr(`helicoid install: ${err.message}\nusage: helicoid install [--user | --prefix DIR]\n`);
    return 2;
  }
  const r = install({ user: a.flags.has("--user"), prefix: a.options.get("--prefix") });
  io.stdout(`installed kernelspec '${KERNEL_NAME}' ("${DISPLAY_NAME}") in ${r.kernelDir}\n`);
  io.stdout(r.labExtensionDir ? `installed JupyterLab extension ${LAB_EXTENSION_NAME} in ${r.labExtensionDir}\n` : `JupyterLab extension not built yet (run npm run build); only the kernelspec was installed\n`);
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
