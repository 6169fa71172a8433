/**
 * Notebooks anywhere can `import ... from "@helicoid/kernel"` (or "@helicoid/lib"), not only those
 * inside this repository.
 *
 * - At run time: our node_modules folder joins Node's global module paths (NODE_PATH, re-read).
 * - For type checking: tslab compiles cells with its own TypeScript, resolving modules from the
 *   notebook's folder. tslab itself forwards `<cwd>/node_modules/tslab` to its own install; we do the
 *   same for `<cwd>/node_modules/@helicoid/*`, by answering TypeScript's file-system questions for
 *   those paths (when they do not exist for real) from our own packages.
 */
import Module from "node:module";
import { existsSync, realpathSync } from "node:fs";
import { dirname, join, relative, sep } from "node:path";

let applied = false;

export function exposeOwnPackages(rootDir: string): void {
  if (applied) return;
  applied = true;
  const ownNodeModules = join(dirname(realpathSync(require.resolve("@helicoid/lib/package.json"))), "..", "node_modules");
  const ownScope = join(ownNodeModules, "@helicoid");
  if (!existsSync(ownScope)) return;
  const paths = (process.env.NODE_PATH ?? "").split(":").filter(Boolean);
  if (!paths.includes(ownNodeModules)) {
    process.env.NODE_PATH = [...paths, ownNodeModules].join(":");
    (Module as unknown as { _initPaths(): void })._initPaths();
  }
  const scopeUnderRoot = join(rootDir, "node_modules", "@helicoid");
  if (existsSync(scopeUnderRoot) || resolvesFrom(rootDir)) return;
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  const ts = require("@tslab/typescript-for-tslab") as { sys: Record<string, (...a: never[]) => unknown> };
  const sys = ts.sys as unknown as {
    fileExists(p: string): boolean;
    directoryExists(p: string): boolean;
    readFile(p: string, enc?: string): string | undefined;
    realpath?(p: string): string;
  };
  const forward = (p: string): string | null => {
    const rel = relative(scopeUnderRoot, p);
    if (rel.startsWith("..") || rel.startsWith(sep)) return null;
    return join(ownScope, rel);
  };
  const { fileExists, directoryExists, readFile, realpath } = sys;
  sys.fileExists = (p) => fileExists.call(sys, p) || (!!forward(p) && fileExists.call(sys, forward(p)!));
  sys.directoryExists = (p) => directoryExists.call(sys, p) || (!!forward(p) && directoryExists.call(sys, forward(p)!));
  sys.readFile = (p, enc) => readFile.call(sys, p, enc) ?? (forward(p) ? readFile.call(sys, forward(p)!, enc) : undefined);
  if (realpath) sys.realpath = (p) => (forward(p) && !existsSync(p) ? realpathSync(forward(p)!) : realpath.call(sys, p));
}

function resolvesFrom(dir: string): boolean {
  try {
    Module.createRequire(join(dir, "x.js")).resolve("@helicoid/kernel");
    return !!existsSync(join(dir, "node_modules"));
  } catch {
    return false;
  }
}
