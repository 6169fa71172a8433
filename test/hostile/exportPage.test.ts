/**
 * Exported pages of untrusted notebooks run no foreign script (issue 11). A notebook carrying 22
 * classic script-injection vectors (Markdown, text/html, text/markdown, SVG and base64 image
 * outputs, widget HTML and Output widgets) is exported with the BUILT command and opened in
 * Debian's chromium: no vector sets the page's flag, and a catalogue explorer in the same page
 * still computes when its slider moves. The same notebook exported with --trusted does run its
 * scripts, which shows the probe can see an executed vector.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, type Browser } from "../e2e/harness";
import { NotebookBuilder } from "../widgets/fixtures/notebook";
import { helicoidBin } from "../helpers/paths";
import { defaultSweep, getCalculator } from "../../lib/src/index";

const P = (n: number) => `(window.__pwned = (window.__pwned || []), window.__pwned.push(${n}))`;
// Inside a frame (srcdoc, data: URL) the page is another origin: the frame reports by postMessage.
const Q = (n: number) => `parent.postMessage('pwned:${n}', '*')`;
const out = (data: Record<string, unknown>) => ({ output_type: "display_data", metadata: {}, data });
const b64 = (s: string) => Buffer.from(s).toString("base64");

const dir = mkdtempSync(join(tmpdir(), "helicoid-hostile-export-"));
const nbPath = join(dir, "hostile.ipynb");
let browser: Browser;

function hostileNotebook(): unknown {
  const nb = new NotebookBuilder();
  // Common practice, no source: the classic vectors of HTML sanitizer test suites.
  nb.markdown(`# Hostile page\n\n<script>${P(1)}</script>`);
  nb.markdown(`<svg><script>${P(2)}</script></svg>`);
  nb.markdown(`<img src="x" onerror="${P(3)}">`);
  nb.markdown(`<details open ontoggle="${P(4)}"><summary>s</summary>d</details>`);
  nb.markdown(`[a link](javascript:${P(5)})`);
  nb.markdown(`<iframe srcdoc="<script>${Q(6)}</script>"></iframe>`);
  nb.markdown(`<a class="raw-js" href="  JaVaScRiPt:${P(7)}">raw link</a>`);
  nb.markdown(`<object data="data:text/html;base64,${b64(`<script>${Q(8)}</script>`)}"></object><embed src="data:text/html;base64,${b64(`<script>${Q(8)}</script>`)}">`);
  nb.markdown(`<math><mtext><table><mglyph><style><img src=x onerror="${P(9)}"></style></mglyph></table></mtext></math>`);
  nb.markdown(`<input autofocus onfocus="${P(10)}"><body onload="${P(10)}">`);
  nb.code("html", [out({ "text/html": `<script>${P(11)}</script><b>bold</b>`, "text/plain": "html" })]);
  nb.code("html", [out({ "text/html": `<img src="x" onerror="${P(12)}">`, "text/plain": "html" })]);
  nb.code("html", [out({ "text/html": `<iframe srcdoc="<script>${Q(13)}</script>"></iframe>`, "text/plain": "html" })]);
  nb.code("html", [out({ "text/html": `<form><button id="fb" formaction="javascript:${P(14)}">go</button></form>`, "text/plain": "html" })]);
  nb.code("html", [out({ "text/html": `<svg><a xlink:href="javascript:${P(15)}"><text x="5" y="15">svg link</text></a></svg>`, "text/plain": "html" })]);
  nb.code("md", [out({ "text/markdown": `<img src="x" onerror="${P(16)}"> and <script>${P(16)}</script>`, "text/plain": "md" })]);
  nb.code("svg", [out({ "image/svg+xml": `<svg xmlns="http://www.w3.org/2000/svg" onload="${P(17)}" width="10" height="10"></svg>`, "text/plain": "svg" })]);
  nb.code("svg", [out({ "image/svg+xml": `<svg xmlns="http://www.w3.org/2000/svg"><script>${P(18)}</script></svg>`, "text/plain": "svg" })]);
  nb.code("png", [out({ "image/png": `iVBORw0KGgo=" onerror="${P(19)}" x="`, "text/plain": "png" })]);
  nb.code("jpeg", [out({ "image/jpeg": `"><script>${P(20)}</script>`, "text/plain": "jpeg" })]);
  const htmlId = nb.model("HTMLModel", "@jupyter-widgets/controls", "2.0.0", {
    _model_name: "HTMLModel",
    _model_module: "@jupyter-widgets/controls",
    _model_module_version: "2.0.0",
    _view_name: "HTMLView",
    _view_module: "@jupyter-widgets/controls",
    _view_module_version: "2.0.0",
    value: `<img src="x" onerror="${P(21)}"><b class="html-widget">kept</b>`,
    description: "",
  });
  nb.code("html widget", [nb.viewOutput(htmlId, "HTML()")]);
  const outputId = nb.model("OutputModel", "@jupyter-widgets/output", "1.0.0", {
    _model_name: "OutputModel",
    _model_module: "@jupyter-widgets/output",
    _model_module_version: "1.0.0",
    _view_name: "OutputView",
    _view_module: "@jupyter-widgets/output",
    _view_module_version: "1.0.0",
    outputs: [
      out({ "text/html": `<img src="x" onerror="${P(22)}"><script>${P(22)}</script>`, "text/plain": "x" }),
      out({ "text/markdown": `width **5.5 nm** (invented) <img src=x onerror="${P(22)}">`, "text/plain": "width" }),
    ],
  });
  nb.code("output widget", [nb.viewOutput(outputId, "Output()")]);
  // Helicoid's own outputs keep working: a table's HTML, a valid PNG, a catalogue explorer.
  nb.code("table", [
    out({
      "text/html": '<div class="helicoid-table"><table><thead><tr><th>quantity</th></tr></thead><tbody><tr><td title="m">w</td></tr></tbody></table></div>',
      "text/plain": "table",
    }),
  ]);
  nb.code("png", [out({ "image/png": "iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8DwHwAFBQIAX8jx0gAAAABJRU5ErkJggg==", "text/plain": "png" })]);
  const spec = getCalculator("wall360");
  const inputs = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
  nb.widget(
    "ExplorerModel",
    { calculator: "wall360", spec: null, inputs, sweep: defaultSweep(spec, {}), result: null, error: "", compute_in: "browser", kernel_version: "0.1.0" },
    {},
    'explore("wall360")',
  );
  return nb.build();
}

function exportWith(args: string[], page: string) {
  return spawnSync(process.execPath, [helicoidBin, "export", nbPath, "-o", page, ...args], { encoding: "utf8" });
}

/** Open a page, give every vector its chance (load, focus, toggle, click links and buttons), return the flags set. */
async function probe(pagePath: string): Promise<{ page: Page; pwned: number[] }> {
  const page = await browser.newPage();
  page.on("dialog", (d) => void d.dismiss());
  await page.addInitScript(() => {
    window.addEventListener("message", (e) => {
      const m = /^pwned:(\d+)$/.exec(String(e.data));
      const w = window as unknown as { __pwned?: number[] };
      if (m) (w.__pwned ??= []).push(Number(m[1]));
    });
  });
  await page.route(/^(?!file:|data:|blob:).*/, (route) => route.abort());
  await page.goto(`file://${pagePath}`);
  await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
  await page.waitForTimeout(500);
  for (const sel of ["main a", "main button", "main summary", "main svg a"]) {
    for (const el of await page.locator(sel).all()) await el.click({ timeout: 2000, force: true }).catch(() => undefined);
  }
  await page.waitForTimeout(500);
  const pwned = await page.evaluate(() => ((window as unknown as { __pwned?: number[] }).__pwned ?? []).slice());
  return { page, pwned };
}

