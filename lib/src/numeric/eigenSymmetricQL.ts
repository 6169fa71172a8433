/**
 * Eigenvalues and eigenvectors of a real symmetric matrix: Householder tridiagonalization and the
 * implicit QL algorithm (the real branch of eigenHermitian.ts, without complex arithmetic, about four
 * times faster). Used for the single-spin Hamiltonians, which are real for fields in the xz plane.
 * Sources: J. H. Wilkinson, C. Reinsch, *Handbook for Automatic Computation II* (1971), II/2, II/3.
 *
 * Storage: row-major n x n; eigenvector k is the column k of `vectors` (component i at [i * n + k]);
 * eigenvalues ascending.
 *
 * Paths. Dense: Householder, Q formed explicitly, then QL whose rotations act on Q's columns one
 * sweep at a time, eight rows together with the rotated entry in registers (tql2RealColumns), the
 * known eigenvalues (a values-only pass) as first shifts. Centrosymmetric input (A[i][j] =
 * A[n-1-i][n-1-j], detected in O(n^2)): two half-size blocks (solveCentrosymmetric).
 *
 * Verdict (test/bench/eigen.bench.mjs, interleaved call by call with numpy.linalg.eigh, LAPACK
 * dsyevd, one thread, CPU time; single spin S = 50, 101 x 101, field along x; shared 2-core machine):
 * - generic dense path, values + vectors: 3.9x numpy before this work (2.43 ms), 3.2x now (1.78 ms
 *   against 0.56 ms); values only 2.4x (0.68 ms against 0.29 ms). MISSED the 2x goal. Profile (V8,
 *   2000 warm solves): Householder reduction (update fused with the next product) and forming Q 49 %,
 *   QL rotations on the vectors 31 % (6729 rotations of 101-long rows, 10076 with Wilkinson shifts
 *   alone), QL scalar work 8 %, the values-only pass for the shifts 7 %. LAPACK's dsyevd does divide
 *   and conquer with vectorized BLAS; here scalar JavaScript runs the reduction at about 2.3 Gflop/s
 *   (0.6 ms alone). What is left to try: WebAssembly SIMD for the reduction and the
 *   rotations, divide and conquer for the tridiagonal eigenvectors.
 * - default path on the same matrix (centrosymmetric, split): 0.98x numpy with vectors, 0.85x values
 *   only; MET. Kept as our own code: ml-matrix's EigenvalueDecomposition is a port of JAMA's
 *   tred2/tql2 (the pre-work form of this routine, from memory), on nested arrays.
 */
import { ConvergenceError, InputError } from "../errors.js";

const EPS = 2 ** -52;

export class SymmetricEigenSolver {
  readonly n: number;
  readonly values: Float64Array;
  /** Column k = eigenvector k after `solve(a, true)`. */
  readonly vectors: Float64Array;
  private readonly a: Float64Array;
  private readonly e: Float64Array;
  private readonly v: Float64Array;
  private readonly p: Float64Array;
  private readonly hv: Float64Array;
  private readonly taus: Float64Array;
  private readonly w: Float64Array;
  private readonly v2: Float64Array;
  private readonly p2: Float64Array;
  private readonly cs: Float64Array;
  private readonly sn: Float64Array;
  private readonly known: Float64Array;
  private readonly ec: Float64Array;
  private readonly used: Uint8Array;

  constructor(n: number) {
    if (!Number.isInteger(n) || n < 1) throw new InputError("n", n, "a positive whole matrix size");
    this.n = n;
    this.values = new Float64Array(n);
    this.vectors = new Float64Array(n * n);
    this.a = new Float64Array(n * n);
    this.e = new Float64Array(n);
    this.v = new Float64Array(n);
    this.p = new Float64Array(n);
    this.hv = new Float64Array(n * n);
    this.taus = new Float64Array(n);
    this.w = new Float64Array(n * n);
    this.v2 = new Float64Array(n);
    this.p2 = new Float64Array(n);
    this.cs = new Float64Array(n);
    this.sn = new Float64Array(n);
    this.known = new Float64Array(n);
    this.ec = new Float64Array(n);
    this.used = new Uint8Array(n);
  }

