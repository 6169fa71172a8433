/**
 * The gallery of `npm start`: every example notebook is run by our runner and exported
 * (buildGallery of kernel-ext/src/cli/start.ts); each page renders its widgets offline in chromium
 * with no page error, and a screenshot of the index and of every page is written for reviewers.
 */
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { existsSync, readdirSync, rmSync } from "node:fs";
import { join } from "node:path";
import { launchBrowser, screenshot, repoRoot, outputDir, type Browser } from "./harness";

const startJs = join(repoRoot, "kernel-ext", "dist", "cli", "start.js");
const built = existsSync(startJs) && existsSync(join(repoRoot, "widgets", "dist", "export.js"));
const out = join(outputDir, "gallery");
let browser: Browser;
let entries: Array<{ name: string; page: string | null; error: string | null }> = [];

describe("gallery pages", () => {
  it("has the build it tests (npm run build; npm test builds first)", () => {
    // a missing build fails here, by name, instead of skipping the browser checks below
    expect(built, "kernel-ext/dist and widgets/dist: run npm run build").toBe(true);
  });

  beforeAll(async () => {
    rmSync(out, { recursive: true, force: true });

    const { buildGallery, galleryIndex } = require(startJs);
    entries = await buildGallery(join(repoRoot, "notebooks"), out, () => {});
    require("node:fs").writeFileSync(join(out, "index.html"), galleryIndex(entries));
    browser = await launchBrowser();
  }, 600_000);

  afterAll(async () => {
    await browser?.close();
  });

  it("every example notebook runs and its page renders its widgets offline without page errors", async () => {
    const notebooks = readdirSync(join(repoRoot, "notebooks")).filter((f) => f.endsWith(".ipynb"));
    expect(entries.length).toBe(notebooks.length);
    const index = await browser.newPage();
    await index.goto(`file://${join(out, "index.html")}`);
    await screenshot(index, "gallery-index");
    for (const e of entries) {
      expect(e.error, `${e.name}: ${e.error}`).toBeNull();
      const page = await browser.newPage();
      const errors: string[] = [];
      page.on("pageerror", (err) => errors.push(err.message));
      await page.route(/^(?!file:).*/, (route) => route.abort());
      await page.goto(`file://${e.page}`);
      await page.waitForSelector("body[data-helicoid-ready]", { timeout: 60_000 });
      await page.waitForFunction(() => Array.from(document.querySelectorAll(".hx-explorer")).every((x) => (x as HTMLElement).dataset.busy !== "1"), null, { timeout: 60_000 });
      expect(errors, `${e.name}: page errors`).toEqual([]);
      expect(await page.locator(".hx-widget-fallback").count(), `${e.name}: widgets left unrendered`).toBe(0);
      await screenshot(page, `gallery-${e.name.replace(/\.ipynb$/, "")}`);
      await page.close();
    }
  });
});
