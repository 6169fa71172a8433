/**
 * Helicoid as a user installs it, with no repository around it:
 *   npm pack of the three workspaces -> npm install of the tarballs into an empty folder (a project
 *   install) and `npm install -g --prefix` (a global install) -> `helicoid install --prefix` (a
 *   Jupyter prefix) -> a notebook in ANOTHER folder, which has its own node_modules with an unrelated
 *   package, importing @helicoid/lib and @helicoid/kernel and showing an explorer, executed by Debian's
 *   `jupyter nbconvert --execute` with that kernelspec -> `helicoid export` of the result, opened in
 *   chromium with no network.
 *
 * Slow (minutes: npm installs from the registry, two notebook executions). Prerequisites (the build,
 * Debian's jupyter nbconvert, chromium, the npm registry) are checked first and a missing one fails
 * with a message saying what to install.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawnSync, type SpawnSyncReturns } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, realpathSync, rmSync, writeFileSync } from "node:fs";
import { homedir, tmpdir } from "node:os";
import { join, relative } from "node:path";
import { repoRoot } from "../../helpers/paths.js";
import { chromiumPath, launchBrowser, type Browser } from "../../e2e/harness.js";

const JUPYTER = "/usr/bin/jupyter";
const SLOW = 900_000;

const work = mkdtempSync(join(tmpdir(), "helicoid-packed-"));
const home = join(work, "home");
mkdirSync(home);

/**
 * The environment of a user's shell: no npm_* variables inherited from `npm test`, no NODE_PATH, no
 * JUPYTER_* settings; a fresh HOME (so the machine's own Jupyter folders do not count), with npm's
 * default cache kept (packages come from the npm registry).
 */
function userEnv(extra: Record<string, string> = {}): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = {};
  for (const [k, v] of Object.entries(process.env)) if (!/^(npm_|JUPYTER_|XDG_)/i.test(k) && k !== "NODE_PATH" && k !== "INIT_CWD") env[k] = v;
  return { ...env, HOME: home, npm_config_cache: join(homedir(), ".npm"), ...extra };
}

function sh(cmd: string, args: string[], opts: { cwd: string; env?: NodeJS.ProcessEnv; timeout?: number }): SpawnSyncReturns<string> {
  const r = spawnSync(cmd, args, { encoding: "utf8", cwd: opts.cwd, env: opts.env ?? userEnv(), timeout: opts.timeout ?? 600_000 });
  if (r.error || r.status !== 0) {
    throw new Error(`${cmd} ${args.join(" ")} (in ${opts.cwd}) failed: ${r.error?.message ?? `status ${r.status}`}\n${r.stdout}\n${r.stderr}`);
  }
  return r;
}

function requirePrerequisites(): void {
  const missing: string[] = [];
  for (const f of ["lib/dist/index.js", "kernel-ext/dist/cli/main.js", "widgets/dist/export.js", "widgets/labextension/package.json"]) {
    if (!existsSync(join(repoRoot, f))) missing.push(`${f} (run \`npm run build\` at the repository root)`);
  }
  const nb = spawnSync(JUPYTER, ["nbconvert", "--version"], { encoding: "utf8" });
  if (nb.error || nb.status !== 0) missing.push(`${JUPYTER} nbconvert (sudo apt-get install jupyter-nbconvert jupyter-client python3-ipykernel)`);
  if (!existsSync(chromiumPath)) missing.push(`${chromiumPath} (sudo apt-get install chromium)`);
  const npm = spawnSync("npm", ["--version"], { encoding: "utf8" });
  if (npm.error || npm.status !== 0) missing.push("npm");
  if (missing.length) throw new Error(`packed-install test: prerequisites missing:\n  ${missing.join("\n  ")}`);
}

const tarballs: string[] = [];
let browser: Browser | undefined;

beforeAll(() => {
  requirePrerequisites();
  const dest = join(work, "tarballs");
  mkdirSync(dest);
  // lib and kernel run their prepack (tsc -b: nothing to do after the build; the kernel copies the
  // example notebooks in). The widgets' prepack is its full build (build.mjs), which `npm test` has
  // just run; running it again here would rewrite files other test files are reading, so it is
  // packed as built (its `files` field picks dist/ and labextension/, which git ignores).
  sh("npm", ["pack", "-w", "lib", "-w", "kernel-ext", "--pack-destination", dest], { cwd: repoRoot });
  sh("npm", ["pack", "-w", "widgets", "--ignore-scripts", "--pack-destination", dest], { cwd: repoRoot });
  for (const f of readdirSync(dest)) tarballs.push(join(dest, f));
  expect(tarballs.map((t) => t.split("/").pop()).sort()).toEqual(["helicoid-kernel-0.1.0.tgz", "helicoid-lib-0.1.0.tgz", "helicoid-widgets-0.1.0.tgz"]);
}, SLOW);