  /**
   * Whether `solve` may split a centrosymmetric matrix (A[i][j] = A[n-1-i][n-1-j]) into its two
   * half-size blocks (true by default; false forces the dense path, for benchmarks and tests).
   */
  splitCentrosymmetric = true;
  private halves: [SymmetricEigenSolver, SymmetricEigenSolver] | null = null;

  /** Diagonalize the symmetric matrix `a` (row-major; the lower triangle is read). */
  solve(input: ArrayLike<number>, vectors = true): void {
    if (this.splitCentrosymmetric && this.n >= 16 && isCentrosymmetric(this.n, input)) {
      this.solveCentrosymmetric(input, vectors);
      return;
    }
    this.solveDense(input, vectors);
  }

  /**
   * Symmetric and centrosymmetric A (J A J = A, J the exchange matrix; single-spin Hamiltonians in
   * the Sz basis with a field along x or none are of this kind: a pi rotation about x maps m to -m).
   * In the basis (e_i +- e_{n-1-i}) / sqrt 2 (and e_c, the middle, for odd n) A is block diagonal:
   * the even block P_ij = A_ij + A_i,n-1-j (P_ic = sqrt 2 A_ic, P_cc = A_cc) and the odd block
   * M_ij = A_ij - A_i,n-1-j, i, j < floor(n / 2). Two half-size problems: about a quarter of the
   * work. Source: A. Cantoni, P. Butler, "Eigenvalues and eigenvectors of symmetric centrosymmetric
   * matrices", Linear Algebra Appl. 13, 275 (1976).
   */
  private solveCentrosymmetric(input: ArrayLike<number>, vectors: boolean): void {
    const n = this.n;
    const k = n >> 1;
    const ke = n - k; // even block size (k + 1 for odd n)
    const odd = n % 2 === 1;
    if (!this.halves) {
      this.halves = [new SymmetricEigenSolver(ke), new SymmetricEigenSolver(k)];
      this.halves[0].splitCentrosymmetric = false;
      this.halves[1].splitCentrosymmetric = false;
    }
    const [even, oddBlock] = this.halves;
    // Blocks built in the work arrays of this solver (lower triangles read by the half solvers).
    const P = this.a;
    const M = this.w;
    const at = (i: number, j: number) => (i >= j ? input[i * n + j]! : input[j * n + i]!);
    for (let i = 0; i < k; i++) {
      for (let j = 0; j <= i; j++) {
        const x = at(i, j);
        const y = at(i, n - 1 - j);
        P[i * ke + j] = x + y;
        M[i * k + j] = x - y;
      }
    }
    if (odd) {
      const r2 = Math.SQRT2;
      for (let j = 0; j < k; j++) P[k * ke + j] = r2 * at(k, j);
      P[k * ke + k] = at(k, k);
    }
    even.solve(P, vectors);
    oddBlock.solve(M, vectors);
    // Merge the two ascending lists; vector columns expanded back to the full basis.
    const d = this.values;
    const V = this.vectors;
    const we = even.values;
    const wo = oddBlock.values;
    const Ve = even.vectors;
    const Vo = oddBlock.vectors;
    const h = Math.SQRT1_2;
    let a = 0;
    let b = 0;
    for (let c = 0; c < n; c++) {
      const takeEven = b >= k || (a < ke && we[a]! <= wo[b]!);
      if (takeEven) {
        d[c] = we[a]!;
        if (vectors) {
          for (let i = 0; i < k; i++) {
            const x = h * Ve[i * ke + a]!;
            V[i * n + c] = x;
            V[(n - 1 - i) * n + c] = x;
          }
          if (odd) V[k * n + c] = Ve[k * ke + a]!;
        }
        a++;
      } else {
        d[c] = wo[b]!;
        if (vectors) {
          for (let i = 0; i < k; i++) {
            const x = h * Vo[i * k + b]!;
            V[i * n + c] = x;
            V[(n - 1 - i) * n + c] = -x;
          }
          if (odd) V[k * n + c] = 0;
        }
        b++;
      }
    }
  }

