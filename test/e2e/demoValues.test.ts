/**
 * Film inputs an explorer shows at the invented demo film's values (the notebook did not give
 * them) are marked "demo" beside the value, in an exported page in Debian's chromium; values the
 * notebook gave, and values the reader changes, are not. Common practice, no source: a default that
 * is not the reader's own number is labelled where it is shown.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, buildTestWidgets, outputDir, type Browser } from "./harness";
import { NotebookBuilder } from "../widgets/fixtures/notebook";
import { exportNotebook } from "../../kernel-ext/src/notebook/export";
import { getCalculator, filmInputNames, runCalculator } from "../../lib/src/index";

let browser: Browser;
let page: Page;

beforeAll(async () => {
  const bundle = await buildTestWidgets();
  const nb = new NotebookBuilder();
  nb.markdown("# Demo values\n\nInvented materials.");
  const spec = getCalculator("wall");
  const defaults = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
  // one explorer opened without a film, one with the whole film given (Ms not at its default)
  nb.widget(
    "ExplorerModel",
    { calculator: "wall", spec: null, inputs: defaults, sweep: null, result: null, error: "", compute_in: "browser", given: [], kernel_version: "0.1.0" },
    {},
    'explore("wall")',
  );
  const own = { ...defaults, Ms: 9.5e5 };
  nb.widget(
    "ExplorerModel",
    { calculator: "wall", spec: null, inputs: own, sweep: null, result: null, error: "", compute_in: "browser", given: filmInputNames(spec), kernel_version: "0.1.0" },
    {},
    'explore("wall", myFilm)',
  );
  const html = exportNotebook(nb.build(), { bundle, sourceName: "demo-values-test.ipynb" });
  mkdirSync(join(outputDir, "export"), { recursive: true });
  const pagePath = join(outputDir, "export", "demo-values-test.html");
  writeFileSync(pagePath, html);
  browser = await launchBrowser();
  page = await browser.newPage();
  await page.route(/^(?!file:).*/, (route) => route.abort());
  await page.goto(`file://${pagePath}`);
  await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
}, 240_000);

afterAll(async () => {
  await browser?.close();
});

const shownTags = (p: Page, nth: number) =>
  p.evaluate((k) => {
    const ex = document.querySelectorAll(".hx-explorer")[k]!;
    return [...ex.querySelectorAll(".hx-control")]
      .filter((r) => {
        const tag = r.querySelector(".hx-demo") as HTMLElement | null;
        return !!tag && !tag.hidden;
      })
      .map((r) => (r as HTMLElement).dataset.input!);
  }, nth);

describe("demo film values in an explorer", () => {
  it("are marked beside the value until the reader gives their own; values the notebook gave are not", async () => {
    await page.waitForSelector(".hx-explorer .hx-control", { timeout: 60_000 });
    expect((await shownTags(page, 0)).sort()).toEqual(filmInputNames(getCalculator("wall")).sort());
    expect(await shownTags(page, 1)).toEqual([]);
    // the reader types their own exchange stiffness: its mark goes, the others stay
    const entry = page.locator(".hx-explorer >> nth=0").locator('.hx-control[data-input="A"] input.hx-entry');
    await entry.fill("11 pJ/m");
    await entry.press("Enter");
    await page.waitForFunction(() => Number((document.querySelector('.hx-explorer .hx-control[data-input="A"]') as HTMLElement).dataset.value) < 1.2e-11);
    const after = await shownTags(page, 0);
    expect(after).not.toContain("A");
    expect(after).toContain("Ms");
  });

  it("and runCalculator says in its notes which film values were the demo film's", () => {
    // Common practice, no source.
    const r = runCalculator("wall", { A: "12 pJ/m" });
    expect(r.notes[0]).toMatch(/^demo values: Ms = .*Ku = .*D = .*t = .* were not given and are the invented demo film's/);
    expect(r.notes[0]).not.toMatch(/\bA = /);
    const full = runCalculator("wall", { Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm" });
    expect(full.notes.some((n) => n.startsWith("demo values"))).toBe(false);
  });
});
