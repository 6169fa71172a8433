/**
 * Static HTML export of an executed notebook: `helicoid export NOTEBOOK -o PAGE.html`.
 *
 * One self-contained page, no network: the widget front end (@helicoid/widgets' export bundle:
 * html-manager, standard controls, our views, plotly, CSS) is embedded once; the notebook's
 * widget state (metadata.widgets) is embedded as saved by the runner; markdown is rendered;
 * code cells and their outputs are shown. Plotly outputs (application/vnd.plotly.v1+json) are
 * drawn with the embedded plotly. Catalogue explorers stay live in the page (they compute with
 * the bundled @helicoid/lib); widgets that need the kernel show their last state and say so.
 */
import { readFileSync, writeFileSync, existsSync } from "node:fs";
import { gzipSync } from "node:zlib";
import { dirname, join, resolve, basename } from "node:path";
import { fileReason, isSameFile, outputFileProblem, parseStrict, shorten, UsageError } from "../cli/args.js";
import { sanitizeUntrustedHtml, strictBase64 } from "./sanitize.js";

export interface ExportOptions {
  /** Page title (default: the notebook's first heading, else "Helicoid notebook"). */
  title?: string;
  /** Source text of the widget bundle (default: read from @helicoid/widgets' dist/export.js). */
  bundle?: string;
  /** Where the notebook came from, shown in the page footer. */
  sourceName?: string;
  /** Show code cells (default true). */
  showCode?: boolean;
  /**
   * Keep the notebook's raw HTML and Markdown as they are, scripts included (default false: the
   * notebook is untrusted and its HTML is sanitized; see sanitize.ts). Only for notebooks you trust.
   */
  trusted?: boolean;
}

export class ExportError extends Error {
  override readonly name = "ExportError";
}

type Json = Record<string, unknown>;
type MimeBundle = Record<string, unknown>;

const WIDGET_STATE = "application/vnd.jupyter.widget-state+json";
const WIDGET_VIEW = "application/vnd.jupyter.widget-view+json";
const PLOTLY = "application/vnd.plotly.v1+json";

/** The directory of the @helicoid/widgets package (built with `npm run build`). */
export function widgetsDir(): string {
  try {
    return dirname(require.resolve("@helicoid/widgets/package.json"));
  } catch {
    return resolve(__dirname, "..", "..", "..", "widgets");
  }
}

function readBuilt(file: string): string {
  const path = join(widgetsDir(), "dist", file);
  if (!existsSync(path)) {
    throw new ExportError(`The widget front end is not built (${path} is missing): run \`npm run build\` in the Helicoid checkout first.`);
  }
  return readFileSync(path, "utf8");
}

let markdownRenderer: ((s: string) => string) | null = null;
function renderMarkdown(source: string): string {
  if (!markdownRenderer) {
    readBuilt("markdown.cjs"); // clear error when missing

    markdownRenderer = (require(join(widgetsDir(), "dist", "markdown.cjs")) as { renderMarkdown: (s: string) => string }).renderMarkdown;
  }
  return markdownRenderer(source);
}

export function escapeHtml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/** JSON inside a <script> element: "</" and "<!--" must not appear. */
function scriptJson(value: unknown): string {
  return JSON.stringify(value)
    .replace(/</g, "\\u003c")
    .replace(/\u2028/g, "\\u2028")
    .replace(/\u2029/g, "\\u2029");
}

/** Where widgets/build.mjs splits dist/export.js into parts that the page runs one task each. */
export const BUNDLE_PART_MARK = "\n//# helicoid-part\n";
/** The type of a bundle part's <script>: gzip-compressed JavaScript, in base64. */
export const BUNDLE_PART_TYPE = "application/vnd.helicoid.bundle-part+gzip;base64";

/**
 * The page's loader: decompresses each bundle part (DecompressionStream, native) and runs it as a
 * classic script, one part per task, so that no single task parses and runs the whole bundle.
 */
