import { describe, expect, it } from "vitest";
import { SymmetricEigenSolver } from "../../../lib/src/numeric/eigenSymmetricQL.js";
import { symmetricEigen } from "../../../lib/src/numeric/denseLinalg.js";
import { runPython } from "../../helpers/python.js";

// Reference: LAPACK's symmetric eigensolver through numpy.linalg.eigh (Debian's numpy), an
// independent implementation (divide and conquer). Eigenvectors compared up to sign, for
// eigenvalues separated from their neighbours.
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32 - 0.5;
}
function randomSymmetric(n: number, seed: number, graded = false): Float64Array {
  const r = lcg(seed);
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      const v = r() * (graded ? 10 ** ((-(i + j) / n) * 6) : 1);
      a[i * n + j] = v;
      a[j * n + i] = v;
    }
  return a;
}

describe("dense symmetric eigenproblem (Householder + QL)", () => {
  const cases = [
    [1, 1],
    [2, 2],
    [5, 3],
    [40, 4],
    [101, 5],
    [60, 6, 1],
  ] as const;
  const mats = cases.map(([n, seed, graded]) => ({ n, a: randomSymmetric(n, seed, !!graded) }));
  const ref = runPython<Array<{ w: number[]; v: number[] }>>(
    `
import sys, json, numpy as np
out = []
for m in json.load(sys.stdin):
    n = m["n"]; A = np.array(m["a"]).reshape(n, n)
    w, v = np.linalg.eigh(A)
    out.append({"w": w.tolist(), "v": v.ravel().tolist()})
print(json.dumps(out))`,
    mats.map((m) => ({ n: m.n, a: Array.from(m.a) })),
  );

  it("eigenvalues and eigenvectors agree with numpy.linalg.eigh (row-major solver and symmetricEigen)", () => {
    mats.forEach(({ n, a }, c) => {
      const s = new SymmetricEigenSolver(n);
      s.solve(a, true);
      const { values, vectors } = symmetricEigen(a, n);
      const w = ref[c]!.w,
        V = ref[c]!.v;
      const scale = Math.max(...w.map(Math.abs));
      for (let k = 0; k < n; k++) {
        expect(Math.abs(s.values[k]! - w[k]!)).toBeLessThan(1e-13 * scale * Math.max(1, Math.sqrt(n) / 4));
        expect(values[k]).toBe(s.values[k]);
        const gap = Math.min(k > 0 ? w[k]! - w[k - 1]! : Infinity, k < n - 1 ? w[k + 1]! - w[k]! : Infinity);
        if (gap < 1e-6 * scale) continue;
        let dot = 0,
          dot2 = 0;
        for (let i = 0; i < n; i++) {
          dot += s.vectors[i * n + k]! * V[i * n + k]!;
          dot2 += vectors[i + k * n]! * V[i * n + k]!;
        }
        expect(Math.abs(Math.abs(dot) - 1)).toBeLessThanOrEqual(Math.max(1e-14, (1e-10 * scale) / gap));
        expect(Math.abs(Math.abs(dot2) - 1)).toBeLessThanOrEqual(Math.max(1e-14, (1e-10 * scale) / gap));
      }
    });
  });

  it("values only equal the values of the full solve, and the residual |A v - l v| is at rounding level", () => {
    const { n, a } = mats[4]!;
    const s = new SymmetricEigenSolver(n);
    s.solve(a, true);
    const full = Float64Array.from(s.values);
    let worst = 0,
      norm = 0;
    for (const x of full) norm = Math.max(norm, Math.abs(x));
    for (let k = 0; k < n; k++)
      for (let i = 0; i < n; i++) {
        let t = 0;
        for (let j = 0; j < n; j++) t += a[i * n + j]! * s.vectors[j * n + k]!;
        worst = Math.max(worst, Math.abs(t - full[k]! * s.vectors[i * n + k]!));
      }
    expect(worst).toBeLessThan(1e-13 * norm);
    s.solve(a, false);
    for (let k = 0; k < n; k++) expect(Math.abs(s.values[k]! - full[k]!)).toBeLessThan(1e-14 * norm);
  });
});

