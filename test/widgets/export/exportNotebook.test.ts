/**
 * The static exporter (kernel-ext/src/notebook/export.ts) without a browser: page structure,
 * escaping, the bundle embedded once, clear errors, the input never modified.
 */
import { describe, it, expect } from "vitest";
import { mkdtempSync, writeFileSync, readFileSync, existsSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { gunzipSync } from "node:zlib";
import { exportNotebook, exportCommand, ExportError, BUNDLE_PART_MARK, BUNDLE_PART_TYPE } from "../../../kernel-ext/src/notebook/export";
import { NotebookBuilder } from "../fixtures/notebook";

const BUNDLE = "/*bundle*/window.__bundleRan = true; var s = '</script>';";

/** The bundle parts of a page, unpacked (gzip in base64, node:zlib), joined with `sep`. */
function unpackBundle(html: string, sep = ""): string {
  const type = BUNDLE_PART_TYPE.replace(/[+.]/g, "\\$&");
  const parts = [...html.matchAll(new RegExp(`<script type="${type}">([A-Za-z0-9+/=]*)</script>`, "g"))].map((m) => gunzipSync(Buffer.from(m[1]!, "base64")).toString("utf8"));
  return parts.join(sep);
}

function capture() {
  let out = "",
    err = "";
  return { io: { stdout: (s: string) => void (out += s), stderr: (s: string) => void (err += s) }, out: () => out, err: () => err };
}

describe("exportNotebook", () => {
  it("renders markdown, code, streams, errors and widget placeholders; embeds the state and the bundle once", () => {
    const nb = new NotebookBuilder();
    nb.markdown("# Title *here*\n\n- one\n- two");
    const a = nb.widget("FigureModel", { figure: { data: [] } });
    const b = nb.widget("TextureModel", { nx: 2, ny: 1 }, { field: new Float32Array([0, 0, 1, 0, 0, 1]) });
    nb.code("throw 1", [{ output_type: "error", ename: "Error", evalue: "boom", traceback: ["\u001b[31mError\u001b[0m: boom"] }]);
    nb.code("1 < 2", [{ output_type: "execute_result", execution_count: 4, metadata: {}, data: { "text/plain": "true && 1 < 2" } }]);
    const html = exportNotebook(nb.build(), { bundle: BUNDLE });
    expect(html).toContain("<h1>Title <em>here</em></h1>");
    expect(html).toContain("<li>one</li>");
    expect(html).toContain("<title>Title here</title>");
    expect(html).toContain("Error: boom");
    expect(html).not.toContain("\u001b[");
    expect(html).toContain("true &amp;&amp; 1 &lt; 2");
    // the bundle is embedded once, as gzip parts in base64 (split where widgets/build.mjs marks them)
    expect(html).not.toContain("/*bundle*/");
    expect(unpackBundle(html)).toBe(BUNDLE);
    const parts = exportNotebook(nb.build(), { bundle: `${BUNDLE}${BUNDLE_PART_MARK}/*second*/` });
    expect(unpackBundle(parts, "|")).toBe(`${BUNDLE}|/*second*/`);
    const state = /<script type="application\/vnd.jupyter.widget-state\+json">(.*?)<\/script>/s.exec(html)![1]!;
    const parsed = JSON.parse(state);
    expect(Object.keys(parsed.state)).toEqual([a, b]);
    expect(parsed.state[b].buffers[0].path).toEqual(["field"]);
    expect(Buffer.from(parsed.state[b].buffers[0].data, "base64").length).toBe(24);
    for (const id of [a, b]) expect(html).toContain(`"model_id":"${id}"`);
  });

  it("escapes a state string that holds </script>", () => {
    const nb = new NotebookBuilder();
    nb.widget("FigureModel", { figure: { data: [], layout: { title: { text: "</script><script>alert(1)</script>" } } } });
    const html = exportNotebook(nb.build(), { bundle: BUNDLE });
    expect(html).not.toContain("<script>alert(1)");
    const state = /<script type="application\/vnd.jupyter.widget-state\+json">(.*?)<\/script>/s.exec(html)![1]!;
    expect(JSON.parse(state).state).toBeDefined();
  });

  it("says when a displayed widget has no saved state, and adds no script to a page without widgets", () => {
    const nb = new NotebookBuilder();
    nb.code("w", [nb.viewOutput("0123456789abcdef0123456789abcdef", "Slider()")]);
    const html = exportNotebook(nb.build(), { bundle: BUNDLE });
    expect(html).toContain("state was not saved");
    expect(html).not.toContain("/*bundle*/");
    expect(html).not.toContain(BUNDLE_PART_TYPE);
  });

  it("refuses what is not a notebook, naming the problem", () => {
    expect(() => exportNotebook("{", { sourceName: "x.ipynb" })).toThrow(/x\.ipynb: not valid JSON/);
    expect(() => exportNotebook({ cells: 3 })).toThrow(ExportError);
    expect(() => exportNotebook({ nbformat: 3, cells: [] })).toThrow(/nbformat 3/);
  });
});

describe("helicoid export", () => {
  it("writes the page and leaves the notebook unchanged", async () => {
    const dir = mkdtempSync(join(tmpdir(), "helicoid-export-"));
    const nbPath = join(dir, "n.ipynb");
    const text = JSON.stringify(
      new NotebookBuilder()
        .markdown("# N")
        .code("1", [{ output_type: "stream", name: "stdout", text: "1\n" }])
        .build(),
    );
    writeFileSync(nbPath, text);
    const c = capture();
    expect(await exportCommand([nbPath, "-o", join(dir, "p.html")], c.io)).toBe(0);
    expect(readFileSync(nbPath, "utf8")).toBe(text);
    expect(readFileSync(join(dir, "p.html"), "utf8")).toContain("<h1>N</h1>");
    expect(c.out()).toContain("wrote");
    // Default output name: the notebook's with .html.
    expect(await exportCommand([nbPath], capture().io)).toBe(0);
    expect(existsSync(join(dir, "n.html"))).toBe(true);
  });

  it("answers bad use with a message and a non-zero status", async () => {
    let c = capture();
    expect(await exportCommand([], c.io)).toBe(2);
    expect(c.err()).toContain("usage");
    c = capture();
    expect(await exportCommand(["/nonexistent/x.ipynb"], c.io)).toBe(2); // bad input: exit 2 (Common practice, no source)
    expect(c.err()).toContain("no such file");
    c = capture();
    expect(await exportCommand(["a.ipynb", "--bogus"], c.io)).toBe(2);
    const dir = mkdtempSync(join(tmpdir(), "helicoid-export-"));
    writeFileSync(join(dir, "bad.ipynb"), "{not json");
    c = capture();
    expect(await exportCommand([join(dir, "bad.ipynb")], { stdout: { write: c.io.stdout }, stderr: { write: c.io.stderr } })).toBe(2);
    expect(c.err()).toContain("bad.ipynb: not valid JSON");
  });
});
