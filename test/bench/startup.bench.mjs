// Start-up benchmarks (cold, one fresh process each), side by side in one run:
// - `helicoid calc ID ... --json` for several calculators (wall and skyrmion with their film typed
//   with units, as a user types it; berry-loop, chern, chain-spectrum at their defaults) against
//   the minimal Python + numpy + scipy script computing the same results
//   (test/bench/startup/*_ref.py, run by Debian's python3 as a user runs it, and again with one
//   BLAS thread, which makes numpy's start cheaper: the issue's 0.34 s is the former),
//   INTERLEAVED (ours, reference, reference with one thread, ours ...), CPU time = user + sys of
//   the child from /usr/bin/time, median and spread (min-max) over the runs;
// - the floor (an empty process of each) and what mathjs costs: the units-only instance the
//   library builds against `require("mathjs")` (the whole library), interleaved;
// - importing @helicoid/lib (CPU of the require, RSS after) and whether mathjs got loaded;
// - the first notebook cell that imports @helicoid/lib and runs a calculator, in a started kernel
//   (CPU of the kernel process over the cell, from /proc/PID/stat), beside the kernel's own start
//   and a second cell;
// - a worker thread's start: new Worker (the calculator worker) to its first answer, with SI
//   numbers and with units; and a page's Web Worker start in chromium (the library's bundle).
// Goals (issue 18): calc CPU <= the Python script's; first cell < 300 ms CPU; worker start < 200 ms.
import { spawnSync } from "node:child_process";
import { createRequire } from "node:module";
import { readFileSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import client from "../../kernel-ext/dist/comm/client.js";
import { systemPython, interleaved, summary, verdict } from "./util.mjs";

const require = createRequire(import.meta.url);
const root = fileURLToPath(new URL("../..", import.meta.url));
const here = join(root, "test", "bench");
const helicoid = join(root, "kernel-ext", "bin", "helicoid.js");
const RUNS = Number(process.env.HELICOID_BENCH_STARTUP_RUNS ?? 7);
const ONE_BLAS_THREAD = { OPENBLAS_NUM_THREADS: "1", OMP_NUM_THREADS: "1", MKL_NUM_THREADS: "1" };
// the invented demo film (lib/src/material/demo.ts), typed with units as a user types it
const FILM = ["Ms=1.1MA/m", "A=15pJ/m", "Ku=1.2MJ/m^3", "D=1.5mJ/m^2", "t=1nm"];
const rel = (a, b) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);
const maxRel = (a, b) => (a.length === b.length ? Math.max(...a.map((x, i) => Math.abs(x - b[i]) / Math.max(Math.abs(b[i]), 1e-12))) : Infinity);
/**
 * [calculator, arguments, what the reference leaves out, agreement of the main results (ours, the
 * reference's JSON) -> [true/false, what was compared]]
 */
const CALCS = [
  ["wall", FILM, "", (o, r) => [rel(o.width.value, r.width) < 1e-9 && rel(o.energy.value, r.energy) < 1e-9, "width, energy to 1e-9"]],
  [
    "skyrmion",
    [...FILM, "B=50mT"],
    "one field, local magnetostatics, one local minimum (less work, another model: results not compared)",
    () => [true, "not compared (another model)"],
  ],
  ["berry-loop", [], "", (o, r) => [maxRel(o.gammaDiscrete.value, r.gammaDisc) < 1e-9 && maxRel(o.gammaTopDiscreteSweep.value, r.gammaSweep) < 1e-9, "phases and sweep to 1e-9"]],
  ["chern", [], "", (o, r) => [o.chernLower.value === r.chernLower && o.chernUpper.value === r.chernUpper, "both Chern numbers"]],
  [
    "chain-spectrum",
    [],
    "",
    (o, r) => [
      rel(o.groundEnergy.value, r.groundEnergy) < 1e-9 &&
        maxRel(
          o.levelLowest.value,
          r.levels.map((l) => l[0]),
        ) < 1e-6,
      "E0 to 1e-9, lowest level per k",
    ],
  ],
];