  /** The dense path: Householder tridiagonalization, QL with the rotations on the vectors. */
  private solveDense(input: ArrayLike<number>, vectors: boolean): void {
    const n = this.n;
    const a = this.a;
    // Only the lower triangle is read and updated below.
    for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) a[i * n + j] = input[i * n + j]!;
    const hv = this.hv;
    const taus = this.taus;
    taus.fill(0);
    // Householder steps k = 0 .. n-3. The rank-2 update of step k and the product p = A v of step
    // k + 1 share one pass over the trailing lower triangle (each entry is updated, then used at
    // once): half the memory traffic of two passes, and the same arithmetic in the same order.
    let v = this.v;
    let p = this.p;
    let v2 = this.v2;
    let p2 = this.p2;
    let prepared = false; // v, tau, alpha and p = A v (unscaled) of step k are ready
    let tau = 0;
    let alpha = 0;
    for (let k = 0; k < n - 2; k++) {
      if (!prepared) {
        let tail = 0;
        for (let i = k + 2; i < n; i++) tail += a[i * n + k]! * a[i * n + k]!;
        if (tail === 0) continue;
        const x0 = a[(k + 1) * n + k]!;
        const norm = Math.sqrt(x0 * x0 + tail);
        alpha = x0 >= 0 ? -norm : norm;
        v[k + 1] = x0 - alpha;
        for (let i = k + 2; i < n; i++) v[i] = a[i * n + k]!;
        tau = 2 / (v[k + 1]! * v[k + 1]! + tail);
        // p = A v on the trailing block from its lower triangle only, row by row: row i gives
        // p_i its dot product and adds a_ij v_i to each p_j (both contiguous in j).
        p.fill(0, k + 1, n);
        for (let i = k + 1; i < n; i++) {
          const row = i * n;
          const vi = v[i]!;
          let s = 0;
          for (let j = k + 1; j < i; j++) {
            const aij = a[row + j]!;
            s += aij * v[j]!;
            p[j] = p[j]! + aij * vi;
          }
          p[i] = p[i]! + s + a[row + i]! * vi;
        }
      }
      prepared = false;
      let beta = 0;
      for (let i = k + 1; i < n; i++) {
        p[i] = tau * p[i]!;
        beta += v[i]! * p[i]!;
      }
      const half = 0.5 * tau * beta;
      for (let i = k + 1; i < n; i++) p[i] = p[i]! - half * v[i]!;
      a[(k + 1) * n + k] = alpha;
      taus[k] = tau;
      for (let i = k + 1; i < n; i++) hv[k * n + i] = v[i]!;
      // Rank-2 update A -= v q^T + q v^T of the lower triangle: column k + 1 first (it holds the
      // next reflector's vector), then rows k + 2 .. with the next step's product fused in.
      const c = k + 1;
      const vc = v[c]!;
      const qc = p[c]!;
      for (let i = c; i < n; i++) a[i * n + c] = a[i * n + c]! - (v[i]! * qc + p[i]! * vc);
      let tail = 0;
      if (k + 1 < n - 2) for (let i = k + 3; i < n; i++) tail += a[i * n + c]! * a[i * n + c]!;
      if (tail === 0) {
        // no next reflector to prepare (last step, or column k + 1 already reduced): plain update
        for (let i = k + 2; i < n; i++) {
          const row = i * n;
          const vi = v[i]!;
          const qi = p[i]!;
          for (let j = k + 2; j <= i; j++) a[row + j] = a[row + j]! - (vi * p[j]! + qi * v[j]!);
        }
        continue;
      }
      const x0 = a[(c + 1) * n + c]!;
      const norm = Math.sqrt(x0 * x0 + tail);
      const alpha2 = x0 >= 0 ? -norm : norm;
      v2[c + 1] = x0 - alpha2;
      for (let i = c + 2; i < n; i++) v2[i] = a[i * n + c]!;
      const tau2 = 2 / (v2[c + 1]! * v2[c + 1]! + tail);
      p2.fill(0, c + 1, n);
      for (let i = c + 1; i < n; i++) {
        const row = i * n;
        const vi = v[i]!;
        const qi = p[i]!;
        const wi = v2[i]!;
        let s = 0;
        for (let j = c + 1; j < i; j++) {
          const aij = a[row + j]! - (vi * p[j]! + qi * v[j]!);
          a[row + j] = aij;
          s += aij * v2[j]!;
          p2[j] = p2[j]! + aij * wi;
        }
        const aii = a[row + i]! - (vi * qi + qi * vi);
        a[row + i] = aii;
        p2[i] = p2[i]! + s + aii * wi;
      }
      // the prepared step k + 1
      let t = v;
      v = v2;
      v2 = t;
      t = p;
      p = p2;
      p2 = t;
      tau = tau2;
      alpha = alpha2;
      prepared = true;
    }
    const d = this.values;
    const e = this.e;
    for (let i = 0; i < n; i++) {
      d[i] = a[i * n + i]!;
      e[i] = i < n - 1 ? a[(i + 1) * n + i]! : 0;
    }
    if (!vectors) {
      tql2Real(n, d, e, null);
      d.sort();
      return;
    }
    const W = this.w;
    W.fill(0);
    for (let i = 0; i < n; i++) W[i * n + i] = 1;
    // W = H_0 H_1 ... H_{n-3} applied from the last reflector on: W <- (I - tau h h^T) W on the
    // trailing block, as s^T = h^T W (row by row) then W -= tau h s^T (row by row): contiguous.
    const sv = p;
    for (let k = n - 3; k >= 0; k--) {
      const tau = taus[k]!;
      if (tau === 0) continue;
      const base = k * n;
      sv.fill(0, k + 1, n);
      for (let i = k + 1; i < n; i++) {
        const h = hv[base + i]!;
        if (h === 0) continue;
        const row = i * n;
        for (let j = k + 1; j < n; j++) sv[j] = sv[j]! + h * W[row + j]!;
      }
      for (let i = k + 1; i < n; i++) {
        const h = tau * hv[base + i]!;
        if (h === 0) continue;
        const row = i * n;
        for (let j = k + 1; j < n; j++) W[row + j] = W[row + j]! - h * sv[j]!;
      }
    }
    // Eigenvectors stay the columns of W: the QL rotations of each sweep are applied row by row of
    // W with the running entry in a register (tql2RealColumns), then the columns are sorted.
    // Known eigenvalues first (values-only QL on a copy, O(n^2)), then used as shifts.
    const known = this.known;
    const ec = this.ec;
    known.set(d);
    ec.set(e);
    tql2Real(n, known, ec, null);
    tql2RealColumns(n, d, e, W, this.cs, this.sn, known, this.used);
    sortAscendingColumns(n, d, W);
    this.vectors.set(W);
  }
}

