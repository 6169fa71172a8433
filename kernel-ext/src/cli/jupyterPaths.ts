/**
 * Jupyter's data directories, computed the way jupyter_core documents them, so installing needs no
 * Python: `--prefix DIR` -> DIR/share/jupyter; `--user` -> $JUPYTER_DATA_DIR or the per-user data
 * directory; otherwise the system directory (/usr/local/share/jupyter), or the user one when the
 * system one is not writable.
 */
import { accessSync, constants, existsSync, mkdirSync } from "node:fs";
import { homedir } from "node:os";
import { join } from "node:path";

export function userDataDir(): string {
  if (process.env.JUPYTER_DATA_DIR) return process.env.JUPYTER_DATA_DIR;
  if (process.platform === "darwin") return join(homedir(), "Library", "Jupyter");
  if (process.platform === "win32") return join(process.env.APPDATA ?? homedir(), "jupyter");
  return join(process.env.XDG_DATA_HOME ?? join(homedir(), ".local", "share"), "jupyter");
}

export const systemDataDir = process.platform === "win32" ? join(process.env.PROGRAMDATA ?? "C:\\ProgramData", "jupyter") : "/usr/local/share/jupyter";

function writable(dir: string): boolean {
  try {
    mkdirSync(dir, { recursive: true });
    accessSync(dir, constants.W_OK);
    return true;
  } catch {
    return false;
  }
}

export function dataDirFor(opts: { user?: boolean; prefix?: string }): string {
  if (opts.prefix) return join(opts.prefix, "share", "jupyter");
  if (opts.user) return userDataDir();
  return writable(systemDataDir) ? systemDataDir : userDataDir();
}

/** Every data directory Jupyter searches that might hold our install (for uninstall). */
export function candidateDataDirs(prefix?: string): string[] {
  const dirs = prefix ? [join(prefix, "share", "jupyter")] : [userDataDir(), systemDataDir, "/usr/share/jupyter"];
  return dirs.filter((d, i) => dirs.indexOf(d) === i && existsSync(d));
}
