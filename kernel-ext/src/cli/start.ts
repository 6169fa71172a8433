/**
 * `helicoid start` (= `npm start`): serve the gallery on 127.0.0.1 at once (port printed; Ctrl-C
 * stops), then run every example notebook with our in-process runner (no Jupyter needed) and export
 * each as a self-contained page whose catalogue explorers stay live. The index lists every notebook
 * as queued, running, done or failed and refreshes itself until all are done, so a slow machine
 * shows the first pages while the rest run. A notebook whose source, widget bundle (which carries
 * the library) and Helicoid version are unchanged since its last run is not run again (`--fresh`
 * runs it anyway). If a Jupyter installation is found, the kernelspec is installed for this user
 * and the `helicoid lab` command is printed.
 */
import { spawn } from "node:child_process";
import { createHash } from "node:crypto";
import { createReadStream, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from "node:fs";
import { createServer, type Server } from "node:http";
import { basename, extname, join, normalize, resolve, sep } from "node:path";
import { availableParallelism } from "node:os";
import { exportNotebook, widgetsDir } from "../notebook/export.js";
import { KERNEL_VERSION } from "../version.js";
import { parseStrict, shorten, UsageError, type CommandIO } from "./args.js";
import { parseTimeout } from "./run.js";
import { binPath, install } from "./install.js";
import { findJupyter } from "./lab.js";
import { defaultGalleryDir, exampleNotebooksDir } from "./places.js";

/** The time limit of one cell of an example notebook in `helicoid start` (seconds). */
export const START_CELL_TIMEOUT = 300;

export interface GalleryEntry {
  name: string;
  title: string;
  page: string | null;
  executed: string | null;
  error: string | null;
  seconds: number;
  /** Where the notebook is: waiting for a free process, running, or finished (done or failed). */
  state?: "queued" | "running" | "done";
  /** The page is from an earlier run with the same notebook, bundle and version. */
  cached?: boolean;
}

export interface GalleryOptions {
  /** Run every notebook even if an earlier run of the same inputs is in the output folder. */
  fresh?: boolean;
  /** Called whenever an entry changes state (the index is rewritten before). */
  onProgress?: (entries: GalleryEntry[]) => void;
}

/** What decides whether an earlier run can be reused: the notebook, the page bundle (which carries the library) and the version. */
function runKey(notebookPath: string): string {
  const h = createHash("sha256");
  h.update(KERNEL_VERSION + "\0");
  h.update(readFileSync(notebookPath));
  const bundle = join(widgetsDir(), "dist", "export.js");
  h.update(existsSync(bundle) ? readFileSync(bundle) : Buffer.from("no bundle"));
  return h.digest("hex");
}

const running = new Set<ReturnType<typeof spawn>>();
function runNotebookInChild(input: string, out: string, timeout: number): Promise<{ code: number; stderr: string }> {
  return new Promise((res) => {
    const child = spawn(process.execPath, [binPath, "run", input, "-o", out, "--quiet", "--timeout", String(timeout)], { stdio: ["ignore", "ignore", "pipe"] });
    running.add(child);
    let stderr = "";
    child.stderr.on("data", (d) => (stderr += d));
    child.on("exit", (code) => {
      running.delete(child);
      res({ code: code ?? 1, stderr });
    });
  });
}
/** Stop the notebook runs still going (the gallery is being closed). */
function stopRuns(): void {
  for (const child of running) child.kill("SIGTERM");
}

function titleOf(nb: { cells?: Array<{ cell_type: string; source: string | string[] }> }, fallback: string): string {
  for (const c of nb.cells ?? []) {
    if (c.cell_type !== "markdown") continue;
    const m = /^#\s+(.+)$/m.exec(Array.isArray(c.source) ? c.source.join("") : c.source);
    if (m) return m[1]!.trim();
  }
  return fallback;
}

/** Execute and export every notebook of `notebooksDir` into `outDir`; returns what happened to each. */
export async function buildGallery(
  notebooksDir: string,
  outDir: string,
  log: (s: string) => void,
  timeout = START_CELL_TIMEOUT,
  options: GalleryOptions = {},
): Promise<GalleryEntry[]> {
  mkdirSync(outDir, { recursive: true });
  const names = readdirSync(notebooksDir)
    .filter((f) => f.endsWith(".ipynb"))
    .sort();
  // Each notebook runs in its own process: as many at a time as the machine has cores (at most 4),
  // the entries kept in the notebooks' order.
  const entries: GalleryEntry[] = names.map((name) => ({ name, title: name.replace(/\.ipynb$/, ""), page: null, executed: null, error: null, seconds: 0, state: "queued" }));
  const changed = () => {
    writeFileSync(join(outDir, "index.html"), galleryIndex(entries));
    options.onProgress?.(entries);
  };
  changed();
  let next = 0;
  const workers = Math.max(1, Math.min(4, availableParallelism(), names.length));
  await Promise.all(
    Array.from({ length: workers }, async () => {
      while (next < names.length) {
        const k = next++;
        entries[k]!.state = "running";
        changed();
        entries[k] = await galleryEntry(names[k]!);
        changed();
      }
    }),
  );
  return entries;

  async function galleryEntry(name: string): Promise<GalleryEntry> {
    const t0 = performance.now();
    const stem = name.replace(/\.ipynb$/, "");
    const executed = join(outDir, `${stem}.ipynb`);
    const page = join(outDir, `${stem}.html`);
    const stampFile = join(outDir, `${stem}.run.json`);
    const key = runKey(join(notebooksDir, name));
    if (!options.fresh && existsSync(executed) && existsSync(page) && existsSync(stampFile)) {
      try {
        const stamp = JSON.parse(readFileSync(stampFile, "utf8")) as { key?: string; title?: string };
        if (stamp.key === key) {
          log(`  ${name}: unchanged since its last run, page kept (--fresh runs it again)\n`);
          return { name, title: stamp.title ?? stem, page, executed, error: null, seconds: 0, state: "done", cached: true };
        }
      } catch {
        // an unreadable stamp: run again
      }
    }
    rmSync(stampFile, { force: true });
    log(`running ${name} ...\n`);
    const r = await runNotebookInChild(join(notebooksDir, name), executed, timeout);
    const entry: GalleryEntry = { name, title: stem, page: null, executed: existsSync(executed) ? executed : null, error: null, seconds: 0, state: "done" };
    if (r.code !== 0) entry.error = r.stderr.trim().split("\n").slice(-3).join(" ") || `exit status ${r.code}`;
    if (entry.executed) {
      const nb = JSON.parse(readFileSync(executed, "utf8"));
      entry.title = titleOf(nb, stem);
      writeFileSync(page, exportNotebook(nb, { sourceName: name }));
      entry.page = page;
      if (!entry.error) writeFileSync(stampFile, JSON.stringify({ key, title: entry.title }) + "\n");
    }
    entry.seconds = (performance.now() - t0) / 1000;
    log(`  ${name}: ${entry.error ? `FAILED: ${entry.error}` : "ok"} (${entry.seconds.toFixed(1)} s)\n`);
    return entry;
  }
}

function esc(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

export function galleryIndex(entries: GalleryEntry[]): string {
  const pending = entries.filter((e) => e.state === "queued" || e.state === "running").length;
  const items = entries
    .map(
      (e) =>
        `<li class="${e.state === "queued" || e.state === "running" ? e.state : e.error ? "failed" : "ok"}">` +
        (e.page ? `<a href="${esc(basename(e.page))}">${esc(e.title)}</a>` : esc(e.title)) +
        ` <span class="file">${esc(e.name)}</span>` +
        (e.state === "queued" ? ` <span class="state">waiting to run</span>` : e.state === "running" ? ` <span class="state">running now…</span>` : "") +
        (e.executed ? ` <a class="file" href="${esc(basename(e.executed))}" download>executed .ipynb</a>` : "") +
        (e.error ? `<div class="error">did not run to the end: ${esc(e.error)}</div>` : "") +
        `</li>`,
    )
    .join("\n");
  return `<!DOCTYPE html><html lang="en"><head><meta charset="utf-8"><title>Helicoid gallery</title>
${pending ? '<meta http-equiv="refresh" content="3">\n' : ""}<style>body{font:16px/1.5 system-ui,sans-serif;max-width:860px;margin:40px auto;padding:0 16px;color:#222}
h1{font-weight:600}li{margin:10px 0}.file{color:#777;font-size:13px;margin-left:8px}.error{color:#a00;font-size:13px}
.note{color:#555;font-size:14px;border-left:3px solid #ddd;padding-left:10px}.state{color:#8a6d00;font-size:13px;margin-left:8px}
.queued,.running{color:#666}</style></head><body>
<h1>Helicoid gallery</h1>
${pending ? `<p class="note">${pending} of ${entries.length} notebooks still to run on this machine; this page refreshes itself.</p>` : ""}
<p>Example notebooks, executed just now by Helicoid's own runner and exported as pages. The explorers of catalogue
calculators compute in your browser: move their sliders. All materials in these notebooks are invented demo materials.</p>
<ul>
${items}
</ul>
<p class="note">Results are estimates under the assumptions stated beside them (continuum micromagnetics, thin film,
zero temperature unless stated).</p>
</body></html>
`;
}

const mime: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".ipynb": "application/x-ipynb+json",
  ".json": "application/json",
  ".js": "text/javascript",
  ".css": "text/css",
  ".png": "image/png",
};

/** Serve `dir` read-only on 127.0.0.1 (never outside it). Port 0 picks a free port. */
export function serveDirectory(dir: string, port: number): Promise<Server> {
  const root = resolve(dir);
  const server = createServer((req, res) => {
    let path: string;
    try {
      path = decodeURIComponent(new URL(req.url ?? "/", "http://127.0.0.1").pathname);
      if (path.includes("\0")) throw new URIError("NUL in the path");
    } catch {
      // A malformed percent-encoding (/%, /%zz, /%ff) or URL is the client's error: 400, keep serving.
      res.writeHead(400, { "content-type": "text/plain" }).end("bad request: the path is not a valid percent-encoded URL path\n");
      return;
    }
    const rel = path === "/" ? "index.html" : path.slice(1);
    const file = normalize(join(root, rel));
    if (!(file === root || file.startsWith(root + sep)) || !existsSync(file) || !statSync(file).isFile() || (req.method !== "GET" && req.method !== "HEAD")) {
      res.writeHead(404, { "content-type": "text/plain" }).end("not found\n");
      return;
    }
    res.writeHead(200, { "content-type": mime[extname(file)] ?? "application/octet-stream", "cache-control": "no-store" });
    if (req.method === "HEAD") res.end();
    else createReadStream(file).pipe(res);
  });
  return new Promise((res, rej) => {
    server.once("error", rej);
    server.listen(port, "127.0.0.1", () => res(server));
  });
}

export async function startCommand(args: string[], io: CommandIO): Promise<number> {
  let a: ReturnType<typeof parseStrict>;
  let timeout = START_CELL_TIMEOUT;
  try {
    a = parseStrict(args, {
      flags: ["--no-serve", "--fresh"],
      valued: { "--port": "a port number such as 8765", "--out": "a directory", "--notebooks": "a directory of .ipynb files", "--timeout": "seconds per cell, such as 300" },
    });
    if (a.positional.length > 0) throw new UsageError(`unexpected argument ${shorten(a.positional[0])}`);
    if (a.options.has("--timeout")) timeout = parseTimeout(a.options.get("--timeout")!);
    const p = a.options.get("--port");
    if (p !== undefined && !(/^\d{1,5}$/.test(p) && Number(p) <= 65535)) throw new UsageError(`--port is ${shorten(JSON.stringify(p))}; expected a port number from 0 to 65535`);
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    io.stderr(`helicoid start: ${err.message}\n`);
    return 2;
  }
  const given = a.options.get("--notebooks");
  const examples = exampleNotebooksDir();
  if (given === undefined && examples === null) {
    io.stderr("helicoid start: no example notebooks in this install; give a folder of notebooks with --notebooks DIR\n");
    return 2;
  }
  const notebooks = resolve(given ?? examples!);
  const out = resolve(a.options.get("--out") ?? defaultGalleryDir());
  const fresh = a.flags.has("--fresh");
  if (a.flags.has("--no-serve")) {
    const entries = await buildGallery(notebooks, out, io.stderr, timeout, { fresh });
    reportJupyter(io);
    io.stdout(`gallery written to ${join(out, "index.html")}\n`);
    return entries.some((e) => e.error) ? 1 : 0;
  }
  // Serve at once: the index says which notebooks are still running and refreshes itself.
  mkdirSync(out, { recursive: true });
  writeFileSync(join(out, "index.html"), galleryIndex([]));
  let port = Number(a.options.get("--port") ?? process.env.PORT ?? 8765);
  let server: Server | null = null;
  for (let attempt = 0; attempt < 20 && !server; attempt++) {
    try {
      server = await serveDirectory(out, port);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== "EADDRINUSE" || port === 0) throw err;
      port++;
    }
  }
  if (!server) throw new Error("no free port found for the gallery");
  const actual = (server.address() as { port: number }).port;
  io.stdout(`\nHelicoid gallery: http://127.0.0.1:${actual}/  (pages appear as their notebooks finish; Ctrl-C stops)\n`);
  const stopped = new Promise<number>((res) => {
    const stop = () => {
      stopRuns();
      server!.close(() => res(0));
    };
    process.once("SIGINT", stop);
    process.once("SIGTERM", stop);
  });
  const built = buildGallery(notebooks, out, io.stderr, timeout, { fresh }).then((entries) => {
    const failed = entries.filter((e) => e.error);
    reportJupyter(io);
    io.stdout(`Helicoid gallery ready: http://127.0.0.1:${actual}/  (${entries.length} notebooks${failed.length ? `, ${failed.length} failed` : ""}; Ctrl-C stops)\n`);
  });
  return Promise.race([stopped, built.then(() => stopped)]);
}

function reportJupyter(io: CommandIO): void {
  const jupyter = findJupyter();
  if (jupyter) {
    const r = install({ user: true });
    io.stdout(`Jupyter found (${jupyter.cmd}${jupyter.args.length ? " " + jupyter.args.join(" ") : ""}): kernelspec installed in ${r.kernelDir}.\n`);
    if (r.widgetManager) io.stdout(`${r.widgetManager.message}\n`);
    io.stdout(`To work in notebooks with live kernel widgets: npx helicoid lab\n`);
  } else {
    io.stdout("No Jupyter found: the gallery needs none. For notebooks with a live kernel, install Jupyter, then run: npx helicoid lab\n");
  }
}
