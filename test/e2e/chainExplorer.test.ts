/**
 * The chain-dynamics explorer in an exported page (Debian's chromium, computing in the page's Web
 * Worker): up to N = 16 it shows exact diagonalization, above it the thermodynamic-limit domain-wall
 * model, and the page says which (the `model` output and the warning notes), with the values that
 * @helicoid/lib computes in Node for the same inputs.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, screenshot, buildTestWidgets, outputDir, type Browser } from "./harness";
import { NotebookBuilder } from "../widgets/fixtures/notebook";
import { exportNotebook } from "../../kernel-ext/src/notebook/export";
import { getCalculator, runCalculator } from "../../lib/src/index";

let browser: Browser;
let page: Page;
const spec = getCalculator("chain-dynamics");
const base = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
const small = { ...base, N: 10, Jz: 20, Jperp: 1, hx: 0, points: 60 };
const large = { ...base, N: 24, Jz: 20, Jperp: 1, hx: 0, points: 60 };

beforeAll(async () => {
  const bundle = await buildTestWidgets();
  const nb = new NotebookBuilder();
  nb.markdown("# An Ising-like ring\n\nInvented exchange values; results are estimates.");
  for (const inputs of [small, large]) {
    nb.widget(
      "ExplorerModel",
      { calculator: "chain-dynamics", spec: null, inputs, sweep: null, result: null, error: "", compute_in: "browser", kernel_version: "0.1.0" },
      {},
      'explore("chain-dynamics")',
    );
  }
  const html = exportNotebook(nb.build(), { bundle, sourceName: "chain-explorer-test.ipynb" });
  mkdirSync(join(outputDir, "export"), { recursive: true });
  const pagePath = join(outputDir, "export", "chain-explorer-test.html");
  writeFileSync(pagePath, html);
  browser = await launchBrowser();
  page = await browser.newPage();
  await page.route(/^(?!file:).*/, (route) => route.abort());
  await page.goto(`file://${pagePath}`);
  await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
  await page.waitForFunction(() => document.querySelectorAll('.hx-explorer[data-calculator="chain-dynamics"] tr[data-output="model"]').length === 2, null, { timeout: 120_000 });
}, 300_000);

afterAll(async () => {
  await browser?.close();
});

describe("chain-dynamics explorer: exact diagonalization up to N = 16, the wall model above", () => {
  it("says which model computed each explorer's maps, as the library does in Node", async () => {
    const explorers = page.locator('.hx-explorer[data-calculator="chain-dynamics"]');
    expect(await explorers.count()).toBe(2);
    const texts = await page.$$eval('.hx-explorer[data-calculator="chain-dynamics"] tr[data-output="model"] .hx-value', (cells) => cells.map((c) => c.textContent ?? ""));
    const ed = runCalculator(spec, small);
    const tl = runCalculator(spec, large);
    expect(texts[0]).toBe(ed.outputs.model!.value);
    expect(texts[0]).toMatch(/^exact diagonalization of the ring of 10 sites/);
    expect(texts[1]).toBe(tl.outputs.model!.value);
    expect(texts[1]).toMatch(/^thermodynamic-limit domain-wall model \(N = 24 > 16/);
    // the wall-model explorer lists its notes as warnings, the first saying that it is not ED
    const warning = await explorers.nth(1).locator("ul.hx-warning li").first().textContent();
    expect(warning).toBe(tl.notes.find((n) => n.startsWith("N = 24 > 16")));
    // the same chiral weight as in Node
    const chiral = await explorers.nth(1).locator('tr[data-output="chiralWeight"]').getAttribute("data-value");
    expect(Number(chiral)).toBeCloseTo(tl.outputs.chiralWeight!.value as number, 12);
    await screenshot(page, "chain-explorer-wall-model", '.hx-explorer[data-calculator="chain-dynamics"]:nth-of-type(1)');
  });
});
