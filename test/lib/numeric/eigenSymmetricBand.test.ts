import { describe, expect, it } from "vitest";
import { SymmetricBandEigenSolver, matrixBandwidth } from "../../../lib/src/numeric/eigenSymmetricBand.js";
import { SymmetricEigenSolver } from "../../../lib/src/numeric/eigenSymmetricQL.js";
import { giantSpinMatrix } from "../../../lib/src/berry/giantSpin.js";
import { kB } from "../../../lib/src/quantity/constants.js";
import { InputError } from "../../../lib/src/errors.js";
import { runPython } from "../../helpers/python.js";

function lcg(seed: number) {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32 - 0.5;
}
function randomBand(n: number, b: number, seed: number): Float64Array {
  const r = lcg(seed);
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = Math.max(0, i - b); j <= i; j++) {
      const v = r();
      a[i * n + j] = v;
      a[j * n + i] = v;
    }
  return a;
}

// Single-spin Hamiltonians (pentadiagonal): an invented "Ferrowheel-50" (S = 50, D = 0.3 K, E = 0.05 K)
// in a hard-axis, an easy-axis and an oblique field, and at zero field (exact Kramers / parity
// degeneracies), plus random band matrices of several bandwidths.
const spin = { S: 50, D: 0.3 * kB, E: 0.05 * kB, g: 2 };
const cases: Array<{ label: string; n: number; b: number; a: Float64Array }> = [
  ...(
    [
      [0.4, 0, 0],
      [0, 0, 0.3],
      [0.3, 0, 0.2],
      [0, 0, 0],
    ] as const
  ).map((B) => {
    const H = giantSpinMatrix(spin, B);
    return { label: `S = 50, B = ${B}`, n: H.dim, b: 2, a: H.re };
  }),
  (() => {
    const H = giantSpinMatrix({ ...spin, S: 49.5 }, [0, 0, 0]);
    return { label: "S = 49.5, B = 0 (Kramers pairs)", n: H.dim, b: 2, a: H.re };
  })(),
  { label: "random n = 60, b = 3", n: 60, b: 3, a: randomBand(60, 3, 3) },
  { label: "random n = 30, b = 5", n: 30, b: 5, a: randomBand(30, 5, 4) },
  { label: "random n = 9, b = 1", n: 9, b: 1, a: randomBand(9, 1, 5) },
  { label: "random n = 5, b = 4 (dense)", n: 5, b: 4, a: randomBand(5, 4, 6) },
  { label: "n = 1", n: 1, b: 0, a: new Float64Array([2.5]) },
];

