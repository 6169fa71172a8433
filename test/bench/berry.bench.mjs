// Benchmarks of the Berry-phase domain. Every row with a reference interleaves ours and the
// reference A B A B in one period (util.mjs interleavedJs for JavaScript against JavaScript,
// pythonPeer.mjs for numpy/scipy), warm on both sides, medians and [min-max]:
// - Chern numbers on a 200 x 200 zone: the 2-band Haldane model (ours only; numpy rows are in
//   chern.bench.mjs for the 6-band case), and the 6-band supercell on 2 worker threads against the
//   same computation on 1 thread (the speed-up; the 1-thread figure against numpy is chern.bench.mjs).
// - single spin S = 50 (101 x 101 pentadiagonal): the banded solver and the parity blocks against
//   numpy.linalg.eigh on the dense matrix and scipy.linalg.eig_banded on the band, through the
//   Python peer (batches of 20 solves a sample). The dense solver's rows are in eigen.bench.mjs.
// - the double-double tunnel splitting (S = 10) against the all-double-double route (both ours);
// - the calculator specs on defaults and their slowest corner (ours only, the browser-slider budget);
// - the Hermitian eigensolver against mathjs eigs (the library alternative).
import lib from "../../lib/dist/internal.js";
import { eigs, complex } from "mathjs";
import { interleavedJs, runsOf, summary, verdict } from "./util.mjs";
import { pythonPeer, interleavedWithPython } from "./pythonPeer.mjs";
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
  const two = await runsOf(() => lib.chernNumbers(haldane, { n1: 200 }), { runs: 9, warmup: 4 });
  rows.push({ group: "chern", name: "Haldane 2-band, 200 x 200 grid, warm, 9 runs", ours_ms: two.median, ours_spread: two.spread, goal: "<= 200 ms" });
  const twoGeneral = await runsOf(() => lib.chernNumbers(haldane, { n1: 200, closedFormTwoBand: false }), { runs: 5, warmup: 1 });
  rows.push({
    group: "chern",
    name: "Haldane 2-band, 200 x 200 grid, general Hermitian solver (no closed form), warm, 5 runs",
    ours_ms: twoGeneral.median,
    ours_spread: twoGeneral.spread,
    goal: "(for comparison)",
  });
  const sc = lib.supercellModel(lib.haldaneSpec({ t2: 0.1, phi: Math.PI / 2, M: 0.1 }), 3, 1);
  const groups = [
    [0, 1, 2],
    [3, 4, 5],
  ];
  // Worker threads (kernel-ext parallelChernNumbers) against one thread, interleaved; the pool is
  // started first, as a notebook session keeps it; "threads" includes the calling thread.
  await parallelChern.parallelChernNumbers(sc, { n1: 200, groups, threads: 2 });
  const pc = await interleavedJs(
    () => parallelChern.parallelChernNumbers(sc, { n1: 200, groups, threads: 2 }),
    () => lib.chernNumbers(sc, { n1: 200, groups }),
    { runs: 9, warmup: 2 },
  );
  await parallelChern.closeChernWorkers();
  {
    const o = summary(pc.a),
      r = summary(pc.b);
    const same = pc.aValue.chernSum.every((c, i) => Math.abs(c - pc.bValue.chernSum[i]) < 1e-9);
    rows.push({
      group: "chern",
      name: `Haldane 3x1 supercell 6-band, 200 x 200 grid, parallelChernNumbers 2 threads vs 1 thread, wall time, warm, interleaved x9 (same Chern numbers: ${same})`,
      ours_ms: o.median,
      ours_spread: o.spread,
      reference: "chernNumbers, 1 thread (ours)",
      reference_ms: r.median,
      reference_spread: r.spread,
      ratio: o.median / r.median,
      goal: verdict(o.median <= 200 && same, "<= 200 ms wall"),
    });
  }

  // Single spin S = 50: H = -D Sz^2 + E (Sx^2 - Sy^2) - g muB B Sx, 101 x 101 real symmetric, pentadiagonal.
  const p = { S: 50, D: 0.3 * kB, E: 0.05 * kB, g: 2 };
  const H = lib.giantSpinMatrix(p, [0.4, 0, 0]);
  const n = H.dim;
  const BATCH = 20;
  const peer = pythonPeer();
  try {
    await peer.define(`
import numpy as np
from scipy.linalg import eig_banded
def load(n, a):
    global A, AB
    A = np.array(a).reshape(n, n)
    AB = np.zeros((3, n))
    for dd in range(3): AB[dd, :n - dd] = np.diagonal(A, -dd)
    return 0
def eigh(r):
    for _ in range(r): w, v = np.linalg.eigh(A)
    return w.tolist()
def eigvalsh(r):
    for _ in range(r): w = np.linalg.eigvalsh(A)
    return w.tolist()
def banded(r):
    for _ in range(r): w, v = eig_banded(AB, lower=True)
    return w.tolist()
def bandedValues(r):
    for _ in range(r): w = eig_banded(AB, lower=True, eigvals_only=True)
    return w.tolist()
`);
    await peer.call("load", n, Array.from(H.re));
    const band = new lib.SymmetricBandEigenSolver(n, 2);
    const blocks = lib.hardAxisParityBlocks(p, 0.4);
    const s1 = new lib.SymmetricEigenSolver(blocks.nSym),
      s2 = new lib.SymmetricEigenSolver(blocks.nAnti);
    const parity = () => {
      for (let i = 0; i < BATCH; i++) {
        s1.solve(blocks.sym, true);
        s2.solve(blocks.anti, true);
      }
      return [...s1.values, ...s2.values].sort((x, y) => x - y);
    };
    const banded = (vectors) => () => {
      for (let i = 0; i < BATCH; i++) band.solve(H.re, vectors);
      return Array.from(band.values);
    };
    for (const [name, ours, fn, ref, goal] of [
      ["banded (pentadiagonal) 101 x 101, values + vectors", banded(true), "eigh", "numpy.linalg.eigh (dense, LAPACK)", "<= 2x numpy"],
      ["banded 101 x 101, values + vectors", banded(true), "banded", "scipy.linalg.eig_banded (banded LAPACK)", "(for comparison)"],
      ["banded 101 x 101, values only", banded(false), "eigvalsh", "numpy.linalg.eigvalsh (dense, LAPACK)", "<= 2x numpy"],
      ["banded 101 x 101, values only", banded(false), "bandedValues", "scipy.linalg.eig_banded (banded LAPACK)", "(for comparison)"],
      ["parity blocks 51 + 50, values + vectors", parity, "eigh", "numpy.linalg.eigh (dense, LAPACK)", "<= 2x numpy"],
    ]) {
      const r = await interleavedWithPython(peer, ours, fn, [BATCH], { runs: 11, warmup: 3 });
      const w = r.refValue;
      const norm = Math.max(...w.map(Math.abs));
      let diff = 0;
      for (let k = 0; k < n; k++) diff = Math.max(diff, Math.abs(r.oursValue[k] - w[k]) / norm);
      const o = summary(r.ours.map((x) => x / BATCH)),
        q = summary(r.ref.map((x) => x / BATCH));
      const ratio = o.median / q.median;
      const wallRatio = summary(r.oursWall).median / summary(r.refWall).median;
      rows.push({
        group: "single spin S=50",
        name: `${name}, warm, CPU time, interleaved x11 batches of ${BATCH} (max |value difference| ${diff.toExponential(1)} of the norm; wall-time ratio ${wallRatio.toFixed(2)})`,
        ours_ms: o.median,
        ours_spread: o.spread,
        reference: ref,
        reference_ms: q.median,
        reference_spread: q.spread,
        ratio,
        goal: goal.startsWith("<=") ? verdict(ratio <= 2 && diff < 1e-13, `${goal}, values within 1e-13 of the norm`) : goal,
      });
    }
  } finally {
    await peer.close();
  }

  // Tunnel splitting (S = 10): double-double Rayleigh quotients of double eigenvectors (used)
  // against the all-double-double route (Householder + Sturm bisection in double-double), interleaved.
  const mol = { S: 10, D: 0.29 * kB, E: 0.047 * kB, g: 2 };
  const b10 = lib.hardAxisParityBlocks(mol, 0.3);
  const tu = await interleavedJs(
    () => lib.hardAxisTunnelSplitting(mol, 0.3),
    () => {
      lib.symmetricEigenvaluesDD(b10.nSym, b10.sym, [0, 1]);
      lib.symmetricEigenvaluesDD(b10.nAnti, b10.anti, [0, 1]);
    },
    { runs: 11, warmup: 3 },
  );
  {
    const o = summary(tu.a),
      r = summary(tu.b);
    rows.push({
      group: "tunnel splitting S=10",
      name: "one splitting in double-double (Rayleigh quotient route), warm, interleaved x11",
      ours_ms: o.median,
      ours_spread: o.spread,
      reference: "all-double-double route (ours, previous)",
      reference_ms: r.median,
      reference_spread: r.spread,
      ratio: o.median / r.median,
      goal: "fast enough for a slider",
    });
  }

  // Calculator specs: defaults and the slowest range corner (browser-slider budget), ours only.
  for (const spec of ["berry-loop", "chern", "magnon-hall", "spin-tunnel", "easy-plane"].map((id) => lib.getCalculator(id))) {
    const corners = [];
    const k = spec.inputs.length;
    for (let mask = 0; mask < 1 << k; mask++) {
      const v = {};
      spec.inputs.forEach((inp, i) => (v[inp.name] = mask & (1 << i) ? inp.max : inp.min));
      corners.push(v);
    }
    const def = await runsOf(() => lib.runCalculator(spec, {}), { runs: 5, warmup: 1 });
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
    const w = await runsOf(() => lib.runCalculator(spec, worstCorner), { runs: 3, warmup: 0 });
    rows.push({ group: "calculators", name: `${spec.id}: defaults (with its default sweep), warm, 5 runs`, ours_ms: def.median, ours_spread: def.spread, goal: "<= 50 ms" });
    rows.push({
      group: "calculators",
      name: `${spec.id}: slowest corner ${JSON.stringify(worstCorner)}, 3 runs after one`,
      ours_ms: w.median,
      ours_spread: w.spread,
      goal: "<= 300 ms",
    });
  }

  // Hermitian eigensolver: ours against mathjs eigs (complex), the reason for the choice; interleaved.
  for (const m of [6, 40]) {
    const A = randomHermitian(m, 11 + m);
    const hs = new lib.HermitianEigenSolver(m);
    const rowsC = [];
    for (let i = 0; i < m; i++) rowsC.push(Array.from({ length: m }, (_, j) => complex(A.re[i * m + j], A.im[i * m + j])));
    // mathjs needs ~10 s for the 40 x 40 case: one pair is enough for a ratio of ~1e4; ours is a
    // batch of 50 solves a sample for a measurable time.
    const reps = 50;
    const r = await interleavedJs(
      () => {
        for (let i = 0; i < reps; i++) hs.solve(A.re, A.im, true);
        return Array.from(hs.values);
      },
      () => eigs(rowsC).values.map((x) => (typeof x === "number" ? x : x.re)),
      m < 10 ? { runs: 11, warmup: 2 } : { runs: 1, warmup: 0 },
    );
    const norm = Math.max(...r.aValue.map(Math.abs));
    const mv = [...r.bValue].sort((x, y) => x - y);
    let diff = 0;
    for (let k = 0; k < m; k++) diff = Math.max(diff, Math.abs(r.aValue[k] - mv[k]) / norm);
    const o = summary(r.a.map((x) => x / reps)),
      q = summary(r.b);
    rows.push({
      group: "hermitian eigensolver",
      name: `${m} x ${m} complex, values + vectors, warm, interleaved x${r.a.length} (max |value difference| to mathjs ${diff.toExponential(1)} of the norm)`,
      ours_ms: o.median,
      ours_spread: o.spread,
      reference: "mathjs eigs",
      reference_ms: q.median,
      reference_spread: q.spread,
      ratio: o.median / q.median,
      goal: verdict(o.median < q.median, "faster than the library"),
    });
  }
  return rows;
};
