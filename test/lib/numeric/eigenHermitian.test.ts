import { describe, expect, it } from "vitest";
import { eigs, complex, type Complex } from "mathjs";
import { HermitianEigenSolver, eigenHermitian } from "../../../lib/src/numeric/eigenHermitian.js";
import { SymmetricEigenSolver } from "../../../lib/src/numeric/eigenSymmetricQL.js";
import { symmetricEigenvaluesDD, ddToNumber } from "../../../lib/src/numeric/doubleDouble.js";
import { InputError } from "../../../lib/src/errors.js";
import { runPython } from "../../helpers/python.js";

// Deterministic pseudo-random Hermitian matrices (LCG, so numpy sees the same numbers).
function lcg(seed: number) {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32 - 0.5;
}
function randomHermitian(n: number, seed: number, scaleSpread = false) {
  const r = lcg(seed);
  const re = new Float64Array(n * n),
    im = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      const w = scaleSpread ? 10 ** (3 * r()) : 1;
      const a = r() * w,
        b = i === j ? 0 : r() * w;
      re[i * n + j] = a;
      re[j * n + i] = a;
      im[i * n + j] = b;
      im[j * n + i] = -b;
    }
  return { re, im };
}

const cases = [1, 2, 3, 5, 8, 17, 40, 101].map((n, k) => ({ n, seed: 100 + k, spread: k % 2 === 1 }));

