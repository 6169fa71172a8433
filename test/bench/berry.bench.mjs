// Benchmarks of the Berry-phase domain: Chern numbers on a 200 x 200 zone (2-band Haldane model,
// 6-band Haldane supercell), single-spin diagonalization for S = 50 side by side with numpy's eigh,
// and the Hermitian eigensolver against mathjs eigs (the library alternative).
import lib from "../../lib/dist/index.js";
import { eigs, complex } from "mathjs";
import { medianMs, pythonTiming } from "./util.mjs";

const kB = 1.380649e-23;

function lcg(seed) {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32) - 0.5;
}
function randomHermitian(n, seed) {
  const r = lcg(seed);
  const re = new Float64Array(n * n), im = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) {
    const a = r(), b = i === j ? 0 : r();
    re[i * n + j] = a; re[j * n + i] = a; im[i * n + j] = b; im[j * n + i] = -b;
  }
  return { re, im };
}

export default async () => {
  const rows = [];
  const haldane = lib.haldaneModel({ t2: 0.1, phi: Math.PI / 2, M: 0.1 });
  rows.push({
    group: "chern", name: "Haldane 2-band, 200 x 200 grid",
    ours_ms: await medianMs(() => lib.chernNumbers(haldane, { n1: 200 }), { runs: 7, warmup: 2 }), goal: "<= 200 ms",
  });
  const sc = lib.supercellModel(lib.haldaneSpec({ t2: 0.1, phi: Math.PI / 2, M: 0.1 }), 3, 1);
  rows.push({
    group: "chern", name: "Haldane 3x1 supercell 6-band (2 groups of 3), 200 x 200 grid",
    ours_ms: await medianMs(() => lib.chernNumbers(sc, { n1: 200, groups: [[0, 1, 2], [3, 4, 5]] }), { runs: 5, warmup: 1 }), goal: "<= 200 ms",
  });

  // Single spin S = 50: H = -D Sz^2 + E (Sx^2 - Sy^2) - g muB B Sx, 101 x 101 real symmetric.
  const p = { S: 50, D: 0.3 * kB, E: 0.05 * kB, g: 2 };
  const H = lib.giantSpinMatrix(p, [0.4, 0, 0]);
  const n = H.dim;
  const solver = new lib.SymmetricEigenSolver(n);
  const ref = pythonTiming(`
import json, sys, time, numpy as np
d = json.load(sys.stdin); n = d["n"]; A = np.array(d["a"]).reshape(n, n)
def med(f, runs=41):
    for _ in range(5): f()
    t = []
    for _ in range(runs):
        t0 = time.perf_counter(); f(); t.append((time.perf_counter() - t0) * 1e3)
    return sorted(t)[len(t) // 2]
print(json.dumps({"eigh": med(lambda: np.linalg.eigh(A)), "eigvalsh": med(lambda: np.linalg.eigvalsh(A))}))`, { n, a: Array.from(H.re) });
  const full = await medianMs(() => solver.solve(H.re, true), { runs: 41, warmup: 5 });
  rows.push({ group: "single spin S=50", name: "dense 101 x 101, values + vectors", ours_ms: full, reference: "numpy.linalg.eigh", reference_ms: ref.eigh, ratio: full / ref.eigh, goal: "<= 5 ms, <= 2x numpy" });
  const vals = await medianMs(() => solver.solve(H.re, false), { runs: 41, warmup: 5 });
  rows.push({ group: "single spin S=50", name: "dense 101 x 101, values only", ours_ms: vals, reference: "numpy.linalg.eigvalsh", reference_ms: ref.eigvalsh, ratio: vals / ref.eigvalsh, goal: "<= 5 ms, <= 2x numpy" });
  const blocks = lib.hardAxisParityBlocks(p, 0.4);
  const s1 = new lib.SymmetricEigenSolver(blocks.nSym), s2 = new lib.SymmetricEigenSolver(blocks.nAnti);
  const par = await medianMs(() => { s1.solve(blocks.sym, true); s2.solve(blocks.anti, true); }, { runs: 41, warmup: 5 });
  rows.push({ group: "single spin S=50", name: "parity blocks 51 + 50, values + vectors", ours_ms: par, reference: "numpy.linalg.eigh (dense)", reference_ms: ref.eigh, ratio: par / ref.eigh, goal: "<= 5 ms, <= 2x numpy" });

  // Hermitian eigensolver: ours against mathjs eigs (complex), the reason for the choice.
  for (const m of [6, 40]) {
    const A = randomHermitian(m, 11 + m);
    const hs = new lib.HermitianEigenSolver(m);
    const ours = await medianMs(() => hs.solve(A.re, A.im, true), { runs: m < 10 ? 201 : 21, warmup: 5 });
    const rowsC = [];
    for (let i = 0; i < m; i++) rowsC.push(Array.from({ length: m }, (_, j) => complex(A.re[i * m + j], A.im[i * m + j])));
    const mj = await medianMs(() => eigs(rowsC), { runs: m < 10 ? 21 : 3, warmup: 1 });
    rows.push({ group: "hermitian eigensolver", name: `${m} x ${m} complex, values + vectors`, ours_ms: ours, reference: "mathjs eigs", reference_ms: mj, ratio: ours / mj, goal: "faster than the library" });
  }
  return rows;
};
