/* global PerformanceObserver, MutationObserver, requestAnimationFrame */
// Measures an exported page in Debian's chromium (used by page.bench.mjs; also runnable by hand:
// `node test/bench/pageProbe.mjs PAGE.html [PAGE2.html ...] [--runs N] [--shot out.png]`):
// - load -> drawn explorer: navigation start to the first plotly SVG inside an explorer's plot, as
//   a MutationObserver in the page sees it;
// - the longest main-thread task during that load (PerformanceObserver "longtask");
// - slider -> next animation frame after the explorer's plot changed in the DOM (p50, p90), over
//   SLIDER_MOVES moves of the explorer's first slider, 350 ms apart, after one warm-up move, with
//   the worker's compute time of each (the explorer's data-compute-ms).
import { createRequire } from "node:module";
import { statSync } from "node:fs";
import { execSync } from "node:child_process";
import { fileURLToPath } from "node:url";

const require = createRequire(import.meta.url);
const { chromium } = require("playwright-core");
export const SLIDER_MOVES = 25;

export function chromiumPath() {
  if (process.env.HELICOID_CHROMIUM) return process.env.HELICOID_CHROMIUM;
  try {
    return execSync("command -v chromium", { encoding: "utf8", shell: "/bin/sh" }).trim() || "/usr/bin/chromium";
  } catch {
    return "/usr/bin/chromium";
  }
}

export async function launch() {
  return chromium.launch({
    executablePath: chromiumPath(),
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
}

/** The p-th quantile (0..1) of a list, nearest rank. */
export function quantile(values, p) {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil(p * s.length) - 1))];
}

/**
 * One load of `file` in a fresh context: { ms, longest, tasks, slider: [ms...] | null }.
 * `slider`: also move the first explorer's first slider. `screenshot`: a PNG path.
 */
export async function probe(browser, file, { slider = false, screenshot = null, selector = ".hx-explorer .hx-plot svg.main-svg" } = {}) {
  const context = await browser.newContext({ viewport: { width: 1200, height: 900 } });
  try {
    const page = await context.newPage();
    const errors = [];
    page.on("pageerror", (e) => errors.push(String(e)));
    await page.addInitScript((sel) => {
      window.__hxLong = [];
      new PerformanceObserver((l) => {
        for (const e of l.getEntries()) window.__hxLong.push(e.duration);
      }).observe({ type: "longtask", buffered: true });
      // the time the selector first matches, taken in the page (not when the driver hears of it)
      const mo = new MutationObserver(() => {
        if (document.querySelector(sel)) {
          window.__hxDrawn = performance.now();
          mo.disconnect();
        }
      });
      mo.observe(document, { subtree: true, childList: true, attributes: true });
    }, selector);
    await page.goto(`file://${file}`, { waitUntil: "commit" });
    await page.waitForSelector(selector, { timeout: 120_000 });
    await page.waitForFunction(() => window.__hxDrawn !== undefined, null, { timeout: 120_000 });
    const ms = await page.evaluate(() => window.__hxDrawn);
    // let the load settle (later tasks of the same load count towards the longest task)
    await page.waitForFunction(() => document.body.dataset.helicoidReady === "1", null, { timeout: 120_000 });
    await page.waitForTimeout(300);
    const { longest, tasks } = await page.evaluate(() => ({ longest: Math.max(0, ...window.__hxLong), tasks: window.__hxLong.length }));
    let moves = null;
    if (slider) {
      await page.hover(".hx-explorer .hx-slider");
      moves = await page.evaluate(async (n) => {
        const ex = document.querySelector(".hx-explorer");
        const s = ex.querySelector(".hx-slider");
        const plots = ex.querySelector(".hx-plots");
        const wait = (t) => new Promise((r) => setTimeout(r, t));
        const out = [];
        const move = (pos) =>
          new Promise((resolve, reject) => {
            const timer = setTimeout(() => reject(new Error("no plot change within 5 s of a slider move")), 5000);
            let t0 = 0;
            const mo = new MutationObserver(() => {
              mo.disconnect();
              requestAnimationFrame(() => {
                clearTimeout(timer);
                resolve(performance.now() - t0);
              });
            });
            mo.observe(plots, { subtree: true, childList: true, attributes: true, characterData: true });
            t0 = performance.now();
            s.value = String(pos);
            s.dispatchEvent(new Event("input", { bubbles: true }));
          });
        const max = Number(s.max);
        await move(max * 0.3);
        await wait(300);
        for (let k = 0; k < n; k++) {
          const ms = await move(max * (0.35 + (0.3 * ((k * 7) % n)) / n));
          out.push({ ms, compute: Number(ex.dataset.computeMs) });
          // past the explorer's exact redraw after a move (120 ms of quiet), so it is not taken for the next move's change
          await wait(350);
        }
        return out;
      }, SLIDER_MOVES);
    }
    if (screenshot) {
      await page.waitForTimeout(500);
      await page.screenshot({ path: screenshot, fullPage: true });
    }
    return {
      ms,
      parts: await page.evaluate(() =>
        performance
          .getEntriesByType("measure")
          .filter((m) => m.name.startsWith("hx-bundle-part"))
          .map((m) => Math.round(m.duration)),
      ),
      longest,
      tasks,
      all: await page.evaluate(() => window.__hxLong.map(Math.round)),
      slider: moves,
      errors,
    };
  } finally {
    await context.close();
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  // `node test/bench/pageProbe.mjs PAGE.html [PAGE2.html ...] [--runs N] [--shot out.png]`: pages
  // interleaved (A B A B ...), each run a fresh context; the last run of each also moves the slider.
  const args = process.argv.slice(2);
  const opt = (name, d) => {
    const i = args.indexOf(name);
    return i >= 0 ? args.splice(i, 2)[1] : d;
  };
  const runs = Number(opt("--runs", "3")),
    shot = opt("--shot", null);
  const files = args;
  const browser = await launch();
  const med = (a) => quantile(a, 0.5);
  try {
    const all = files.map(() => []);
    for (let k = 0; k < runs; k++)
      for (const [j, file] of files.entries()) all[j].push(await probe(browser, file, { slider: k === runs - 1, screenshot: k === 0 && j === 0 ? shot : null }));
    for (const [j, file] of files.entries()) {
      const rs = all[j];
      const last = rs.at(-1);
      const ms = last.slider.map((m) => m.ms),
        compute = last.slider.map((m) => m.compute);
      console.log(`${file}: size ${(statSync(file).size / 1e6).toFixed(3)} MB`);
      for (const r of rs)
        console.log(
          `  load->drawn ${r.ms.toFixed(0)} ms, longest task ${r.longest.toFixed(0)} ms (long tasks ${r.all.join(" ")}; bundle parts ran ${r.parts.join(" ")} ms)${r.errors.length ? ` errors: ${r.errors.join("; ")}` : ""}`,
        );
      console.log(
        `  median load->drawn ${med(rs.map((r) => r.ms)).toFixed(0)} ms, median longest task ${med(rs.map((r) => r.longest)).toFixed(0)} ms; slider p50 ${med(ms).toFixed(1)} p90 ${quantile(ms, 0.9).toFixed(1)} ms (worker compute p50 ${med(compute).toFixed(1)} p90 ${quantile(compute, 0.9).toFixed(1)} ms)`,
      );
    }
  } finally {
    await browser.close();
  }
}
