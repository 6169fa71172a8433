/**
 * Helicoid's notebook front end built from JupyterLab 4's npm packages (the `lab-frontend/` folder
 * of the repository, its own npm package, not installed by the root `npm ci`), served by a plain
 * `jupyter-server` through `--ServerApp.extra_static_paths`:
 *
 *   <site>/helicoid-lab/index.html   the page, with the page config written in as jupyterlab_server does
 *   <site>/helicoid-lab/dist         -> lab-frontend/dist (the esbuild bundle)
 *   <data dir>/labextensions         the installed prebuilt extensions (served as /static/<name>/...)
 *
 * The server token is never written into the served files: the page takes it from its address.
 * Used by `helicoid lab` (when there is no JupyterLab 4 or Notebook 7) and by the end-to-end test.
 */
import { spawnSync } from "node:child_process";
import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, statSync, symlinkSync, writeFileSync } from "node:fs";
import { homedir, tmpdir } from "node:os";
import { join, resolve } from "node:path";

/**
 * Where the front end is built and served from: lab-frontend/ of a checkout; in an installed
 * package, a copy of the sources it ships (lab-frontend/, written at prepack) in the user's cache
 * folder, since a global install's folder may not be writable and the build needs ~360 MB.
 */
export const labFrontendDir = ((): string => {
  const inCheckout = resolve(__dirname, "..", "..", "..", "lab-frontend");
  if (existsSync(join(inCheckout, "package.json"))) return inCheckout;
  const cache = process.env.XDG_CACHE_HOME || join(homedir(), ".cache");
  return join(cache, "helicoid", `lab-frontend-${packageVersion()}`);
})();

/** The front end's sources shipped inside an installed @helicoid/kernel (absent in a checkout). */
const shippedSources = resolve(__dirname, "..", "..", "lab-frontend");

function packageVersion(): string {
  try {
    return (JSON.parse(readFileSync(resolve(__dirname, "..", "..", "package.json"), "utf8")) as { version?: string }).version ?? "0";
  } catch {
    return "0";
  }
}

export interface FederatedExtension {
  name: string;
  load: string;
  extension: string;
  style?: string;
}

/** Newest modification time under `dir` (files only), 0 when it does not exist. */
function newest(path: string): number {
  if (!existsSync(path)) return 0;
  const st = statSync(path);
  if (!st.isDirectory()) return st.mtimeMs;
  let t = 0;
  for (const e of readdirSync(path)) t = Math.max(t, newest(join(path, e)));
  return t;
}

/** What is missing before the front end can be served: its npm packages, its build. */
export function labFrontendState(dir = labFrontendDir): { present: boolean; installed: boolean; built: boolean } {
  const present = existsSync(join(dir, "package.json")) && existsSync(join(dir, "package-lock.json"));
  const installed = existsSync(join(dir, "node_modules", ".package-lock.json"));
  const bundle = join(dir, "dist", "main.js");
  const built = existsSync(bundle) && statSync(bundle).mtimeMs >= Math.max(newest(join(dir, "src")), newest(join(dir, "build.mjs")), newest(join(dir, "package-lock.json")));
  return { present, installed, built };
}

/**
 * Install the front end's npm packages (`npm ci --prefix lab-frontend`, about 360 MB, once) and
 * build it when its bundle is missing or older than its sources. Says what it does on `log`.
 */