/**
 * Whether the symmetric matrix (lower triangle read) is centrosymmetric, A[i][j] = A[n-1-i][n-1-j],
 * to 4 units of rounding of its largest entry: a difference that small is within the backward error
 * of the dense solver itself, so the split solves the same problem at the same accuracy.
 */
function isCentrosymmetric(n: number, A: ArrayLike<number>): boolean {
  let max = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) max = Math.max(max, Math.abs(A[i * n + j]!));
  if (!(max > 0) || !Number.isFinite(max)) return false;
  const tol = 4 * EPS * max;
  // Mirror of (i, j), i >= j, is (n-1-i, n-1-j), stored in the lower triangle at (n-1-j, n-1-i).
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      if (!(Math.abs(A[i * n + j]! - A[(n - 1 - j) * n + (n - 1 - i)]!) <= tol)) return false;
    }
  }
  return true;
}

/** Sort eigenvalues ascending, swapping the columns (vectors = columns) of the row-major V. */
export function sortAscendingColumns(n: number, d: Float64Array, V: Float64Array): void {
  for (let i = 0; i < n - 1; i++) {
    let k = i;
    for (let j = i + 1; j < n; j++) if (d[j]! < d[k]!) k = j;
    if (k === i) continue;
    const t = d[i]!;
    d[i] = d[k]!;
    d[k] = t;
    for (let r = 0; r < n * n; r += n) {
      const x = V[r + i]!;
      V[r + i] = V[r + k]!;
      V[r + k] = x;
    }
  }
}

