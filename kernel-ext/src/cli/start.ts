/**
 * `helicoid start` (= `npm start`): run every example notebook with our in-process runner (no
 * Jupyter needed), export each as a self-contained page whose catalogue explorers stay live, and
 * serve the gallery on 127.0.0.1 (port printed; Ctrl-C stops). If a Jupyter installation is found,
 * the kernelspec is installed for this user and the `helicoid lab` command is printed.
 */
import { spawn } from "node:child_process";
import { createReadStream, existsSync, mkdirSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { createServer, type Server } from "node:http";
import { basename, extname, join, normalize, resolve, sep } from "node:path";
import { availableParallelism } from "node:os";
import { exportNotebook } from "../notebook/export.js";
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
}

function runNotebookInChild(input: string, out: string, timeout: number): Promise<{ code: number; stderr: string }> {
  return new Promise((res) => {
    const child = spawn(process.execPath, [binPath, "run", input, "-o", out, "--quiet", "--timeout", String(timeout)], { stdio: ["ignore", "ignore", "pipe"] });
    let stderr = "";
    child.stderr.on("data", (d) => (stderr += d));
    child.on("exit", (code) => res({ code: code ?? 1, stderr }));
  });
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
export async function buildGallery(notebooksDir: string, outDir: string, log: (s: string) => void, timeout = START_CELL_TIMEOUT): Promise<GalleryEntry[]> {
  mkdirSync(outDir, { recursive: true });
  const names = readdirSync(notebooksDir).filter((f) => f.endsWith(".ipynb")).sort();
  // Each notebook runs in its own process: as many at a time as the machine has cores (at most 4),
  // the entries kept in the notebooks' order.
  const entries: GalleryEntry[] = new Array(names.length);
  let next = 0;
  const workers = Math.max(1, Math.min(4, availableParallelism(), names.length));
  await Promise.all(Array.from({ length: workers }, async () => {
    while (next < names.length) {
      const k = next++;
      entries[k] = await galleryEntry(names[k]!);
    }
  }));
  writeFileSync(join(outDir, "index.html"), galleryIndex(entries));
  return entries;

  async function galleryEntry(name: string): Promise<GalleryEntry> {
    const t0 = performance.now();
    const stem = name.replace(/\.ipynb$/, "");
    const executed = join(outDir, `${stem}.ipynb`);
    log(`running ${name} ...\n`);
    const r = await runNotebookInChild(join(notebooksDir, name), executed, timeout);
    const entry: GalleryEntry = { name, title: stem, page: null, executed: existsSync(executed) ? executed : null, error: null, seconds: 0 };
    if (r.code !== 0) entry.error = r.stderr.trim().split("\n").slice(-3).join(" ") || `exit status ${r.code}`;
    if (entry.executed) {
      const nb = JSON.parse(readFileSync(executed, "utf8"));
      entry.title = titleOf(nb, stem);
      const page = join(outDir, `${stem}.html`);
      writeFileSync(page, exportNotebook(nb, { sourceName: name }));
      entry.page = page;
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
  const items = entries
    .map(
      (e) =>
        `<li class="${e.error ? "failed" : "ok"}">` +
        (e.page ? `<a href="${esc(basename(e.page))}">${esc(e.title)}</a>` : esc(e.title)) +
        ` <span class="file">${esc(e.name)}</span>` +
        (e.executed ? ` <a class="file" href="${esc(basename(e.executed))}" download>executed .ipynb</a>` : "") +
        (e.error ? `<div class="error">did not run to the end: ${esc(e.error)}</div>` : "") +
        `</li>`,
    )
    .join("\n");
  return `<!DOCTYPE html><html lang="en"><head><meta charset="utf-8"><title>Helicoid gallery</title>
<style>body{font:16px/1.5 system-ui,sans-serif;max-width:860px;margin:40px auto;padding:0 16px;color:#222}
h1{font-weight:600}li{margin:10px 0}.file{color:#777;font-size:13px;margin-left:8px}.error{color:#a00;font-size:13px}
.note{color:#555;font-size:14px;border-left:3px solid #ddd;padding-left:10px}</style></head><body>
<h1>Helicoid gallery</h1>
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

const mime: Record<string, string> = { ".html": "text/html; charset=utf-8", ".ipynb": "application/x-ipynb+json", ".json": "application/json", ".js": "text/javascript", ".css": "text/css", ".png": "image/png" };

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
    a = parseStrict(args, { flags: ["--no-serve"], valued: { "--port": "a port number such as 8765", "--out": "a directory", "--notebooks": "a directory of .ipynb files", "--timeout": "seconds per cell, such as 300" } });
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
  const entries = await buildGallery(notebooks, out, io.stderr, timeout);
  const failed = entries.filter((e) => e.error);
  const jupyter = findJupyter();
  if (jupyter) {
    const r = install({ user: true });
    io.stdout(`Jupyter found (${jupyter.cmd}${jupyter.args.length ? " " + jupyter.args.join(" ") : ""}): kernelspec installed in ${r.kernelDir}.\n`);
    if (r.widgetManager) io.stdout(`${r.widgetManager.message}\n`);
    io.stdout(`To work in notebooks with live kernel widgets: npx helicoid lab\n`);
  } else {
    io.stdout("No Jupyter found: the gallery below needs none. For notebooks with a live kernel, install Jupyter, then run: npx helicoid lab\n");
  }
  if (a.flags.has("--no-serve")) {
    io.stdout(`gallery written to ${join(out, "index.html")}\n`);
    return failed.length ? 1 : 0;
  }
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
  io.stdout(`\nHelicoid gallery: http://127.0.0.1:${actual}/  (${entries.length} notebooks${failed.length ? `, ${failed.length} failed` : ""}; Ctrl-C stops)\n`);
  return new Promise<number>((res) => {
    const stop = () => server!.close(() => res(0));
    process.once("SIGINT", stop);
    process.once("SIGTERM", stop);
  });
}
