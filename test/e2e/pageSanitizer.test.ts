/**
 * The exported page's stand-in for sanitize-html (widgets/src/stubs/sanitizeHtml), in Debian's
 * chromium: a TRUSTED export keeps widget descriptions raw, so the standard controls pass
 * description_allow_html text through the widget manager's inline_sanitize, which the page serves
 * with the stand-in. Allowed inline markup stays; event handlers, javascript: links, scripts and
 * frames do not run. Common practice, no source: classic vectors of HTML sanitizer test suites.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { launchBrowser, type Browser } from "./harness";
import { NotebookBuilder } from "../widgets/fixtures/notebook";
import { exportNotebook } from "../../kernel-ext/src/notebook/export";

const P = (n: number) => `(window.__pwned = (window.__pwned || []), window.__pwned.push(${n}))`;
const dir = mkdtempSync(join(tmpdir(), "helicoid-page-sanitizer-"));
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
}, 60_000);
afterAll(async () => {
  await browser?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe("exported page: inline sanitizer of widget descriptions", () => {
  it("keeps allowed inline markup and runs none of the vectors", async () => {
    const nb = new NotebookBuilder();
    const descriptions = [
      `<b class="kept-b">bold</b> <code class="kept-code">x</code><img src="x" onerror="${P(1)}">`,
      `<a class="js-link" href=" JaVaScRiPt:${P(2)}">link</a><a class="ok-link" href="https://example.invalid/">ok</a>`,
      `<script>${P(3)}</script><iframe srcdoc="<script>parent.${P(4)}</script>"></iframe><span class="kept-span" onmouseover="${P(5)}" style="color: red">s</span>`,
      `<svg><script>${P(6)}</script></svg><math><style><img src=x onerror="${P(7)}"></style></math><span class="bg" style="background: url(javascript:${P(8)})">bg</span>`,
    ];
    descriptions.forEach((d, k) => {
      const id = nb.model("CheckboxModel", "@jupyter-widgets/controls", "2.0.0", {
        _model_name: "CheckboxModel",
        _model_module: "@jupyter-widgets/controls",
        _model_module_version: "2.0.0",
        _view_name: "CheckboxView",
        _view_module: "@jupyter-widgets/controls",
        _view_module_version: "2.0.0",
        value: false,
        description: d,
        description_allow_html: true,
        indent: true,
      });
      nb.code(`checkbox ${k}`, [nb.viewOutput(id, "Checkbox()")]);
    });
    const html = exportNotebook(nb.build() as never, { trusted: true });
    const file = join(dir, "page.html");
    writeFileSync(file, html);
    const page = await browser.newPage();
    await page.route(/^(?!file:|data:|blob:).*/, (route) => route.abort());
    await page.goto(`file://${file}`);
    await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
    await page.waitForTimeout(300);
    for (const sel of [".js-link", ".kept-span", ".bg"])
      await page
        .locator(sel)
        .first()
        .hover({ timeout: 2000, force: true })
        .catch(() => undefined);
    await page
      .locator(".js-link")
      .first()
      .click({ timeout: 2000, force: true })
      .catch(() => undefined);
    await page.waitForTimeout(300);
    const seen = await page.evaluate(() => ({
      pwned: (window as unknown as { __pwned?: number[] }).__pwned ?? [],
      kept: [".kept-b", ".kept-code", ".kept-span", ".ok-link"].map((s) => document.querySelectorAll(s).length),
      jsHref: document.querySelector(".js-link")?.getAttribute("href") ?? null,
      okHref: document.querySelector(".ok-link")?.getAttribute("href") ?? null,
      handlers: document.querySelectorAll(".widget-inline-hbox [onerror], .widget-inline-hbox [onmouseover]").length,
      scripts: document.querySelectorAll(".widget-inline-hbox script, .widget-inline-hbox iframe, .widget-inline-hbox svg").length,
      spanStyle: document.querySelector(".kept-span")?.getAttribute("style") ?? null,
      bgStyle: document.querySelector(".bg")?.getAttribute("style") ?? null,
    }));
    await page.close();
    expect(seen.pwned).toEqual([]);
    expect(seen.kept).toEqual([1, 1, 1, 1]);
    expect(seen.jsHref).toBeNull();
    expect(seen.okHref).toBe("https://example.invalid/");
    expect(seen.handlers).toBe(0);
    expect(seen.scripts).toBe(0);
    expect(seen.spanStyle).toBe("color: red");
    expect(seen.bgStyle).toBeNull();
  }, 120_000);
});