afterAll(async () => {
  await browser?.close();
  rmSync(work, { recursive: true, force: true });
});

/** A folder with its own node_modules holding a small unrelated package, like any user's project. */
function notebookFolder(name: string): string {
  const dir = join(work, name);
  const pkg = join(dir, "node_modules", "tiny-greeting");
  mkdirSync(pkg, { recursive: true });
  writeFileSync(join(pkg, "package.json"), JSON.stringify({ name: "tiny-greeting", version: "1.0.0", main: "index.js", types: "index.d.ts" }));
  writeFileSync(join(pkg, "index.js"), 'exports.greet = (n) => "hello " + n;\n');
  writeFileSync(join(pkg, "index.d.ts"), "export declare function greet(n: string): string;\n");
  const cells = [
    'import { getCalculator, runCalculator } from "@helicoid/lib";\nimport { explore, table } from "@helicoid/kernel";\nimport { greet } from "tiny-greeting";\nconsole.log(greet("reader"));',
    'const w = runCalculator(getCalculator("wall"), { A: "15 pJ/m" });\nconsole.log("width in nm:", (w.outputs.width.value as number) * 1e9);',
    'explore("wall")',
  ];
  const nb = {
    nbformat: 4,
    nbformat_minor: 5,
    metadata: { kernelspec: { name: "helicoid", display_name: "TypeScript (Helicoid)", language: "typescript" } },
    cells: cells.map((source, i) => ({ id: `cell-${i}`, cell_type: "code", metadata: {}, source, outputs: [], execution_count: null })),
  };
  writeFileSync(join(dir, "explore.ipynb"), JSON.stringify(nb, null, 1));
  return dir;
}

type Output = { output_type: string; name?: string; text?: string | string[]; data?: Record<string, unknown>; ename?: string; evalue?: string };

/** Install the kernelspec with the installed command, run a notebook with Jupyter, export it, look at the page. */
async function installedWorks(helicoid: string, installRoot: string, label: string): Promise<void> {
  const prefix = join(work, `jupyter-${label}`);
  const inst = sh(helicoid, ["install", "--prefix", prefix], { cwd: installRoot });
  expect(inst.stdout).toMatch(/installed kernelspec 'helicoid'/);
  // No widget manager in this fresh user's Jupyter: the one shipped in @helicoid/widgets is put in place.
  expect(inst.stdout).toMatch(/installed the one Helicoid built from the npm package @jupyter-widgets\/jupyterlab-manager 5\./);
  const data = join(prefix, "share", "jupyter");
  const spec = JSON.parse(readFileSync(join(data, "kernels", "helicoid", "kernel.json"), "utf8"));
  // The kernelspec points at the installed command, which exists, inside the install (not a checkout).
  expect(existsSync(spec.argv[1]), spec.argv[1]).toBe(true);
  expect(relative(realpathSync(installRoot), spec.argv[1]).startsWith("..")).toBe(false);
  expect(spec.argv[1]).not.toContain(repoRoot);
  expect(existsSync(join(data, "labextensions", "@helicoid", "widgets", "package.json"))).toBe(true);
  // The installed doctor agrees: kernelspec (this install), kernel_info, extension, widget manager.
  const doc = spawnSync(helicoid, ["doctor", "--json", "--start-kernel", "--prefix", prefix], { encoding: "utf8", cwd: installRoot, env: userEnv(), timeout: 300_000 });
  const report = JSON.parse(doc.stdout) as { checks: Array<{ name: string; status: string; found: string }> };
  const status = Object.fromEntries(report.checks.map((c) => [c.name, c.status]));
  expect(status, doc.stdout).toMatchObject({ kernelspec: "ok", kernel: "ok", extension: "ok", "widget manager": "ok" });

  const dir = notebookFolder(`notebooks-${label}`);
  const jenv = userEnv({ JUPYTER_PATH: data, JUPYTER_DATA_DIR: data });
  sh(
    JUPYTER,
    [
      "nbconvert",
      "--to",
      "notebook",
      "--execute",
      "explore.ipynb",
      "--output",
      "explore.out.ipynb",
      "--ExecutePreprocessor.kernel_name=helicoid",
      "--ExecutePreprocessor.timeout=300",
    ],
    { cwd: dir, env: jenv },
  );
  const out = JSON.parse(readFileSync(join(dir, "explore.out.ipynb"), "utf8"));
  const outputs: Output[] = out.cells.flatMap((c: { outputs: Output[] }) => c.outputs);
  expect(
    outputs.filter((o) => o.output_type === "error"),
    JSON.stringify(outputs),
  ).toEqual([]);
  const text = (o: Output) => (Array.isArray(o.text) ? o.text.join("") : (o.text ?? ""));
  expect(outputs.map(text).join("")).toMatch(/hello reader/);
  const width = Number(/width in nm: ([\d.eE+-]+)/.exec(outputs.map(text).join(""))?.[1]);
  expect(width).toBeGreaterThan(0);
  const views = outputs.filter((o) => o.data?.["application/vnd.jupyter.widget-view+json"]);
  expect(views.length).toBeGreaterThan(0);
  const state = out.metadata.widgets["application/vnd.jupyter.widget-state+json"].state as Record<string, { model_name: string; state: Record<string, unknown> }>;
  const explorer = Object.values(state).find((m) => m.model_name === "ExplorerModel");
  expect(explorer, JSON.stringify(Object.values(state).map((m) => m.model_name))).toBeDefined();

  const page = join(dir, "explore.html");
  const exp = sh(helicoid, ["export", "explore.out.ipynb", "-o", page], { cwd: dir });
  expect(exp.stdout + exp.stderr).toMatch(/wrote/);
  browser ??= await launchBrowser();
  const p = await browser.newPage();
  await p.route(/^(?!file:).*/, (route) => route.abort()); // no network
  await p.goto(`file://${page}`);
  await p.waitForSelector("body[data-helicoid-ready]", { timeout: 120_000 });
  const sel = '.hx-explorer[data-calculator="wall"]';
  await p.waitForFunction(
    (s) => {
      const r = document.querySelector(s) as HTMLElement | null;
      return !!r && r.dataset.busy === "" && r.textContent!.includes("nm");
    },
    sel,
    { timeout: 120_000 },
  );
  expect(await p.locator(sel).count()).toBe(1);
  await p.close();
}