beforeAll(async () => {
  writeFileSync(nbPath, JSON.stringify(hostileNotebook(), null, 1));
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe("helicoid export of an untrusted notebook", () => {
  it("runs none of the 22 vectors, keeps our own outputs, and the explorer still computes; the input is unchanged", async () => {
    const before = createHash("sha256").update(readFileSync(nbPath)).digest("hex");
    const pagePath = join(dir, "safe.html");
    const r = exportWith([], pagePath);
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    expect(createHash("sha256").update(readFileSync(nbPath)).digest("hex")).toBe(before);
    const { page, pwned } = await probe(pagePath);
    expect(pwned).toEqual([]);
    // What is harmless stays: the markdown heading, bold HTML, our table, a valid PNG, the HTML widget's text, the Output widget's Markdown.
    expect(await page.locator("main h1").textContent()).toBe("Hostile page");
    expect(await page.locator(".hx-html b").first().textContent()).toBe("bold");
    expect(await page.locator(".helicoid-table td[title=m]").textContent()).toBe("w");
    expect(await page.locator('img[src^="data:image/png;base64,iVBORw0KGgoAAAANSUhEUg"]').count()).toBe(1);
    expect(await page.locator(".hx-image-invalid").count()).toBe(2);
    expect(await page.locator("b.html-widget").textContent()).toBe("kept");
    expect(await page.locator(".widget-output strong").first().textContent()).toBe("5.5 nm");
    // the page's own scripts only: its loader, and the bundle parts the loader made from the compressed part tags
    expect(await page.locator("iframe, object, embed, script:not([type]):not([data-helicoid-part])").count()).toBe(1);
    const partTags = await page.locator('script[type="application/vnd.helicoid.bundle-part+gzip;base64"]').count();
    expect(partTags).toBeGreaterThan(0);
    expect(await page.locator("script[data-helicoid-part]:not([type])").count()).toBe(partTags);
    // The catalogue explorer computes in the page, and again when its B slider moves.
    const ex = '.hx-explorer[data-calculator="wall360"]';
    await page.waitForSelector(`${ex} .hx-plot[data-drawn]`, { timeout: 30_000 });
    const first = await page.evaluate((sel) => JSON.stringify((document.querySelector(`${sel} .hx-plot`) as unknown as { data: unknown[] }).data), ex);
    const name = await page.evaluate((sel) => (document.querySelector(`${sel} .hx-control input.hx-slider`)!.closest(".hx-control") as HTMLElement).dataset.input!, ex);
    await page.evaluate(
      ([sel, n]) => {
        const s = document.querySelector(`${sel} .hx-control[data-input="${n}"] input.hx-slider`) as HTMLInputElement;
        s.value = String(Number(s.value) > 500 ? 200 : 800);
        s.dispatchEvent(new Event("input", { bubbles: true }));
      },
      [ex, name] as const,
    );
    await page.waitForFunction(
      ([sel, before]) => {
        const root = document.querySelector(sel) as HTMLElement;
        const plot = root.querySelector(".hx-plot") as unknown as { data?: unknown[] } | null;
        return root.dataset.busy === "" && !!plot?.data && JSON.stringify(plot.data) !== before;
      },
      [ex, first] as const,
      { timeout: 30_000 },
    );
    expect(await page.evaluate(() => ((window as unknown as { __pwned?: number[] }).__pwned ?? []).length)).toBe(0);
    await page.close();
  });

  it("with --trusted the raw HTML is kept, so the same probe sees scripts run", async () => {
    const pagePath = join(dir, "trusted.html");
    const r = exportWith(["--trusted"], pagePath);
    expect(r.status).toBe(0);
    const { page, pwned } = await probe(pagePath);
    // A trusted page is the notebook's HTML as written: its scripts and inline handlers run.
    expect(pwned).toEqual(expect.arrayContaining([1, 3, 6, 11, 12, 13]));
    await page.close();
  });
});
