/**
 * Eigenvalues and eigenvectors of a real symmetric BANDED matrix (half-bandwidth b: A[i][j] = 0 for
 * |i - j| > b), e.g. the single-spin Hamiltonians -D Sz^2 + E (Sx^2 - Sy^2) - g muB (Bx Sx + Bz Sz),
 * which are pentadiagonal (b = 2) in the |S, m> basis.
 *
 * Method (cost O(n^2 b) for the values, O(n^2 b^2) for the vectors, against O(n^3) dense):
 *  1. Band -> tridiagonal by Givens rotations with bulge chasing, one outer diagonal at a time
 *     (H. R. Schwarz, Numer. Math. 12, 231 (1968); the algorithm of EISPACK bandr / LAPACK dsbtrd).
 *     The rotations are not accumulated.
 *  2. Eigenvalues of the tridiagonal by the implicit QL algorithm (tql2Real, values only).
 *  3. Eigenvectors by inverse iteration on the ORIGINAL band matrix (band LU with partial
 *     pivoting of A - lambda I), following the design of LAPACK dstein: random start, scaling of the
 *     right-hand side, up to 8 iterations, one more after the growth criterion (dstein: two more), modified Gram-Schmidt
 *     against the previous vectors of a group of close eigenvalues (|lambda_j - lambda_j-1| <=
 *     1e-3 ||A||_1), eigenvalues closer than 10 eps |lambda| pushed apart. Sources: J. H. Wilkinson,
 *     C. Reinsch, Handbook II (1971), contribution II/18 (tristurm: inverse iteration);
 *     E. Anderson et al., LAPACK Users' Guide, 3rd ed. (SIAM 1999), dstein.
 *  4. Every vector is checked (residual |A v - lambda v| <= 1e3 n eps ||A||_1 and unit norm);
 *     if any check fails, the whole problem falls back to the dense Householder + QL solver
 *     (eigenSymmetricQL.ts), so the result is never worse than the dense path.
 *
 * Why not the dense path: for S = 50 (n = 101, b = 2) the dense solver with vectors costs O(n^3)
 * (Householder, accumulation and QL rotations on 101-vectors); this one does a few hundred thousand
 * flops (measured in test/bench/berry.bench.mjs, side by side with numpy.linalg.eigh).
 *
 * Storage: input is a dense row-major n x n matrix (only entries with |i - j| <= b of the lower
 * triangle are read). Eigenvalues ascending; eigenvector k is column k of `vectors`
 * (component i at [i * n + k]), the dense solvers' layout.
 */
import { InputError } from "../errors.js";
import { fastHypot, SymmetricEigenSolver, tql2Real } from "./eigenSymmetricQL.js";

const EPS = 2 ** -52;

export class SymmetricBandEigenSolver {
  readonly n: number;
  readonly bandwidth: number;
  readonly values: Float64Array;
  /** Column k = eigenvector k (for k below the requested count) after `solve(a, true)`. */
  readonly vectors: Float64Array;
  /** True when the last solve fell back to the dense solver (diagnostic). */
  usedDenseFallback = false;
  private readonly w: Float64Array; // dense working copy for the band reduction
  private readonly e: Float64Array;
  private readonly band: Float64Array; // lower band of the input: band[d * n + j] = A[j + d][j]
  private readonly lu: Float64Array; // band LU rows: lu[i * ldw + (j - i + b)], j in [i - b, i + 2b]
  private readonly piv: Int32Array;
  private readonly fullRows: Float64Array; // rows[i * (2b + 1) + (j - i + b)] = A[i][j], zero outside the matrix
  private readonly x: Float64Array;
  private readonly rows: Float64Array; // vectors as rows during inverse iteration
  private readonly ldw: number;
  private dense: SymmetricEigenSolver | null = null;
  private seed = 1;

  constructor(n: number, bandwidth: number) {
    if (!Number.isInteger(n) || n < 1) throw new InputError("n", n, "a positive whole matrix size");
    if (!Number.isInteger(bandwidth) || bandwidth < 0) throw new InputError("bandwidth", bandwidth, "a whole half-bandwidth >= 0");
    this.n = n;
    this.bandwidth = Math.min(bandwidth, n - 1);
    this.values = new Float64Array(n);
    this.vectors = new Float64Array(n * n);
    this.w = new Float64Array(n * n);
    this.e = new Float64Array(n);
    this.band = new Float64Array((this.bandwidth + 1) * n);
    this.ldw = 3 * this.bandwidth + 1;
    this.lu = new Float64Array(n * this.ldw);
    this.piv = new Int32Array(n);
    this.fullRows = new Float64Array(n * (2 * this.bandwidth + 1));
    this.x = new Float64Array(n);
    this.rows = new Float64Array(n * n);
  }

