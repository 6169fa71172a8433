// Benchmarks of the spin-chain domain, ours and the reference interleaved (ours, reference, ours,
// reference, ...; medians; Lanczos with full re-orthogonalization and without): the N = 20 Heisenberg ring in its S^z = 0 sector (dimension 184,756)
// against numpy building the sparse matrix plus scipy.sparse.linalg.eigsh (times taken inside Python,
// interpreter start excluded); the N = 24 ground state with momentum and spin-inversion sectors (time
// and peak memory); S(q, w) of an N = 16 ring at T = 0 for all q.
import lib from "../../lib/dist/index.js";
import { pythonTiming } from "./util.mjs";

const scipyScript = `
import json, sys, time, numpy as np, scipy.sparse as sp, scipy.sparse.linalg as sla
from itertools import combinations
d = json.load(sys.stdin); N = d["N"]; tol = d["tol"]
t0 = time.perf_counter()
# states with N/2 up spins as integers, sorted; neighbours found by searchsorted
states = np.array(sorted(sum(1 << np.array(c)) for c in combinations(range(N), N // 2)), dtype=np.int64)
dim = len(states)
diag = np.zeros(dim); rows = []; cols = []
for i in range(N):
    j = (i + 1) % N
    bi = (states >> i) & 1; bj = (states >> j) & 1
    diag += np.where(bi == bj, 0.25, -0.25)
    anti = np.nonzero(bi != bj)[0]
    flipped = states[anti] ^ ((1 << i) | (1 << j))
    rows.append(np.searchsorted(states, flipped)); cols.append(anti)
rows = np.concatenate(rows + [np.arange(dim)]); cols = np.concatenate(cols + [np.arange(dim)])
vals = np.concatenate([np.full(len(rows) - dim, 0.5), diag])
H = sp.csr_matrix((vals, (rows, cols)), shape=(dim, dim))
t1 = time.perf_counter()
w = sla.eigsh(H, k=1, which="SA", tol=tol)[0]
t2 = time.perf_counter()
print(json.dumps({"build": (t1 - t0) * 1e3, "eigsh": (t2 - t1) * 1e3, "e0": float(w[0]), "dim": dim}))
`;

function time(fn) {
  const t0 = performance.now();
  const r = fn();
  return { ms: performance.now() - t0, r };
}

export default async () => {
  const rows = [];
  const N = 20;
  const model = lib.chainModel({ N, Jz: 1, Jperp: 1 });
  const tol = 1e-10;
  const ours = [], oursPlain = [], refB = [], refE = [];
  let e0 = 0, refE0 = 0;
  for (let round = 0; round < 3; round++) {
    const o = time(() => lib.sectorLevels(model, { nUp: N / 2, m: null, flip: 0 }, { tol, vectors: false }));
    ours.push(o.ms);
    e0 = o.r.values[0];
    oursPlain.push(time(() => lib.sectorLevels(model, { nUp: N / 2, m: null, flip: 0 }, { tol, vectors: false, reorthogonalization: "none" })).ms);
    const p = pythonTiming(scipyScript, { N, tol });
    refB.push(p.build);
    refE.push(p.eigsh);
    refE0 = p.e0;
  }
  const med = (a) => [...a].sort((x, y) => x - y)[Math.floor(a.length / 2)];
  const refTotal = med(refB.map((b, i) => b + refE[i]));
  rows.push({
    group: "chains", name: `Heisenberg ring N = 20, S^z = 0 (dim 184756), ground state, tol ${tol} (E0/N ours ${(e0 / N).toFixed(10)}, scipy ${(refE0 / N).toFixed(10)})`,
    ours_ms: med(ours), reference: `numpy build (${med(refB).toFixed(0)} ms) + scipy eigsh (${med(refE).toFixed(0)} ms)`, reference_ms: refTotal, ratio: med(ours) / refTotal, goal: "<= 1x",
  });
  rows.push({
    group: "chains", name: "the same, Lanczos without re-orthogonalization (lowest level only)",
    ours_ms: med(oursPlain), reference: "numpy build + scipy eigsh", reference_ms: refTotal, ratio: med(oursPlain) / refTotal, goal: "<= 1x",
  });

  // N = 24: the ground state lies in k = 0 or pi with spin-inversion parity +-1 (S^z = 0).
  const m24 = lib.chainModel({ N: 24, Jz: 1, Jperp: 1 });
  const rss0 = process.memoryUsage().rss;
  const t24 = time(() => {
    let best = Infinity, dims = [];
    for (const m of [0, 12]) for (const flip of [1, -1]) {
      const r = lib.sectorLevels(m24, { nUp: 12, m, flip }, { tol: 1e-10, vectors: false, reorthogonalization: "none" });
      dims.push(r.dimension);
      best = Math.min(best, r.values[0]);
    }
    return { best, dims };
  });
  const peak = process.resourceUsage().maxRSS / 1024; // MB
  rows.push({
    group: "chains", name: `Heisenberg ring N = 24, 4 sectors (k = 0, pi; flip +-1; Lanczos without re-orthogonalization; dims ${t24.r.dims.join(", ")}), E0/N = ${(t24.r.best / 24).toFixed(10)}; peak RSS ${peak.toFixed(0)} MB (start ${(rss0 / 2 ** 20).toFixed(0)} MB)`,
    ours_ms: t24.ms, goal: "<= 60 s, <= 2 GB",
  });

  // S(q, w), N = 16, T = 0, all q from 0 to pi (reflection gives the rest)
  const m16 = lib.chainModel({ N: 16, Jz: 4, Jperp: 1, hx: 0.3 });
  const omega = Array.from({ length: 400 }, (_, i) => (i * 8) / 399);
  const zz = time(() => lib.dynamicStructureFactor(m16, { T: 0, eta: 0.05, omega, components: ["zz"], steps: 150 }));
  rows.push({ group: "chains", name: "S^zz(q, w), N = 16 ring with hx, T = 0, 9 q, 400 w, continued fractions of depth 150", ours_ms: zz.ms, goal: "<= 10 s" });
  const all = time(() => lib.dynamicStructureFactor(m16, { T: 0, eta: 0.05, omega, components: ["xx", "yy", "zz", "chiral"], steps: 150 }));
  rows.push({ group: "chains", name: "S^xx, S^yy, S^zz, C(q, w), N = 16, T = 0, 9 q (5 continued fractions per q)", ours_ms: all.ms, goal: "<= 10 s" });
  return rows;
};
