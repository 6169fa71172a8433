/**
 * Small dense linear algebra for least-squares problems: Householder QR with column pivoting of a
 * tall m x n matrix (m >> n allowed, column-major storage so each column is contiguous), solution
 * of damped triangular systems, inverse of R^T R, and the symmetric eigenproblem (Householder + QL,
 * from eigenSymmetricQL.ts).
 *
 * Hand-written because no maintained TypeScript library offers pivoted QR on Float64Array columns
 * (mathjs works on nested arrays and boxes numbers; far too slow for 100 000 x 5 Jacobians).
 *
 * Sources: G. Golub, C. Van Loan, *Matrix Computations* (4th ed., 2013), sections 5.2 (Householder
 * QR), 5.4.1 (column pivoting); J. More, "The Levenberg-Marquardt algorithm:
 * implementation and theory", Lecture Notes in Mathematics 630 (1978) for the use in LM.
 */

import { SymmetricEigenSolver } from "./eigenSymmetricQL.js";
import { InputError } from "../errors.js";

/** Result of a pivoted QR factorization A P = Q R of an m x n matrix (m >= n). */
export interface PivotedQr {
  m: number;
  n: number;
  /** R, n x n upper triangular, column-major (r[i + j*n] = R_ij). */
  r: Float64Array;
  /** Column permutation: column j of A P is column perm[j] of A. */
  perm: Int32Array;
  /** Euclidean norms of the columns of the original A (unpivoted order). */
  columnNorms: Float64Array;
  /** Numerical rank (diagonal of R above rcond * |R_00|). */
  rank: number;
  /** Householder vectors (column-major, m x n) and their scalars, for applying Q^T. */
  v: Float64Array;
  beta: Float64Array;
}

/**
 * Householder QR with column pivoting of `a` (column-major m x n, length m*n). `a` is not
 * modified. `rcond` decides the numerical rank.
 */
export function pivotedQr(a: Float64Array, m: number, n: number, rcond = 1e-13): PivotedQr {
  if (a.length !== m * n) throw new RangeError(`pivotedQr: matrix has ${a.length} entries, expected ${m}*${n}`);
  if (m < n) throw new RangeError(`pivotedQr: needs m >= n (got ${m} x ${n})`);
  const w = Float64Array.from(a);
  const perm = new Int32Array(n);
  const colNorm2 = new Float64Array(n);
  const columnNorms = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    perm[j] = j;
    let s = 0;
    const off = j * m;
    for (let i = 0; i < m; i++) s += w[off + i]! * w[off + i]!;
    colNorm2[j] = s;
    columnNorms[j] = Math.sqrt(s);
  }
  const beta = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    // pivot: column with the largest remaining norm (recomputed exactly: n is small)
    let best = k;
    let bestNorm = -1;
    for (let j = k; j < n; j++) {
      let s = 0;
      const off = j * m;
      for (let i = k; i < m; i++) s += w[off + i]! * w[off + i]!;
      colNorm2[j] = s;
      if (s > bestNorm) {
        bestNorm = s;
        best = j;
      }
    }
    if (best !== k) {
      const ok = k * m;
      const ob = best * m;
      for (let i = 0; i < m; i++) {
        const t = w[ok + i]!;
        w[ok + i] = w[ob + i]!;
        w[ob + i] = t;
      }
      const tp = perm[k]!;
      perm[k] = perm[best]!;
      perm[best] = tp;
    }
    // Householder vector for column k, rows k..m-1 (stored in place, v_k = 1 implicit scaling)
    const ok = k * m;
    const normx = Math.sqrt(bestNorm);
    if (normx === 0) {
      beta[k] = 0;
      continue;
    }
    const alpha = w[ok + k]! >= 0 ? -normx : normx;
    const v0 = w[ok + k]! - alpha;
    // v = [v0, x_{k+1..}], beta = 2 / (v^T v)
    let vtv = v0 * v0;
    for (let i = k + 1; i < m; i++) vtv += w[ok + i]! * w[ok + i]!;
    w[ok + k] = v0;
    const b = vtv > 0 ? 2 / vtv : 0;
    beta[k] = b;
    // apply H = I - b v v^T to the remaining columns
    for (let j = k + 1; j < n; j++) {
      const oj = j * m;
      let s = 0;
      for (let i = k; i < m; i++) s += w[ok + i]! * w[oj + i]!;
      s *= b;
      if (s !== 0) for (let i = k; i < m; i++) w[oj + i]! -= s * w[ok + i]!;
    }
    // store R_kk separately: we keep v in column k and put alpha in the R array below
    colNorm2[k] = alpha; // reuse as storage of the diagonal
  }
  const r = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < j; i++) r[i + j * n] = w[j * m + i]!;
    r[j + j * n] = beta[j] === 0 && colNorm2[j] === 0 ? 0 : colNorm2[j]!;
  }
  let rank = 0;
  const r00 = Math.abs(r[0]!);
  for (let k = 0; k < n; k++) if (Math.abs(r[k + k * n]!) > rcond * r00 && r00 > 0) rank++;
  return { m, n, r, perm, columnNorms, rank, v: w, beta };
}