  /**
   * Diagonalize the symmetric band matrix `a` (dense row-major; entries outside the band are
   * ignored). With `vectors`, eigenvectors of the `count` lowest eigenvalues are computed
   * (default all).
   */
  solve(a: ArrayLike<number>, vectors = true, count = this.n): void {
    const n = this.n;
    const b = this.bandwidth;
    if (a.length !== n * n) throw new InputError("matrix", a, `an ${n} x ${n} row-major matrix`);
    if (!Number.isInteger(count) || count < 0 || count > n) throw new InputError("count", count, `a whole number from 0 to ${n}`);
    this.usedDenseFallback = false;
    const band = this.band;
    let onenrm = 0;
    for (let d = 0; d <= b; d++) for (let j = 0; j + d < n; j++) band[d * n + j] = a[(j + d) * n + j]!;
    const rows = this.fullRows;
    const wb = 2 * b + 1;
    rows.fill(0);
    for (let d = 0; d <= b; d++) {
      for (let j = 0; j + d < n; j++) {
        const v = band[d * n + j]!;
        rows[(j + d) * wb + b - d] = v; // A[j + d][j]
        rows[j * wb + b + d] = v; // A[j][j + d]
      }
    }
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = Math.max(0, i - b); j <= Math.min(n - 1, i + b); j++) s += Math.abs(i >= j ? band[(i - j) * n + j]! : band[(j - i) * n + i]!);
      if (s > onenrm) onenrm = s;
    }
    this.tridiagonalValues();
    if (!vectors || count === 0) return;
    if (!this.inverseIteration(count, onenrm)) {
      this.usedDenseFallback = true;
      const dense = this.dense ?? (this.dense = new SymmetricEigenSolver(n));
      // Dense copy of the band (the input may hold stray entries outside the band).
      const w = this.w;
      w.fill(0);
      for (let d = 0; d <= b; d++) for (let j = 0; j + d < n; j++) w[(j + d) * n + j] = band[d * n + j]!;
      dense.solve(w, true);
      this.values.set(dense.values);
      this.vectors.set(dense.vectors);
    }
  }

  /** Steps 1 and 2: band reduction (no accumulation) and QL eigenvalues, ascending. */
  private tridiagonalValues(): void {
    const n = this.n;
    const b = this.bandwidth;
    const w = this.w;
    const band = this.band;
    // Dense working copy (lower and upper), only the band and one bulge diagonal are ever nonzero.
    // Clearing only what the reduction can touch keeps the cost O(n b).
    for (let i = 0; i < n; i++) {
      const lo = Math.max(0, i - b - 1),
        hi = Math.min(n - 1, i + b + 1);
      for (let j = lo; j <= hi; j++) w[i * n + j] = 0;
    }
    for (let d = 0; d <= b; d++) {
      for (let j = 0; j + d < n; j++) {
        const v = band[d * n + j]!;
        w[(j + d) * n + j] = v;
        w[j * n + j + d] = v;
      }
    }
    for (let d = b; d >= 2; d--) {
      for (let j = 0; j + d < n; j++) {
        // zero A[j + d][j] with rows/columns (j + d - 1, j + d), then chase the bulge down.
        let row = j + d;
        let col = j;
        while (row < n) {
          const x = w[row * n + col]!;
          if (x !== 0) {
            const y = w[(row - 1) * n + col]!;
            const r = fastHypot(x, y);
            const c = y / r;
            const s = x / r;
            rotate(w, n, row - 1, row, c, s, d);
            w[row * n + col] = 0;
            w[col * n + row] = 0;
          }
          col = row - 1;
          row += d;
        }
      }
    }
    const dd = this.values;
    const e = this.e;
    for (let i = 0; i < n; i++) {
      dd[i] = w[i * n + i]!;
      e[i] = i < n - 1 ? w[(i + 1) * n + i]! : 0;
    }
    tql2Real(n, dd, e, null);
    dd.sort(); // typed arrays sort numerically
  }

  /** Step 3; false if a vector fails the checks (the caller then falls back to the dense path). */
  private inverseIteration(count: number, onenrm: number): boolean {
    const n = this.n;
    const b = this.bandwidth;
    const lam = this.values;
    const Z = this.rows;
    const x = this.x;
    const scale = onenrm > 0 ? onenrm : 1;
    const ortol = 1e-3 * scale;
    const dtpcrt = Math.sqrt(0.1 / n);
    const tol = EPS * scale;
    let groupStart = 0;
    let xjm = 0;
    this.seed = 1; // same start vectors on every call: reproducible results
    for (let j = 0; j < count; j++) {
      let xj = lam[j]!;
      if (j > 0) {
        const pertol = 10 * Math.abs(EPS * xj) + 10 * EPS * scale * 1e-3;
        if (xj - xjm < pertol) xj = xjm + pertol;
        if (Math.abs(xj - xjm) > ortol) groupStart = j;
      } else groupStart = 0;
      this.factor(xj, tol);
      const unn = 1 / Math.abs(this.lu[(n - 1) * this.ldw + b]!);
      // pseudo-random start in (-1, 1) (32-bit LCG)
      let s = this.seed;
      for (let i = 0; i < n; i++) {
        s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
        x[i] = s / 2147483648 - 1;
      }
      this.seed = s;
      // Converged after the growth criterion held in two iterations (one extra; dstein uses two).
      let passes = 0;
      let amax = 0;
      for (let i = 0; i < n; i++) {
        const a = Math.abs(x[i]!);
        if (a > amax) amax = a;
      }
      // dstein scales to n |A|_1 max(eps, |u_nn|); n max(eps |A|_1, |u_nn|) agrees with it for
      // |A|_1 ~ 1 and does not depend on the units of the matrix.
      const target = n * (unn > EPS * scale ? unn : EPS * scale);
      for (let it = 0; it < 8 && passes < 2; it++) {
        if (!(amax > 0) || !Number.isFinite(amax)) return false;
        const scl = target / amax;
        for (let i = 0; i < n; i++) x[i] = x[i]! * scl;
        this.backSolve(x);
        for (let g = groupStart; g < j; g++) {
          let dot = 0;
          const base = g * n;
          for (let i = 0; i < n; i++) dot += x[i]! * Z[base + i]!;
          for (let i = 0; i < n; i++) x[i] = x[i]! - dot * Z[base + i]!;
        }
        amax = 0;
        for (let i = 0; i < n; i++) {
          const a = Math.abs(x[i]!);
          if (a > amax) amax = a;
        }
        if (amax >= dtpcrt) passes++;
      }
      if (passes < 2) return false;
      let ss = 0;
      let jmax = 0;
      for (let i = 0; i < n; i++) {
        ss += x[i]! * x[i]!;
        if (Math.abs(x[i]!) > Math.abs(x[jmax]!)) jmax = i;
      }
      const inv = (x[jmax]! < 0 ? -1 : 1) / Math.sqrt(ss);
      const base = j * n;
      for (let i = 0; i < n; i++) Z[base + i] = x[i]! * inv;
      // residual check |A z - lambda z|_inf
      const rows = this.fullRows;
      const wb = 2 * b + 1;
      let res = 0;
      for (let i = 0; i < n; i++) {
        let t = -lam[j]! * Z[base + i]!;
        const lo = i - b < 0 ? 0 : i - b,
          hi = i + b > n - 1 ? n - 1 : i + b;
        const r = i * wb - i + b;
        for (let k = lo; k <= hi; k++) t += rows[r + k]! * Z[base + k]!;
        if (Math.abs(t) > res) res = Math.abs(t);
      }
      if (!(res <= 1e3 * n * EPS * scale)) return false;
      xjm = xj;
    }
    // Columns layout.
    const V = this.vectors;
    for (let k = 0; k < count; k++) for (let i = 0; i < n; i++) V[i * n + k] = Z[k * n + i]!;
    for (let k = count; k < n; k++) for (let i = 0; i < n; i++) V[i * n + k] = 0;
    return true;
  }

  /**
   * Band LU with partial pivoting of A - shift I; pivots below tol are replaced by +-tol. The
   * diagonal of U is stored as its reciprocal.
   */
  private factor(shift: number, tol: number): void {
    const n = this.n;
    const b = this.bandwidth;
    const L = this.ldw;
    const lu = this.lu;
    const rows = this.fullRows;
    const piv = this.piv;
    const wb = 2 * b + 1;
    // Row i holds columns i - b .. i + 2b at offsets 0 .. 3b.
    for (let i = 0; i < n; i++) {
      const r = i * L;
      const q = i * wb;
      for (let o = 0; o < wb; o++) lu[r + o] = rows[q + o]!;
      for (let o = wb; o < L; o++) lu[r + o] = 0;
      lu[r + b] = lu[r + b]! - shift;
    }
    for (let k = 0; k < n; k++) {
      const last = Math.min(n - 1, k + b);
      let p = k;
      let best = Math.abs(lu[k * L + b]!);
      for (let r = k + 1; r <= last; r++) {
        const v = Math.abs(lu[r * L + k - r + b]!);
        if (v > best) {
          best = v;
          p = r;
        }
      }
      piv[k] = p;
      const jEnd = Math.min(n - 1, k + 2 * b);
      if (p !== k) {
        for (let j = k; j <= jEnd; j++) {
          const ik = k * L + j - k + b;
          const ip = p * L + j - p + b;
          const t = lu[ik]!;
          lu[ik] = lu[ip]!;
          lu[ip] = t;
        }
      }
      let pivot = lu[k * L + b]!;
      if (Math.abs(pivot) < tol) pivot = pivot < 0 ? -tol : tol;
      const inv = 1 / pivot;
      lu[k * L + b] = inv; // the reciprocal pivot is stored: back substitution multiplies
      for (let r = k + 1; r <= last; r++) {
        const ir = r * L - r + b;
        const f = lu[ir + k]! * inv;
        lu[ir + k] = f;
        if (f === 0) continue;
        const ik = k * L - k + b;
        for (let j = k + 1; j <= jEnd; j++) lu[ir + j] = lu[ir + j]! - f * lu[ik + j]!;
      }
    }
  }

  /** x <- (A - shift I)^-1 x with the factors of `factor`. */
  private backSolve(x: Float64Array): void {
    const n = this.n;
    const b = this.bandwidth;
    const L = this.ldw;
    const lu = this.lu;
    const piv = this.piv;
    for (let k = 0; k < n; k++) {
      const p = piv[k]!;
      if (p !== k) {
        const t = x[k]!;
        x[k] = x[p]!;
        x[p] = t;
      }
      const xk = x[k]!;
      if (xk === 0) continue;
      const last = Math.min(n - 1, k + b);
      for (let r = k + 1; r <= last; r++) x[r] = x[r]! - lu[r * L + k - r + b]! * xk;
    }
    for (let i = n - 1; i >= 0; i--) {
      const r = i * L - i + b;
      let s = x[i]!;
      const jEnd = Math.min(n - 1, i + 2 * b);
      for (let j = i + 1; j <= jEnd; j++) s -= lu[r + j]! * x[j]!;
      x[i] = s * lu[r + i]!;
    }
  }
}

