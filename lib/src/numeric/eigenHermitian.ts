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
 * Verdict against LAPACK (test/bench/eigen.bench.mjs, numpy.linalg.eigh = zheevd, values + vectors,
 * interleaved rounds): 6 x 6 0.39x (2.7 us against 6.8 us, numpy's per-call overhead included), MET;
 * 40 x 40 1.90x (0.28 ms against 0.15 ms), MET the 2x goal since the QL for n >= 16 runs on Z's
 * columns with the real solver's eight-row sweeps and known-eigenvalue shifts (2.10x before).
 *
 * Storage: an n x n matrix is two row-major Float64Arrays (real and imaginary parts).
 * Eigenvectors are returned as the columns of an n x n row-major matrix:
 * component i of eigenvector k is `vectorsRe[i * n + k] + i * vectorsIm[i * n + k]`.
 * Eigenvalues are ascending.
 */
import { InputError } from "../errors.js";
import { fastHypot, sortAscending, sortAscendingColumns, tql2Real, tql2RealColumns } from "./eigenSymmetricQL.js";

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
  /** Working matrix, complex entries interleaved (re at 2q, im at 2q + 1), lower triangle only. */
  private readonly a: Float64Array;
  private readonly e: Float64Array;
  /** Householder vector and the product p = tau A v (interleaved). */
  private readonly v: Float64Array;
  private readonly p: Float64Array;
  /** Reflector k in row k (interleaved, components k+1..n-1), for the back-transformation. */
  private readonly h: Float64Array;
  /** Phases delta_j of the diagonal transform that makes the tridiagonal real (interleaved). */
  private readonly phase: Float64Array;
  private readonly taus: Float64Array;
  private readonly z: Float64Array;
  /** Work arrays of the column QL (n >= 16 only). */
  private readonly known: Float64Array | null;
  private readonly ec: Float64Array | null;
  private readonly cs: Float64Array | null;
  private readonly sn: Float64Array | null;
  private readonly used: Uint8Array | null;

  constructor(n: number) {
    if (!Number.isInteger(n) || n < 1) throw new InputError("n", n, "a positive whole matrix size");
    this.n = n;
    this.values = new Float64Array(n);
    this.vectorsRe = new Float64Array(n * n);
    this.vectorsIm = new Float64Array(n * n);
    this.a = new Float64Array(2 * n * n);
    this.e = new Float64Array(n);
    this.v = new Float64Array(2 * n);
    this.p = new Float64Array(2 * n);
    this.h = new Float64Array(2 * n * n);
    this.phase = new Float64Array(2 * n);
    this.taus = new Float64Array(n);
    this.z = new Float64Array(n * n);
    const big = n >= 16;
    this.known = big ? new Float64Array(n) : null;
    this.ec = big ? new Float64Array(n) : null;
    this.cs = big ? new Float64Array(n) : null;
    this.sn = big ? new Float64Array(n) : null;
    this.used = big ? new Uint8Array(n) : null;
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

  /**
   * As `solveVectorRows`, but writes straight into the caller's arrays, without the copy through
   * the workspace: eigenvalues at values[valuesOffset .. + n - 1], and the vectors first ..
   * first + count - 1 packed as rows: vector k at [vectorsOffset + (k - first) * n ..] of
   * (vectorsRe, vectorsIm), count * n numbers in all. For grids of k-points stored one after another.
   */
  solveVectorRowsInto(
    re: ArrayLike<number>,
    im: ArrayLike<number> | null,
    first: number,
    count: number,
    values: Float64Array,
    valuesOffset: number,
    vectorsRe: Float64Array,
    vectorsIm: Float64Array,
    vectorsOffset: number,
  ): void {
    const n = this.n;
    if (!Number.isInteger(first) || !Number.isInteger(count) || first < 0 || count < 0 || first + count > n) {
      throw new InputError("first, count", [first, count], `a range of eigenvector indices within 0..${n - 1}`);
    }
    if (!(valuesOffset >= 0 && valuesOffset + n <= values.length))
      throw new InputError("valuesOffset", valuesOffset, `an offset with room for ${n} values in an array of ${values.length}`);
    if (!(vectorsOffset >= 0 && vectorsOffset + count * n <= vectorsRe.length && vectorsOffset + count * n <= vectorsIm.length)) {
      throw new InputError("vectorsOffset", vectorsOffset, `an offset with room for ${count} x ${n} components in arrays of ${vectorsRe.length}`);
    }
    this.solveInternal(re, im, true, true, first, first + count, vectorsRe, vectorsIm, vectorsOffset - first * n);
    for (let b = 0; b < n; b++) values[valuesOffset + b] = this.values[b]!;
  }

  private solveInternal(
    re: ArrayLike<number>,
    im: ArrayLike<number> | null,
    vectors: boolean,
    rows: boolean,
    kFrom = 0,
    kTo = this.n,
    Vr: Float64Array = this.vectorsRe,
    Vi: Float64Array = this.vectorsIm,
    vOff = 0,
  ): void {
    const n = this.n;
    const A = this.a;
    // Copy the lower triangle, complex entries interleaved: the input is never modified. Only the
    // lower triangle is kept and updated (the upper is its conjugate): one array and half the stores
    // of full planar storage. Measured on 40 000 6 x 6 matrices of the Haldane supercell: the
    // reduction alone ~30 % faster, whole solves with 3 vectors ~5 % faster.
    for (let i = 0; i < n; i++) {
      for (let j = 0; j <= i; j++) {
        const q = 2 * (i * n + j);
        A[q] = re[i * n + j]!;
        A[q + 1] = im && j < i ? im[i * n + j]! : 0;
      }
    }
    const H = this.h;
    const taus = this.taus;
    const v = this.v;
    const p = this.p;
    // Householder reduction: step k annihilates A[k+2.., k] with P = I - tau v v^H acting on k+1..n-1.
    for (let k = 0; k < n - 2; k++) {
      taus[k] = 0;
      let tail = 0;
      for (let i = k + 2; i < n; i++) {
        const q = 2 * (i * n + k);
        tail += A[q]! * A[q]! + A[q + 1]! * A[q + 1]!;
      }
      if (tail === 0) continue;
      const q1 = 2 * ((k + 1) * n + k);
      const x0r = A[q1]!;
      const x0i = A[q1 + 1]!;
      const abs0 = fastHypot(x0r, x0i);
      const norm = Math.sqrt(abs0 * abs0 + tail);
      // alpha = -e^{i arg x0} |x|, so that v0 = x0 - alpha never cancels.
      const phr = abs0 === 0 ? 1 : x0r / abs0;
      const phi = abs0 === 0 ? 0 : x0i / abs0;
      const alr = -phr * norm;
      const ali = -phi * norm;
      const v0r = x0r - alr;
      const v0i = x0i - ali;
      v[2 * k + 2] = v0r;
      v[2 * k + 3] = v0i;
      for (let i = k + 2; i < n; i++) {
        const q = 2 * (i * n + k);
        v[2 * i] = A[q]!;
        v[2 * i + 1] = A[q + 1]!;
      }
      const tau = 2 / (v0r * v0r + v0i * v0i + tail);
      // p = A v on the trailing block, from the lower triangle: row i gives sum_{j<=i} A_ij v_j to
      // p_i and conj(A_ij) v_i to p_j.
      for (let i = 2 * k + 2; i < 2 * n; i++) p[i] = 0;
      for (let i = k + 1; i < n; i++) {
        const o = 2 * i * n;
        const vir = v[2 * i]!;
        const vii = v[2 * i + 1]!;
        let sr = 0;
        let si = 0;
        for (let j = k + 1; j < i; j++) {
          const ar = A[o + 2 * j]!,
            ai = A[o + 2 * j + 1]!;
          const vjr = v[2 * j]!,
            vji = v[2 * j + 1]!;
          sr += ar * vjr - ai * vji;
          si += ar * vji + ai * vjr;
          p[2 * j] = p[2 * j]! + ar * vir + ai * vii;
          p[2 * j + 1] = p[2 * j + 1]! + ar * vii - ai * vir;
        }
        const d = A[o + 2 * i]!;
        p[2 * i] = p[2 * i]! + sr + d * vir;
        p[2 * i + 1] = p[2 * i + 1]! + si + d * vii;
      }
      // p <- tau p, beta = v^H p (real for Hermitian A), q = p - (tau beta / 2) v (kept in p).
      let beta = 0;
      for (let i = k + 1; i < n; i++) {
        const pr = tau * p[2 * i]!,
          pi = tau * p[2 * i + 1]!;
        p[2 * i] = pr;
        p[2 * i + 1] = pi;
        beta += v[2 * i]! * pr + v[2 * i + 1]! * pi;
      }
      const half = 0.5 * tau * beta;
      for (let i = k + 1; i < n; i++) {
        p[2 * i] = p[2 * i]! - half * v[2 * i]!;
        p[2 * i + 1] = p[2 * i + 1]! - half * v[2 * i + 1]!;
      }
      // A -= v q^H + q v^H on the lower triangle of the trailing block.
      for (let i = k + 1; i < n; i++) {
        const o = 2 * i * n;
        const vir = v[2 * i]!;
        const vii = v[2 * i + 1]!;
        const qir = p[2 * i]!;
        const qii = p[2 * i + 1]!;
        for (let j = k + 1; j <= i; j++) {
          const qjr = p[2 * j]!,
            qji = p[2 * j + 1]!,
            vjr = v[2 * j]!,
            vji = v[2 * j + 1]!;
          // v_i conj(q_j) + q_i conj(v_j)
          A[o + 2 * j] = A[o + 2 * j]! - (vir * qjr + vii * qji + qir * vjr + qii * vji);
          A[o + 2 * j + 1] = A[o + 2 * j + 1]! - (vii * qjr - vir * qji + qii * vjr - qir * vji);
        }
      }
      A[q1] = alr;
      A[q1 + 1] = ali;
      taus[k] = tau;
      const hb = 2 * k * n;
      for (let i = 2 * k + 2; i < 2 * n; i++) H[hb + i] = v[i]!;
    }
    // Phase transform: T' = D^H T D real symmetric, delta_{i+1} = delta_i c_i / |c_i|.
    const d = this.values;
    const e = this.e;
    for (let i = 0; i < n; i++) d[i] = A[2 * (i * n + i)]!;
    if (!vectors) {
      for (let i = 0; i < n - 1; i++) {
        const q = 2 * ((i + 1) * n + i);
        e[i] = fastHypot(A[q]!, A[q + 1]!);
      }
      e[n - 1] = 0;
      tql2Real(n, d, e, null, "tridiagonal QL (Hermitian eigensolver)");
      d.sort(); // typed arrays sort numerically
      return;
    }
    // Phases D: delta_0 = 1, delta_{j+1} = delta_j c_j / |c_j| (c_j = T[j+1][j]); e_j = |c_j|.
    const ph = this.phase;
    let dr = 1;
    let di = 0;
    for (let j = 0; j < n; j++) {
      ph[2 * j] = dr;
      ph[2 * j + 1] = di;
      if (j < n - 1) {
        const q = 2 * ((j + 1) * n + j);
        const cr = A[q]!;
        const ci = A[q + 1]!;
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
    // From n = 16 on, Z keeps the vectors as columns and the QL rotations go sweep by sweep over its
    // rows, eight at a time, with the known eigenvalues as first shifts (tql2RealColumns, as the real
    // symmetric solver); below that the short rows make the plain row rotations cheaper.
    const cols = n >= 16;
    if (cols) {
      const known = this.known!;
      const ec = this.ec!;
      known.set(d);
      ec.set(e);
      tql2Real(n, known, ec, null, "tridiagonal QL (Hermitian eigensolver)");
      tql2RealColumns(n, d, e, Z, this.cs!, this.sn!, known, this.used!, "tridiagonal QL (Hermitian eigensolver)");
      sortAscendingColumns(n, d, Z);
    } else {
      tql2Real(n, d, e, Z, "tridiagonal QL (Hermitian eigensolver)");
      sortAscending(n, d, Z, null);
    }
    const zRow = cols ? 1 : n;
    const zCol = cols ? n : 1;
    for (let k = kFrom; k < kTo; k++) {
      const o = vOff + k * n;
      for (let j = 0; j < n; j++) {
        const z = Z[k * zRow + j * zCol]!;
        Vr[o + j] = z * ph[2 * j]!;
        Vi[o + j] = z * ph[2 * j + 1]!;
      }
      for (let q = n - 3; q >= 0; q--) {
        const tau = taus[q]!;
        if (tau === 0) continue;
        const base = 2 * q * n;
        // v <- v - tau h (h^H v), on components q+1..n-1
        let sr = 0;
        let si = 0;
        for (let i = q + 1; i < n; i++) {
          const xr = H[base + 2 * i]!,
            xi = H[base + 2 * i + 1]!;
          const a = Vr[o + i]!,
            b = Vi[o + i]!;
          sr += xr * a + xi * b;
          si += xr * b - xi * a;
        }
        sr *= tau;
        si *= tau;
        for (let i = q + 1; i < n; i++) {
          const xr = H[base + 2 * i]!,
            xi = H[base + 2 * i + 1]!;
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
        throw new InputError(parameter, `H[${i}][${j}] = ${hij}, H[${j}][${i}] = ${hji}`, `a Hermitian matrix, H[i][j] = conj(H[j][i]) within ${tolerance} of its largest entry`);
      }
    }
  }
}