const BUNDLE_LOADER = `(async function () {
  var tags = document.querySelectorAll('script[type="${BUNDLE_PART_TYPE}"]');
  try {
    if (typeof DecompressionStream === "undefined") throw new Error("this browser has no DecompressionStream (gzip), which the page needs to unpack its scripts");
    var texts = Array.prototype.map.call(tags, function (t) {
      var b64 = t.textContent.trim();
      var bytes = Uint8Array.fromBase64 && Uint8Array.fromBase64(b64);
      if (!bytes) {
        var bin = atob(b64);
        bytes = new Uint8Array(bin.length);
        for (var i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
      }
      return new Response(new Blob([bytes]).stream().pipeThrough(new DecompressionStream("gzip"))).text();
    });
    for (var k = 0; k < texts.length; k++) {
      var s = document.createElement("script");
      s.setAttribute("data-helicoid-part", String(k));
      s.textContent = await texts[k];
      var t0 = performance.now();
      document.body.appendChild(s);
      performance.measure("hx-bundle-part-" + k, { start: t0, end: performance.now() });
      await new Promise(function (r) { setTimeout(r, 0); });
    }
  } catch (err) {
    var box = document.createElement("div");
    box.className = "hx-error";
    box.textContent = "The page's scripts could not be unpacked: " + ((err && err.message) || String(err));
    document.body.prepend(box);
    document.body.dataset.helicoidReady = "1";
  }
})();`;

/** The bundle as gzip-compressed parts plus the loader that runs them in order. */
function bundleScripts(bundle: string): string {
  const parts = bundle.split(BUNDLE_PART_MARK);
  return (
    parts.map((p) => `<script type="${BUNDLE_PART_TYPE}">${gzipSync(Buffer.from(p, "utf8"), { level: 9 }).toString("base64")}</script>\n`).join("") +
    `<script>${BUNDLE_LOADER}</script>\n`
  );
}

