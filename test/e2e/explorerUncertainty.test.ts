/**
 * An explorer opened with a film file's uncertainties, in an exported page in Debian's chromium: the
 * table shows the skyrmion radius ± its standard uncertainty, and after the reader moves D the page
 * (its Web Worker) recomputes value and ± at the new point, keeping D's uncertainty. The ± read from
 * the table is runCalculator's first-order one at the same inputs (JCGM 100:2008 eq. (13), as the
 * library applies it; checked against the hand-worked formula in
 * test/widgets/compute/explorerUncertainty.test.ts). Near the critical DMI the radius is flagged (!)
 * as `helicoid calc` flags it.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { launchBrowser, buildTestWidgets, outputDir, type Browser } from "./harness";
import { NotebookBuilder } from "../widgets/fixtures/notebook";
import { exportNotebook } from "../../kernel-ext/src/notebook/export";
import { comms } from "../../kernel-ext/src/comm/comms";
import { explore } from "../../kernel-ext/src/widgets/index";
import { filmInputsFor, getCalculator, loadFilm, runCalculator, formatWithError, type CalculatorResult } from "../../lib/src/index";

const filmPath = join(__dirname, "../../notebooks/data/zx3-film.json");
const film = loadFilm(filmPath);
const skyrmion = getCalculator("skyrmion");
const uOf = (r: CalculatorResult, name: string) => (r.outputs as Record<string, { uncertainty?: number }>)[name]!.uncertainty!;

let browser: Browser;
let page: Page;
let pagePath: string;

/** The state an explorer opens with in the kernel (what a notebook run saves into the page). */
function kernelState(open: () => unknown): Record<string, unknown> {
  let state: Record<string, unknown> | null = null;
  comms.channel = {
    send: (type, content) => {
      if (type === "comm_open") state = (content as { data: { state: Record<string, unknown> } }).data.state;
    },
  };
  open();
  if (!state) throw new Error("the explorer opened no comm");
  return state;
}

beforeAll(async () => {
  const bundle = await buildTestWidgets();
  const nb = new NotebookBuilder();
  nb.markdown("# A film file's uncertainties in an explorer\n\nFilm ZX-3 is invented.");
  nb.widget(
    "ExplorerModel",
    kernelState(() => explore("skyrmion", film)),
    {},
    'explore("skyrmion", loadFilm("data/zx3-film.json"))',
  );
  const Dc = runCalculator("wall", filmInputsFor(getCalculator("wall"), film).inputs).outputs.criticalDmi.value;
  nb.widget(
    "ExplorerModel",
    kernelState(() =>
      explore(
        "skyrmion",
        { ...filmInputsFor(skyrmion, film).inputs, D: { value: 0.9 * Dc, uncertainty: 0.02 * Dc }, B: "5 mT" },
        { sweep: { over: "", from: 0, to: 0, points: 0 } },
      ),
    ),
    {},
    "explore(skyrmion, nearCritical)",
  );
  const html = exportNotebook(nb.build(), { bundle, sourceName: "explorer-uncertainty-test.ipynb" });
  mkdirSync(join(outputDir, "export"), { recursive: true });
  pagePath = join(outputDir, "export", "explorer-uncertainty-test.html");
  writeFileSync(pagePath, html);
  browser = await launchBrowser();
  page = await browser.newPage({ viewport: { width: 1200, height: 1000 } });
  await page.route(/^(?!file:).*/, (route) => route.abort());
  await page.goto(`file://${pagePath}`);
  await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
}, 240_000);

afterAll(async () => {
  await browser?.close();
});

const row = (p: Page, nth: number, output: string) =>
  p.evaluate(
    ([k, name]) => {
      const tr = document.querySelectorAll(".hx-explorer")[k as number]!.querySelector(`tr[data-output="${name}"]`) as HTMLElement | null;
      return tr
        ? {
            text: tr.querySelector(".hx-value")!.textContent!,
            value: Number(tr.dataset.value),
            uncertainty: tr.dataset.uncertainty ? Number(tr.dataset.uncertainty) : null,
            flagged: tr.classList.contains("hx-flagged"),
          }
        : null;
    },
    [nth, output] as const,
  );

