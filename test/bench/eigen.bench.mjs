// Dense symmetric eigenproblem of a single spin S = 50 (101 x 101, H = -D Sz^2 + E (Sx^2 - Sy^2) -
// g muB B Sx, real symmetric): our Householder + QL solver (SymmetricEigenSolver, also behind
// symmetricEigen) against LAPACK through numpy.linalg.eigh / eigvalsh on the same matrix, interleaved:
// each round times ours (median of 41 calls, warm) then numpy in a Python process (median of 41
// calls, warm, interpreter start excluded). Same accuracy class (both backward stable, values within
// 1e-13 of each other relative to the norm, checked here). Also the complex Hermitian solver
// (HermitianEigenSolver, the Chern-number workhorse) at 6 x 6 and 40 x 40 against numpy.linalg.eigh
// (zheevd), interleaved the same way: berry.bench.mjs compares it only with mathjs.
// HELICOID_BENCH_EIGEN_ROUNDS (default 5).
import lib from "../../lib/dist/internal.js";
import { medianMs, pythonTiming, summary, verdict } from "./util.mjs";

const ROUNDS = Number(process.env.HELICOID_BENCH_EIGEN_ROUNDS ?? 5);
const kB = 1.380649e-23;
const PY = `
import json, sys, time, numpy as np
d = json.load(sys.stdin); n = d["n"]; A = np.array(d["a"]).reshape(n, n)
def med(f, runs=41):
    for _ in range(5): f()
    t = []
    for _ in range(runs):
        t0 = time.perf_counter(); f(); t.append((time.perf_counter() - t0) * 1e3)
    return sorted(t)[len(t) // 2]
print(json.dumps({"eigh": med(lambda: np.linalg.eigh(A)), "eigvalsh": med(lambda: np.linalg.eigvalsh(A)), "w": np.linalg.eigvalsh(A).tolist()}))`;

export default async () => {
  const H = lib.giantSpinMatrix({ S: 50, D: 0.3 * kB, E: 0.05 * kB, g: 2 }, [0.4, 0, 0]);
  const n = H.dim;
  const solver = new lib.SymmetricEigenSolver(n);
  const input = { n, a: Array.from(H.re) };
  const o = { full: [], vals: [] },
    r = { full: [], vals: [] };
  let w = null;
  for (let k = 0; k < ROUNDS; k++) {
    o.full.push(await medianMs(() => solver.solve(H.re, true), { runs: 41, warmup: 5 }));
    o.vals.push(await medianMs(() => solver.solve(H.re, false), { runs: 41, warmup: 5 }));
    const p = pythonTiming(PY, input);
    r.full.push(p.eigh);
    r.vals.push(p.eigvalsh);
    w = p.w;
  }
  solver.solve(H.re, false);
  const norm = Math.max(...w.map(Math.abs));
  let diff = 0;
  for (let k = 0; k < n; k++) diff = Math.max(diff, Math.abs(solver.values[k] - w[k]) / norm);
  const rows = [];
  for (const [key, name, ref] of [
    ["full", "values + vectors", "numpy.linalg.eigh"],
    ["vals", "values only", "numpy.linalg.eigvalsh"],
  ]) {
    const so = summary(o[key]),
      sr = summary(r[key]);
    const ratio = so.median / sr.median;
    rows.push({
      group: "single spin S=50",
      name: `dense 101 x 101, ${name}, warm, interleaved x${ROUNDS} (max |value difference| ${diff.toExponential(1)} of the norm)`,
      ours_ms: so.median,
      ours_spread: so.spread,
      reference: ref,
      reference_ms: sr.median,
      reference_spread: sr.spread,
      ratio,
      goal: verdict(ratio <= 2, "<= 2x numpy"),
    });
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
