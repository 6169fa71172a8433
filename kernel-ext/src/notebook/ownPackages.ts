/**
 * Notebooks anywhere can `import ... from "@helicoid/kernel"` (or "@helicoid/lib"), not only those
 * inside this repository or the folder Helicoid was installed into.
 *
 * - At run time: the node_modules folder(s) holding our packages (as Node resolves them from this
 *   file: a checkout, a project install, a global install) join Node's global module paths
 *   (NODE_PATH, re-read). A notebook folder's own node_modules still comes first, as Node does.
 * - For type checking: tslab compiles cells with its own TypeScript, which resolves modules from the
 *   notebook's folder up through each parent's node_modules and never reads NODE_PATH. tslab itself
 *   forwards `<cwd>/node_modules/tslab` to its own install; we do the same for each of our packages
 *   that TypeScript would not find on its own: `<cwd>/node_modules/@helicoid/<name>` is answered from
 *   our installed package, by answering TypeScript's file-system questions for those paths. The
 *   decision is taken per package from the folders on disk (not from Node's resolution, which now
 *   includes NODE_PATH), so a notebook folder with its own node_modules (say with mathjs in it) is
 *   forwarded too.
 */
import Module from "node:module";
import { existsSync, realpathSync } from "node:fs";
import { dirname, join, relative, sep } from "node:path";

/** Our packages a notebook may import, by their name under the @helicoid scope. */
export const OWN_PACKAGES = ["lib", "kernel", "widgets"] as const;

let applied = false;

/** Where each of our packages is installed, as Node resolves it from this file (real paths). */
export function ownPackageDirs(): Map<string, string> {
  const dirs = new Map<string, string>();
  for (const name of OWN_PACKAGES) {
    try {
      dirs.set(name, dirname(realpathSync(require.resolve(`@helicoid/${name}/package.json`))));
    } catch {
      /* not installed (widgets is optional for type checking) */
    }
  }
  // This file belongs to @helicoid/kernel: its root is two folders up from dist/notebook.
  if (!dirs.has("kernel")) dirs.set("kernel", realpathSync(join(__dirname, "..", "..")));
  return dirs;
}

/** The node_modules folders Node searches from this file that hold one of our packages (unresolved links kept). */
export function ownNodeModulesDirs(): string[] {
  const found: string[] = [];
  for (const name of OWN_PACKAGES) {
    for (const d of require.resolve.paths(`@helicoid/${name}`) ?? []) {
      if (existsSync(join(d, "@helicoid", name, "package.json"))) {
        if (!found.includes(d)) found.push(d);
        break;
      }
    }
  }
  return found;
}

/** True when TypeScript, resolving from `dir`, finds `@helicoid/<name>` in `dir` or a parent's node_modules. */
export function typeScriptFinds(dir: string, name: string): boolean {
  for (let d = dir; ; d = dirname(d)) {
    if (existsSync(join(d, "node_modules", "@helicoid", name, "package.json"))) return true;
    if (dirname(d) === d) return false;
  }
}

export function exposeOwnPackages(rootDir: string): void {
  if (applied) return;
  applied = true;
  const paths = (process.env.NODE_PATH ?? "").split(":").filter(Boolean);
  const extra = ownNodeModulesDirs().filter((d) => !paths.includes(d));
  if (extra.length > 0) {
    process.env.NODE_PATH = [...paths, ...extra].join(":");
    (Module as unknown as { _initPaths(): void })._initPaths();
  }
  // Decided from the folders on disk, not from Node's resolution: NODE_PATH (just set) is invisible to TypeScript.
  const forwarded = new Map<string, string>();
  for (const [name, dir] of ownPackageDirs()) {
    if (!typeScriptFinds(rootDir, name)) forwarded.set(name, dir);
  }
  if (forwarded.size === 0) return;
  const scopeUnderRoot = join(rootDir, "node_modules", "@helicoid");

  const ts = require("@tslab/typescript-for-tslab") as { sys: Record<string, (...a: never[]) => unknown> };
  const sys = ts.sys as unknown as {
    fileExists(p: string): boolean;
    directoryExists(p: string): boolean;
    readFile(p: string, enc?: string): string | undefined;
    realpath?(p: string): string;
  };
  const forward = (p: string): string | null => {
    const rel = relative(scopeUnderRoot, p);
    if (rel === "" || rel.startsWith("..") || rel.startsWith(sep)) return null;
    const [name, ...rest] = rel.split(sep);
    const dir = forwarded.get(name!);
    return dir ? join(dir, ...rest) : null;
  };
  const { fileExists, directoryExists, readFile, realpath } = sys;
  sys.fileExists = (p) => fileExists.call(sys, p) || (!!forward(p) && fileExists.call(sys, forward(p)!));
  sys.directoryExists = (p) => directoryExists.call(sys, p) || p === scopeUnderRoot || (!!forward(p) && directoryExists.call(sys, forward(p)!));
  sys.readFile = (p, enc) => readFile.call(sys, p, enc) ?? (forward(p) ? readFile.call(sys, forward(p)!, enc) : undefined);
  if (realpath) sys.realpath = (p) => (forward(p) && !existsSync(p) ? realpathSync(forward(p)!) : realpath.call(sys, p));
}