/** Q^T b for the factorization (b has length m); returns a new array. */
export function applyQt(qr: PivotedQr, b: ArrayLike<number>): Float64Array {
  const { m, n, v, beta } = qr;
  const out = Float64Array.from(b as ArrayLike<number>);
  for (let k = 0; k < n; k++) {
    const bk = beta[k]!;
    if (bk === 0) continue;
    const ok = k * m;
    let s = 0;
    for (let i = k; i < m; i++) s += v[ok + i]! * out[i]!;
    s *= bk;
    for (let i = k; i < m; i++) out[i]! -= s * v[ok + i]!;
  }
  return out;
}

/**
 * Solve min || [R; sqrt(lambda) D] z - [qtb; 0] || for z (n small), where R is n x n upper
 * triangular (column-major) and D a diagonal (in the same, pivoted, order as R's columns).
 * Returns z and the upper-triangular factor S of the stacked matrix (S^T S = R^T R + lambda D^2),
 * which the Levenberg-Marquardt parameter search needs for phi'(lambda). Uses Givens rotations
 * (as MINPACK's qrsolv). Components beyond `rank` are set to zero when lambda = 0.
 */
export function solveDampedTriangular(
  r: Float64Array,
  n: number,
  diag: ArrayLike<number>,
  lambda: number,
  qtb: ArrayLike<number>,
  rank = n,
): { z: Float64Array; s: Float64Array; singular: boolean } {
  const s = Float64Array.from(r);
  const rhs = new Float64Array(n);
  for (let i = 0; i < n; i++) rhs[i] = qtb[i]!;
  const sq = Math.sqrt(Math.max(lambda, 0));
  if (sq > 0) {
    // eliminate each row of sqrt(lambda) D by Givens rotations against S
    const row = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      if (diag[j] === 0) continue;
      row.fill(0);
      row[j] = sq * diag[j]!;
      let extra = 0; // rhs component of the appended row
      for (let k = j; k < n; k++) {
        if (row[k] === 0) continue;
        const skk = s[k + k * n]!;
        let c: number;
        let sn: number;
        if (Math.abs(skk) < Math.abs(row[k]!)) {
          const cot = skk / row[k]!;
          sn = 0.5 / Math.sqrt(0.25 + 0.25 * cot * cot);
          c = sn * cot;
        } else {
          const tan = row[k]! / skk;
          c = 0.5 / Math.sqrt(0.25 + 0.25 * tan * tan);
          sn = c * tan;
        }
        s[k + k * n] = c * skk + sn * row[k]!;
        const t = c * rhs[k]! + sn * extra;
        extra = -sn * rhs[k]! + c * extra;
        rhs[k] = t;
        for (let i = k + 1; i < n; i++) {
          const ski = s[k + i * n]!;
          const t2 = c * ski + sn * row[i]!;
          row[i] = -sn * ski + c * row[i]!;
          s[k + i * n] = t2;
        }
      }
    }
  }
  // back substitution; in the singular case (lambda = 0, rank < n) zero the trailing components
  const z = new Float64Array(n);
  let nsing = n;
  for (let j = 0; j < n; j++) {
    if (s[j + j * n] === 0 || (sq === 0 && j >= rank)) {
      nsing = j;
      break;
    }
  }
  for (let j = nsing - 1; j >= 0; j--) {
    let sum = rhs[j]!;
    for (let i = j + 1; i < nsing; i++) sum -= s[j + i * n]! * z[i]!;
    z[j] = sum / s[j + j * n]!;
  }
  return { z, s, singular: nsing < n };
}