describe("packed packages, installed as a user does", () => {
  it(
    "a project install (npm install of the tarballs into an empty folder) runs, executes and exports a notebook elsewhere",
    async () => {
      const project = join(work, "project");
      mkdirSync(project);
      writeFileSync(join(project, "package.json"), JSON.stringify({ name: "my-analysis", version: "1.0.0", private: true }));
      sh("npm", ["install", "--no-audit", "--no-fund", ...tarballs], { cwd: project });
      // The installed library: the root entry is the supported API, internals resolve from
      // @helicoid/lib/internal (lib/internal.js and .d.ts, shipped in the package's files).
      const entries = sh(
        process.execPath,
        [
          "-e",
          'const pub = require("@helicoid/lib"); const internal = require("@helicoid/lib/internal"); console.log(JSON.stringify({ pub: typeof pub.runCalculator, pubInternal: typeof pub.tql2Real, internal: typeof internal.tql2Real, same: internal.runCalculator === pub.runCalculator }))',
        ],
        { cwd: project },
      );
      expect(JSON.parse(entries.stdout)).toEqual({ pub: "function", pubInternal: "undefined", internal: "function", same: true });
      expect(existsSync(join(project, "node_modules", "@helicoid", "lib", "internal.d.ts"))).toBe(true);
      // npx finds the installed command, as a user types it.
      const help = sh("npx", ["--no", "helicoid", "help"], { cwd: project });
      expect(help.stdout).toMatch(/usage: helicoid COMMAND/);
      // Installed, the command knows it is not in a checkout: `helicoid lab` opens the current folder and
      // `helicoid start` runs the example notebooks shipped in the package (no node_modules/@helicoid/notebooks).
      const kernelDir = join(project, "node_modules", "@helicoid", "kernel");
      const places = sh(
        process.execPath,
        [
          "-e",
          `const p = require(${JSON.stringify(join(kernelDir, "dist", "cli", "places.js"))}); console.log(JSON.stringify({ checkout: p.checkoutRoot(), examples: p.exampleNotebooksDir() }))`,
        ],
        { cwd: project },
      );
      expect(JSON.parse(places.stdout)).toEqual({ checkout: null, examples: join(kernelDir, "examples") });
      expect(
        readdirSync(join(kernelDir, "examples"))
          .filter((f) => f.endsWith(".ipynb"))
          .sort(),
      ).toEqual(
        readdirSync(join(repoRoot, "notebooks"))
          .filter((f) => f.endsWith(".ipynb"))
          .sort(),
      );
      await installedWorks(join(project, "node_modules", ".bin", "helicoid"), project, "project");
    },
    SLOW,
  );

  it(
    "a global install (npm install -g --prefix) works the same way",
    async () => {
      const global = join(work, "global");
      sh("npm", ["install", "-g", "--prefix", global, "--no-audit", "--no-fund", ...tarballs], { cwd: work });
      const bin = join(global, "bin", "helicoid");
      expect(existsSync(bin)).toBe(true);
      await installedWorks(bin, join(global, "lib", "node_modules", "@helicoid", "kernel"), "global");
    },
    SLOW,
  );
});
