/**
 * Eigenvalues and eigenvectors of complex Hermitian (and real symmetric) matrices.
 *
 * Method: complex Householder reduction to Hermitian tridiagonal form, a diagonal unitary phase
 * transform that makes the tridiagonal real symmetric, then the implicit QL algorithm with Wilkinson
 * shifts (the EISPACK htridi / tql2 / htribk sequence). Eigenvectors: the QL rotations act on a REAL
 * matrix Z (eigenvectors of the real tridiagonal), then v_k = Q D z_k with the Householder
 * reflectors applied to each vector (the htribk back-transformation), which halves the rotation work
 * against rotating complex vectors and never forms Q.
 * Sources: J. H. Wilkinson, C. Reinsch, *Handbook for Automatic Computation II, Linear Algebra*
 * (Springer 1971), contributions II/2 (tred2) and II/3 (tql2); B. T. Smith et al., *Matrix Eigensystem
 * Routines - EISPACK Guide* (Springer 1976) for the complex Hermitian variant.
 *
 * Why a dedicated routine rather than mathjs `eigs` (measured by test/bench/berry.bench.mjs on the
 * shared 2-core machine, Node 20, load ~6, so absolute times are inflated; ratios are what count):
 * mathjs 15 treats complex matrices with its general (non-Hermitian) algorithm on boxed Complex
 * objects. Values + vectors of a random 6 x 6 Hermitian matrix: mathjs 34 ms, this routine 4 us
 * (~8000x); 40 x 40: mathjs 15 s, this routine 0.6 ms (~24000x). mathjs eigenvalues also carry
 * spurious imaginary parts (~1e-13 of the norm) and errors ~1e-13 relative to the spectral norm,
 * against <= 1e-15 here (both checked against numpy.linalg.eigh in the tests). Chern numbers need
 * 40 000 diagonalizations per 200 x 200 zone, so only the dedicated routine fits a browser slider;
 * mathjs stays as the library reference in the comparison test.
 *
 * Storage: an n x n matrix is two row-major Float64Arrays (real and imaginary parts).
 * Eigenvectors are returned as the columns of an n x n row-major matrix:
 * component i of eigenvector k is `vectorsRe[i * n + k] + i * vectorsIm[i * n + k]`.
 * Eigenvalues are ascending.
 */
import { InputError } from "../errors.js";
import { fastHypot, sortAscending, tql2Real } from "./eigenSymmetricQL.js";

export interface HermitianEigenResult {
  n: number;
  values: Float64Array;
  /** Present unless eigenvalues only were asked for. */
  vectorsRe?: Float64Array;
  vectorsIm?: Float64Array;
}


/**
 * Reusable workspace for repeated diagonalizations of n x n Hermitian matrices (no allocation per
 * call). `solve` overwrites the workspace's outputs; copy them if you keep them.
 */
export class HermitianEigenSolver {
  readonly n: number;
  readonly values: Float64Array;
  readonly vectorsRe: Float64Array;
  readonly vectorsIm: Float64Array;
  private readonly ar: Float64Array;
  private readonly ai: Float64Array;
  private readonly e: Float64Array;
  private readonly vr: Float64Array;
  private readonly vi: Float64Array;
  private readonly pr: Float64Array;
  private readonly pi: Float64Array;
  private readonly hr: Float64Array;
  private readonly hi: Float64Array;
  private readonly taus: Float64Array;
  private readonly z: Float64Array;

  constructor(n: number) {
    if (!Number.isInteger(n) || n < 1) throw new InputError("n", n, "a positive whole matrix size");
    this.n = n;
    this.values = new Float64Array(n);
    this.vectorsRe = new Float64Array(n * n);
    this.vectorsIm = new Float64Array(n * n);
    this.ar = new Float64Array(n * n);
    this.ai = new Float64Array(n * n);
    this.e = new Float64Array(n);
    this.vr = new Float64Array(n);
    this.vi = new Float64Array(n);
    this.pr = new Float64Array(n);
    this.pi = new Float64Array(n);
    this.hr = new Float64Array(n * n);
    this.hi = new Float64Array(n * n);
    this.taus = new Float64Array(n);
    this.z = new Float64Array(n * n);
  }

