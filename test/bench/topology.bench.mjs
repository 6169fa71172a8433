// Topology benchmarks. The lattice skyrmion number against the best numpy code is latticeQ.bench.mjs
// (interleaved, row-blocked numpy); this file holds the rows around it, each interleaved A B A B:
// worker threads against our own single thread (the speed-up; numpy has no threaded form to set
// beside it), the density map against Q alone, the texture calculator (ours only: the slider budget),
// the peak memory of reading a field and computing Q (a fresh process, against the field's bytes),
// and reading a 200 MB .npy file against numpy.load with the same normalization, through the Python
// peer (pythonPeer.mjs). `helicoid charge` on the same size of file is charge.bench.mjs.
import lib from "../../lib/dist/internal.js";
import par from "../../kernel-ext/dist/parallel/parallelSkyrmionNumber.js";
import rff from "../../kernel-ext/dist/io/readFieldFile.js";
import { interleavedJs, runsOf, summary } from "./util.mjs";
import { pythonPeer, interleavedWithPython } from "./pythonPeer.mjs";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { tmpdir } from "node:os";
import { join, dirname } from "node:path";
import { fileURLToPath } from "node:url";

const here = dirname(fileURLToPath(import.meta.url));

const NUMPY_LOAD = `
import numpy as np
def load_norm(path):
    a = np.load(path)
    n = np.sqrt(np.einsum("...i,...i", a, a))
    vac = ~(n > 1e-9)
    a /= np.where(vac, 1.0, n)[..., None]
    return float(a[..., 2].sum())
`;

// Child process: peak resident memory of reading the field and computing Q, against the field's bytes.
const MEMORY_CHILD = `
const lib = require(${JSON.stringify(join(here, "../../lib/dist/internal.js"))});
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
    const shared = par.toSharedField(field);
    await par.parallelSkyrmionNumber(shared, { threads: 2 }); // start the pool
    const t2 = await interleavedJs(
      () => par.parallelSkyrmionNumber(shared, { threads: 2, boundary: "periodic" }),
      () => lib.skyrmionNumber(field, { boundary: "periodic" }),
      { runs: 11, warmup: 2 },
    );
    await par.closeChargeWorkers();
    {
      const o = summary(t2.a),
        r = summary(t2.b);
      const q2 = t2.aValue.Q ?? t2.aValue;
      rows.push({
        group: "topology",
        name: `lattice Q ${n}x${n}, 2 threads (worker_threads, shared memory) against our 1 thread, wall time, warm, interleaved x11 (Q ${Number(q2).toFixed(6)} and ${t2.bValue.Q.toFixed(6)})`,
        ours_ms: o.median,
        ours_spread: o.spread,
        reference: "skyrmionNumber, 1 thread (ours)",
        reference_ms: r.median,
        reference_spread: r.spread,
        ratio: o.median / r.median,
        goal: "(speed-up of the second thread)",
      });
    }

    // per-plaquette density map (one atan2 per plaquette where both half-angles are below pi/2)
    const dm = await interleavedJs(
      () => lib.skyrmionNumber(field, { boundary: "periodic", density: true }),
      () => lib.skyrmionNumber(field, { boundary: "periodic" }),
      { runs: 7, warmup: 2 },
    );
    {
      const o = summary(dm.a),
        r = summary(dm.b);
      rows.push({
        group: "topology",
        name: `lattice Q with density map ${n}x${n}, 1 thread, against Q alone, warm, interleaved x7`,
        ours_ms: o.median,
        ours_spread: o.spread,
        reference: "skyrmionNumber without the map (ours)",
        reference_ms: r.median,
        reference_spread: r.spread,
        ratio: o.median / r.median,
        goal: "(information)",
      });
    }

    // the texture calculator as the explorer runs it (live sliders), and the size of its result
    const spec = lib.getCalculator("texture");
    for (const side of [128, 512]) {
      const t = await runsOf(() => lib.runCalculator(spec, { n: side }), { runs: side > 200 ? 5 : 21, warmup: 2 });
      const bytes = JSON.stringify(lib.runCalculator(spec, { n: side })).length;
      rows.push({
        group: "topology",
        name: `texture calculator n = ${side}${side === 128 ? " (default)" : ""}, warm: result ${(bytes / 1e3).toFixed(0)} kB as JSON`,
        ours_ms: t.median,
        ours_spread: t.spread,
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
    const { readVectorField } = lib;
    const { readFileSync } = await import("node:fs");
    const peer = pythonPeer();
    try {
      await peer.define(NUMPY_LOAD);
      const mzSum = (f) => {
        let t = 0;
        for (let k = 2; k < f.m.length; k += 3) t += f.m[k];
        return t;
      };
      for (const [name, ours, runs] of [
        [`read ${(bytes / 1e6).toFixed(0)} MB .npy (normalize, mask)`, () => mzSum(rff.readVectorFieldFile(bigPath, { dx: 1e-9 }).field), 5],
        [
          "read the same file via readFile + lib reader (browser path)",
          () => mzSum(readVectorField(new Uint8Array(readFileSync(bigPath)), { file: "big.npy", dx: 1e-9 }).field),
          3,
        ],
      ]) {
        const r = await interleavedWithPython(peer, ours, "load_norm", [bigPath], { runs, warmup: 1 });
        const o = summary(r.ours),
          q = summary(r.ref);
        const same = Math.abs(r.oursValue - r.refValue) <= 1e-9 * side * side;
        rows.push({
          group: "topology",
          name: `${name}, file in the page cache, CPU time, interleaved x${runs} (sum of m_z ${same ? "agrees" : "DIFFERS"}; wall-time ratio ${(summary(r.oursWall).median / summary(r.refWall).median).toFixed(2)})`,
          ours_ms: o.median,
          ours_spread: o.spread,
          reference: "numpy.load + the same normalization (1 thread)",
          reference_ms: q.median,
          reference_spread: q.spread,
          ratio: o.median / q.median,
          goal: name.includes("browser path") ? "(information)" : "ours <= 1000 ms",
        });
      }
    } finally {
      await peer.close();
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return rows;
};