export function ensureLabFrontend(log: (s: string) => void, dir = labFrontendDir): void {
  if (!existsSync(join(dir, "package.json")) && dir === labFrontendDir && existsSync(join(shippedSources, "package.json"))) {
    log(`copying the front end's sources to ${dir}\n`);
    mkdirSync(dir, { recursive: true });
    cpSync(shippedSources, dir, { recursive: true });
  }
  const s = labFrontendState(dir);
  if (!s.present) throw new Error(`the front end's sources are missing: ${dir} has no package.json/package-lock.json`);
  if (!s.installed) {
    log(`installing the front end's npm packages (JupyterLab 4 and the widget manager, about 360 MB, once): npm ci --prefix ${dir}\n`);
    const npm = process.platform === "win32" ? "npm.cmd" : "npm";
    const r = spawnSync(npm, ["ci", "--prefix", dir, "--no-audit", "--no-fund"], { stdio: ["ignore", "pipe", "pipe"], encoding: "utf8" });
    if (r.error || r.status !== 0) throw new Error(`npm ci --prefix ${dir} failed (${r.error?.message ?? `status ${r.status}`}):\n${(r.stdout ?? "") + (r.stderr ?? "")}`);
  }
  if (!s.installed || !s.built) {
    log(`building the front end (esbuild): node ${join(dir, "build.mjs")}\n`);
    const r = spawnSync(process.execPath, [join(dir, "build.mjs")], { cwd: dir, stdio: ["ignore", "pipe", "pipe"], encoding: "utf8" });
    if (r.error || r.status !== 0) throw new Error(`the front end's build failed (${r.error?.message ?? `status ${r.status}`}):\n${(r.stdout ?? "") + (r.stderr ?? "")}`);
  }
}

/** The entry JupyterLab's page config gives a prebuilt extension, read from its package.json. */
export function federatedExtension(extDir: string): FederatedExtension {
  const meta = JSON.parse(readFileSync(join(extDir, "package.json"), "utf8"));
  const b = meta?.jupyterlab?._build;
  if (!b?.load) throw new Error(`${extDir} is not a prebuilt JupyterLab extension (no jupyterlab._build.load in its package.json)`);
  return { name: meta.name, load: b.load, extension: b.extension ?? "./extension", ...(b.style ? { style: b.style } : {}) };
}

export interface LabSite {
  /** Directories for `--ServerApp.extra_static_paths`. */
  staticPaths: string[];
  /** The page's path on the server (append `?token=...&path=...`). */
  pagePath: string;
  /** The extensions the page loads. */
  extensions: FederatedExtension[];
  siteDir: string;
}

/**
 * Write the page for a server with base URL `baseUrl`. `labextensionsDir` is the installed
 * extensions folder (`<data dir>/labextensions`); only Helicoid's extension is loaded from it (the
 * page brings its own widget manager; other extensions may need packages it does not share).
 */
export function prepareLabSite(opts: { labextensionsDir: string; widgetManager?: boolean; baseUrl?: string; siteDir?: string; frontendDir?: string }): LabSite {
  const frontend = opts.frontendDir ?? labFrontendDir;
  const baseUrl = opts.baseUrl ?? "/";
  const siteDir = opts.siteDir ?? mkdtempSync(join(tmpdir(), "helicoid-lab-site-"));
  const page = join(siteDir, "helicoid-lab");
  mkdirSync(page, { recursive: true });
  const dist = join(page, "dist");
  if (!existsSync(dist)) {
    try {
      symlinkSync(join(frontend, "dist"), dist, "dir");
    } catch {
      cpSync(join(frontend, "dist"), dist, { recursive: true });
    }
  }
  const own = join(opts.labextensionsDir, "@helicoid", "widgets");
  const extensions = existsSync(join(own, "package.json")) ? [federatedExtension(own)] : [];
  const config = {
    appName: "Helicoid lab front end",
    baseUrl,
    fullLabextensionsUrl: `${baseUrl.replace(/\/$/, "")}/static`,
    federated_extensions: extensions,
    helicoidWidgetManager: opts.widgetManager !== false,
  };
  const template = readFileSync(join(frontend, "index.template.html"), "utf8");
  const json = JSON.stringify(config).replace(/</g, "\\u003c");
  writeFileSync(
    join(page, "index.html"),
    template.replace("__PAGE_CONFIG__", () => json),
  );
  return { staticPaths: [siteDir, opts.labextensionsDir], pagePath: `${baseUrl.replace(/\/$/, "")}/static/helicoid-lab/index.html`, extensions, siteDir };
}