describe("an exported explorer with a film file's uncertainties", () => {
  it("shows the radius ± runCalculator's uncertainty, and recomputes both in the page when D moves", async () => {
    const ex = page.locator(".hx-explorer >> nth=0");
    await ex.locator('tr[data-output="radius"]').waitFor({ timeout: 60_000 });
    const fromFile = filmInputsFor(skyrmion, film);
    const direct = runCalculator(skyrmion, fromFile.inputs, { noSweep: true, uncertainty: fromFile.uncertainty });
    const first = (await row(page, 0, "radius"))!;
    expect(first.text).toBe(formatWithError(direct.outputs.radius.value, uOf(direct, "radius"), "m"));
    expect(first.text).toContain("±");
    expect(first.uncertainty! / uOf(direct, "radius")).toBeCloseTo(1, 9);
    expect(await ex.locator(".hx-uncertainty-method").textContent()).toMatch(/first order \(JCGM 100:2008\)/);
    expect(await ex.locator('.hx-control[data-input="D"] .hx-input-uncertainty').textContent()).toMatch(/^± 0\.1 mJ\/m/);
    // the film file gave these values: no "demo" mark is seen beside them
    for (const name of ["Ms", "A", "Ku", "D", "t"]) expect(await ex.locator(`.hx-control[data-input="${name}"] .hx-demo`).isVisible()).toBe(false);

    // the reader types another D: value and ± are recomputed in the page at the new point
    const entry = ex.locator('.hx-control[data-input="D"] input.hx-entry');
    await entry.fill("3.2 mJ/m^2");
    await entry.press("Enter");
    await page.waitForFunction(() => {
      const e = document.querySelector(".hx-explorer")! as HTMLElement;
      const tr = e.querySelector('tr[data-output="radius"]') as HTMLElement | null;
      return e.dataset.busy === "" && !!tr && (e.querySelector('.hx-control[data-input="D"]') as HTMLElement).dataset.value === "0.0032" && tr.dataset.uncertainty !== undefined;
    });
    await page.waitForFunction((u0) => Number((document.querySelector('.hx-explorer tr[data-output="radius"]') as HTMLElement).dataset.uncertainty) !== u0, first.uncertainty);
    const moved = (await row(page, 0, "radius"))!;
    const there = runCalculator(skyrmion, { ...fromFile.inputs, D: "3.2 ± 0.1 mJ/m^2" }, { noSweep: true, uncertainty: fromFile.uncertainty });
    expect(moved.value / there.outputs.radius.value).toBeCloseTo(1, 9);
    expect(moved.uncertainty! / uOf(there, "radius")).toBeCloseTo(1, 9);
    expect(moved.text).toBe(formatWithError(there.outputs.radius.value, uOf(there, "radius"), "m"));
    expect(await ex.locator('.hx-control[data-input="D"] .hx-input-uncertainty').textContent()).toMatch(/^± 0\.1 mJ\/m/);
    expect(await ex.locator(".hx-badge").textContent()).toMatch(/Web Worker/);
    mkdirSync(join(outputDir, "screenshots"), { recursive: true });
    // the controls and the table (the plots below are the explorer's usual ones)
    const box = (await ex.boundingBox())!;
    await page.screenshot({
      path: join(outputDir, "screenshots", "explorer-uncertainty.png"),
      fullPage: true,
      clip: { x: box.x, y: box.y, width: box.width, height: Math.min(box.height, 820) },
    });
  });

  it("marks the radius (!) near the critical DMI, as the library flags it", async () => {
    const ex = page.locator(".hx-explorer >> nth=1");
    await ex.locator('tr[data-output="radius"]').waitFor({ timeout: 60_000 });
    const Dc = runCalculator("wall", filmInputsFor(getCalculator("wall"), film).inputs).outputs.criticalDmi.value;
    const near = filmInputsFor(skyrmion, film, { D: { value: 0.9 * Dc, uncertainty: 0.02 * Dc }, B: "5 mT" });
    const direct = runCalculator(skyrmion, near.inputs, { noSweep: true, uncertainty: near.uncertainty });
    expect(direct.uncertainty!.flagged.radius).toBeDefined();
    const r = (await row(page, 1, "radius"))!;
    expect(r.flagged).toBe(true);
    expect(r.text).toMatch(/ \(!\)$/);
    expect(await ex.locator("ul.hx-warning").textContent()).toContain("radius: uncertainty not trustworthy");
    const box = (await ex.boundingBox())!;
    await page.screenshot({
      path: join(outputDir, "screenshots", "explorer-uncertainty-flagged.png"),
      fullPage: true,
      clip: { x: box.x, y: box.y, width: box.width, height: Math.min(box.height, 820) },
    });
  });
});
