// Dense symmetric eigenproblem of a single spin S = 50 (101 x 101, H = -D Sz^2 + E (Sx^2 - Sy^2) -
// g muB B Sx, real symmetric): our SymmetricEigenSolver against LAPACK through numpy.linalg.eigh /
// eigvalsh on the same matrix, interleaved call by call through the Python peer (pythonPeer.mjs):
// each sample is a batch of BATCH solves on each side (ours, then numpy), A B A B, warm on both
// sides, CPU-time medians and [min-max]. Two rows per task: the generic dense path
// (splitCentrosymmetric = false: Householder + QL, no structure used) and the default path, which
// finds that this matrix is centrosymmetric (a field along x: the pi rotation about x maps m to -m)
// and solves two half-size blocks. numpy gets the full matrix in both, as a numpy user would write
// it. Accuracy: eigenvalues compared with numpy's (difference relative to the norm, printed) and our
// eigenvector residual max |H v - l v| / |H| (printed).
//
// Verdict (this file's S = 50 rows, header of eigenSymmetricQL.ts): the generic dense path misses
// the 2x goal (3.2x with vectors, 2.4x values only; 3.9x before); the default path meets it on this
// matrix (0.98x, 0.85x). What is left on the generic path (V8 CPU profile, 2000 warm solves):
// Householder reduction and forming Q 49 %, QL rotations on the vectors 31 %, QL scalar work 8 %,
// the values-only pass for the shifts 7 %. LAPACK's dsyevd uses divide and conquer and vectorized
// BLAS for the same steps.
// Also the complex Hermitian solver (HermitianEigenSolver, the Chern-number workhorse) at 6 x 6 and
// 40 x 40 against numpy.linalg.eigh (zheevd), in rounds (ours: median of 101 warm calls; numpy: the
// same in a Python process), alternating ROUNDS times.
// HELICOID_BENCH_EIGEN_ROUNDS (default 5).
import lib from "../../lib/dist/internal.js";
import { medianMs, pythonTiming, summary, verdict } from "./util.mjs";
import { pythonPeer, interleavedWithPython } from "./pythonPeer.mjs";

const ROUNDS = Number(process.env.HELICOID_BENCH_EIGEN_ROUNDS ?? 5);
const BATCH = 20;
const kB = 1.380649e-23;
const PEER = `
import numpy as np
def load(n, a):
    global A
    A = np.array(a).reshape(n, n)
    return 0
def eigh(r):
    for _ in range(r): w, v = np.linalg.eigh(A)
    return w.tolist()
def eigvalsh(r):
    for _ in range(r): w = np.linalg.eigvalsh(A)
    return w.tolist()
`;