/** Sort eigenvalues ascending, swapping the rows (vectors = rows) of Vr and Vi along. */
export function sortAscending(n: number, d: Float64Array, Vr: Float64Array, Vi: Float64Array | null): void {
  // Selection sort swapping rows (vectors): n is small next to the QL cost.
  for (let i = 0; i < n - 1; i++) {
    let k = i;
    for (let j = i + 1; j < n; j++) if (d[j]! < d[k]!) k = j;
    if (k === i) continue;
    const t = d[i]!;
    d[i] = d[k]!;
    d[k] = t;
    for (let c = 0; c < n; c++) {
      let x = Vr[i * n + c]!;
      Vr[i * n + c] = Vr[k * n + c]!;
      Vr[k * n + c] = x;
      if (Vi) {
        x = Vi[i * n + c]!;
        Vi[i * n + c] = Vi[k * n + c]!;
        Vi[k * n + c] = x;
      }
    }
  }
}

/** Implicit QL on (d, e), e[i] = T[i+1][i]; rotations applied to the rows of V when given. */
export function tql2Real(n: number, d: Float64Array, e: Float64Array, V: Float64Array | null, solver = "tridiagonal QL (symmetric eigensolver)"): void {
  let f = 0;
  let tst1 = 0;
  for (let l = 0; l < n; l++) {
    tst1 = Math.max(tst1, Math.abs(d[l]!) + Math.abs(e[l]!));
    let m = l;
    while (m < n - 1) {
      if (Math.abs(e[m]!) <= EPS * tst1) break;
      m++;
    }
    if (m > l) {
      let iter = 0;
      do {
        if (++iter > 60) {
          throw new ConvergenceError(solver, "no convergence in 60 iterations", { n, index: l, offDiagonal: e[l] });
        }
        let g = d[l]!;
        let p = (d[l + 1]! - g) / (2 * e[l]!);
        // hypot written out in this hot loop rather than called: a profile of a slow run showed the
        // helper as a separate, not inlined call. Math.hypot only where squares could over/underflow.
        let r = Math.abs(p) < 1e150 ? Math.sqrt(p * p + 1) : Math.hypot(p, 1);
        if (p < 0) r = -r;
        d[l] = e[l]! / (p + r);
        d[l + 1] = e[l]! * (p + r);
        const dl1 = d[l + 1]!;
        let h = g - d[l]!;
        for (let i = l + 2; i < n; i++) d[i] = d[i]! - h;
        f += h;
        p = d[m]!;
        let c = 1;
        let c2 = c;
        let c3 = c;
        const el1 = e[l + 1]!;
        let s = 0;
        let s2 = 0;
        for (let i = m - 1; i >= l; i--) {
          c3 = c2;
          c2 = c;
          s2 = s;
          g = c * e[i]!;
          h = c * p;
          const ei = e[i]!;
          const ap = Math.abs(p);
          const ae = Math.abs(ei);
          r = ap < 1e150 && ae < 1e150 && (ap > 1e-150 || ae > 1e-150) ? Math.sqrt(p * p + ei * ei) : Math.hypot(p, ei);
          e[i + 1] = s * r;
          const ir = 1 / r;
          s = e[i]! * ir;
          c = p * ir;
          p = c * d[i]! - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]!);
          if (V) {
            const r0 = i * n;
            const r1 = r0 + n;
            for (let k = 0; k < n; k++) {
              const t = V[r1 + k]!;
              V[r1 + k] = s * V[r0 + k]! + c * t;
              V[r0 + k] = c * V[r0 + k]! - s * t;
            }
          }
        }
        p = (-s * s2 * c3 * el1 * e[l]!) / dl1;
        e[l] = s * p;
        d[l] = c * p;
      } while (Math.abs(e[l]!) > EPS * tst1);
    }
    d[l] = d[l]! + f;
    e[l] = 0;
  }
}

