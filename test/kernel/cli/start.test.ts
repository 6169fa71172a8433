/**
 * `helicoid start` (npm start): runs notebooks in process, exports each as a page and serves the
 * gallery on 127.0.0.1; a failing notebook is listed as such. (The real example notebooks are run
 * by test/notebooks; here a small one keeps the test quick.)
 */
import { describe, expect, it } from "vitest";
import { spawn, spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin } from "../../helpers/paths.js";
import { systemPython } from "../../helpers/python.js";

const nb = (source: string, title: string) =>
  JSON.stringify({
    nbformat: 4,
    nbformat_minor: 5,
    metadata: {},
    cells: [
      { cell_type: "markdown", metadata: {}, source: `# ${title}` },
      { cell_type: "code", metadata: {}, source, outputs: [], execution_count: null },
    ],
  });

describe("helicoid start", () => {
  it("serves the executed gallery on 127.0.0.1 and stops on Ctrl-C", async () => {
    const dir = mkdtempSync(join(tmpdir(), "helicoid-start-"));
    const notebooks = join(dir, "nbs");
    mkdirSync(notebooks);
    writeFileSync(join(notebooks, "a.ipynb"), nb('import { explore } from "@helicoid/kernel";\nexplore("wall")', "Wall explorer"));
    const child = spawn(process.execPath, [helicoidBin, "start", "--notebooks", notebooks, "--out", join(dir, "out"), "--port", "0"], { stdio: ["ignore", "pipe", "pipe"] });
    let out = "";
    child.stdout.on("data", (d) => (out += d));
    child.stderr.on("data", (d) => (out += d));
    const url = await new Promise<string>((res, rej) => {
      const t = setTimeout(() => rej(new Error(`no gallery address printed: ${out}`)), 120_000);
      const check = () => {
        const m = /Helicoid gallery ready: (http:\/\/127\.0\.0\.1:\d+\/)/.exec(out);
        if (m) {
          clearTimeout(t);
          res(m[1]!);
        }
      };
      child.stdout.on("data", check);
    });
    const index = await (await fetch(url)).text();
    expect(index).toMatch(/<a href="a\.html">Wall explorer<\/a>/);
    const page = await fetch(url + "a.html");
    expect(page.status).toBe(200);
    expect(await page.text()).toMatch(/application\/vnd\.jupyter\.widget-state\+json/);
    expect((await fetch(url + "..%2f..%2f..%2fetc%2fpasswd")).status).toBe(404); // encoded traversal stays inside
    // The executed notebook it wrote is trusted for this user, by Jupyter's own notary (Debian's nbformat).
    const trust = spawnSync(
      systemPython,
      [
        "-c",
        "import nbformat, sys\nfrom nbformat.sign import NotebookNotary\nprint(NotebookNotary().check_signature(nbformat.read(sys.argv[1], as_version=4)))",
        join(dir, "out", "a.ipynb"),
      ],
      { encoding: "utf8" },
    );
    expect(trust.stdout.trim(), trust.stderr).toBe("True");
    child.kill("SIGINT");
    const code = await new Promise<number | null>((res) => child.on("exit", res));
    expect(code).toBe(0);
  });

  it("serves at once, lists notebooks still running, adds each page when it is done, and keeps unchanged ones next time", async () => {
    const dir = mkdtempSync(join(tmpdir(), "helicoid-start-"));
    const notebooks = join(dir, "nbs");
    mkdirSync(notebooks);
    writeFileSync(join(notebooks, "slow.ipynb"), nb("await new Promise((r) => setTimeout(r, 6000));\n'slept'", "Slow one"));
    const startOnce = async (extra: string[] = []) => {
      const child = spawn(process.execPath, [helicoidBin, "start", "--notebooks", notebooks, "--out", join(dir, "out"), "--port", "0", ...extra], {
        stdio: ["ignore", "pipe", "pipe"],
      });
      let out = "";
      child.stdout.on("data", (d) => (out += d));
      child.stderr.on("data", (d) => (out += d));
      const waitFor = (re: RegExp, ms: number) =>
        new Promise<RegExpExecArray>((res, rej) => {
          const t = setTimeout(() => rej(new Error(`not printed (${re}): ${out}`)), ms);
          const check = () => {
            const m = re.exec(out);
            if (m) {
              clearTimeout(t);
              res(m);
            }
          };
          check();
          child.stdout.on("data", check);
          child.stderr.on("data", check);
        });
      const url = (await waitFor(/Helicoid gallery: (http:\/\/127\.0\.0\.1:\d+\/)/, 60_000))[1]!;
      return { child, url, waitFor, output: () => out };
    };
    const first = await startOnce();
    // The server answers while the notebook still runs (it sleeps 6 s): listed, no page yet, refreshing.
    const during = await (await fetch(first.url)).text();
    expect(during).toMatch(/Slow one|slow/);
    expect(during).not.toMatch(/<a href="slow\.html">/);
    expect(during).toMatch(/http-equiv="refresh"/);
    await first.waitFor(/Helicoid gallery ready: /, 120_000);
    const after = await (await fetch(first.url)).text();
    expect(after).toMatch(/<a href="slow\.html">Slow one<\/a>/);
    expect(after).not.toMatch(/http-equiv="refresh"/);
    first.child.kill("SIGINT");
    expect(await new Promise<number | null>((res) => first.child.on("exit", res))).toBe(0);
    // Unchanged notebook, bundle and version: the page is kept, the notebook not run again.
    const second = await startOnce();
    await second.waitFor(/Helicoid gallery ready: /, 60_000);
    expect(second.output()).toMatch(/slow\.ipynb: unchanged since its last run/);
    expect(second.output()).not.toMatch(/running slow\.ipynb/);
    second.child.kill("SIGINT");
    await new Promise((res) => second.child.on("exit", res));
    // --fresh runs it again.
    const third = await startOnce(["--fresh"]);
    await third.waitFor(/Helicoid gallery ready: /, 120_000);
    expect(third.output()).toMatch(/running slow\.ipynb/);
    third.child.kill("SIGINT");
    await new Promise((res) => third.child.on("exit", res));
  }, 300_000);

  it("lists a notebook that fails, and exits non-zero without serving when asked", () => {
    const dir = mkdtempSync(join(tmpdir(), "helicoid-start-"));
    const notebooks = join(dir, "nbs");
    mkdirSync(notebooks);
    writeFileSync(join(notebooks, "bad.ipynb"), nb('throw new Error("no such film")', "Broken"));
    const r = spawnSync(process.execPath, [helicoidBin, "start", "--notebooks", notebooks, "--out", join(dir, "out"), "--no-serve"], { encoding: "utf8", timeout: 120_000 });
    expect(r.status).toBe(1);
    const index = readFileSync(join(dir, "out", "index.html"), "utf8");
    expect(index).toMatch(/did not run to the end: .*cell 2 failed: Error: no such film/);
  });
});
