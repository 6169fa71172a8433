// Benchmarks of the Berry-phase domain: Chern numbers on a 200 x 200 zone (2-band Haldane model,
// 6-band Haldane supercell), single-spin diagonalization for S = 50 side by side with numpy's eigh
// (dense and banded paths; scipy's eig_banded as the banded LAPACK reference), the double-double
// tunnel splitting, the calculator specs on defaults and their slowest corner, and the Hermitian
// eigensolver against mathjs eigs (the library alternative).
import lib from "../../lib/dist/internal.js";
import { eigs, complex } from "mathjs";
import { medianMs, pythonTiming } from "./util.mjs";
import parallelChern from "../../kernel-ext/dist/parallel/parallelChernNumbers.js";

const kB = 1.380649e-23;

function lcg(seed) {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32 - 0.5;
}
function randomHermitian(n, seed) {
  const r = lcg(seed);
  const re = new Float64Array(n * n),
    im = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      const a = r(),
        b = i === j ? 0 : r();
      re[i * n + j] = a;
      re[j * n + i] = a;
      im[i * n + j] = b;
      im[j * n + i] = -b;
    }
  return { re, im };
}

export default async () => {
  const rows = [];
  // Warm-up of 4 calls: the first calls of chernNumbers run partly unoptimized code (JIT tier-up).
  const haldane = lib.haldaneModel({ t2: 0.1, phi: Math.PI / 2, M: 0.1 });
  rows.push({
    group: "chern",
    name: "Haldane 2-band, 200 x 200 grid",
    ours_ms: await medianMs(() => lib.chernNumbers(haldane, { n1: 200 }), { runs: 9, warmup: 4 }),
    goal: "<= 200 ms",
  });
  const sc = lib.supercellModel(lib.haldaneSpec({ t2: 0.1, phi: Math.PI / 2, M: 0.1 }), 3, 1);
  rows.push({
    group: "chern",
    name: "Haldane 2-band, 200 x 200 grid, general Hermitian solver (no closed form)",
    ours_ms: await medianMs(() => lib.chernNumbers(haldane, { n1: 200, closedFormTwoBand: false }), { runs: 5, warmup: 1 }),
    goal: "(for comparison)",
  });
  rows.push({
    group: "chern",
    name: "Haldane 3x1 supercell 6-band (2 groups of 3), 200 x 200 grid",
    ours_ms: await medianMs(
      () =>
        lib.chernNumbers(sc, {
          n1: 200,
          groups: [
            [0, 1, 2],
            [3, 4, 5],
          ],
        }),
      { runs: 9, warmup: 4 },
    ),
    goal: "<= 200 ms",
  });
  // The same on worker threads (kernel-ext parallelChernNumbers): the pool is started first, as a
  // notebook session keeps it; "threads" includes the calling thread.
  await parallelChern.parallelChernNumbers(sc, {
    n1: 200,
    groups: [
      [0, 1, 2],
      [3, 4, 5],
    ],
    threads: 2,
  });
  rows.push({
    group: "chern",
    name: "Haldane 3x1 supercell 6-band, 200 x 200 grid, parallelChernNumbers, 2 threads",
    ours_ms: await medianMs(
      () =>
        parallelChern.parallelChernNumbers(sc, {
          n1: 200,
          groups: [
            [0, 1, 2],
            [3, 4, 5],
          ],
          threads: 2,
        }),
      { runs: 9, warmup: 2 },
    ),
    goal: "<= 200 ms",
  });
  await parallelChern.closeChernWorkers();

  // Single spin S = 50: H = -D Sz^2 + E (Sx^2 - Sy^2) - g muB B Sx, 101 x 101 real symmetric.
  const p = { S: 50, D: 0.3 * kB, E: 0.05 * kB, g: 2 };
  const H = lib.giantSpinMatrix(p, [0.4, 0, 0]);
  const n = H.dim;
  const solver = new lib.SymmetricEigenSolver(n);
  const ref = pythonTiming(
    `
import json, sys, time, numpy as np
d = json.load(sys.stdin); n = d["n"]; A = np.array(d["a"]).reshape(n, n)
def med(f, runs=41):
    for _ in range(5): f()
    t = []
    for _ in range(runs):
        t0 = time.perf_counter(); f(); t.append((time.perf_counter() - t0) * 1e3)
    return sorted(t)[len(t) // 2]
from scipy.linalg import eig_banded
ab = np.zeros((3, n))
for dd in range(3): ab[dd, :n - dd] = np.diagonal(A, -dd)
print(json.dumps({"eigh": med(lambda: np.linalg.eigh(A)), "eigvalsh": med(lambda: np.linalg.eigvalsh(A)),
                  "banded": med(lambda: eig_banded(ab, lower=True)), "bandedValues": med(lambda: eig_banded(ab, lower=True, eigvals_only=True))}))`,
    { n, a: Array.from(H.re) },
  );
  const full = await medianMs(() => solver.solve(H.re, true), { runs: 41, warmup: 5 });
  rows.push({
    group: "single spin S=50",
    name: "dense 101 x 101, values + vectors",
    ours_ms: full,
    reference: "numpy.linalg.eigh",
    reference_ms: ref.eigh,
    ratio: full / ref.eigh,
    goal: "<= 5 ms, <= 2x numpy",
  });
  const vals = await medianMs(() => solver.solve(H.re, false), { runs: 41, warmup: 5 });
  rows.push({
    group: "single spin S=50",
    name: "dense 101 x 101, values only",
    ours_ms: vals,
    reference: "numpy.linalg.eigvalsh",
    reference_ms: ref.eigvalsh,
    ratio: vals / ref.eigvalsh,
    goal: "<= 5 ms, <= 2x numpy",
  });
  // The giant-spin Hamiltonian for a field in the xz plane is pentadiagonal: the banded solver.
  const band = new lib.SymmetricBandEigenSolver(n, 2);
  const bfull = await medianMs(() => band.solve(H.re, true), { runs: 41, warmup: 5 });
  rows.push({
    group: "single spin S=50",
    name: "banded (pentadiagonal) 101 x 101, values + vectors",
    ours_ms: bfull,
    reference: "numpy.linalg.eigh",
    reference_ms: ref.eigh,
    ratio: bfull / ref.eigh,
    goal: "<= 5 ms, <= 2x numpy",
  });
  rows.push({
    group: "single spin S=50",
    name: "banded 101 x 101, values + vectors",
    ours_ms: bfull,
    reference: "scipy.linalg.eig_banded",
    reference_ms: ref.banded,
    ratio: bfull / ref.banded,
    goal: "(banded LAPACK, for comparison)",
  });
  const bvals = await medianMs(() => band.solve(H.re, false), { runs: 41, warmup: 5 });
  rows.push({
    group: "single spin S=50",
    name: "banded 101 x 101, values only",
    ours_ms: bvals,
    reference: "numpy.linalg.eigvalsh",
    reference_ms: ref.eigvalsh,
    ratio: bvals / ref.eigvalsh,
    goal: "<= 5 ms, <= 2x numpy",
  });
  rows.push({
    group: "single spin S=50",
    name: "banded 101 x 101, values only",
    ours_ms: bvals,
    reference: "scipy.linalg.eig_banded",
    reference_ms: ref.bandedValues,
    ratio: bvals / ref.bandedValues,
    goal: "(banded LAPACK, for comparison)",
  });
  const blocks = lib.hardAxisParityBlocks(p, 0.4);
  const s1 = new lib.SymmetricEigenSolver(blocks.nSym),
    s2 = new lib.SymmetricEigenSolver(blocks.nAnti);
  const par = await medianMs(
    () => {
      s1.solve(blocks.sym, true);
      s2.solve(blocks.anti, true);
    },
    { runs: 41, warmup: 5 },
  );
  rows.push({
    group: "single spin S=50",
    name: "parity blocks 51 + 50, values + vectors",
    ours_ms: par,
    reference: "numpy.linalg.eigh (dense)",
    reference_ms: ref.eigh,
    ratio: par / ref.eigh,
    goal: "<= 5 ms, <= 2x numpy",
  });

  // Tunnel splitting (S = 10): double-double Rayleigh quotients of double eigenvectors (used)
  // against the all-double-double route (Householder + Sturm bisection in double-double).
  const mol = { S: 10, D: 0.29 * kB, E: 0.047 * kB, g: 2 };
  const rq = await medianMs(() => lib.hardAxisTunnelSplitting(mol, 0.3), { runs: 41, warmup: 5 });
  const b10 = lib.hardAxisParityBlocks(mol, 0.3);
  const allDD = await medianMs(
    () => {
      lib.symmetricEigenvaluesDD(b10.nSym, b10.sym, [0, 1]);
      lib.symmetricEigenvaluesDD(b10.nAnti, b10.anti, [0, 1]);
    },
    { runs: 11, warmup: 2 },
  );
  rows.push({
    group: "tunnel splitting S=10",
    name: "one splitting in double-double (Rayleigh quotient route)",
    ours_ms: rq,
    reference: "all-double-double route (ours, previous)",
    reference_ms: allDD,
    ratio: rq / allDD,
    goal: "fast enough for a slider",
  });

  // Calculator specs: defaults and the slowest range corner (browser-slider budget).
  for (const spec of ["berry-loop", "chern", "magnon-hall", "spin-tunnel", "easy-plane"].map((id) => lib.getCalculator(id))) {
    const corners = [];
    const k = spec.inputs.length;
    for (let mask = 0; mask < 1 << k; mask++) {
      const v = {};
      spec.inputs.forEach((inp, i) => (v[inp.name] = mask & (1 << i) ? inp.max : inp.min));
      corners.push(v);
    }
    const def = await medianMs(() => lib.runCalculator(spec, {}), { runs: 5, warmup: 1 });
    let worst = 0,
      worstCorner = null;
    for (const c of corners) {
      const t0 = performance.now();
      lib.runCalculator(spec, c);
      const t = performance.now() - t0;
      if (t > worst) {
        worst = t;
        worstCorner = c;
      }
    }
    const w = await medianMs(() => lib.runCalculator(spec, worstCorner), { runs: 3, warmup: 0 });
    rows.push({ group: "calculators", name: `${spec.id}: defaults (with its default sweep)`, ours_ms: def, goal: "<= 50 ms" });
    rows.push({ group: "calculators", name: `${spec.id}: slowest corner ${JSON.stringify(worstCorner)}`, ours_ms: w, goal: "<= 300 ms" });
  }

  // Hermitian eigensolver: ours against mathjs eigs (complex), the reason for the choice.
  for (const m of [6, 40]) {
    const A = randomHermitian(m, 11 + m);
    const hs = new lib.HermitianEigenSolver(m);
    const ours = await medianMs(() => hs.solve(A.re, A.im, true), { runs: m < 10 ? 201 : 21, warmup: 5 });
    const rowsC = [];
    for (let i = 0; i < m; i++) rowsC.push(Array.from({ length: m }, (_, j) => complex(A.re[i * m + j], A.im[i * m + j])));
    // mathjs needs ~10 s for the 40 x 40 case: one run is enough for a ratio of ~1e4.
    const mj = await medianMs(() => eigs(rowsC), m < 10 ? { runs: 21, warmup: 1 } : { runs: 1, warmup: 0 });
    rows.push({
      group: "hermitian eigensolver",
      name: `${m} x ${m} complex, values + vectors`,
      ours_ms: ours,
      reference: "mathjs eigs",
      reference_ms: mj,
      ratio: ours / mj,
      goal: "faster than the library",
    });
  }
  return rows;
};