/**
 * Implicit QL with the eigenvectors as the COLUMNS of the row-major n x n matrix W (component i of
 * vector k at [i * n + k]). The rotations of one QL sweep are recorded in (cs, sn) and then applied
 * to W row by row in one pass, the entry being rotated kept in a register (the pattern of LAPACK's
 * dlasr), eight rows at a time.
 *
 * Shifts: when `known` holds the eigenvalues (ascending, from a values-only pass, which costs O(n^2)
 * against the O(n^3) of the rotations), the first iterations at each l use the known eigenvalue
 * nearest the Wilkinson shift ("perfect shift": in exact arithmetic one sweep deflates it), later
 * ones the Wilkinson shift. Any shift keeps the sweep an orthogonal similarity, so this changes only
 * how many sweeps are needed (measured on the S = 50 single-spin matrix: 193 sweeps -> see the
 * SymmetricEigenSolver header). The sweep is the explicit-shift form of W. H. Press et al.,
 * *Numerical Recipes* (3rd ed., 2007) section 11.4 (tqli), which handles an early deflation (r = 0).
 */
export function tql2RealColumns(
  n: number,
  d: Float64Array,
  e: Float64Array,
  W: Float64Array,
  cs: Float64Array,
  sn: Float64Array,
  known: Float64Array | null = null,
  used: Uint8Array | null = null,
  solver = "tridiagonal QL (symmetric eigensolver)",
): void {
  // e[i] couples i and i + 1 on input; tqli's convention below is the same (e[n - 1] = 0).
  e[n - 1] = 0;
  if (used) used.fill(0);
  let norm = 0;
  for (let i = 0; i < n; i++) norm = Math.max(norm, Math.abs(d[i]!) + Math.abs(e[i]!));
  for (let l = 0; l < n; l++) {
    let iter = 0;
    for (;;) {
      let m = l;
      // Negligible against the norm, as tql2Real (backward error EPS * |T|).
      for (; m < n - 1; m++) if (Math.abs(e[m]!) <= EPS * norm) break;
      if (m === l) break;
      if (++iter > 60) {
        throw new ConvergenceError(solver, "no convergence in 60 iterations", { n, index: l, offDiagonal: e[l] });
      }
      // Wilkinson shift: the eigenvalue of the leading 2 x 2 nearer d[l].
      let g = (d[l + 1]! - d[l]!) / (2 * e[l]!);
      let r = Math.abs(g) < 1e150 ? Math.sqrt(g * g + 1) : Math.hypot(g, 1);
      let shift = d[l]! - e[l]! / (g + (g >= 0 ? r : -r));
      if (known && used && iter <= 2) {
        let best = -1;
        let bd = Infinity;
        for (let k = 0; k < n; k++) {
          if (used[k]) continue;
          const dist = Math.abs(known[k]! - shift);
          if (dist < bd) {
            bd = dist;
            best = k;
          }
        }
        if (best >= 0) shift = known[best]!;
      }
      g = d[m]! - shift;
      let s = 1;
      let c = 1;
      let p = 0;
      let i = m - 1;
      let early = false;
      for (; i >= l; i--) {
        const f = s * e[i]!;
        const b = c * e[i]!;
        const af = Math.abs(f);
        const ag = Math.abs(g);
        r = af < 1e150 && ag < 1e150 && (af > 1e-150 || ag > 1e-150) ? Math.sqrt(f * f + g * g) : Math.hypot(f, g);
        e[i + 1] = r;
        if (r === 0) {
          // Early deflation: undo the pending update and restart with the block split at i + 1.
          d[i + 1] = d[i + 1]! - p;
          e[m] = 0;
          early = true;
          break;
        }
        s = f / r;
        c = g / r;
        g = d[i + 1]! - p;
        r = (d[i]! - g) * s + 2 * c * b;
        p = s * r;
        d[i + 1] = g + p;
        g = c * r - b;
        // Rotation mixing vectors i and i + 1: new_{i+1} = s x_i + c x_{i+1}, new_i = c x_i - s x_{i+1}.
        cs[i] = c;
        sn[i] = s;
      }
      applySweepToColumns(n, W, cs, sn, early ? i + 1 : l, m);
      if (early) continue;
      d[l] = d[l]! - p;
      e[l] = g;
      e[m] = 0;
    }
    if (known && used) {
      // The eigenvalue found at l is spent as a shift.
      let best = -1;
      let bd = Infinity;
      for (let k = 0; k < n; k++) {
        if (used[k]) continue;
        const dist = Math.abs(known[k]! - d[l]!);
        if (dist < bd) {
          bd = dist;
          best = k;
        }
      }
      if (best >= 0) used[best] = 1;
    }
  }
}

