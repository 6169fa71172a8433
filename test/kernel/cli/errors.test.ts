/**
 * The exit-code rule of the `helicoid` command, on the built command: 0 done, 2 bad input or usage
 * (one line naming the path or parameter, the value and what was expected; never a stack trace),
 * 1 a computation that failed. Here: missing, unreadable and unwritable paths of export, run and
 * charge, checked before any work is done.
 */
import { afterAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin } from "../../helpers/paths.js";

const dir = mkdtempSync(join(tmpdir(), "helicoid-errors-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function helicoid(args: string[], cwd?: string) {
  const r = spawnSync(process.execPath, [helicoidBin, ...args], { encoding: "utf8", timeout: 60_000, cwd });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** No stack frames, no raw errno error text. */
const noTrace = (s: string) => expect(s).not.toMatch(/\n\s+at |Error: E[A-Z]+:|node:internal/);

/** A notebook of one code cell that leaves a trace when it runs. */
function notebook(name: string, source: string): string {
  const path = join(dir, name);
  writeFileSync(path, JSON.stringify({ nbformat: 4, nbformat_minor: 5, metadata: {}, cells: [{ cell_type: "code", metadata: {}, execution_count: null, outputs: [], source }] }));
  return path;
}

// A directory that does not exist, below our own temporary directory.
const missingDir = join(dir, "no", "such", "dir");

describe("helicoid export: bad paths exit 2 with one line", () => {
  // Common practice, no source: the conventions of command-line tools (exit 2 for bad input).
  it("a notebook that does not exist", () => {
    const r = helicoid(["export", join(dir, "nosuch.ipynb"), "-o", join(dir, "x.html")]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`helicoid export: cannot read ${join(dir, "nosuch.ipynb")}: no such file\n`);
    expect(existsSync(join(dir, "x.html"))).toBe(false);
  });

  it("an output directory that does not exist: refused before the page is built, nothing written", () => {
    const nb = notebook("e.ipynb", "1 + 1");
    const out = join(missingDir, "p.html");
    const r = helicoid(["export", nb, "-o", out]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`helicoid export: cannot write ${out}: the directory ${missingDir} does not exist\n`);
    noTrace(r.stderr);
    expect(existsSync(join(dir, "no"))).toBe(false);
    expect(r.stdout).toBe("");
  });

  it("an output path that is a directory, and a notebook that is one", () => {
    const nb = notebook("e2.ipynb", "1 + 1");
    let r = helicoid(["export", nb, "-o", dir]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`helicoid export: cannot write ${dir}: it is a directory, not a file name\n`);
    r = helicoid(["export", dir, "-o", join(dir, "d.html")]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`helicoid export: cannot read ${dir}: it is a directory, not a file\n`);
    expect(existsSync(join(dir, "d.html"))).toBe(false);
  });
});

describe("helicoid run: the output path is checked before any cell runs", () => {
  // Common practice, no source: fail fast on bad input, before the long part of the work.
  it("an output directory that does not exist: exit 2 at once, no cell ran, nothing written", () => {
    const marker = join(dir, "ran.txt");
    const nb = notebook("r.ipynb", `require("node:fs").writeFileSync(${JSON.stringify(marker)}, "ran")`);
    const out = join(missingDir, "x.ipynb");
    const r = helicoid(["run", nb, "-o", out]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`helicoid run: cannot write ${out}: the directory ${missingDir} does not exist (nothing was run)\n`);
    expect(r.stderr).not.toMatch(/code cells ran|cell 1\/1/);
    noTrace(r.stderr);
    expect(existsSync(marker)).toBe(false); // the cell did not run
    expect(existsSync(join(dir, "no"))).toBe(false);
  });

  it("a notebook that is a directory, an option without its value, an unknown option: exit 2", () => {
    let r = helicoid(["run", dir]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`helicoid run: cannot read ${dir}: it is a directory, not a file\n`);
    const nb = notebook("r2.ipynb", "1");
    r = helicoid(["run", nb, "-o"]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^helicoid run: -o needs a value \(a file name such as OUT\.ipynb\)\nusage: helicoid run /);
    r = helicoid(["run", nb, "--bogus"]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/unknown option --bogus; the options are --quiet, --no-trust, -o, --output/);
    expect(r.stderr).not.toMatch(/code cells ran/);
  });

  it("a relative -o is taken from the current directory, not the notebook's", () => {
    const nbDir = join(dir, "nbs");
    const cwd = join(dir, "cwd");
    mkdirSync(nbDir);
    mkdirSync(cwd);
    writeFileSync(
      join(nbDir, "n.ipynb"),
      JSON.stringify({ nbformat: 4, nbformat_minor: 5, metadata: {}, cells: [{ cell_type: "code", metadata: {}, execution_count: null, outputs: [], source: "6 * 7" }] }),
    );
    const r = helicoid(["run", join(nbDir, "n.ipynb"), "-o", "out.ipynb", "--quiet"], cwd);
    expect(r.status, r.stderr).toBe(0);
    expect(readdirSync(cwd)).toEqual(["out.ipynb"]);
    expect(readdirSync(nbDir)).toEqual(["n.ipynb"]);
  });
});

describe("helicoid charge: a directory or a missing file is bad input", () => {
  // Common practice, no source.
  it("exits 2 with one line naming the path and the problem", () => {
    let r = helicoid(["charge", dir]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe(`helicoid charge: file = ${JSON.stringify(dir)} is not valid: expected an existing, readable vector field file. it is a directory, not a file\n`);
    r = helicoid(["charge", join(dir, "none.npy"), "--json"]);
    expect(r.status).toBe(2);
    expect(JSON.parse(r.stdout)).toMatchObject({ id: "charge", status: "error", error: { type: "InputError", parameter: "file", value: join(dir, "none.npy") } });
    expect(r.stderr).toMatch(/none\.npy" is not valid: expected an existing, readable vector field file\. no such file or directory\n$/);
    noTrace(r.stderr);
  });
});

describe("helicoid export of a notebook that was never run", () => {
  // Common practice, no source: a page of code without results is allowed, and said.
  it("writes the page, exits 0, and notes on stderr that there are no outputs", () => {
    const nb = notebook("unrun.ipynb", "console.log(1)");
    const out = join(dir, "unrun.html");
    const r = helicoid(["export", nb, "-o", out]);
    expect(r.status, r.stderr).toBe(0);
    expect(existsSync(out)).toBe(true);
    expect(r.stderr).toMatch(/note: .*unrun\.ipynb has no outputs \(it was not run\).*helicoid run/);
  });
});