describe("banded symmetric eigensolver (band reduction + QL values, inverse iteration vectors)", () => {
  // Source: Debian's numpy.linalg.eigh (LAPACK dsyevd) as an independent oracle.
  const ref = runPython<Array<{ w: number[]; v: number[]; norm: number }>>(
    `
import json, sys, numpy as np
out = []
for m in json.load(sys.stdin):
    n = m["n"]; A = np.array(m["a"]).reshape(n, n)
    w, v = np.linalg.eigh(A)
    out.append({"w": w.tolist(), "v": v.reshape(-1).tolist(), "norm": float(np.linalg.norm(A, 2))})
print(json.dumps(out))`,
    cases.map((c) => ({ n: c.n, a: Array.from(c.a) })),
  );

  it("eigenvalues agree with numpy.linalg.eigh to 1e-12 of the spectral norm", () => {
    cases.forEach((c, k) => {
      const s = new SymmetricBandEigenSolver(c.n, c.b);
      s.solve(c.a, false);
      for (let i = 0; i < c.n; i++) expect(Math.abs(s.values[i]! - ref[k]!.w[i]!) / ref[k]!.norm, `${c.label} i=${i}`).toBeLessThan(1e-12);
    });
  });

  it("eigenvectors: residual and orthonormality below 1e-12, and the same spectral projectors as numpy", () => {
    // Common practice, no source: backward-error checks; projectors (gauge- and basis-free) of
    // eigenvalues separated from their neighbours by > 1e-6 |A| are compared with numpy's.
    cases.forEach((c, k) => {
      const n = c.n;
      const s = new SymmetricBandEigenSolver(n, c.b);
      s.solve(c.a, true);
      expect(s.usedDenseFallback, c.label).toBe(false);
      const V = s.vectors,
        norm = ref[k]!.norm,
        nv = ref[k]!.v;
      let res = 0,
        orth = 0,
        proj = 0;
      for (let q = 0; q < n; q++) {
        for (let i = 0; i < n; i++) {
          let t = -s.values[q]! * V[i * n + q]!;
          for (let j = 0; j < n; j++) t += c.a[i * n + j]! * V[j * n + q]!;
          res = Math.max(res, Math.abs(t) / norm);
        }
        for (let p = 0; p <= q; p++) {
          let d = 0;
          for (let i = 0; i < n; i++) d += V[i * n + q]! * V[i * n + p]!;
          orth = Math.max(orth, Math.abs(d - (p === q ? 1 : 0)));
        }
        const w = s.values;
        const sep = Math.min(q > 0 ? w[q]! - w[q - 1]! : Infinity, q < n - 1 ? w[q + 1]! - w[q]! : Infinity);
        if (sep > 1e-6 * norm) {
          let d = 0;
          for (let i = 0; i < n; i++) d += V[i * n + q]! * nv[i * n + q]!;
          proj = Math.max(proj, 1 - Math.abs(d));
        }
      }
      expect(res, c.label).toBeLessThan(1e-12);
      expect(orth, c.label).toBeLessThan(1e-12);
      expect(proj, c.label).toBeLessThan(1e-12);
    });
  });

  it("a reused workspace gives the same results as a fresh one and as the dense solver; count limits the vectors", () => {
    // Common practice, no source: workspace reuse must not change results.
    const c = cases[0]!;
    const reused = new SymmetricBandEigenSolver(c.n, c.b);
    reused.solve(cases[3]!.a, true); // a different matrix first
    reused.solve(c.a, true);
    const fresh = new SymmetricBandEigenSolver(c.n, c.b);
    fresh.solve(c.a, true);
    expect(Array.from(reused.values)).toEqual(Array.from(fresh.values));
    expect(Array.from(reused.vectors)).toEqual(Array.from(fresh.vectors));
    const dense = new SymmetricEigenSolver(c.n);
    dense.solve(c.a, true);
    for (let i = 0; i < c.n; i++) expect(Math.abs(fresh.values[i]! - dense.values[i]!)).toBeLessThan(1e-13 * ref[0]!.norm);
    const low = new SymmetricBandEigenSolver(c.n, c.b);
    low.solve(c.a, true, 2);
    for (let i = 0; i < c.n; i++) {
      expect(low.vectors[i * c.n]).toBe(fresh.vectors[i * c.n]);
      expect(low.vectors[i * c.n + 5]).toBe(0);
    }
  });

  it("degenerate spectra: multiple of the identity and a diagonal matrix with pairs", () => {
    // Common practice, no source: eigenvalues of c I are c; of diag(1, 1, 2, 2, 3) are its entries.
    const s = new SymmetricBandEigenSolver(3, 1);
    s.solve([-1e-24, 0, 0, 0, -1e-24, 0, 0, 0, -1e-24], true);
    expect(Array.from(s.values)).toEqual([-1e-24, -1e-24, -1e-24]);
    const d = new SymmetricBandEigenSolver(5, 2);
    const a = new Float64Array(25);
    [1, 1, 2, 2, 3].forEach((x, i) => (a[i * 5 + i] = x));
    d.solve(a, true);
    expect(Array.from(d.values)).toEqual([1, 1, 2, 2, 3]);
    for (let p = 0; p < 5; p++)
      for (let q = 0; q < 5; q++) {
        let t = 0;
        for (let i = 0; i < 5; i++) t += d.vectors[i * 5 + p]! * d.vectors[i * 5 + q]!;
        expect(Math.abs(t - (p === q ? 1 : 0))).toBeLessThan(1e-14);
      }
  });

  it("matrixBandwidth and bad input", () => {
    expect(matrixBandwidth(4, randomBand(4, 2, 9))).toBe(2);
    expect(matrixBandwidth(3, [1, 0, 0, 0, 1, 0, 0, 0, 1])).toBe(0);
    expect(() => new SymmetricBandEigenSolver(0, 1)).toThrow(InputError);
    expect(() => new SymmetricBandEigenSolver(3, -1)).toThrow(InputError);
    expect(() => new SymmetricBandEigenSolver(3, 1).solve([1, 2], true)).toThrow(/3 x 3/);
  });
});