  /**
   * Diagonalize the Hermitian matrix (re, im) (row-major; only the lower triangle is read, the
   * upper is assumed to be its conjugate). `im` may be omitted for a real symmetric matrix.
   * With `vectors = false` only eigenvalues are computed (about 3 times faster).
   */
  solve(re: ArrayLike<number>, im: ArrayLike<number> | null, vectors = true): void {
    this.solveInternal(re, im, vectors, false);
  }

  /**
   * As `solve` with vectors, but leaves eigenvector k as ROW k of (vectorsRe, vectorsIm)
   * (component i at [k * n + i]): the solver's internal layout, which saves a transpose for
   * callers that read whole vectors (link variables). Only the vectors first .. first + count - 1
   * are computed (the QL runs in full; the back-transformation is skipped for the others, whose
   * rows are then undefined).
   */
  solveVectorRows(re: ArrayLike<number>, im: ArrayLike<number> | null, first = 0, count = this.n): void {
    if (!Number.isInteger(first) || !Number.isInteger(count) || first < 0 || count < 0 || first + count > this.n) {
      throw new InputError("first, count", [first, count], `a range of eigenvector indices within 0..${this.n - 1}`);
    }
    this.solveInternal(re, im, true, true, first, first + count);
  }

  private solveInternal(re: ArrayLike<number>, im: ArrayLike<number> | null, vectors: boolean, rows: boolean, kFrom = 0, kTo = this.n): void {
    const n = this.n;
    const ar = this.ar;
    const ai = this.ai;
    // Copy the lower triangle and mirror it: the input is never modified.
    for (let i = 0; i < n; i++) {
      for (let j = 0; j <= i; j++) {
        const r = re[i * n + j]!;
        const m = im ? im[i * n + j]! : 0;
        ar[i * n + j] = r;
        ai[i * n + j] = m;
        ar[j * n + i] = r;
        ai[j * n + i] = -m;
      }
      ai[i * n + i] = 0;
    }
    const hr = this.hr;
    const hi = this.hi;
    const taus = this.taus;
    for (let k = 0; k < n; k++) taus[k] = 0;
    const vr = this.vr;
    const vi = this.vi;
    const pr = this.pr;
    const pi = this.pi;
    // Householder reduction: step k annihilates A[k+2.., k] with P = I - tau v v^H acting on k+1..n-1.
    for (let k = 0; k < n - 2; k++) {
      let tail = 0;
      for (let i = k + 2; i < n; i++) tail += ar[i * n + k]! * ar[i * n + k]! + ai[i * n + k]! * ai[i * n + k]!;
      if (tail === 0) continue;
      const x0r = ar[(k + 1) * n + k]!;
      const x0i = ai[(k + 1) * n + k]!;
      const abs0 = fastHypot(x0r, x0i);
      const norm = Math.sqrt(abs0 * abs0 + tail);
      // alpha = -e^{i arg x0} |x|, so that v0 = x0 - alpha never cancels.
      const phr = abs0 === 0 ? 1 : x0r / abs0;
      const phi = abs0 === 0 ? 0 : x0i / abs0;
      const alr = -phr * norm;
      const ali = -phi * norm;
      vr[k + 1] = x0r - alr;
      vi[k + 1] = x0i - ali;
      let vv = vr[k + 1]! * vr[k + 1]! + vi[k + 1]! * vi[k + 1]!;
      for (let i = k + 2; i < n; i++) {
        vr[i] = ar[i * n + k]!;
        vi[i] = ai[i * n + k]!;
      }
      vv += tail;
      const tau = 2 / vv;
      // p = tau A v on the trailing block.
      let beta = 0;
      for (let i = k + 1; i < n; i++) {
        let sr = 0;
        let si = 0;
        const row = i * n;
        for (let j = k + 1; j < n; j++) {
          const a = ar[row + j]!;
          const b = ai[row + j]!;
          sr += a * vr[j]! - b * vi[j]!;
          si += a * vi[j]! + b * vr[j]!;
        }
        pr[i] = tau * sr;
        pi[i] = tau * si;
        // beta = v^H p (real for Hermitian A).
        beta += vr[i]! * pr[i]! + vi[i]! * pi[i]!;
      }
      const half = 0.5 * tau * beta;
      for (let i = k + 1; i < n; i++) {
        pr[i] = pr[i]! - half * vr[i]!;
        pi[i] = pi[i]! - half * vi[i]!;
      }
      // A -= v q^H + q v^H (q stored in p).
      for (let i = k + 1; i < n; i++) {
        const row = i * n;
        const vir = vr[i]!;
        const vii = vi[i]!;
        const qir = pr[i]!;
        const qii = pi[i]!;
        for (let j = k + 1; j <= i; j++) {
          // v_i conj(q_j) + q_i conj(v_j)
          const dr = vir * pr[j]! + vii * pi[j]! + qir * vr[j]! + qii * vi[j]!;
          const di = vii * pr[j]! - vir * pi[j]! + qii * vr[j]! - qir * vi[j]!;
          ar[row + j] = ar[row + j]! - dr;
          ai[row + j] = ai[row + j]! - di;
          ar[j * n + i] = ar[row + j]!;
          ai[j * n + i] = -ai[row + j]!;
        }
      }
      ar[(k + 1) * n + k] = alr;
      ai[(k + 1) * n + k] = ali;
      for (let i = k + 2; i < n; i++) {
        ar[i * n + k] = 0;
        ai[i * n + k] = 0;
      }
      taus[k] = tau;
      for (let i = k + 1; i < n; i++) {
        hr[k * n + i] = vr[i]!;
        hi[k * n + i] = vi[i]!;
      }
    }
    // Phase transform: T' = D^H T D real symmetric, delta_{i+1} = delta_i c_i / |c_i|.
    const d = this.values;
    const e = this.e;
    for (let i = 0; i < n; i++) d[i] = ar[i * n + i]!;
    if (!vectors) {
      for (let i = 0; i < n - 1; i++) e[i] = fastHypot(ar[(i + 1) * n + i]!, ai[(i + 1) * n + i]!);
      e[n - 1] = 0;
      tql2Real(n, d, e, null, "tridiagonal QL (Hermitian eigensolver)");
      d.sort(); // typed arrays sort numerically
      return;
    }
    // Phases D: delta_0 = 1, delta_{j+1} = delta_j c_j / |c_j| (c_j = T[j+1][j]); e_j = |c_j|.
    const phr = pr;
    const phi = pi;
    let dr = 1;
    let di = 0;
    for (let j = 0; j < n; j++) {
      phr[j] = dr;
      phi[j] = di;
      if (j < n - 1) {
        const cr = ar[(j + 1) * n + j]!;
        const ci = ai[(j + 1) * n + j]!;
        const ac = fastHypot(cr, ci);
        e[j] = ac;
        if (ac > 0) {
          const ur = cr / ac;
          const ui = ci / ac;
          const nr = dr * ur - di * ui;
          di = dr * ui + di * ur;
          dr = nr;
        }
      } else {
        e[j] = 0;
      }
    }
    // QL on the real tridiagonal with REAL rotations of Z (eigenvector k of T' = row k of Z): half
    // the work of rotating complex rows. Then v_k = Q D z_k with Q = P_0 P_1 ... P_{n-3} applied
    // reflector by reflector (P_{n-3} first): cheaper than forming Q and multiplying.
    const Z = this.z;
    for (let i = 0; i < n * n; i++) Z[i] = 0;
    for (let i = 0; i < n; i++) Z[i * n + i] = 1;
    tql2Real(n, d, e, Z, "tridiagonal QL (Hermitian eigensolver)");
    sortAscending(n, d, Z, null);
    const Vr = this.vectorsRe;
    const Vi = this.vectorsIm;
    for (let k = kFrom; k < kTo; k++) {
      const o = k * n;
      for (let j = 0; j < n; j++) {
        const z = Z[o + j]!;
        Vr[o + j] = z * phr[j]!;
        Vi[o + j] = z * phi[j]!;
      }
      for (let q = n - 3; q >= 0; q--) {
        const tau = taus[q]!;
        if (tau === 0) continue;
        const base = q * n;
        // v <- v - tau h (h^H v), on components q+1..n-1
        let sr = 0;
        let si = 0;
        for (let i = q + 1; i < n; i++) {
          const xr = hr[base + i]!, xi = hi[base + i]!;
          const a = Vr[o + i]!, b = Vi[o + i]!;
          sr += xr * a + xi * b;
          si += xr * b - xi * a;
        }
        sr *= tau;
        si *= tau;
        for (let i = q + 1; i < n; i++) {
          const xr = hr[base + i]!, xi = hi[base + i]!;
          Vr[o + i] = Vr[o + i]! - (xr * sr - xi * si);
          Vi[o + i] = Vi[o + i]! - (xr * si + xi * sr);
        }
      }
    }
    if (rows) return;
    // Back to the documented layout: component i of vector k at [i * n + k].
    for (let i = 0; i < n; i++) {
      for (let k = i + 1; k < n; k++) {
        let t = Vr[i * n + k]!;
        Vr[i * n + k] = Vr[k * n + i]!;
        Vr[k * n + i] = t;
        t = Vi[i * n + k]!;
        Vi[i * n + k] = Vi[k * n + i]!;
        Vi[k * n + i] = t;
      }
    }
  }
}