const text = (v: unknown): string => (Array.isArray(v) ? v.join("") : typeof v === "string" ? v : v == null ? "" : String(v));
const stripAnsi = (s: string) => s.replace(/\u001b\[[0-9;]*[A-Za-z]/g, "");

/** Check the shape we rely on and name the problem (nbformat 4). */
export function checkNotebook(nb: unknown, name = "notebook"): asserts nb is { cells: Json[]; metadata?: Json; nbformat: number } {
  if (!nb || typeof nb !== "object" || Array.isArray(nb)) throw new ExportError(`${name}: not a notebook (expected a JSON object with "cells")`);
  const o = nb as Json;
  if (!Array.isArray(o.cells)) throw new ExportError(`${name}: not an nbformat 4 notebook: "cells" is missing or not a list`);
  if (typeof o.nbformat === "number" && o.nbformat < 4) throw new ExportError(`${name}: nbformat ${o.nbformat} is not supported (expected 4)`);
}

function widgetState(nb: { metadata?: Json }): { state: Json; ids: Set<string> } | null {
  const w = (nb.metadata?.widgets as Json | undefined)?.[WIDGET_STATE] as Json | undefined;
  if (!w || typeof w !== "object" || typeof w.state !== "object" || w.state === null) return null;
  return { state: w, ids: new Set(Object.keys(w.state as Json)) };
}

interface RenderState {
  widgets: number;
  plots: number;
  missing: number;
  trusted: boolean;
}

/** HTML from the notebook: as is when trusted, else sanitized. */
function notebookHtml(html: string, st: RenderState): string {
  return st.trusted ? html : sanitizeUntrustedHtml(html);
}

function imageTag(mime: string, value: unknown): string {
  const b64 = strictBase64(text(value));
  if (b64 === null) return `<div class="hx-out hx-image-invalid"><em>(an ${escapeHtml(mime)} output whose data is not valid base64; not shown)</em></div>`;
  return `<div class="hx-out hx-image"><img alt="output image" src="data:${escapeHtml(mime)};base64,${b64}"></div>`;
}

function renderOutput(out: Json, widgetIds: Set<string>, counters: RenderState): string {
  if (!out || typeof out !== "object" || Array.isArray(out))
    return `<pre class="hx-out hx-plain"><em>(an output that is not an object: ${escapeHtml(shorten(JSON.stringify(out) ?? String(out)))}; skipped)</em></pre>`;
  const type = out.output_type;
  if (type === "stream") {
    const name = out.name === "stderr" ? "stderr" : "stdout";
    return `<pre class="hx-out hx-stream hx-${name}">${escapeHtml(stripAnsi(text(out.text)))}</pre>`;
  }
  if (type === "error") {
    const tb =
      Array.isArray(out.traceback) && out.traceback.length ? (out.traceback as unknown[]).map((l) => stripAnsi(text(l))).join("\n") : `${text(out.ename)}: ${text(out.evalue)}`;
    return `<pre class="hx-out hx-error-output">${escapeHtml(tb)}</pre>`;
  }
  if (type !== "display_data" && type !== "execute_result" && type !== "update_display_data") return "";
  const data = (out.data && typeof out.data === "object" ? out.data : {}) as MimeBundle;
  const plain = data["text/plain"] !== undefined ? escapeHtml(text(data["text/plain"])) : "";
  if (data[WIDGET_VIEW] && typeof data[WIDGET_VIEW] === "object") {
    const view = data[WIDGET_VIEW] as Json;
    const id = String(view.model_id ?? "");
    if (widgetIds.has(id)) {
      counters.widgets++;
      return (
        `<div class="hx-out hx-widget-output">` +
        `<script type="${WIDGET_VIEW}">${scriptJson({ version_major: 2, version_minor: 0, model_id: id })}</script>` +
        `<div class="hx-widget-fallback">${plain || "(widget)"} <em>(loading widget…)</em></div></div>`
      );
    }
    counters.missing++;
    return `<div class="hx-out hx-widget-missing">${plain || "(widget)"} <em>(this widget's state was not saved with the notebook; run it with <code>helicoid run</code> to keep it)</em></div>`;
  }
  if (data[PLOTLY]) {
    counters.plots++;
    return `<div class="hx-out hx-plotly"><script type="${PLOTLY}">${scriptJson(data[PLOTLY])}</script><div class="hx-plotly-fallback">${plain}</div></div>`;
  }
  if (data["text/html"] !== undefined) return `<div class="hx-out hx-html">${notebookHtml(text(data["text/html"]), counters)}</div>`;
  if (data["image/svg+xml"] !== undefined) {
    // Untrusted SVG is shown as an image: an SVG in <img> never runs script.
    if (counters.trusted) return `<div class="hx-out hx-image">${text(data["image/svg+xml"])}</div>`;
    return `<div class="hx-out hx-image"><img alt="output image" src="data:image/svg+xml;base64,${Buffer.from(text(data["image/svg+xml"]), "utf8").toString("base64")}"></div>`;
  }
  for (const mime of ["image/png", "image/jpeg", "image/gif"]) {
    if (data[mime] !== undefined) return imageTag(mime, data[mime]);
  }
  if (data["text/markdown"] !== undefined) return `<div class="hx-out hx-markdown">${notebookHtml(renderMarkdown(text(data["text/markdown"])), counters)}</div>`;
  if (data["text/latex"] !== undefined) return `<pre class="hx-out hx-latex">${escapeHtml(text(data["text/latex"]))}</pre>`;
  if (data["application/json"] !== undefined) return `<pre class="hx-out hx-json">${escapeHtml(JSON.stringify(data["application/json"], null, 2) ?? "")}</pre>`;
  if (plain) return `<pre class="hx-out hx-plain">${plain}</pre>`;
  return "";
}

/**
 * The widget state of an untrusted notebook, with what the standard controls would show as HTML
 * cleaned the same way: HTML widgets' values, descriptions shown as HTML, and the outputs held by
 * Output widgets (rendered in the page as trusted by the widget manager).
 */
function sanitizeWidgetState(state: Json): Json {
  const copy = structuredClone(state);
  const models = (copy.state ?? {}) as Record<string, Json>;
  for (const m of Object.values(models)) {
    const st = m && typeof m === "object" ? (m.state as Json | undefined) : undefined;
    if (!st || typeof st !== "object") continue;
    if (/^HTML(Math)?Model$/.test(String(st._model_name ?? "")) && typeof st.value === "string") st.value = sanitizeUntrustedHtml(st.value);
    if (typeof st.description === "string" && st.description_allow_html) st.description = sanitizeUntrustedHtml(st.description);
    if (Array.isArray(st.outputs)) {
      st.outputs = (st.outputs as unknown[]).filter((o) => o && typeof o === "object").map((o) => sanitizeOutputData(o as Json));
    }
  }
  return copy;
}

function sanitizeOutputData(o: Json): Json {
  const data = o.data && typeof o.data === "object" ? { ...(o.data as MimeBundle) } : undefined;
  if (!data) return o;
  if (data["text/html"] !== undefined) data["text/html"] = sanitizeUntrustedHtml(text(data["text/html"]));
  if (data["text/markdown"] !== undefined) {
    data["text/html"] ??= sanitizeUntrustedHtml(renderMarkdown(text(data["text/markdown"])));
    delete data["text/markdown"];
  }
  if (data["image/svg+xml"] !== undefined) {
    data["text/html"] = `<img alt="output image" src="data:image/svg+xml;base64,${Buffer.from(text(data["image/svg+xml"]), "utf8").toString("base64")}">`;
    delete data["image/svg+xml"];
  }
  for (const mime of ["image/png", "image/jpeg", "image/gif"]) {
    if (data[mime] === undefined) delete data[mime];
    else if (strictBase64(text(data[mime])) === null) delete data[mime];
  }
  for (const mime of ["application/javascript", "text/javascript"]) delete data[mime];
  return { ...o, data };
}

function firstHeading(cells: Json[]): string | null {
  for (const c of cells) {
    if (!c || typeof c !== "object" || c.cell_type !== "markdown") continue;
    const m = /^\s{0,3}#{1,3}\s+(.+?)\s*#*\s*$/m.exec(text(c.source));
    if (m) return m[1]!.replace(/[*_`]/g, "");
  }
  return null;
}

const PAGE_CSS = `
body { margin: 0; background: #fafafa; color: #222; font: 15px/1.5 system-ui, -apple-system, "Segoe UI", sans-serif; }
main { max-width: 1100px; margin: 0 auto; padding: 16px 24px 48px; background: #fff; min-height: 100vh; box-shadow: 0 0 8px rgba(0,0,0,.06); }
.hx-cell { margin: 10px 0; }
.hx-code-cell .hx-input { display: flex; gap: 8px; }
.hx-prompt { color: #307fc1; font: 12px/1.9 monospace; min-width: 56px; text-align: right; flex: none; }
.hx-source { flex: 1; margin: 0; background: #f5f7f9; border: 1px solid #e0e4e8; border-radius: 3px; padding: 6px 10px; overflow-x: auto; font: 13px/1.45 ui-monospace, "DejaVu Sans Mono", monospace; }
.hx-outputs-area { margin-left: 64px; }
.hx-out { margin: 6px 0; overflow-x: auto; }
pre.hx-out { font: 13px/1.45 ui-monospace, "DejaVu Sans Mono", monospace; white-space: pre-wrap; }
.hx-stderr { background: #fff3f3; }
.hx-error-output { background: #fdecea; color: #8a1c1c; padding: 6px; }
.hx-markdown-cell { padding: 0 8px 0 72px; }
.hx-markdown-cell table, .hx-html table { border-collapse: collapse; }
.hx-markdown-cell td, .hx-markdown-cell th, .hx-html td, .hx-html th { border: 1px solid #ddd; padding: 2px 8px; }
.hx-widget-fallback { color: #666; font-style: italic; }
.hx-widget-missing { color: #7a4d00; }
.hx-page-note { color: #666; font-size: 13px; border-bottom: 1px solid #eee; padding-bottom: 6px; }
footer { color: #888; font-size: 12px; margin-top: 40px; }
`;

/** The HTML page of a notebook (object or JSON text). */
export function exportNotebook(ipynb: unknown, options: ExportOptions = {}): string {
  let nb: unknown = ipynb;
  if (typeof ipynb === "string") {
    try {
      nb = JSON.parse(ipynb);
    } catch (err) {
      throw new ExportError(`${options.sourceName ?? "notebook"}: not valid JSON (${(err as Error).message})`);
    }
  }
  checkNotebook(nb, options.sourceName);
  const cells = nb.cells;
  const ws = widgetState(nb);
  const ids = ws?.ids ?? new Set<string>();
  const trusted = options.trusted ?? false;
  const counters: RenderState = { widgets: 0, plots: 0, missing: 0, trusted };
  const showCode = options.showCode ?? true;
  const parts: string[] = [];
  for (const cell of cells) {
    if (!cell || typeof cell !== "object") continue;
    const source = text(cell.source);
    if (cell.cell_type === "markdown") {
      parts.push(`<section class="hx-cell hx-markdown-cell">${notebookHtml(renderMarkdown(source), counters)}</section>`);
    } else if (cell.cell_type === "code") {
      const count = cell.execution_count == null ? " " : String(cell.execution_count);
      const outputs = Array.isArray(cell.outputs) ? (cell.outputs as Json[]).map((o) => renderOutput(o, ids, counters)).join("\n") : "";
      parts.push(
        `<section class="hx-cell hx-code-cell">` +
          (showCode && source.trim()
            ? `<div class="hx-input"><div class="hx-prompt">[${escapeHtml(count)}]:</div><pre class="hx-source"><code>${escapeHtml(source)}</code></pre></div>`
            : "") +
          (outputs ? `<div class="hx-outputs-area">${outputs}</div>` : "") +
          `</section>`,
      );
    } else if (cell.cell_type === "raw") {
      parts.push(`<section class="hx-cell hx-raw"><pre>${escapeHtml(source)}</pre></section>`);
    }
  }
  const title = options.title ?? firstHeading(cells) ?? "Helicoid notebook";
  const needsScript = counters.widgets > 0 || counters.plots > 0;
  const bundle = needsScript ? (options.bundle ?? readBuilt("export.js")) : "";
  const note =
    counters.widgets > 0
      ? `<p class="hx-page-note">Exported notebook. Explorers of catalogue calculators compute in this page: move their sliders. Widgets that need the kernel show their last state.</p>`
      : "";
  return (
    `<!DOCTYPE html>\n<html lang="en">\n<head>\n<meta charset="utf-8">\n<meta name="viewport" content="width=device-width, initial-scale=1">\n` +
    `<meta name="generator" content="helicoid export">\n<title>${escapeHtml(title)}</title>\n<style>${PAGE_CSS}</style>\n</head>\n<body>\n<main>\n` +
    note +
    parts.join("\n") +
    `\n<footer>Exported by Helicoid${options.sourceName ? ` from ${escapeHtml(basename(options.sourceName))}` : ""}. Results are estimates under the assumptions stated with each calculator.</footer>\n</main>\n` +
    (ws && counters.widgets > 0 ? `<script type="${WIDGET_STATE}">${scriptJson(trusted ? ws.state : sanitizeWidgetState(ws.state))}</script>\n` : "") +
    (needsScript ? bundleScripts(bundle) : "") +
    `</body>\n</html>\n`
  );
}

const USAGE =
  "usage: helicoid export NOTEBOOK.ipynb [-o PAGE.html] [--title TEXT] [--no-code] [--trusted]\n  --trusted  keep the notebook's raw HTML and scripts (only for notebooks you trust; by default HTML and Markdown are sanitized)\nExit status: 0 done, 2 bad input or usage (a missing or malformed notebook, an unwritable output path), 1 a failed export.";

type Out = ((s: string) => unknown) | { write(s: string): unknown };

/**
 * `helicoid export NOTEBOOK -o PAGE.html`: returns the exit status (0 done; 2 bad input or usage:
 * a missing, unreadable or malformed notebook, an output path that cannot be written; 1 a failed
 * export, such as an unbuilt widget front end). `io` writers may be functions or streams.
 */
export async function exportCommand(args: string[], cio: { stdout: Out; stderr: Out }): Promise<number> {
  const w = (o: Out) => ({ write: (s: string) => (typeof o === "function" ? o(s) : o.write(s)) });
  const io = { stdout: w(cio.stdout), stderr: w(cio.stderr) };
  const usage = (message: string) => {
    io.stderr.write(`helicoid export: ${message}\n${USAGE}\n`);
    return 2;
  };
  let a: ReturnType<typeof parseStrict>;
  try {
    a = parseStrict(args, {
      flags: ["--no-code", "--trusted", "-h", "--help"],
      valued: { "-o": "a file name such as PAGE.html", "--output": "a file name such as PAGE.html", "--title": "the page title" },
    });
  } catch (err) {
    if (err instanceof UsageError) return usage(err.message);
    throw err;
  }
  if (a.flags.has("-h") || a.flags.has("--help")) {
    io.stdout.write(USAGE + "\n");
    return 0;
  }
  if (a.options.has("-o") && a.options.has("--output"))
    return usage(`-o and --output both given (${shorten(a.options.get("-o"))}, ${shorten(a.options.get("--output"))}): give one`);
  if (a.positional.length > 1) return usage(`more than one notebook given (${shorten(a.positional.join(", "))})`);
  const input = a.positional[0];
  const output = a.options.get("-o") ?? a.options.get("--output");
  const title = a.options.get("--title");
  const showCode = !a.flags.has("--no-code");
  const trusted = a.flags.has("--trusted");
  if (!input) return usage("no notebook given");
  const out = output ?? input.replace(/\.ipynb$/i, "") + ".html";
  if (resolve(out) === resolve(input) || isSameFile(out, input)) {
    io.stderr.write(`helicoid export: the output ${out} is the notebook itself (the same file, or a link to it): choose another -o path (the notebook is never modified)\n`);
    return 2;
  }
  let raw: string;
  try {
    raw = readFileSync(input, "utf8");
  } catch (err) {
    io.stderr.write(`helicoid export: cannot read ${input}: ${(err as NodeJS.ErrnoException).code === "ENOENT" ? "no such file" : fileReason(err)}\n`);
    return 2;
  }
  // Bad input first (the notebook, the output path), before any page is built.
  let nb: unknown;
  try {
    nb = JSON.parse(raw);
    checkNotebook(nb, input);
  } catch (err) {
    io.stderr.write(
      `helicoid export: ${err instanceof ExportError ? err.message : `${input}: not valid JSON (${err instanceof RangeError ? "nested too deeply to read" : shorten((err as Error).message)})`}\n`,
    );
    return 2;
  }
  const problem = outputFileProblem(out);
  if (problem !== null) {
    io.stderr.write(`helicoid export: cannot write ${problem}\n`);
    return 2;
  }
  let html: string;
  try {
    html = exportNotebook(nb, { title, showCode, trusted, sourceName: input });
  } catch (err) {
    io.stderr.write(`helicoid export: ${err instanceof ExportError ? err.message : `the page could not be built: ${shorten(describeErrorLine(err))}`}\n`);
    return 1;
  }
  try {
    writeFileSync(out, html);
  } catch (err) {
    io.stderr.write(`helicoid export: cannot write ${out}: ${fileReason(err)}\n`);
    return 2;
  }
  io.stdout.write(`wrote ${out} (${(Buffer.byteLength(html) / 1e6).toFixed(2)} MB)\n`);
  // A page of a notebook that was never run has code and no results: say so (not an error).
  const cells = (nb as { cells?: Array<{ cell_type?: string; outputs?: unknown[] }> }).cells ?? [];
  const code = cells.filter((c) => c && typeof c === "object" && c.cell_type === "code");
  if (code.length > 0 && code.every((c) => !Array.isArray(c.outputs) || c.outputs.length === 0)) {
    io.stderr.write(`helicoid export: note: ${input} has no outputs (it was not run): the page shows code only; run it first with helicoid run ${input} -o RUN.ipynb\n`);
  }
  return 0;
}

function describeErrorLine(err: unknown): string {
  try {
    return err instanceof Error ? `${err.name}: ${err.message}` : String(err);
  } catch {
    return "an error that cannot be shown";
  }
}