/** CPU ms (user + sys) and max RSS (MB) of one child process, from /usr/bin/time. */
function timedChild(argv, env = undefined, { cwd = root } = {}) {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-bench-"));
  const out = join(dir, "time.txt");
  try {
    const r = spawnSync("/usr/bin/time", ["-f", "%U %S %M", "-o", out, ...argv], {
      cwd,
      encoding: "utf8",
      maxBuffer: 1 << 26,
      env: env ? { ...process.env, ...env } : process.env,
    });
    if (r.status !== 0) throw new Error(`${argv.join(" ")} failed: ${r.stderr}`);
    const json = r.stdout.trim() ? JSON.parse(r.stdout) : null; // both sides print JSON: a failed run is not timed
    const [u, s, kb] = readFileSync(out, "utf8").trim().split(/\s+/).slice(-3).map(Number);
    return { cpu: (u + s) * 1000, rssMB: kb / 1024, json };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const IMPORT_CHILD = `
const t0 = process.cpuUsage();
const lib = require(${JSON.stringify(join(root, "lib", "dist", "index.js"))});
const t1 = process.cpuUsage(t0);
const r = lib.runCalculator(lib.getCalculator("wall"));
const t2 = process.cpuUsage(t0);
const mathjs = Object.keys(require.cache).some((k) => /[\\\\/]node_modules[\\\\/]mathjs[\\\\/]/.test(k));
console.log(JSON.stringify({ importMs: (t1.user + t1.system) / 1000, withWallMs: (t2.user + t2.system) / 1000, rssMB: process.memoryUsage().rss / 2 ** 20, mathjs, status: r.status }));
`;

const UNITS_CHILD = `
const lib = require(${JSON.stringify(join(root, "lib", "dist", "index.js"))});
lib.parseQuantity("A", "15 pJ/m", "J/m");
lib.parseQuantity("H", "1 kOe", "A/m");
console.log("{}");
`;

// new Worker to the first answer of a job (what a caller waits for), and to "online" (the thread
// runs, before it has loaded its modules); argv[1]: the calculator's inputs
const WORKER_CHILD = `
const { Worker } = require("node:worker_threads");
// the caller as computeInWorker is in the kernel: the library loaded and the inputs read there
// (argv[2] "caller"), their unit conversions handed to the worker with the job
const caller = process.argv[2] === "caller";
let quantities;
if (caller) {
  const lib = require(${JSON.stringify(join(root, "lib", "dist", "internal.js"))});
  lib.coerceInputs(lib.getCalculator("wall"), JSON.parse(process.argv[1]));
  quantities = lib.knownQuantityConversions();
}
const t0 = process.cpuUsage(); const w0 = performance.now();
const cpu = () => { const c = process.cpuUsage(t0); return (c.user + c.system) / 1000; };
let onlineCpuMs;
const w = new Worker(${JSON.stringify(join(root, "kernel-ext", "dist", "parallel", "calculatorWorker.js"))});
w.once("online", () => { onlineCpuMs = cpu(); });
w.postMessage({ id: "wall", inputs: JSON.parse(process.argv[1]), options: {}, ...(caller ? { quantities } : {}) });
w.once("message", (m) => {
  console.log(JSON.stringify({ cpuMs: cpu(), wallMs: performance.now() - w0, onlineCpuMs, status: m.result ? m.result.status : m.error.message }));
  w.terminate();
});
`;

function procCpuMs(pid) {
  // utime + stime in clock ticks (fields 14, 15); 100 ticks a second on Linux
  const f = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1].split(" ");
  return (Number(f[11]) + Number(f[12])) * 10;
}

const VM_CHILD = `
const fs = require("fs"); const vm = require("vm");
const src = fs.readFileSync(process.argv[1], "utf8");
const ctx = vm.createContext({ console, performance });
const t0 = process.cpuUsage();
const cpu = () => { const c = process.cpuUsage(t0); return (c.user + c.system) / 1000; };
vm.runInContext(src + ";globalThis.__lib = __lib;", ctx);
const evaluated = cpu();
const lib = ctx.__lib;
const si = lib.runCalculator(lib.getCalculator("wall"), { Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 1.5e-3, t: 1e-9 });
const firstSi = cpu();
const un = lib.runCalculator(lib.getCalculator("wall"), { Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm" });
const thenUnits = cpu();
if (si.status !== "ok" || un.status !== "ok") throw new Error("status " + si.status + " " + un.status);
console.log(JSON.stringify({ evaluated, firstSi, thenUnits }));
`;

/**
 * A page's Web Worker start in Debian's chromium: @helicoid/lib bundled for the browser as the
 * pages bundle it (esbuild, lib/package.json's "browser" field), started as a Worker from a blob
 * of its source, to its first answer (calc wall); wall time in the page (performance.now), each
 * start on a fresh page. The page's own bundle (widgets/build.mjs) is not involved: this is the
 * library's part of the worker start.
 */
export async function pageWorkerStarts(runs) {
  const { build } = require("esbuild");
  const { chromium } = require("playwright-core");
  const bundle = await build({
    entryPoints: [join(root, "lib", "src", "index.ts")],
    bundle: true,
    minify: true,
    platform: "browser",
    format: "iife",
    globalName: "__lib",
    write: false,
    logLevel: "error",
  });
  const source = `${bundle.outputFiles[0].text};onmessage=(e)=>{const r=__lib.runCalculator(__lib.getCalculator("wall"),e.data);postMessage(r.status)};`;
  const browser = await chromium.launch({
    executablePath: process.env.HELICOID_CHROMIUM ?? "/usr/bin/chromium",
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
  const out = { si: [], units: [], bytes: source.length, cpu: [] };
  // the same source evaluated in a fresh Node process's V8 (vm context): CPU to the first answer
  const dir = mkdtempSync(join(tmpdir(), "helicoid-bench-worker-"));
  try {
    const file = join(dir, "lib.js");
    writeFileSync(file, bundle.outputFiles[0].text);
    for (let i = 0; i < runs; i++) {
      const r = spawnSync(process.execPath, ["-e", VM_CHILD, file], { encoding: "utf8" });
      if (r.status !== 0) throw new Error(`vm child failed: ${r.stderr}`);
      out.cpu.push(JSON.parse(r.stdout));
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  try {
    for (let i = 0; i < runs; i++) {
      for (const [key, inputs] of [
        ["si", { Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 1.5e-3, t: 1e-9 }],
        ["units", { Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm" }],
      ]) {
        const page = await browser.newPage();
        try {
          await page.setContent("<!doctype html><title>worker start</title>");
          const r = await page.evaluate(
            ([src, job]) =>
              new Promise((resolve) => {
                const url = URL.createObjectURL(new globalThis.Blob([src], { type: "text/javascript" }));
                const t0 = performance.now();
                const w = new globalThis.Worker(url);
                w.onmessage = (e) => resolve({ ms: performance.now() - t0, status: e.data });
                w.onerror = (e) => resolve({ ms: NaN, status: String(e.message) });
                w.postMessage(job);
              }),
            [source, inputs],
          );
          if (r.status !== "ok") throw new Error(`page worker answered ${r.status}`);
          out[key].push(r.ms);
        } finally {
          await page.close();
        }
      }
    }
  } finally {
    await browser.close();
  }
  return out;
}

export default async () => {
  const rows = [];
  for (const [id, args, note, agree] of CALCS) {
    // A B C A B C ...: ours, the script as a user runs it (numpy's default BLAS threads), the
    // script with one BLAS thread (numpy's start-up is cheaper then)
    const script = join(here, "startup", `${id.replace(/-/g, "_")}_ref.py`);
    const ours = [];
    const ref = [];
    const ref1 = [];
    for (let i = 0; i < RUNS; i++) {
      ours.push(timedChild([process.execPath, helicoid, "calc", id, ...args, "--json"]));
      ref.push(timedChild([systemPython, script]));
      ref1.push(timedChild([systemPython, script], ONE_BLAS_THREAD));
    }
    const o = summary(ours.map((x) => x.cpu));
    const p = summary(ref.map((x) => x.cpu));
    const p1 = summary(ref1.map((x) => x.cpu));
    const [same, what] = agree(ours[0].json.outputs, ref[0].json);
    rows.push({
      group: "startup",
      name: `helicoid calc ${id} ${args.join(" ")} --json, cold process, CPU user+sys, interleaved x${RUNS} (RSS ${summary(ours.map((x) => x.rssMB)).median.toFixed(0)} MB vs ${summary(ref.map((x) => x.rssMB)).median.toFixed(0)} MB; results agree: ${same ? "yes" : "NO"}, ${what})`,
      ours_ms: o.median,
      ours_spread: o.spread,
      reference: `python3 + numpy + scipy script (startup/${id.replace(/-/g, "_")}_ref.py)${note ? `: ${note}` : ""}; with one BLAS thread (OPENBLAS_NUM_THREADS=1, interleaved too): ${p1.median.toFixed(0)} ms [${p1.min.toFixed(0)}-${p1.max.toFixed(0)}], ratio ${(o.median / p1.median).toFixed(2)}`,
      reference_ms: p.median,
      reference_spread: p.spread,
      ratio: o.median / p.median,
      goal: verdict(o.median <= p.median, `CPU <= the Python script's as a user runs it (with one BLAS thread: ${o.median <= p1.median ? "met" : "missed"})`),
    });
  }

  // the floor: an empty Node process and an empty Python process (what no library change can remove)
  {
    const { ours, ref } = interleaved(
      () => timedChild([process.execPath, "-e", "0"]),
      () => timedChild([systemPython, "-c", "pass"]),
      RUNS,
    );
    const o = summary(ours.map((x) => x.cpu));
    const p = summary(ref.map((x) => x.cpu));
    rows.push({
      group: "startup",
      name: `floor: empty process, CPU user+sys, interleaved x${RUNS}`,
      ours_ms: o.median,
      ours_spread: o.spread,
      reference: "python3 -c pass",
      reference_ms: p.median,
      reference_spread: p.spread,
      ratio: o.median / p.median,
      goal: "informational (node's own start-up)",
    });
  }

  // what mathjs costs: the units-only instance the library builds (require the library, parse two
  // quantities, one of them CGS) against `require("mathjs")` (the whole library, eagerly built)
  {
    const { ours, ref } = interleaved(
      () => timedChild([process.execPath, "-e", UNITS_CHILD]),
      () => timedChild([process.execPath, "-e", 'require("mathjs").unit("15 pJ/m"); console.log("{}")'], undefined, { cwd: join(root, "lib") }),
      RUNS,
    );
    const o = summary(ours.map((x) => x.cpu));
    const p = summary(ref.map((x) => x.cpu));
    rows.push({
      group: "startup",
      name: `mathjs for units: require @helicoid/lib + parseQuantity("15 pJ/m") and ("1 kOe") (units-only mathjs), cold process, CPU, interleaved x${RUNS} (RSS ${summary(ours.map((x) => x.rssMB)).median.toFixed(0)} MB vs ${summary(ref.map((x) => x.rssMB)).median.toFixed(0)} MB)`,
      ours_ms: o.median,
      ours_spread: o.spread,
      reference: 'node -e \'require("mathjs").unit("15 pJ/m")\' (the whole mathjs, as before)',
      reference_ms: p.median,
      reference_spread: p.spread,
      ratio: o.median / p.median,
      goal: "informational (what the units-only instance saves)",
    });
  }

  const imports = [];
  for (let i = 0; i < RUNS; i++) {
    const r = spawnSync(process.execPath, ["-e", IMPORT_CHILD], { encoding: "utf8" });
    if (r.status !== 0) throw new Error(`import child failed: ${r.stderr}`);
    imports.push(JSON.parse(r.stdout));
  }
  const imp = summary(imports.map((x) => x.importMs));
  rows.push({
    group: "startup",
    name: `require("@helicoid/lib"), cold, CPU (then calc wall: ${summary(imports.map((x) => x.withWallMs)).median.toFixed(0)} ms; RSS ${summary(imports.map((x) => x.rssMB)).median.toFixed(0)} MB; mathjs loaded: ${imports.some((x) => x.mathjs)})`,
    ours_ms: imp.median,
    ours_spread: imp.spread,
    goal: verdict(imp.median < 300 && !imports.some((x) => x.mathjs), "< 300 ms, mathjs not loaded for SI numbers"),
  });

  const withUnits = { Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm" };
  for (const [label, inputs, mode] of [
    ["SI numbers", { Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 1.5e-3, t: 1e-9 }, "alone"],
    ["units, the worker alone (it builds mathjs)", withUnits, "alone"],
    ["units, as computeInWorker sends them (the caller's conversions with the job)", withUnits, "caller"],
  ]) {
    const workers = [];
    for (let i = 0; i < RUNS; i++) {
      const r = spawnSync(process.execPath, ["-e", WORKER_CHILD, JSON.stringify(inputs), mode], { encoding: "utf8" });
      if (r.status !== 0) throw new Error(`worker child failed: ${r.stderr}`);
      const w = JSON.parse(r.stdout);
      if (w.status !== "ok") throw new Error(`worker answered ${r.stdout}`);
      workers.push(w);
    }
    const wk = summary(workers.map((x) => x.cpuMs));
    rows.push({
      group: "startup",
      name: `worker thread start: new Worker (calculator worker) to its first answer (calc wall, ${label}), CPU of the process over it (wall ${summary(workers.map((x) => x.wallMs)).median.toFixed(0)} ms; to "online" only: ${summary(workers.map((x) => x.onlineCpuMs)).median.toFixed(0)} ms)`,
      ours_ms: wk.median,
      ours_spread: wk.spread,
      goal: verdict(wk.median < 200, "< 200 ms"),
    });
  }

  const pw = await pageWorkerStarts(RUNS);
  {
    const c = summary(pw.cpu.map((x) => x.firstSi));
    rows.push({
      group: "startup",
      name: `page worker's library, CPU: the same browser bundle evaluated in a fresh V8 context (Node vm) to its first answer, calc wall with SI numbers (evaluation alone ${summary(pw.cpu.map((x) => x.evaluated)).median.toFixed(0)} ms; a second calc with units then adds ${summary(pw.cpu.map((x) => x.thenUnits - x.firstSi)).median.toFixed(0)} ms: mathjs built on first use) x${RUNS}`,
      ours_ms: c.median,
      ours_spread: c.spread,
      goal: verdict(c.median < 200, "< 200 ms"),
    });
  }
  for (const [key, label] of [
    ["si", "SI numbers"],
    ["units", "units"],
  ]) {
    const w = summary(pw[key]);
    rows.push({
      group: "startup",
      name: `page Web Worker start in chromium: new Worker (the library bundled for the browser, ${(pw.bytes / 1e6).toFixed(2)} MB) to its first answer (calc wall, ${label}), wall time in the page, fresh page each x${RUNS}`,
      ours_ms: w.median,
      ours_spread: w.spread,
      goal: verdict(w.median < 200, "< 200 ms"),
    });
  }

  const cells = [];
  for (let i = 0; i < Math.min(RUNS, 3); i++) {
    const k = await client.launchKernel([process.execPath, helicoid, "kernel", "--connection-file", "{connection_file}"], { cwd: root });
    try {
      const started = procCpuMs(k.proc.pid);
      const first = await k.client.execute('import { runCalculator, getCalculator } from "@helicoid/lib";\nrunCalculator(getCalculator("wall")).outputs.width.value');
      const afterFirst = procCpuMs(k.proc.pid);
      await k.client.execute('runCalculator(getCalculator("wall360")).status');
      const afterSecond = procCpuMs(k.proc.pid);
      if (first.reply?.content?.status !== "ok") throw new Error(`first cell: ${JSON.stringify(first.reply?.content)}`);
      cells.push({ start: started, first: afterFirst - started, second: afterSecond - afterFirst });
    } finally {
      await k.stop();
    }
  }
  const cell = summary(cells.map((c) => c.first));
  rows.push({
    group: "startup",
    name: `first notebook cell: import @helicoid/lib + calc wall, CPU of the kernel process over the cell (x${cells.length}, fresh kernel each; the kernel's own start before it: ${summary(cells.map((c) => c.start)).median.toFixed(0)} ms CPU, tslab's TypeScript program and the library read then; a second cell, calc wall360: ${summary(cells.map((c) => c.second)).median.toFixed(0)} ms)`,
    ours_ms: cell.median,
    ours_spread: cell.spread,
    goal: verdict(cell.median < 300, "< 300 ms"),
  });
  return rows;
};
