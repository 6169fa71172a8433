// Start-up benchmarks (cold, one fresh process each), side by side in one run:
// - `helicoid calc skyrmion --json` and `helicoid calc wall --json` against the minimal Python +
//   numpy + scipy script doing the same (test/bench/startup/*_ref.py, run by Debian's python3),
//   INTERLEAVED (ours, reference, ours, reference ...), CPU time = user + sys of the child from
//   /usr/bin/time, median and spread (min-max) over the runs;
// - importing @helicoid/lib (CPU of the require, RSS after) and whether mathjs got loaded;
// - the first notebook cell that imports @helicoid/lib and runs a calculator, in a started kernel
//   (CPU of the kernel process over the cell, from /proc/PID/stat);
// - a worker thread's start (the charge worker: new Worker to its first reply).
// Goals (issue 18): calc CPU <= the Python script's; first cell < 300 ms CPU; worker start < 200 ms.
import { spawnSync } from "node:child_process";
import { readFileSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import client from "../../kernel-ext/dist/comm/client.js";
import { systemPython, interleaved, summary, verdict } from "./util.mjs";

const root = fileURLToPath(new URL("../..", import.meta.url));
const here = join(root, "test", "bench");
const helicoid = join(root, "kernel-ext", "bin", "helicoid.js");
const RUNS = Number(process.env.HELICOID_BENCH_STARTUP_RUNS ?? 7);

/** CPU ms (user + sys) and max RSS (MB) of one child process, from /usr/bin/time. */
function timedChild(argv) {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-bench-"));
  const out = join(dir, "time.txt");
  try {
    const r = spawnSync("/usr/bin/time", ["-f", "%U %S %M", "-o", out, ...argv], { cwd: root, encoding: "utf8", maxBuffer: 1 << 26 });
    if (r.status !== 0) throw new Error(`${argv.join(" ")} failed: ${r.stderr}`);
    if (r.stdout.trim()) JSON.parse(r.stdout); // both sides print JSON: a failed run is not timed
    const [u, s, kb] = readFileSync(out, "utf8").trim().split(/\s+/).slice(-3).map(Number);
    return { cpu: (u + s) * 1000, rssMB: kb / 1024 };
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

const WORKER_CHILD = `
const { Worker } = require("node:worker_threads");
const t0 = process.cpuUsage(); const w0 = performance.now();
const w = new Worker(${JSON.stringify(join(root, "kernel-ext", "dist", "parallel", "chargeWorker.js"))});
w.once("online", () => {
  const c = process.cpuUsage(t0);
  console.log(JSON.stringify({ cpuMs: (c.user + c.system) / 1000, wallMs: performance.now() - w0 }));
  w.terminate();
});
`;

function procCpuMs(pid) {
  // utime + stime in clock ticks (fields 14, 15); 100 ticks a second on Linux
  const f = readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1].split(" ");
  return (Number(f[11]) + Number(f[12])) * 10;
}

export default async () => {
  const rows = [];
  for (const id of ["skyrmion", "wall"]) {
    const { ours, ref } = interleaved(
      () => timedChild([process.execPath, helicoid, "calc", id, "--demo", "--json"]),
      () => timedChild([systemPython, join(here, "startup", `${id}_ref.py`)]),
      RUNS,
    );
    const o = summary(ours.map((x) => x.cpu));
    const p = summary(ref.map((x) => x.cpu));
    rows.push({
      group: "startup",
      name: `helicoid calc ${id} --demo --json, cold process, CPU user+sys, interleaved x${RUNS} (RSS ${summary(ours.map((x) => x.rssMB)).median.toFixed(0)} MB vs ${summary(ref.map((x) => x.rssMB)).median.toFixed(0)} MB)`,
      ours_ms: o.median,
      ours_spread: o.spread,
      reference: `python3 + numpy + scipy script (startup/${id}_ref.py)${id === "skyrmion" ? ": one field, local magnetostatics (less work)" : ""}`,
      reference_ms: p.median,
      reference_spread: p.spread,
      ratio: o.median / p.median,
      goal: verdict(o.median <= p.median, "CPU <= the Python script's"),
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

  const workers = [];
  for (let i = 0; i < RUNS; i++) {
    const r = spawnSync(process.execPath, ["-e", WORKER_CHILD], { encoding: "utf8" });
    if (r.status !== 0) throw new Error(`worker child failed: ${r.stderr}`);
    workers.push(JSON.parse(r.stdout));
  }
  const wk = summary(workers.map((x) => x.cpuMs));
  rows.push({
    group: "startup",
    name: `worker thread start (charge worker, new Worker to online), CPU of the process (wall ${summary(workers.map((x) => x.wallMs)).median.toFixed(0)} ms)`,
    ours_ms: wk.median,
    ours_spread: wk.spread,
    goal: verdict(wk.median < 200, "< 200 ms"),
  });

  const cells = [];
  for (let i = 0; i < Math.min(RUNS, 3); i++) {
    const k = await client.launchKernel([process.execPath, helicoid, "kernel", "--connection-file", "{connection_file}"], { cwd: root });
    try {
      const before = procCpuMs(k.proc.pid);
      await k.client.execute('import { runCalculator, getCalculator } from "@helicoid/lib";\nrunCalculator(getCalculator("wall")).outputs.width.value');
      cells.push(procCpuMs(k.proc.pid) - before);
    } finally {
      await k.stop();
    }
  }
  const cell = summary(cells);
  rows.push({
    group: "startup",
    name: `first notebook cell: import @helicoid/lib + calc wall, CPU of the kernel process over the cell (x${cells.length}, fresh kernel each)`,
    ours_ms: cell.median,
    ours_spread: cell.spread,
    goal: verdict(cell.median < 300, "< 300 ms"),
  });
  return rows;
};