export default async () => {
  const H = lib.giantSpinMatrix({ S: 50, D: 0.3 * kB, E: 0.05 * kB, g: 2 }, [0.4, 0, 0]);
  const n = H.dim;
  const rows = [];
  const peer = pythonPeer();
  try {
    await peer.define(PEER);
    await peer.call("load", n, Array.from(H.re));
    for (const split of [false, true]) {
      const solver = new lib.SymmetricEigenSolver(n);
      solver.splitCentrosymmetric = split;
      for (const [full, fn, name, ref] of [
        [true, "eigh", "values + vectors", "numpy.linalg.eigh (LAPACK dsyevd, 1 thread)"],
        [false, "eigvalsh", "values only", "numpy.linalg.eigvalsh (LAPACK, 1 thread)"],
      ]) {
        const r = await interleavedWithPython(
          peer,
          () => {
            for (let i = 0; i < BATCH; i++) solver.solve(H.re, full);
            return Array.from(solver.values);
          },
          fn,
          [BATCH],
          { runs: 11, warmup: 3 },
        );
        const w = r.refValue;
        const norm = Math.max(...w.map(Math.abs));
        let diff = 0;
        for (let k = 0; k < n; k++) diff = Math.max(diff, Math.abs(r.oursValue[k] - w[k]) / norm);
        let res = 0;
        if (full) {
          solver.solve(H.re, true);
          const V = solver.vectors;
          for (let k = 0; k < n; k++)
            for (let i = 0; i < n; i++) {
              let t = 0;
              for (let j = 0; j < n; j++) t += H.re[i * n + j] * V[j * n + k];
              res = Math.max(res, Math.abs(t - solver.values[k] * V[i * n + k]) / norm);
            }
        }
        const o = summary(r.ours.map((x) => x / BATCH)),
          p = summary(r.ref.map((x) => x / BATCH));
        const ratio = o.median / p.median;
        const wallRatio = summary(r.oursWall).median / summary(r.refWall).median;
        rows.push({
          group: "single spin S=50",
          name: `dense 101 x 101, ${name}, ${split ? "default path (finds the centrosymmetry, two half blocks)" : "generic dense path (no structure)"}, warm, interleaved x11 batches of ${BATCH} (max |value difference| ${diff.toExponential(1)} of the norm${full ? `, residual ${res.toExponential(1)}` : ""}; wall-time ratio ${wallRatio.toFixed(2)})`,
          ours_ms: o.median,
          ours_spread: o.spread,
          reference: ref,
          reference_ms: p.median,
          reference_spread: p.spread,
          ratio,
          goal: verdict(ratio <= 2 && diff < 1e-13, "<= 2x numpy, values within 1e-13 of the norm"),
        });
      }
    }
  } finally {
    await peer.close();
  }
  // Complex Hermitian, values + vectors: ours and LAPACK, interleaved rounds.
  const PYH = `
import json, sys, time, numpy as np
d = json.load(sys.stdin); n = d["n"]; A = (np.array(d["re"]) + 1j * np.array(d["im"])).reshape(n, n)
def med(f, runs=101):
    for _ in range(5): f()
    t = []
    for _ in range(runs):
        t0 = time.perf_counter(); f(); t.append((time.perf_counter() - t0) * 1e3)
    return sorted(t)[len(t) // 2]
print(json.dumps({"eigh": med(lambda: np.linalg.eigh(A)), "w": np.linalg.eigvalsh(A).tolist()}))`;
  for (const m of [6, 40]) {
    let s = (11 + m) >>> 0;
    const rnd = () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32 - 0.5;
    const re = new Float64Array(m * m),
      im = new Float64Array(m * m);
    for (let i = 0; i < m; i++)
      for (let j = 0; j <= i; j++) {
        const a = rnd(),
          b = i === j ? 0 : rnd();
        re[i * m + j] = a;
        re[j * m + i] = a;
        im[i * m + j] = b;
        im[j * m + i] = -b;
      }
    const hs = new lib.HermitianEigenSolver(m);
    const oh = [],
      rh = [];
    let wh = null;
    for (let k = 0; k < ROUNDS; k++) {
      oh.push(await medianMs(() => hs.solve(re, im, true), { runs: 101, warmup: 5 }));
      const p = pythonTiming(PYH, { n: m, re: Array.from(re), im: Array.from(im) });
      rh.push(p.eigh);
      wh = p.w;
    }
    hs.solve(re, im, false);
    const nh = Math.max(...wh.map(Math.abs));
    let dh = 0;
    for (let k = 0; k < m; k++) dh = Math.max(dh, Math.abs(hs.values[k] - wh[k]) / nh);
    const so = summary(oh),
      sr = summary(rh);
    rows.push({
      group: "hermitian eigensolver",
      name: `${m} x ${m} complex, values + vectors, warm, interleaved x${ROUNDS} (max |value difference| ${dh.toExponential(1)} of the norm)`,
      ours_ms: so.median,
      ours_spread: so.spread,
      reference: "numpy.linalg.eigh (LAPACK zheevd)",
      reference_ms: sr.median,
      reference_spread: sr.spread,
      ratio: so.median / sr.median,
      goal: verdict(so.median / sr.median <= 2, "<= 2x LAPACK"),
    });
  }
  return rows;
};
