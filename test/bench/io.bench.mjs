// Large-table reading: a 10-million-row CSV vector field (x, y in nm, mx, my, mz; an invented skyrmion
// lattice) read by helicoid's file reader (bytes parsed straight into typed arrays, then the grid)
// against numpy.loadtxt of the same file (the array only: less work than ours), each in a fresh
// process, interleaved (ours, numpy, ours, numpy, ...): wall time of the read inside the process and
// peak memory (max RSS, /usr/bin/time). A third column: the previous text-line reader (chunks
// decoded to strings, split into lines, then fields), once, in the first round.
// HELICOID_BENCH_CSV_ROWS (default 10,000,000; rounded to a grid), HELICOID_BENCH_IO_RUNS (3),
// HELICOID_BENCH_IO_PREVIOUS=0 leaves the previous reader out (it takes minutes at 10 million rows).
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, mkdtempSync, openSync, readFileSync, rmSync, statSync, writeSync, closeSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { systemPython, interleaved, summary, verdict } from "./util.mjs";

const root = fileURLToPath(new URL("../..", import.meta.url));
const ROWS = Number(process.env.HELICOID_BENCH_CSV_ROWS ?? 1e7);
const RUNS = Number(process.env.HELICOID_BENCH_IO_RUNS ?? 3);

/** Write the table once (kept in test-output/, which git ignores). */
function table(rows) {
  const nx = Math.round(Math.sqrt(rows)),
    ny = Math.round(rows / nx);
  const dir = join(root, "test-output");
  mkdirSync(dir, { recursive: true });
  const file = join(dir, `bench-field-${nx}x${ny}.csv`);
  if (existsSync(file)) return { file, n: nx * ny };
  const fd = openSync(file + ".part", "w");
  writeSync(fd, "x (nm),y (nm),mx,my,mz\n");
  const a = 40; // invented lattice period (cells), skyrmion radius 12, wall width 4
  for (let j = 0; j < ny; j++) {
    let s = "";
    for (let i = 0; i < nx; i++) {
      const x = (i % a) - a / 2 + 0.5,
        y = (j % a) - a / 2 + 0.5,
        r = Math.hypot(x, y);
      const th = 2 * Math.atan(Math.exp((12 - r) / 4)),
        ph = Math.atan2(y, x);
      s += `${(i * 0.5).toFixed(1)},${(j * 0.5).toFixed(1)},${(Math.sin(th) * Math.cos(ph)).toFixed(6)},${(Math.sin(th) * Math.sin(ph)).toFixed(6)},${Math.cos(th).toFixed(6)}\n`;
    }
    writeSync(fd, s);
  }
  closeSync(fd);
  spawnSync("mv", [file + ".part", file]);
  return { file, n: nx * ny };
}

