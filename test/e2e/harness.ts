/**
 * Reusable parts of the real-browser tests:
 * - `launchBrowser()`: Debian's chromium through playwright-core, headless, fresh profile directory;
 * - `startJupyterServer()`: Debian's jupyter-server on a free 127.0.0.1 port with a random token;
 * - `buildPage()`: an esbuild bundle of a page script (browser IIFE);
 * - `buildTestWidgets()`: the widget export bundle with the test calculators added;
 * - `screenshot()`: a PNG under test-output/screenshots/ for reviewers.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync, mkdirSync, rmSync, existsSync, readFileSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { randomBytes } from "node:crypto";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import * as esbuild from "esbuild";

export const repoRoot = resolve(__dirname, "..", "..");
export const outputDir = join(repoRoot, "test-output");
export const chromiumPath = process.env.HELICOID_CHROMIUM ?? "/usr/bin/chromium";

export const CHROMIUM_FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"];

export interface Browser {
  context: BrowserContext;
  newPage(): Promise<Page>;
  close(): Promise<void>;
}

/** Chromium with a fresh --user-data-dir (playwright's persistent context owns that flag). */
export async function launchBrowser(): Promise<Browser> {
  const profile = mkdtempSync(join(tmpdir(), "helicoid-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: chromiumPath,
    headless: true,
    args: CHROMIUM_FLAGS.filter((f) => f !== "--headless"),
    viewport: { width: 1200, height: 900 },
  });
  return {
    context,
    newPage: async () => {
      const page = await context.newPage();
      page.on("pageerror", (e) => console.error("[page error]", e.message));
      if (process.env.HELICOID_E2E_DEBUG) page.on("console", (m) => console.error(`[page ${m.type()}]`, m.text()));
      return page;
    },
    close: async () => {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

export async function screenshot(page: Page, name: string, selector?: string): Promise<string> {
  const dir = join(outputDir, "screenshots");
  mkdirSync(dir, { recursive: true });
  const path = join(dir, `${name}.png`);
  if (selector) await page.locator(selector).first().screenshot({ path });
  else await page.screenshot({ path, fullPage: true });
  return path;
}

export function freePort(): Promise<number> {
  return new Promise((res, rej) => {
    const srv = createServer();
    srv.on("error", rej);
    srv.listen(0, "127.0.0.1", () => {
      const port = (srv.address() as { port: number }).port;
      srv.close(() => res(port));
    });
  });
}

export interface JupyterServer {
  url: string;
  port: number;
  token: string;
  process: ChildProcess;
  log(): string;
  stop(): Promise<void>;
}

/**
 * Start Debian's jupyter-server. `dataDir` (a Jupyter data directory holding kernels/ and
 * labextensions/) goes first on JUPYTER_PATH so its kernelspecs are found.
 */
export async function startJupyterServer(
  options: { dataDir?: string; cwd?: string; env?: Record<string, string>; staticDir?: string; staticPaths?: string[] } = {},
): Promise<JupyterServer> {
  const port = await freePort();
  const token = randomBytes(16).toString("hex");
  const runtime = mkdtempSync(join(tmpdir(), "helicoid-jupyter-runtime-"));
  const env: Record<string, string> = {
    ...(process.env as Record<string, string>),
    JUPYTER_RUNTIME_DIR: runtime,
    JUPYTER_CONFIG_DIR: join(runtime, "config"),
    ...(options.dataDir ? { JUPYTER_PATH: [options.dataDir, process.env.JUPYTER_PATH].filter(Boolean).join(":") } : {}),
    ...(options.env ?? {}),
  };
  const args = [
    "--allow-root",
    "--ServerApp.ip=127.0.0.1",
    `--ServerApp.port=${port}`,
    "--ServerApp.port_retries=0",
    `--ServerApp.token=${token}`,
    "--ServerApp.open_browser=False",
    ...(options.cwd ? [`--ServerApp.root_dir=${options.cwd}`] : []),
    // Test pages served at /static/<file> from the server's own origin (no sandboxing, unlike /files/).
    ...(options.staticDir || options.staticPaths
      ? [`--ServerApp.extra_static_paths=${JSON.stringify([...(options.staticDir ? [options.staticDir] : []), ...(options.staticPaths ?? [])])}`]
      : []),
  ];
  const proc = spawn("/usr/bin/jupyter-server", args, { env, cwd: options.cwd ?? repoRoot, stdio: ["ignore", "pipe", "pipe"] });
  let log = "";
  proc.stdout!.on("data", (d) => (log += d));
  proc.stderr!.on("data", (d) => (log += d));
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (proc.exitCode !== null) throw new Error(`jupyter-server exited with ${proc.exitCode}:\n${log}`);
    try {
      const r = await fetch(`${url}/api/status`, { headers: { Authorization: `token ${token}` } });
      if (r.ok) break;
    } catch {
      /* not yet */
    }
    if (Date.now() > deadline) {
      proc.kill("SIGTERM");
      throw new Error(`jupyter-server did not answer within 30 s:\n${log}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    url,
    port,
    token,
    process: proc,
    log: () => log,
    stop: async () => {
      if (proc.exitCode === null) {
        proc.kill("SIGTERM");
        await new Promise<void>((r) => {
          const t = setTimeout(() => {
            proc.kill("SIGKILL");
            r();
          }, 5000);
          proc.once("exit", () => {
            clearTimeout(t);
            r();
          });
        });
      }
      rmSync(runtime, { recursive: true, force: true });
    },
  };
}

/** CSS imported by page code becomes a <style> tag (as in widgets/build.mjs). */
const cssInject: esbuild.Plugin = {
  name: "css-inject",
  setup(build) {
    build.onLoad({ filter: /\.css$/ }, async (a) => {
      const out = await esbuild.build({
        entryPoints: [a.path],
        bundle: true,
        write: false,
        minify: true,
        logLevel: "silent",
        loader: { ".svg": "dataurl", ".png": "dataurl", ".woff": "dataurl", ".woff2": "dataurl", ".ttf": "dataurl", ".eot": "dataurl", ".gif": "dataurl" },
      });
      const css = out.outputFiles[0]!.text;
      return {
        loader: "js",
        contents: `const c = ${JSON.stringify(css)}; const s = document.createElement("style"); s.textContent = c; document.head.appendChild(s); export default c;`,
      };
    });
  },
};

/** The compute worker's source for page bundles that include our views (they import it). */
const workerSource: esbuild.Plugin = {
  name: "worker-source",
  setup(build) {
    build.onResolve({ filter: /^helicoid:worker-source$/ }, () => ({ path: "w", namespace: "helicoid" }));
    build.onLoad({ filter: /.*/, namespace: "helicoid" }, async () => {
      const w = await esbuild.build({
        entryPoints: [join(repoRoot, "widgets", "src", "compute", "worker.ts")],
        bundle: true,
        write: false,
        format: "iife",
        minify: true,
        alias: { "@helicoid/lib": join(repoRoot, "lib", "src", "index.ts") },
        logLevel: "silent",
      });
      return { loader: "js", contents: `export default ${JSON.stringify(w.outputFiles[0]!.text)};` };
    });
  },
};

/** Bundle a browser page script (IIFE) and return its source text. */
export async function buildPage(entry: string, options: { alias?: Record<string, string> } = {}): Promise<string> {
  const r = await esbuild.build({
    entryPoints: [entry],
    bundle: true,
    write: false,
    format: "iife",
    target: "es2020",
    minify: true,
    define: { __webpack_public_path__: '""', "process.env.NODE_ENV": '"production"', global: "globalThis" },
    loader: { ".svg": "text" },
    plugins: [cssInject, workerSource],
    alias: { "@helicoid/lib": join(repoRoot, "lib", "src", "index.ts"), ...(options.alias ?? {}) },
    logLevel: "silent",
  });
  return r.outputFiles[0]!.text;
}

/** The export bundle with the test calculators (test/widgets/fixtures/testSpecs.ts) added. */
export async function buildTestWidgets(): Promise<string> {
  const out = join(outputDir, "e2e-widgets");
  const r = await new Promise<{ code: number | null; log: string }>((res) => {
    const p = spawn(process.execPath, [join(repoRoot, "widgets", "build.mjs"), "--extra-specs", join(repoRoot, "test", "widgets", "fixtures", "testSpecs.ts"), "--out", out], {
      stdio: ["ignore", "pipe", "pipe"],
    });
    let log = "";
    p.stdout!.on("data", (d) => (log += d));
    p.stderr!.on("data", (d) => (log += d));
    p.on("exit", (code) => res({ code, log }));
  });
  if (r.code !== 0) throw new Error(`test widget build failed:\n${r.log}`);
  return readFileSync(join(out, "export.js"), "utf8");
}

export function hasChromium(): boolean {
  return existsSync(chromiumPath);
}
