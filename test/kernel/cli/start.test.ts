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
        const m = /Helicoid gallery: (http:\/\/127\.0\.0\.1:\d+\/)/.exec(out);
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
    const trust = spawnSync(systemPython, ["-c", "import nbformat, sys\nfrom nbformat.sign import NotebookNotary\nprint(NotebookNotary().check_signature(nbformat.read(sys.argv[1], as_version=4)))", join(dir, "out", "a.ipynb")], { encoding: "utf8" });
    expect(trust.stdout.trim(), trust.stderr).toBe("True");
    child.kill("SIGINT");
    const code = await new Promise<number | null>((res) => child.on("exit", res));
    expect(code).toBe(0);
  });

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