// Centrosymmetric matrices (A[i][j] = A[n-1-i][n-1-j]) are split into two half-size blocks
// (Cantoni & Butler, Linear Algebra Appl. 13, 275 (1976)); the split and the dense path are both
// checked against LAPACK through numpy.linalg.eigh, plus residual and orthogonality.
function randomCentrosymmetric(n: number, seed: number, clustered = false): Float64Array {
  const r = lcg(seed);
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      // near-degenerate even/odd pairs when clustered: weak coupling to the mirror half
      const far = clustered && i >= n / 2 && j < n / 2;
      const v = far ? 1e-9 * r() : r() + (clustered && i === j ? i : 0);
      a[i * n + j] = v;
      a[j * n + i] = v;
      a[(n - 1 - i) * n + (n - 1 - j)] = v;
      a[(n - 1 - j) * n + (n - 1 - i)] = v;
    }
  return a;
}

describe("centrosymmetric split of the dense symmetric eigenproblem", () => {
  const mats = [
    { n: 101, a: randomCentrosymmetric(101, 21) },
    { n: 60, a: randomCentrosymmetric(60, 22) },
    { n: 33, a: randomCentrosymmetric(33, 23, true) },
  ];
  const ref = runPython<Array<{ w: number[]; v: number[]; centro: boolean }>>(
    `
import sys, json, numpy as np
out = []
for m in json.load(sys.stdin):
    n = m["n"]; A = np.array(m["a"]).reshape(n, n)
    w, v = np.linalg.eigh(A)
    out.append({"w": w.tolist(), "v": v.ravel().tolist(), "centro": bool(np.array_equal(A, A[::-1, ::-1]))})
print(json.dumps(out))`,
    mats.map((m) => ({ n: m.n, a: Array.from(m.a) })),
  );

  it("split and dense solves agree with numpy.linalg.eigh; vectors orthonormal, residual at rounding level", () => {
    mats.forEach(({ n, a }, c) => {
      expect(ref[c]!.centro).toBe(true); // the test matrix really has the structure (numpy's check)
      const w = ref[c]!.w,
        V = ref[c]!.v;
      const scale = Math.max(...w.map(Math.abs));
      for (const split of [true, false]) {
        const s = new SymmetricEigenSolver(n);
        s.splitCentrosymmetric = split;
        s.solve(a, true);
        let res = 0,
          orth = 0;
        for (let k = 0; k < n; k++) {
          expect(Math.abs(s.values[k]! - w[k]!)).toBeLessThan(1e-13 * scale * Math.max(1, Math.sqrt(n) / 4));
          for (let i = 0; i < n; i++) {
            let t = 0;
            for (let j = 0; j < n; j++) t += a[i * n + j]! * s.vectors[j * n + k]!;
            res = Math.max(res, Math.abs(t - s.values[k]! * s.vectors[i * n + k]!));
          }
          for (let l = 0; l <= k; l++) {
            let t = 0;
            for (let i = 0; i < n; i++) t += s.vectors[i * n + k]! * s.vectors[i * n + l]!;
            orth = Math.max(orth, Math.abs(t - (k === l ? 1 : 0)));
          }
          const gap = Math.min(k > 0 ? w[k]! - w[k - 1]! : Infinity, k < n - 1 ? w[k + 1]! - w[k]! : Infinity);
          if (gap < 1e-6 * scale) continue;
          let dot = 0;
          for (let i = 0; i < n; i++) dot += s.vectors[i * n + k]! * V[i * n + k]!;
          expect(Math.abs(Math.abs(dot) - 1)).toBeLessThanOrEqual(Math.max(1e-14, (1e-10 * scale) / gap));
        }
        expect(res).toBeLessThan(1e-13 * scale);
        expect(orth).toBeLessThan(1e-13);
        s.solve(a, false);
        for (let k = 0; k < n; k++) expect(Math.abs(s.values[k]! - w[k]!)).toBeLessThan(1e-13 * scale * Math.max(1, Math.sqrt(n) / 4));
      }
    });
  });
});

describe("symmetricEigen: non-finite input", () => {
  it("is refused with an InputError naming the matrix and the entry, not a convergence failure", () => {
    // Common practice, no source: an eigensolver's input must be finite (LAPACK's dsyev returns NaN)
    const a = Float64Array.from([2, 1, 0, 1, 2, 1, 0, 1, Number.NaN]);
    expect(() => symmetricEigen(a, 3)).toThrow(/matrix.*entry 8 of the 3 x 3 matrix/);
    a[8] = Number.POSITIVE_INFINITY;
    expect(() => symmetricEigen(a, 3)).toThrow(/InputError|finite entries/);
  });
});