describe("Hermitian eigensolver (Householder + implicit QL)", () => {
  const mats = cases.map((c) => ({ ...c, ...randomHermitian(c.n, c.seed, c.spread) }));
  // Source: Debian's numpy.linalg.eigh (LAPACK zheevd) run as an independent oracle.
  const ref = runPython<Array<{ values: number[]; norm: number }>>(
    `
import json, sys, numpy as np
data = json.load(sys.stdin)
out = []
for m in data:
    n = m["n"]; A = np.array(m["re"]).reshape(n, n) + 1j * np.array(m["im"]).reshape(n, n)
    w = np.linalg.eigh(A)[0]
    out.append({"values": w.tolist(), "norm": float(np.linalg.norm(A, 2))})
print(json.dumps(out))`,
    mats.map((m) => ({ n: m.n, re: Array.from(m.re), im: Array.from(m.im) })),
  );

  it("eigenvalues agree with numpy.linalg.eigh to 1e-12 of the spectral norm", () => {
    mats.forEach((m, k) => {
      const r = eigenHermitian(m.n, m.re, m.im);
      const { values, norm } = ref[k]!;
      for (let i = 0; i < m.n; i++) expect(Math.abs(r.values[i]! - values[i]!) / norm, `n=${m.n} i=${i}`).toBeLessThan(1e-12);
    });
  });

  it("eigenvectors: residual |A v - lambda v| and orthonormality at 1e-13 of the norm", () => {
    // Common practice, no source: backward-error checks of an eigen-decomposition.
    mats.forEach((m, k) => {
      const n = m.n;
      const r = eigenHermitian(n, m.re, m.im);
      const norm = ref[k]!.norm;
      let res = 0,
        orth = 0;
      for (let c = 0; c < n; c++) {
        for (let i = 0; i < n; i++) {
          let sr = 0,
            si = 0;
          for (let j = 0; j < n; j++) {
            const vr = r.vectorsRe![j * n + c]!,
              vi = r.vectorsIm![j * n + c]!;
            sr += m.re[i * n + j]! * vr - m.im[i * n + j]! * vi;
            si += m.re[i * n + j]! * vi + m.im[i * n + j]! * vr;
          }
          res = Math.max(res, Math.hypot(sr - r.values[c]! * r.vectorsRe![i * n + c]!, si - r.values[c]! * r.vectorsIm![i * n + c]!));
        }
        for (let d = 0; d < n; d++) {
          let dr = 0,
            di = 0;
          for (let i = 0; i < n; i++) {
            dr += r.vectorsRe![i * n + c]! * r.vectorsRe![i * n + d]! + r.vectorsIm![i * n + c]! * r.vectorsIm![i * n + d]!;
            di += r.vectorsRe![i * n + c]! * r.vectorsIm![i * n + d]! - r.vectorsIm![i * n + c]! * r.vectorsRe![i * n + d]!;
          }
          orth = Math.max(orth, Math.hypot(dr - (c === d ? 1 : 0), di));
        }
      }
      expect(res / norm, `n=${n}`).toBeLessThan(1e-13);
      expect(orth, `n=${n}`).toBeLessThan(1e-13);
    });
  });

  it("agrees with mathjs eigs (complex) on a 6 x 6 matrix; mathjs is the less accurate of the two", () => {
    // Source: numpy.linalg.eigh as above is the arbiter; mathjs eigs is the library alternative.
    const m = mats.find((x) => x.n === 8)!;
    const k = mats.indexOf(m);
    const rows: Complex[][] = [];
    for (let i = 0; i < m.n; i++) rows.push(Array.from({ length: m.n }, (_, j) => complex(m.re[i * m.n + j]!, m.im[i * m.n + j]!)));
    const res = eigs(rows as never) as unknown as { values: { toArray(): Array<Complex | number> } | Array<Complex | number> };
    const arr = (Array.isArray(res.values) ? res.values : res.values.toArray()).map((z) => (typeof z === "number" ? z : z.re)).sort((a, b) => a - b);
    const ours = eigenHermitian(m.n, m.re, m.im).values;
    const norm = ref[k]!.norm;
    let errOurs = 0,
      errMath = 0;
    for (let i = 0; i < m.n; i++) {
      errOurs = Math.max(errOurs, Math.abs(ours[i]! - ref[k]!.values[i]!) / norm);
      errMath = Math.max(errMath, Math.abs(arr[i]! - ref[k]!.values[i]!) / norm);
    }
    expect(errMath).toBeLessThan(1e-8);
    expect(errOurs).toBeLessThan(1e-13);
  });

  it("real symmetric path and double-double eigenvalues agree with numpy.linalg.eigvalsh", () => {
    const n = 30;
    const { re } = randomHermitian(n, 7);
    const s = new SymmetricEigenSolver(n);
    s.solve(re, true);
    const dd = symmetricEigenvaluesDD(n, re, [0, 1, n - 1]).map(ddToNumber);
    // Source: numpy.linalg.eigvalsh (LAPACK dsyevd), Debian numpy 1.24.
    const ref2 = runPython<{ w: number[]; norm: number }>(
      `
import json, sys, numpy as np
d = json.load(sys.stdin); A = np.array(d["a"]).reshape(d["n"], d["n"])
print(json.dumps({"w": np.linalg.eigvalsh(A).tolist(), "norm": float(np.linalg.norm(A, 2))}))`,
      { n, a: Array.from(re) },
    );
    for (let i = 0; i < n; i++) expect(Math.abs(s.values[i]! - ref2.w[i]!) / ref2.norm).toBeLessThan(1e-12);
    expect(Math.abs(dd[0]! - ref2.w[0]!) / ref2.norm).toBeLessThan(1e-14);
    expect(Math.abs(dd[1]! - ref2.w[1]!) / ref2.norm).toBeLessThan(1e-14);
    expect(Math.abs(dd[2]! - ref2.w[n - 1]!) / ref2.norm).toBeLessThan(1e-14);
  });

  it("degenerate spectrum (identity plus rank one) is handled", () => {
    // Common practice, no source: eigenvalues of I + u u^H are 1 (n-1 times) and 1 + |u|^2.
    const n = 6;
    const ur = [1, 0.5, -0.3, 0.2, 0, 0.7],
      ui = [0, 0.1, 0.4, -0.2, 0.3, 0];
    const re = new Float64Array(n * n),
      im = new Float64Array(n * n);
    let u2 = 0;
    for (let i = 0; i < n; i++) {
      u2 += ur[i]! ** 2 + ui[i]! ** 2;
      for (let j = 0; j < n; j++) {
        re[i * n + j] = (i === j ? 1 : 0) + ur[i]! * ur[j]! + ui[i]! * ui[j]!;
        im[i * n + j] = ui[i]! * ur[j]! - ur[i]! * ui[j]!;
      }
    }
    const r = eigenHermitian(n, re, im);
    for (let i = 0; i < n - 1; i++) expect(r.values[i]).toBeCloseTo(1, 13);
    expect(r.values[n - 1]).toBeCloseTo(1 + u2, 13);
  });

  it("rejects a non-Hermitian matrix with an InputError naming the entries", () => {
    const re = new Float64Array([1, 2, 3, 1]);
    expect(() => eigenHermitian(2, re, null)).toThrow(InputError);
    expect(() => eigenHermitian(2, re, null)).toThrow(/Hermitian/);
    const solver = new HermitianEigenSolver(2);
    expect(solver.n).toBe(2);
  });

  it("solveVectorRows gives the transposed vectors of solve; a reused workspace gives identical results", () => {
    // Common practice, no source: layout variant and workspace reuse must not change results.
    for (const m of mats.filter((x) => x.n <= 17)) {
      const n = m.n;
      const a = new HermitianEigenSolver(n);
      a.solve(m.re, m.im, true);
      const colsRe = Float64Array.from(a.vectorsRe),
        colsIm = Float64Array.from(a.vectorsIm),
        vals = Float64Array.from(a.values);
      const other = randomHermitian(n, 999);
      a.solve(other.re, other.im, true); // dirty the workspace
      a.solveVectorRows(m.re, m.im);
      expect(Array.from(a.values)).toEqual(Array.from(vals));
      for (let i = 0; i < n; i++)
        for (let k = 0; k < n; k++) {
          expect(a.vectorsRe[k * n + i]).toBe(colsRe[i * n + k]);
          expect(a.vectorsIm[k * n + i]).toBe(colsIm[i * n + k]);
        }
      // a subset of the vectors: the same rows
      const first = Math.floor(n / 3),
        count = Math.max(1, Math.floor(n / 2));
      if (first + count <= n) {
        a.solveVectorRows(m.re, m.im, first, count);
        for (let k = first; k < first + count; k++)
          for (let i = 0; i < n; i++) {
            expect(a.vectorsRe[k * n + i]).toBe(colsRe[i * n + k]);
            expect(a.vectorsIm[k * n + i]).toBe(colsIm[i * n + k]);
          }
      }
    }
    expect(() => new HermitianEigenSolver(3).solveVectorRows(new Float64Array(9), null, 2, 2)).toThrow(InputError);
  });

  it("solveVectorRowsInto writes the same rows, packed, at the caller's offsets and leaves the rest alone", () => {
    // Common practice, no source: an output-placement variant must not change results.
    for (const m of mats.filter((x) => x.n >= 2 && x.n <= 12)) {
      const n = m.n,
        nn = n * n;
      const a = new HermitianEigenSolver(n);
      a.solveVectorRows(m.re, m.im);
      const rowsRe = Float64Array.from(a.vectorsRe),
        rowsIm = Float64Array.from(a.vectorsIm),
        vals = Float64Array.from(a.values);
      const E = new Float64Array(3 * n).fill(-7),
        Vr = new Float64Array(3 * nn).fill(-7),
        Vi = new Float64Array(3 * nn).fill(-7);
      const first = n > 2 ? 1 : 0,
        count = n - first - (n > 3 ? 1 : 0);
      a.solveVectorRowsInto(m.re, m.im, first, count, E, n, Vr, Vi, 2 * nn);
      expect(Array.from(E.subarray(n, 2 * n))).toEqual(Array.from(vals));
      expect(E.subarray(0, n).every((x) => x === -7) && E.subarray(2 * n).every((x) => x === -7)).toBe(true);
      // vector k (first <= k < first + count) at 2 nn + (k - first) n; nothing else touched
      for (let k = first; k < first + count; k++)
        for (let i = 0; i < n; i++) {
          expect(Vr[2 * nn + (k - first) * n + i]).toBe(rowsRe[k * n + i]);
          expect(Vi[2 * nn + (k - first) * n + i]).toBe(rowsIm[k * n + i]);
        }
      expect(Vr.subarray(0, 2 * nn).every((x) => x === -7)).toBe(true);
      expect(Vr.subarray(2 * nn + count * n).every((x) => x === -7)).toBe(true);
      expect(Vi.subarray(2 * nn + count * n).every((x) => x === -7)).toBe(true);
    }
    const s = new HermitianEigenSolver(3),
      z = new Float64Array(9);
    expect(() => s.solveVectorRowsInto(z, null, 0, 3, new Float64Array(3), 1, new Float64Array(9), new Float64Array(9), 0)).toThrow(/valuesOffset/);
    expect(() => s.solveVectorRowsInto(z, null, 0, 3, new Float64Array(3), 0, new Float64Array(9), new Float64Array(9), 1)).toThrow(/vectorsOffset/);
    // two of three vectors need only 6 numbers
    expect(() => s.solveVectorRowsInto(z, null, 1, 2, new Float64Array(3), 0, new Float64Array(6), new Float64Array(6), 0)).not.toThrow();
  });
});
