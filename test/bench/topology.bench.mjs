// Topology benchmarks, side by side with numpy (Debian's python3-numpy, the vectorized code a user would
// write instead): lattice skyrmion number of a 2048 x 2048 field, single thread and worker threads; peak
// memory against the field's own bytes (child process); reading a 200 MB .npy file.
import lib from "../../lib/dist/index.js";
import par from "../../kernel-ext/dist/parallel/parallelSkyrmionNumber.js";
import rff from "../../kernel-ext/dist/io/readFieldFile.js";
import { medianMs, pythonTiming } from "./util.mjs";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { tmpdir } from "node:os";
import { join, dirname } from "node:path";
import { fileURLToPath } from "node:url";

const here = dirname(fileURLToPath(import.meta.url));

const NUMPY_Q = `
import json, sys, time
import numpy as np
d = json.load(sys.stdin)
m = np.load(d["path"])
def q_lattice(m):
    a = m
    b = np.roll(m, -1, axis=1)
    c = np.roll(b, -1, axis=0)
    dd = np.roll(m, -1, axis=0)
    def omega(p, q, r):
        t = np.einsum("...i,...i", p, np.cross(q, r))
        den = 1 + np.einsum("...i,...i", p, q) + np.einsum("...i,...i", q, r) + np.einsum("...i,...i", r, p)
        return 2 * np.arctan2(t, den)
    return float((omega(a, b, c) + omega(a, c, dd)).sum() / (4 * np.pi))
Q = q_lattice(m)
ts = []
for _ in range(d["runs"]):
    t0 = time.perf_counter(); q_lattice(m); ts.append((time.perf_counter() - t0) * 1e3)
ts.sort()
print(json.dumps({"ms": ts[len(ts) // 2], "Q": Q}))
`;

const NUMPY_LOAD = `
import json, sys, time
import numpy as np
d = json.load(sys.stdin)
ts = []
for _ in range(d["runs"]):
    t0 = time.perf_counter(); a = np.load(d["path"]); a.sum(); ts.append((time.perf_counter() - t0) * 1e3)
ts.sort()
print(json.dumps({"ms": ts[len(ts) // 2]}))
`;

// Child process: peak resident memory of reading the field and computing Q, against the field's bytes.
const MEMORY_CHILD = `
const lib = require(${JSON.stringify(join(here, "../../lib/dist/index.js"))});
const rff = require(${JSON.stringify(join(here, "../../kernel-ext/dist/io/readFieldFile.js"))});
global.gc && global.gc();
const base = process.memoryUsage().rss;
const maxBefore = process.resourceUsage().maxRSS * 1024;
const { field } = rff.readVectorFieldFile(process.argv[1], { dx: 1e-9 });
const q = lib.skyrmionNumber(field, { boundary: "periodic" });
const peak = process.resourceUsage().maxRSS * 1024;
console.log(JSON.stringify({ base, maxBefore, peak, fieldBytes: field.m.byteLength + (field.vacuum ? field.vacuum.byteLength : 0), Q: q.Q }));
`;