/**
 * Rotation of rows and columns (p, q = p + 1) of the dense symmetric working matrix:
 * row p <- c row p + s row q, row q <- -s row p + c row q (and the same on the columns). Only the
 * window the band (plus one bulge diagonal) can reach is touched.
 */
function rotate(w: Float64Array, n: number, p: number, q: number, c: number, s: number, d: number): void {
  const lo = Math.max(0, p - d - 1);
  const hi = Math.min(n - 1, q + d + 1);
  const app = w[p * n + p]!,
    aqq = w[q * n + q]!,
    apq = w[q * n + p]!;
  for (let k = lo; k <= hi; k++) {
    if (k === p || k === q) continue;
    const xp = w[p * n + k]!,
      xq = w[q * n + k]!;
    const np = c * xp + s * xq;
    const nq = c * xq - s * xp;
    w[p * n + k] = np;
    w[k * n + p] = np;
    w[q * n + k] = nq;
    w[k * n + q] = nq;
  }
  const cc = c * c,
    ss = s * s,
    cs = c * s;
  w[p * n + p] = cc * app + 2 * cs * apq + ss * aqq;
  w[q * n + q] = ss * app - 2 * cs * apq + cc * aqq;
  const npq = cs * (aqq - app) + (cc - ss) * apq;
  w[q * n + p] = npq;
  w[p * n + q] = npq;
}

/** Half-bandwidth of a dense row-major n x n matrix: the largest |i - j| with A[i][j] != 0 (either triangle). */
export function matrixBandwidth(n: number, a: ArrayLike<number>): number {
  if (a.length !== n * n) throw new InputError("matrix", a, `an ${n} x ${n} row-major matrix`);
  let b = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const d = i > j ? i - j : j - i;
      if (d > b && a[i * n + j] !== 0) b = d;
    }
  }
  return b;
}