function timed(argv) {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-bench-"));
  const out = join(dir, "time.txt");
  try {
    const r = spawnSync("/usr/bin/time", ["-f", "%U %S %M", "-o", out, ...argv], { cwd: root, encoding: "utf8", maxBuffer: 1 << 26 });
    if (r.status !== 0) throw new Error(`${argv.slice(0, 2).join(" ")} failed: ${r.stderr}`);
    const res = JSON.parse(r.stdout.trim().split("\n").pop());
    const [, , kb] = readFileSync(out, "utf8").trim().split(/\s+/).slice(-3).map(Number);
    return { ...res, rssMB: kb / 1024 };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const OURS = (file) => `
const { readVectorFieldFile } = require(${JSON.stringify(join(root, "kernel-ext", "dist", "io", "readFieldFile.js"))});
const t0 = performance.now();
const r = readVectorFieldFile(${JSON.stringify(file)});
const ms = performance.now() - t0;
let s = 0; for (let k = 2; k < r.field.m.length; k += 3) s += r.field.m[k];
console.log(JSON.stringify({ ms, n: r.field.nx * r.field.ny, mzSum: s }));`;

// The reader before the byte path: 16 MB chunks decoded to text, split into lines, each line to the parser.
const PREVIOUS = (file) => `
const fs = require("node:fs");
const { DelimitedFieldParser } = require(${JSON.stringify(join(root, "lib", "dist", "index.js"))});
const t0 = performance.now();
const fd = fs.openSync(${JSON.stringify(file)}, "r"); const size = fs.fstatSync(fd).size;
const parser = new DelimitedFieldParser({ file: "t.csv" }); const dec = new TextDecoder("utf-8");
const chunk = new Uint8Array(1 << 24); let carry = "", line = 0;
const feed = (t, last) => { const parts = (carry + t).split("\\n"); carry = last ? "" : parts.pop(); for (const p of parts) parser.line(p.endsWith("\\r") ? p.slice(0, -1) : p, ++line); };
for (let pos = 0; pos < size; ) { const n = fs.readSync(fd, chunk, 0, Math.min(chunk.length, size - pos), pos); if (n <= 0) break; pos += n; feed(dec.decode(chunk.subarray(0, n), { stream: true }), false); }
feed(dec.decode(), true);
const r = parser.finish();
const ms = performance.now() - t0;
let s = 0; for (let k = 2; k < r.field.m.length; k += 3) s += r.field.m[k];
console.log(JSON.stringify({ ms, n: r.field.nx * r.field.ny, mzSum: s }));`;

const NUMPY = `
import sys, time, json, numpy as np
t0 = time.perf_counter()
a = np.loadtxt(sys.argv[1], delimiter=",", skiprows=1)
ms = (time.perf_counter() - t0) * 1e3
print(json.dumps({"ms": ms, "n": int(a.shape[0]), "mzSum": float(a[:, 4].sum() / 1.0)}))`;

export default async () => {
  const rows = [];
  const { file, n } = table(ROWS);
  const mb = statSync(file).size / 1e6;
  const heap = "--max-old-space-size=8192";
  const prev = [];
  const { ours, ref } = interleaved(
    () => timed([process.execPath, heap, "-e", OURS(file)]),
    (i) => {
      const r = timed([systemPython, "-c", NUMPY, file]);
      if (i === 0 && process.env.HELICOID_BENCH_IO_PREVIOUS !== "0") prev.push(timed([process.execPath, heap, "-e", PREVIOUS(file)]));
      return r;
    },
    RUNS,
  );
  const o = summary(ours.map((x) => x.ms)),
    r = summary(ref.map((x) => x.ms)),
    p = summary(prev.map((x) => x.ms));
  const om = summary(ours.map((x) => x.rssMB)),
    rm = summary(ref.map((x) => x.rssMB)),
    pm = summary(prev.map((x) => x.rssMB));
  // Same data: the sums of mz agree (ours are unit vectors, as written to 6 decimals: close, not equal).
  const agree = Math.abs(ours[0].mzSum - ref[0].mzSum) / n;
  const timeGoal = o.median <= 2 * r.median,
    memGoal = om.median <= 2 * rm.median;
  rows.push({
    group: "io",
    name: `CSV vector field, ${n.toExponential(2)} rows (${mb.toFixed(0)} MB), fresh process, wall time of the read, interleaved x${RUNS} (mean |mz| difference ${agree.toExponential(1)})`,
    ours_ms: o.median,
    ours_spread: o.spread,
    reference: "numpy.loadtxt (array only)",
    reference_ms: r.median,
    reference_spread: r.spread,
    ratio: o.median / r.median,
    goal: verdict(timeGoal, "<= 2x numpy.loadtxt in time"),
  });
  rows.push({
    group: "io",
    name: `  peak memory (max RSS, MB, not ms) of the same runs`,
    ours_ms: om.median,
    ours_spread: om.spread,
    reference: "numpy.loadtxt",
    reference_ms: rm.median,
    reference_spread: rm.spread,
    ratio: om.median / rm.median,
    goal: verdict(memGoal, "<= 2x numpy.loadtxt in memory"),
  });
  if (prev.length)
    rows.push({
      group: "io",
      name: `  previous reader (text lines), first round: time ${p.median.toFixed(0)} ms [${p.min.toFixed(0)}-${p.max.toFixed(0)}], max RSS ${pm.median.toFixed(0)} MB`,
      ours_ms: o.median,
      reference: "previous text-line reader",
      reference_ms: p.median,
      ratio: o.median / p.median,
      goal: "(before/after)",
    });
  return rows;
};