/**
 * Diagonalize one Hermitian matrix given as planar row-major arrays. Checks that the matrix is
 * Hermitian to `tolerance` (relative to its largest entry) and raises an InputError otherwise.
 */
export function eigenHermitian(
  n: number,
  re: ArrayLike<number>,
  im: ArrayLike<number> | null = null,
  options: { vectors?: boolean; tolerance?: number; parameter?: string } = {},
): HermitianEigenResult {
  assertHermitian(n, re, im, options.tolerance ?? 1e-10, options.parameter ?? "H");
  const solver = new HermitianEigenSolver(n);
  const vectors = options.vectors ?? true;
  solver.solve(re, im, vectors);
  const out: HermitianEigenResult = { n, values: Float64Array.from(solver.values) };
  if (vectors) {
    out.vectorsRe = Float64Array.from(solver.vectorsRe);
    out.vectorsIm = Float64Array.from(solver.vectorsIm);
  }
  return out;
}

/**
 * Raise an InputError unless (re, im) is an n x n Hermitian matrix of finite numbers:
 * |H_ij - conj(H_ji)| <= tolerance * max |H_kl| for all i, j.
 */
export function assertHermitian(n: number, re: ArrayLike<number>, im: ArrayLike<number> | null, tolerance = 1e-10, parameter = "H"): void {
  if (re.length !== n * n || (im && im.length !== n * n)) {
    throw new InputError(parameter, re, `an ${n} x ${n} matrix (${n * n} entries, row-major)`);
  }
  let scale = 0;
  for (let i = 0; i < n * n; i++) {
    const a = re[i]!;
    const b = im ? im[i]! : 0;
    if (!Number.isFinite(a) || !Number.isFinite(b)) {
      throw new InputError(parameter, `entry (${Math.floor(i / n)}, ${i % n}) = ${a}${b ? ` + ${b}i` : ""}`, "finite matrix entries");
    }
    scale = Math.max(scale, Math.abs(a), Math.abs(b));
  }
  const tol = tolerance * (scale || 1);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      const dr = re[i * n + j]! - re[j * n + i]!;
      const di = im ? im[i * n + j]! + im[j * n + i]! : 0;
      if (Math.hypot(dr, di) > tol) {
        const hij = `${re[i * n + j]}${im ? ` + ${im[i * n + j]}i` : ""}`;
        const hji = `${re[j * n + i]}${im ? ` + ${im[j * n + i]}i` : ""}`;
        throw new InputError(
          parameter,
          `H[${i}][${j}] = ${hij}, H[${j}][${i}] = ${hji}`,
          `a Hermitian matrix, H[i][j] = conj(H[j][i]) within ${tolerance} of its largest entry`,
        );
      }
    }
  }
}