/** Solve S^T w = b for upper-triangular S (n x n column-major). */
export function solveUpperTransposed(s: Float64Array, n: number, b: ArrayLike<number>): Float64Array {
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sum = b[i]!;
    for (let k = 0; k < i; k++) sum -= s[k + i * n]! * w[k]!;
    const d = s[i + i * n]!;
    w[i] = d === 0 ? 0 : sum / d;
  }
  return w;
}

/**
 * (A^T A)^-1 in the original column order from a pivoted QR, i.e. P (R^T R)^-1 P^T.
 * Returns null if R is singular to working precision (rank < n).
 */
export function inverseNormalFromQr(qr: PivotedQr): Float64Array | null {
  const { n, r, perm, rank } = qr;
  if (rank < n) return null;
  // Rinv (upper triangular)
  const rinv = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    rinv[j + j * n] = 1 / r[j + j * n]!;
    for (let i = j - 1; i >= 0; i--) {
      let sum = 0;
      for (let k = i + 1; k <= j; k++) sum += r[i + k * n]! * rinv[k + j * n]!;
      rinv[i + j * n] = -sum / r[i + i * n]!;
    }
  }
  // C = Rinv Rinv^T, then permute
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      let sum = 0;
      for (let k = Math.max(i, j); k < n; k++) sum += rinv[i + k * n]! * rinv[j + k * n]!;
      const pi = perm[i]!;
      const pj = perm[j]!;
      out[pi + pj * n] = sum;
      out[pj + pi * n] = sum;
    }
  }
  return out;
}

/**
 * Eigen-decomposition of a symmetric n x n matrix (row-major or column-major: symmetric; the lower
 * triangle of the row-major reading is used). Returns eigenvalues (ascending) and eigenvectors as
 * columns (vectors[i + k*n] = component i of eigenvector k). One implementation for the library's
 * dense symmetric problems: Householder tridiagonalization and implicit QL (eigenSymmetricQL.ts,
 * Wilkinson and Reinsch, Handbook II/2 and II/3); this was a cyclic Jacobi method before, 3 to 10
 * times slower from n = 10 on.
 */
export function symmetricEigen(a: ArrayLike<number>, n: number): { values: Float64Array; vectors: Float64Array } {
  for (let i = 0; i < n * n; i++) if (!Number.isFinite(a[i]!)) throw new InputError("matrix", a[i]!, `finite entries (entry ${i} of the ${n} x ${n} matrix is not)`);
  const solver = new SymmetricEigenSolver(n);
  solver.solve(a, true);
  const values = Float64Array.from(solver.values);
  // The solver keeps eigenvector k as its column k in row-major storage ([i * n + k]); here it is
  // the k-th block of n ([i + k * n]).
  const V = solver.vectors;
  const vectors = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) vectors[i + k * n] = V[i * n + k]!;
  return { values, vectors };
}

/**
 * Cholesky factor L (lower, column-major, G = L L^T) of a symmetric positive definite n x n
 * column-major G (lower triangle read), or null when a pivot is not positive or the smallest
 * diagonal of L is below minPivotRatio times the largest (a condition-number guard: cond(G) is
 * about the square of that ratio's inverse). Common practice, no source.
 * Library or hand-written, by measurement (test/bench/libraries.bench.mjs, interleaved): ml-matrix's
 * CholeskyDecomposition, with the conversions our column-major Float64Array API needs, was 4-8 times
 * slower for n = 5 ... 60 at the same backward error (|L L^T - G| / |G| about 2e-16 both); kept ours.
 */
export function choleskyLower(G: ArrayLike<number>, n: number, minPivotRatio: number): Float64Array | null {
  const L = new Float64Array(n * n);
  let dmin = Infinity;
  let dmax = 0;
  for (let j = 0; j < n; j++) {
    let d = G[j + j * n]!;
    for (let k = 0; k < j; k++) d -= L[j + k * n]! * L[j + k * n]!;
    if (!(d > 0)) return null;
    const ljj = Math.sqrt(d);
    L[j + j * n] = ljj;
    dmin = Math.min(dmin, ljj);
    dmax = Math.max(dmax, ljj);
    for (let i = j + 1; i < n; i++) {
      let s = G[i + j * n]!;
      for (let k = 0; k < j; k++) s -= L[i + k * n]! * L[j + k * n]!;
      L[i + j * n] = s / ljj;
    }
  }
  return dmin < minPivotRatio * dmax ? null : L;
}
