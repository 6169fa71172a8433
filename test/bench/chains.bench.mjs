// Benchmarks of the spin-chain domain, ours and the reference interleaved (ours, reference, ours,
// reference, ...; medians over 3 rounds): the N = 20 Heisenberg ring in its S^z = 0 sector (dimension
// 184,756) against numpy building the sparse matrix plus scipy.sparse.linalg.eigsh (times taken inside
// Python, interpreter start excluded), ours in the same sector (same work; thick restart with full
// re-orthogonalization, and the plain recursion that is our default for one level) and ours in the
// symmetry sectors k = 0, pi x reflection x spin inversion (the ground state of the bipartite
// Heisenberg ring is a singlet at k = 0 or pi with both parities defined: Marshall's sign rule,
// E. Lieb, D. Mattis, J. Math. Phys. 3, 749 (1962); all 8 sectors are computed and the lowest taken);
// the N = 24 ground state in the same 8 sectors (time and peak memory); S(q, w) of an N = 16 ring at
// T = 0 for all q. The machine is shared: the load average is printed in the row names.
import { loadavg } from "node:os";
import lib from "../../lib/dist/internal.js";
import { pythonTiming, summary, verdict } from "./util.mjs";

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
const load = () => loadavg()[0].toFixed(1);

/** Lowest level over the k = 0, pi x R = +-1 x F = +-1 sectors of the S^z = 0 sector. */
function symmetricGround(model) {
  const N = model.N;
  let best = Infinity,
    where = "";
  const dims = [];
  for (const m of [0, N / 2])
    for (const reflection of [1, -1])
      for (const flip of [1, -1]) {
        const r = lib.sectorLevels(model, { nUp: N / 2, m, flip, reflection }, { tol: 1e-10, vectors: false });
        dims.push(r.dimension);
        if (r.values[0] < best) {
          best = r.values[0];
          where = r.name;
        }
      }
  return { best, where, dims };
}

export default async () => {
  const rows = [];
  const N = 20;
  const model = lib.chainModel({ N, Jz: 1, Jperp: 1 });
  const tol = 1e-10;
  const full = [],
    plain = [],
    sym = [],
    refB = [],
    refE = [],
    refT = [],
    loads = [];
  let e0 = 0,
    e0plain = 0,
    e0sym = 0,
    refE0 = 0,
    where = "";
  for (let round = 0; round < 3; round++) {
    loads.push(load());
    const o = time(() => lib.sectorLevels(model, { nUp: N / 2, m: null, flip: 0 }, { tol, vectors: false, reorthogonalization: "full" }));
    full.push(o.ms);
    e0 = o.r.values[0];
    const p = pythonTiming(scipyScript, { N, tol });
    refB.push(p.build);
    refE.push(p.eigsh);
    refT.push(p.build + p.eigsh);
    refE0 = p.e0;
    const o2 = time(() => lib.sectorLevels(model, { nUp: N / 2, m: null, flip: 0 }, { tol, vectors: false }));
    plain.push(o2.ms);
    e0plain = o2.r.values[0];
    const o3 = time(() => symmetricGround(model));
    sym.push(o3.ms);
    e0sym = o3.r.best;
    where = o3.r.where;
  }
  const ref = summary(refT);
  const refText = `numpy build (${summary(refB).median.toFixed(0)} ms) + scipy eigsh (${summary(refE).median.toFixed(0)} ms), E0/N ${(refE0 / N).toFixed(10)}`;
  const row = (name, xs, e) => {
    const s = summary(xs);
    const ratio = s.median / ref.median;
    return {
      group: "chains",
      name: `${name}; E0/N ${(e / N).toFixed(10)}; load ${loads.join("/")}`,
      ours_ms: s.median,
      ours_spread: s.spread,
      reference: refText,
      reference_ms: ref.median,
      reference_spread: ref.spread,
      ratio,
      goal: verdict(ratio <= 1, "ratio <= 1 (issue: no more time than numpy build + scipy eigsh, same tolerance 1e-10)"),
    };
  };
  rows.push(row("Heisenberg ring N = 20, S^z = 0 (dim 184756), ground state, thick-restart Lanczos with full re-orthogonalization (same work as scipy)", full, e0));
  rows.push(row("the same sector, plain three-term recursion (our default for one level; same work as scipy)", plain, e0plain));
  rows.push(row(`the same ground state from the 8 sectors k = 0, pi x R = +-1 x F = +-1 (dims about 2300 each; lowest in ${where})`, sym, e0sym));

  // N = 24: the same 8 sectors
  const m24 = lib.chainModel({ N: 24, Jz: 1, Jperp: 1 });
  const rss0 = process.memoryUsage().rss;
  const l24 = load();
  const t24 = time(() => symmetricGround(m24));
  const peak = process.resourceUsage().maxRSS / 1024; // MB
  rows.push({
    group: "chains",
    name: `Heisenberg ring N = 24, ground state from 8 sectors (k = 0, pi; R, F = +-1; dims ${t24.r.dims.join(", ")}), E0/N = ${(t24.r.best / 24).toFixed(10)} in ${t24.r.where}; peak RSS of the bench process ${peak.toFixed(0)} MB (start ${(rss0 / 2 ** 20).toFixed(0)} MB); load ${l24}`,
    ours_ms: t24.ms,
    goal: verdict(t24.ms <= 60000 && peak <= 2048, "<= 60 s and <= 2 GB"),
  });

  // S(q, w), N = 16, T = 0, all q from 0 to pi (reflection gives the rest)
  const m16 = lib.chainModel({ N: 16, Jz: 4, Jperp: 1, hx: 0.3 });
  const omega = Array.from({ length: 400 }, (_, i) => (i * 8) / 399);
  const lz = load();
  const zz = time(() => lib.dynamicStructureFactor(m16, { T: 0, eta: 0.05, omega, components: ["zz"], steps: 150 }));
  rows.push({
    group: "chains",
    name: `S^zz(q, w), N = 16 ring with hx (Jz = 4, Jperp = 1, hx = 0.3), T = 0, 9 q, 400 w, continued fractions of depth 150; load ${lz}`,
    ours_ms: zz.ms,
    goal: verdict(zz.ms <= 10000, "<= 10 s"),
  });
  const la = load();
  const all = time(() => lib.dynamicStructureFactor(m16, { T: 0, eta: 0.05, omega, components: ["xx", "yy", "zz", "chiral"], steps: 150 }));
  rows.push({
    group: "chains",
    name: `S^xx, S^yy, S^zz, C(q, w), the same ring, T = 0, 9 q (4 continued fractions per q: xx, yy, zz, y + iz); load ${la}`,
    ours_ms: all.ms,
    goal: verdict(all.ms <= 10000, "<= 10 s"),
  });
  return rows;
};
