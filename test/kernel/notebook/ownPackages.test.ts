/**
 * Notebooks outside the repository and outside the install folder import @helicoid/lib and
 * @helicoid/kernel (type-checked by tslab's TypeScript and loaded by Node), also when the notebook's
 * folder has a node_modules of its own with an unrelated package in it. Runs the real `helicoid run`
 * (tslab's compiler and executor in a child process).
 *   1. from this checkout, a notebook folder with and without its own node_modules;
 *   2. from an installed layout made of copies of the built packages in a separate folder
 *      (node_modules/@helicoid/{lib,kernel,widgets}; other dependencies linked from this checkout),
 *      the notebook in yet another folder.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { cpSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin, repoRoot } from "../../helpers/paths.js";

const cell = (source: string) => ({ cell_type: "code", metadata: {}, source, outputs: [], execution_count: null });

const SOURCE = [
  'import { getCalculator, runCalculator } from "@helicoid/lib";\nimport { slider } from "@helicoid/kernel";\nconst r = runCalculator(getCalculator("wall"), {});\nconsole.log("wall width", typeof r.outputs.width.value);',
  "const s = slider({ min: 0, max: 3, value: 1 });\ns",
];

/** A folder with its own node_modules holding one small unrelated package (a CommonJS module with types). */
function folderWithOwnModules(): string {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-own-modules-"));
  const pkg = join(dir, "node_modules", "tiny-greeting");
  mkdirSync(pkg, { recursive: true });
  writeFileSync(join(pkg, "package.json"), JSON.stringify({ name: "tiny-greeting", version: "1.0.0", main: "index.js", types: "index.d.ts" }));
  writeFileSync(join(pkg, "index.js"), 'exports.greet = (n) => "hello " + n;\n');
  writeFileSync(join(pkg, "index.d.ts"), "export declare function greet(n: string): string;\n");
  return dir;
}

function runIn(dir: string, bin: string, cells: string[]) {
  const input = join(dir, "nb.ipynb");
  writeFileSync(input, JSON.stringify({ nbformat: 4, nbformat_minor: 5, metadata: {}, cells: cells.map(cell) }));
  const out = join(dir, "nb.out.ipynb");
  const r = spawnSync(process.execPath, [bin, "run", input, "-o", out, "--quiet"], { encoding: "utf8", cwd: dir, timeout: 120_000, env: { ...process.env, NODE_PATH: "" } });
  const nb = JSON.parse(readFileSync(out, "utf8"));
  const outputs = nb.cells.flatMap((c: { outputs: unknown[] }) => c.outputs) as Array<Record<string, unknown>>;
  return { r, outputs, errors: outputs.filter((o) => o.output_type === "error") };
}

function expectRan(res: ReturnType<typeof runIn>) {
  expect(res.errors, JSON.stringify(res.errors)).toEqual([]);
  expect(res.r.status, res.r.stderr).toBe(0);
  expect(JSON.stringify(res.outputs)).toMatch(/wall width number/);
  expect(JSON.stringify(res.outputs)).toMatch(/application\/vnd\.jupyter\.widget-view\+json/);
}

describe("notebooks import @helicoid/* from any folder", () => {
  it("from a checkout: a folder with no node_modules", () => {
    expectRan(runIn(mkdtempSync(join(tmpdir(), "helicoid-bare-")), helicoidBin, SOURCE));
  });

  it("from a checkout: a folder with its own node_modules (an unrelated package) imports both", () => {
    const dir = folderWithOwnModules();
    const res = runIn(dir, helicoidBin, [...SOURCE, 'import { greet } from "tiny-greeting";\nconsole.log(greet("wall"));']);
    expectRan(res);
    expect(JSON.stringify(res.outputs)).toMatch(/hello wall/);
  });

  it("from an installed layout in another folder, with and without the notebook's own node_modules", () => {
    const inst = mkdtempSync(join(tmpdir(), "helicoid-installed-"));
    const nm = join(inst, "node_modules");
    mkdirSync(join(nm, "@helicoid"), { recursive: true });
    const copy = (from: string, to: string, parts: string[]) => {
      for (const p of parts) cpSync(join(repoRoot, from, p), join(nm, "@helicoid", to, p), { recursive: true, filter: (f) => !f.endsWith(".tsbuildinfo") });
    };
    // lib as its package `files` has it: the built entries and @helicoid/lib/internal (internal.js, .d.ts)
    copy("lib", "lib", ["package.json", "dist", "internal.js", "internal.d.ts"]);
    copy("kernel-ext", "kernel", ["package.json", "dist", "bin"]);
    copy("widgets", "widgets", ["package.json", "dist", "labextension"]);
    // Every other dependency: linked from this checkout's node_modules (installed copies would be the same files).
    for (const entry of readdirSync(join(repoRoot, "node_modules"))) {
      if (entry === "@helicoid" || entry.startsWith(".")) continue;
      symlinkSync(join(repoRoot, "node_modules", entry), join(nm, entry));
    }
    const bin = join(nm, "@helicoid", "kernel", "bin", "helicoid.js");
    expectRan(runIn(mkdtempSync(join(tmpdir(), "helicoid-elsewhere-")), bin, SOURCE));
    const own = folderWithOwnModules();
    const res = runIn(own, bin, [...SOURCE, 'import { greet } from "tiny-greeting";\nconsole.log(greet("skyrmion"));']);
    expectRan(res);
    expect(JSON.stringify(res.outputs)).toMatch(/hello skyrmion/);
  });
});