export default async () => {
  const rows = [];
  const dir = mkdtempSync(join(tmpdir(), "helicoid-bench-topology-"));
  try {
    const n = 2048;
    // a smooth, simulated-looking test texture: a periodic skyrmion lattice (invented demo, Q = -(number of skyrmions))
    const field = lib.skyrmionLatticeTexture({ nx: n, ny: n, dx: 1e-9 }, { a: 128e-9, R: 30e-9, w: 8e-9, helicity: 0.3 });
    const path = join(dir, "field2048.npy");
    writeFileSync(path, lib.writeNpyVectorField(field));
    const ours = await medianMs(() => lib.skyrmionNumber(field, { boundary: "periodic" }), { runs: 11, warmup: 2 });
    const Q = lib.skyrmionNumber(field, { boundary: "periodic" }).Q;
    const np = pythonTiming(NUMPY_Q, { path, runs: 5 });
    rows.push({
      group: "topology",
      name: `lattice Q ${n}x${n}, 1 thread (Q = ${Q.toFixed(6)}, numpy ${np.Q.toFixed(6)})`,
      ours_ms: ours,
      reference: "numpy vectorized, same formula",
      reference_ms: np.ms,
      ratio: ours / np.ms,
      goal: "ratio <= 0.2",
    });
    const shared = par.toSharedField(field);
    await par.parallelSkyrmionNumber(shared, { threads: 2 }); // start the pool
    const ours2 = await medianMs(() => par.parallelSkyrmionNumber(shared, { threads: 2, boundary: "periodic" }), { runs: 11, warmup: 2 });
    rows.push({
      group: "topology",
      name: `lattice Q ${n}x${n}, 2 threads (worker_threads, shared memory)`,
      ours_ms: ours2,
      reference: "numpy vectorized, same formula",
      reference_ms: np.ms,
      ratio: ours2 / np.ms,
      goal: "ratio <= 0.12",
    });
    await par.closeChargeWorkers();

    // per-plaquette density map (one atan2 per plaquette where both half-angles are below pi/2);
    // numpy's vectorized formula builds the same per-triangle arrays before summing
    const dens = await medianMs(() => lib.skyrmionNumber(field, { boundary: "periodic", density: true }), { runs: 7, warmup: 2 });
    rows.push({
      group: "topology",
      name: `lattice Q with density map ${n}x${n}, 1 thread`,
      ours_ms: dens,
      reference: "numpy vectorized, same formula",
      reference_ms: np.ms,
      ratio: dens / np.ms,
      goal: "(information)",
    });

    // the texture calculator as the explorer runs it (live sliders), and the size of its result
    const spec = lib.getCalculator("texture");
    for (const side of [128, 512]) {
      const t = await medianMs(() => lib.runCalculator(spec, { n: side }), { runs: side > 200 ? 5 : 21, warmup: 2 });
      const bytes = JSON.stringify(lib.runCalculator(spec, { n: side })).length;
      rows.push({
        group: "topology",
        name: `texture calculator n = ${side}${side === 128 ? " (default)" : ""}: result ${(bytes / 1e3).toFixed(0)} kB as JSON`,
        ours_ms: t,
        goal: side === 128 ? "live slider (<= 16 ms)" : "(information)",
      });
    }

    // peak memory in a fresh process
    const child = spawnSync(process.execPath, ["--expose-gc", "-e", MEMORY_CHILD, path], { encoding: "utf8", maxBuffer: 1 << 20 });
    if (child.status !== 0) throw new Error(`memory child failed: ${child.stderr}`);
    const mem = JSON.parse(child.stdout);
    const extra = mem.peak - Math.min(mem.base, mem.maxBefore);
    rows.push({
      group: "topology",
      name: `peak memory: read .npy + Q, ${n}x${n} (${(extra / 2 ** 20).toFixed(0)} MiB over ${(mem.fieldBytes / 2 ** 20).toFixed(0)} MiB field)`,
      ours_ms: undefined,
      reference: "field bytes",
      ratio: extra / mem.fieldBytes,
      goal: "ratio <= 2",
      peak_bytes: extra,
      field_bytes: mem.fieldBytes,
    });

    // 200 MB .npy read
    rmSync(path);
    const side = 2888; // 2888^2 * 3 * 8 bytes = 200.2 MB
    const big = new Float64Array(3 * side * side);
    for (let c = 0; c < side * side; c++) {
      const t = (c % side) * 0.01;
      big[3 * c] = Math.cos(t);
      big[3 * c + 1] = Math.sin(t);
      big[3 * c + 2] = 0.3;
    }
    const bigPath = join(dir, "field200MB.npy");
    writeFileSync(bigPath, lib.writeNpyVectorField({ nx: side, ny: side, nz: 1, m: big }));
    const bytes = big.byteLength;
    const read = await medianMs(() => rff.readVectorFieldFile(bigPath, { dx: 1e-9 }), { runs: 5, warmup: 1 });
    const npl = pythonTiming(NUMPY_LOAD, { path: bigPath, runs: 5 });
    rows.push({
      group: "topology",
      name: `read ${(bytes / 1e6).toFixed(0)} MB .npy (normalize, mask) [goal: <= 1000 ms]`,
      ours_ms: read,
      reference: "numpy.load + sum (no normalization)",
      reference_ms: npl.ms,
      ratio: read / npl.ms,
      goal: "ours <= 1000 ms",
    });
    const { readVectorField } = lib;
    const { readFileSync } = await import("node:fs");
    const generic = await medianMs(() => readVectorField(new Uint8Array(readFileSync(bigPath)), { file: "big.npy", dx: 1e-9 }), { runs: 3, warmup: 1 });
    rows.push({
      group: "topology",
      name: "read the same file via readFile + lib reader (browser path)",
      ours_ms: generic,
      reference: "numpy.load + sum",
      reference_ms: npl.ms,
      ratio: generic / npl.ms,
      goal: "(information)",
    });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return rows;
};