/**
 * Rotations i = m - 1 down to l (mixing columns i and i + 1: new_{i+1} = s_i x_i + c_i x_{i+1},
 * new_i = c_i x_i - s_i x_{i+1}) applied to every row of the row-major n x n matrix W.
 */
function applySweepToColumns(n: number, W: Float64Array, cs: Float64Array, sn: Float64Array, l: number, m: number): void {
  // 8 rows at a time: independent dependency chains (x_k = c y_k - s x_k) in flight.
  let r = 0;
  for (; r + 7 < n; r += 8) {
    const o0 = r * n;
    const o1 = o0 + n;
    const o2 = o1 + n;
    const o3 = o2 + n;
    const o4 = o3 + n;
    const o5 = o4 + n;
    const o6 = o5 + n;
    const o7 = o6 + n;
    let x0 = W[o0 + m]!;
    let x1 = W[o1 + m]!;
    let x2 = W[o2 + m]!;
    let x3 = W[o3 + m]!;
    let x4 = W[o4 + m]!;
    let x5 = W[o5 + m]!;
    let x6 = W[o6 + m]!;
    let x7 = W[o7 + m]!;
    for (let i = m - 1; i >= l; i--) {
      const c = cs[i]!;
      const s = sn[i]!;
      const y0 = W[o0 + i]!;
      W[o0 + i + 1] = s * y0 + c * x0;
      x0 = c * y0 - s * x0;
      const y1 = W[o1 + i]!;
      W[o1 + i + 1] = s * y1 + c * x1;
      x1 = c * y1 - s * x1;
      const y2 = W[o2 + i]!;
      W[o2 + i + 1] = s * y2 + c * x2;
      x2 = c * y2 - s * x2;
      const y3 = W[o3 + i]!;
      W[o3 + i + 1] = s * y3 + c * x3;
      x3 = c * y3 - s * x3;
      const y4 = W[o4 + i]!;
      W[o4 + i + 1] = s * y4 + c * x4;
      x4 = c * y4 - s * x4;
      const y5 = W[o5 + i]!;
      W[o5 + i + 1] = s * y5 + c * x5;
      x5 = c * y5 - s * x5;
      const y6 = W[o6 + i]!;
      W[o6 + i + 1] = s * y6 + c * x6;
      x6 = c * y6 - s * x6;
      const y7 = W[o7 + i]!;
      W[o7 + i + 1] = s * y7 + c * x7;
      x7 = c * y7 - s * x7;
    }
    W[o0 + l] = x0;
    W[o1 + l] = x1;
    W[o2 + l] = x2;
    W[o3 + l] = x3;
    W[o4 + l] = x4;
    W[o5 + l] = x5;
    W[o6 + l] = x6;
    W[o7 + l] = x7;
  }
  for (; r < n; r++) {
    const o0 = r * n;
    let x0 = W[o0 + m]!;
    for (let i = m - 1; i >= l; i--) {
      const c = cs[i]!;
      const s = sn[i]!;
      const y0 = W[o0 + i]!;
      W[o0 + i + 1] = s * y0 + c * x0;
      x0 = c * y0 - s * x0;
    }
    W[o0 + l] = x0;
  }
}

/** hypot without the slow generic path of Math.hypot, safe for the magnitudes met here. */
export function fastHypot(a: number, b: number): number {
  const x = Math.abs(a);
  const y = Math.abs(b);
  if (x > 1e150 || y > 1e150 || (x < 1e-150 && y < 1e-150)) return Math.hypot(a, b);
  return Math.sqrt(x * x + y * y);
}
