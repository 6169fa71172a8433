/**
 * Lanczos methods on matrix-free Hermitian operators (real or interleaved complex vectors).
 *
 * `lowestEigenpairs`: the lowest eigenvalues and eigenvectors by Lanczos with full
 * re-orthogonalization (classical Gram-Schmidt applied twice, which keeps the basis orthonormal to
 * rounding) and thick restarts: after m steps the Rayleigh-Ritz problem of the m x m projected
 * matrix M_ij = <v_i|A v_j> is solved with the project's Hermitian eigensolver, the best p Ritz
 * vectors and the residual direction are kept, and the iteration continues from there
 * (K. Wu, H. Simon, SIAM J. Matrix Anal. Appl. 22, 602 (2000)). A Ritz pair (theta, y) has the
 * residual |A y - theta y| = beta_m |s_m|, which is the convergence test, so every reported level
 * comes with its residual. A single start vector sees one copy of an exactly degenerate level
 * inside a sector (copies appear only through rounding): use symmetry sectors, or `sectorDense` for
 * small sectors, when multiplicities matter.
 *
 * `lanczosTridiagonal`: the plain three-term recursion from a start vector, without
 * re-orthogonalization, returning the coefficients a_n, b_n of the continued fraction
 * <phi|(z - A)^-1|phi> = <phi|phi> / (z - a_0 - b_1^2 / (z - a_1 - b_2^2 / ...))
 * (E. Gagliano, C. Balseiro, PRL 59, 2999 (1987)). Loss of orthogonality produces spurious copies
 * of converged levels but leaves the moments of the spectral function (hence the continued fraction
 * at finite broadening) accurate: the first 2n moments are exact after n steps.
 */
import { ConvergenceError } from "../errors.js";
import { eigenHermitian } from "../numeric/eigenHermitian.js";
import { tql2Real } from "../numeric/eigenSymmetricQL.js";
import type { SectorOperator } from "./operator.js";

/** Thrown when a long computation is stopped through its `shouldStop` callback. */
export class ComputationStopped extends Error {
  override readonly name = "ComputationStopped";
  constructor(
    readonly where: string,
    readonly progress: Record<string, number>,
  ) {
    super(`${where} was stopped on request after ${progress.matvecs ?? 0} operator applications`);
  }
}

export interface LanczosProgress {
  matvecs: number;
  restarts: number;
  lowest: number;
  residual: number;
}

export interface LanczosOptions {
  /** Number of lowest levels wanted (default 1). */
  levels?: number;
  /** Krylov basis size before a restart (default 24 for one level, max(2 levels + 20, 40) for more). */
  krylov?: number;
  /** Relative residual tolerance |A y - theta y| <= tol max(1, |theta|) (default 1e-10). */
  tol?: number;
  /** Largest number of operator applications (default 20000). */
  maxMatvecs?: number;
  /** Return eigenvectors (default true). */
  vectors?: boolean;
  /** Start vector (copied); default a fixed pseudo-random vector. */
  start?: Float64Array;
  onProgress?: (p: LanczosProgress) => void;
  /** Polled once per step; returning true stops with ComputationStopped. */
  shouldStop?: () => boolean;
  /**
   * "full" (default): thick-restart Lanczos with every new vector orthogonalized against the basis.
   * "none": for the lowest level only, the plain three-term recursion (two vectors), watched through
   * the tridiagonal's lowest eigenvalue, with a second pass to build the vector. Loss of orthogonality
   * only duplicates converged levels, which does not disturb the lowest one; cheaper per step.
   */
  reorthogonalization?: "full" | "none";
}

export interface LanczosResult {
  values: number[];
  vectors: Float64Array[];
  residuals: number[];
  matvecs: number;
  restarts: number;
}

/** Deterministic pseudo-random numbers in [-1, 1) (a 32-bit xorshift). */
export function pseudoRandom(seed = 12345): () => number {
  let x = seed >>> 0 || 1;
  return () => {
    x ^= x << 13;
    x >>>= 0;
    x ^= x >>> 17;
    x ^= x << 5;
    x >>>= 0;
    return x / 2147483648 - 1;
  };
}

/** <x|y> for real (c = 1) or interleaved complex (c = 2) vectors: [re, im]. */
export function dot(x: Float64Array, y: Float64Array, complex: boolean, out: Float64Array): void {
  let re = 0;
  let im = 0;
  if (!complex) {
    for (let i = 0; i < x.length; i++) re += x[i]! * y[i]!;
  } else {
    for (let i = 0; i < x.length; i += 2) {
      const a = x[i]!,
        b = x[i + 1]!,
        c = y[i]!,
        d = y[i + 1]!;
      re += a * c + b * d;
      im += a * d - b * c;
    }
  }
  out[0] = re;
  out[1] = im;
}

/** y += (cr + i ci) x. */
export function axpy(cr: number, ci: number, x: Float64Array, y: Float64Array, complex: boolean): void {
  if (!complex) {
    for (let i = 0; i < x.length; i++) y[i] = y[i]! + cr * x[i]!;
    return;
  }
  for (let i = 0; i < x.length; i += 2) {
    const a = x[i]!,
      b = x[i + 1]!;
    y[i] = y[i]! + cr * a - ci * b;
    y[i + 1] = y[i + 1]! + cr * b + ci * a;
  }
}

export function norm(x: Float64Array): number {
  let s = 0;
  for (let i = 0; i < x.length; i++) s += x[i]! * x[i]!;
  return Math.sqrt(s);
}

export function lowestEigenpairs(op: SectorOperator, options: LanczosOptions = {}): LanczosResult {
  if (options.reorthogonalization === "none" && (options.levels ?? 1) === 1 && op.dim > 2) return lowestByRecursion(op, options);
  const dim = op.dim;
  const complex = op.complex;
  const len = complex ? 2 * dim : dim;
  const nev = Math.min(options.levels ?? 1, dim);
  const m = Math.min(dim, options.krylov ?? (nev === 1 ? 24 : Math.max(2 * nev + 20, 40)));
  const tol = options.tol ?? 1e-10;
  const maxMatvecs = options.maxMatvecs ?? 20000;
  const wantVectors = options.vectors ?? true;
  const V: Float64Array[] = [];
  const M = new Float64Array(2 * m * m); // interleaved complex, M[i][j] at 2 (i m + j)
  const c = new Float64Array(2);
  let v0: Float64Array;
  if (options.start) {
    v0 = Float64Array.from(options.start);
  } else {
    const rnd = pseudoRandom();
    v0 = new Float64Array(len);
    for (let i = 0; i < len; i++) v0[i] = rnd();
  }
  const nv = norm(v0);
  if (!(nv > 0)) throw new ConvergenceError("Lanczos", "the start vector is zero", {});
  for (let i = 0; i < len; i++) v0[i] = v0[i]! / nv;
  V.push(v0);
  let kept = 0; // vectors at the start of this cycle that are Ritz vectors (0 on the first cycle)
  let matvecs = 0;
  let restarts = 0;
  let residualVector: Float64Array | null = null;
  let betaLast = 0;
  for (;;) {
    let size = m;
    for (let j = kept; j < m; j++) {
      if (options.shouldStop?.()) throw new ComputationStopped("Lanczos", { matvecs, restarts });
      const w = new Float64Array(len);
      op.apply(V[j]!, w);
      matvecs++;
      // classical Gram-Schmidt, repeated only when it removed most of w (the DGKS criterion:
      // J. Daniel, W. Gragg, L. Kaufman, G. W. Stewart, Math. Comp. 30, 772 (1976))
      const before = norm(w);
      for (let pass = 0; pass < 2; pass++) {
        if (pass === 1 && norm(w) > 0.7071 * before) break;
        for (let i = 0; i <= j; i++) {
          dot(V[i]!, w, complex, c);
          axpy(-c[0]!, -c[1]!, V[i]!, w, complex);
          M[2 * (i * m + j)] = M[2 * (i * m + j)]! + c[0]!;
          M[2 * (i * m + j) + 1] = M[2 * (i * m + j) + 1]! + c[1]!;
        }
      }
      const beta = norm(w);
      if (beta <= 1e-13 * Math.max(1, Math.abs(M[2 * (j * m + j)]!)) || j === dim - 1) {
        // invariant subspace: the projected problem is exact
        size = j + 1;
        betaLast = 0;
        residualVector = null;
        break;
      }
      for (let i = 0; i < len; i++) w[i] = w[i]! / beta;
      if (j + 1 < m) V.push(w);
      else {
        residualVector = w;
        betaLast = beta;
      }
    }
    // Rayleigh-Ritz on the projected matrix (Hermitian from its upper triangle)
    const re = new Float64Array(size * size);
    const im = new Float64Array(size * size);
    for (let i = 0; i < size; i++) {
      for (let j = i; j < size; j++) {
        re[i * size + j] = M[2 * (i * m + j)]!;
        im[i * size + j] = M[2 * (i * m + j) + 1]!;
        re[j * size + i] = re[i * size + j]!;
        im[j * size + i] = -im[i * size + j]!;
      }
      im[i * size + i] = 0; // <v|A v> is real for Hermitian A; drop the rounding
    }
    const eig = eigenHermitian(size, re, complex ? im : null, { vectors: true, tolerance: 1e-6 });
    const Sre = eig.vectorsRe!,
      Sim = eig.vectorsIm!;
    const residuals: number[] = [];
    for (let i = 0; i < Math.min(nev, size); i++) {
      const sr = Sre[(size - 1) * size + i]!,
        si = Sim[(size - 1) * size + i]!;
      residuals.push(betaLast * Math.hypot(sr, si));
    }
    const lowest = eig.values[0]!;
    options.onProgress?.({ matvecs, restarts, lowest, residual: Math.max(...residuals) });
    const converged = residuals.every((r, i) => r <= tol * Math.max(1, Math.abs(eig.values[i]!)));
    const done = converged || size < m || residualVector === null;
    if (done || matvecs >= maxMatvecs) {
      if (!done) {
        throw new ConvergenceError("Lanczos", `residuals above ${tol} after ${matvecs} operator applications`, {
          matvecs,
          restarts,
          values: Array.from(eig.values.slice(0, nev)),
          residuals,
        });
      }
      const values = Array.from(eig.values.slice(0, nev));
      const vectors: Float64Array[] = [];
      if (wantVectors) for (let i = 0; i < values.length; i++) vectors.push(ritzVector(V, size, Sre, Sim, i, len, complex));
      return { values, vectors, residuals, matvecs, restarts };
    }
    // thick restart: keep p Ritz vectors and the residual direction
    const p = Math.min(size - 1, Math.max(nev + 1, Math.floor((m + nev) / 2)));
    const newV: Float64Array[] = [];
    for (let i = 0; i < p; i++) newV.push(ritzVector(V, size, Sre, Sim, i, len, complex));
    newV.push(residualVector!);
    V.length = 0;
    V.push(...newV);
    M.fill(0);
    // diagonal block: the Ritz values; column p (<y_i|A r> = conj(beta_m s_{m,i})) is computed
    // by the Gram-Schmidt step at j = p
    for (let i = 0; i < p; i++) M[2 * (i * m + i)] = eig.values[i]!;
    kept = p;
    restarts++;
  }
}

function ritzVector(V: Float64Array[], size: number, Sre: Float64Array, Sim: Float64Array, i: number, len: number, complex: boolean): Float64Array {
  const y = new Float64Array(len);
  for (let j = 0; j < size; j++) axpy(Sre[j * size + i]!, complex ? Sim[j * size + i]! : 0, V[j]!, y, complex);
  const n = norm(y);
  for (let t = 0; t < len; t++) y[t] = y[t]! / n;
  return y;
}

export interface TridiagonalResult {
  /** Diagonal a_0..a_{n-1}. */
  a: number[];
  /** Off-diagonal b_1..b_{n-1} (b[0] unused, 0). */
  b: number[];
  /** <phi|phi>. */
  norm2: number;
}

/**
 * Three-term Lanczos recursion from phi (not normalized): n steps or until b_n vanishes.
 * Two vectors of storage plus the operator's.
 */
export function lanczosTridiagonal(op: SectorOperator, phi: Float64Array, steps: number, shouldStop?: () => boolean): TridiagonalResult {
  const len = phi.length;
  const complex = op.complex;
  const n0 = norm(phi);
  const a: number[] = [];
  const b: number[] = [0];
  if (n0 === 0) return { a: [0], b: [0], norm2: 0 };
  let prev = new Float64Array(len);
  let cur = Float64Array.from(phi, (x) => x / n0);
  const w = new Float64Array(len);
  const c = new Float64Array(2);
  let beta = 0;
  for (let n = 0; n < Math.min(steps, op.dim); n++) {
    if (shouldStop?.()) throw new ComputationStopped("Lanczos continued fraction", { matvecs: n });
    op.apply(cur, w);
    dot(cur, w, complex, c);
    const alpha = c[0]!;
    a.push(alpha);
    for (let i = 0; i < len; i++) w[i] = w[i]! - alpha * cur[i]! - beta * prev[i]!;
    beta = norm(w);
    if (n + 1 >= Math.min(steps, op.dim) || beta < 1e-12 * Math.max(1, Math.abs(alpha))) break;
    b.push(beta);
    const t = prev;
    prev = cur;
    cur = t;
    for (let i = 0; i < len; i++) cur[i] = w[i]! / beta;
  }
  return { a, b, norm2: n0 * n0 };
}

/**
 * -(1/pi) Im of the continued fraction at z = omega + e0 + i eta: the broadened spectral weight
 * sum_n |<n|phi>|^2 L_eta(omega - (E_n - e0)) with Lorentzians of half width eta.
 */
export function continuedFractionSpectrum(t: TridiagonalResult, omega: number, e0: number, eta: number): number {
  const zr = omega + e0;
  // evaluate from the bottom: g = 1 / (z - a_n - b_{n+1}^2 g_{n+1})
  let gr = 0;
  let gi = 0;
  for (let n = t.a.length - 1; n >= 0; n--) {
    const b2 = n + 1 < t.b.length ? t.b[n + 1]! * t.b[n + 1]! : 0;
    const dr = zr - t.a[n]! - b2 * gr;
    const di = eta - b2 * gi;
    const d = dr * dr + di * di;
    gr = dr / d;
    gi = -di / d;
  }
  return (-t.norm2 * gi) / Math.PI;
}

/** Lowest eigenpair by the plain recursion (see LanczosOptions.reorthogonalization). */
function lowestByRecursion(op: SectorOperator, options: LanczosOptions): LanczosResult {
  const dim = op.dim;
  const complex = op.complex;
  const len = complex ? 2 * dim : dim;
  const tol = options.tol ?? 1e-10;
  const maxSteps = Math.min(options.maxMatvecs ?? 20000, 100000);
  let start: Float64Array;
  if (options.start) start = Float64Array.from(options.start);
  else {
    const rnd = pseudoRandom();
    start = new Float64Array(len);
    for (let i = 0; i < len; i++) start[i] = rnd();
  }
  const n0 = norm(start);
  for (let i = 0; i < len; i++) start[i] = start[i]! / n0;
  const a: number[] = [];
  const b: number[] = [];
  const c = new Float64Array(2);
  const lowest = (j: number, wantVector: boolean): { theta: number; z: Float64Array | null } => {
    const d = Float64Array.from(a.slice(0, j));
    const e = new Float64Array(j);
    for (let i = 0; i + 1 < j; i++) e[i] = b[i]!;
    if (!wantVector) {
      tql2Real(j, d, e, null, "Lanczos tridiagonal");
      return { theta: Math.min(...d), z: null };
    }
    const V = new Float64Array(j * j);
    for (let i = 0; i < j; i++) V[i * j + i] = 1;
    tql2Real(j, d, e, V, "Lanczos tridiagonal");
    let k = 0;
    for (let i = 1; i < j; i++) if (d[i]! < d[k]!) k = i;
    // the eigenvector is a row or a column of V: take the one that satisfies T z = theta z
    const row = Float64Array.from({ length: j }, (_, i) => V[k * j + i]!);
    const col = Float64Array.from({ length: j }, (_, i) => V[i * j + k]!);
    const res = (z: Float64Array) => {
      let r = 0;
      for (let i = 0; i < j; i++) {
        const t = a[i]! * z[i]! + (i > 0 ? b[i - 1]! * z[i - 1]! : 0) + (i + 1 < j ? b[i]! * z[i + 1]! : 0) - d[k]! * z[i]!;
        r += t * t;
      }
      return r;
    };
    return { theta: d[k]!, z: res(row) <= res(col) ? row : col };
  };
  let prev = new Float64Array(len);
  let cur = Float64Array.from(start);
  const w = new Float64Array(len);
  let beta = 0;
  let matvecs = 0;
  let lastTheta = Infinity;
  let steps = 0;
  let final: { theta: number; z: Float64Array; residual: number } | null = null;
  for (let j = 0; j < maxSteps; j++) {
    if (options.shouldStop?.()) throw new ComputationStopped("Lanczos", { matvecs, restarts: 0 });
    op.apply(cur, w);
    matvecs++;
    dot(cur, w, complex, c);
    const alpha = c[0]!;
    a.push(alpha);
    for (let i = 0; i < len; i++) w[i] = w[i]! - alpha * cur[i]! - beta * prev[i]!;
    beta = norm(w);
    steps = j + 1;
    const exhausted = beta < 1e-13 * Math.max(1, Math.abs(alpha)) || steps >= dim;
    if (steps % 10 === 0 || exhausted) {
      const { theta } = lowest(steps, false);
      options.onProgress?.({ matvecs, restarts: 0, lowest: theta, residual: NaN });
      if (exhausted || Math.abs(theta - lastTheta) <= 1e-3 * tol * Math.max(1, Math.abs(theta))) {
        const r = lowest(steps, true);
        const residual = exhausted ? 0 : beta * Math.abs(r.z![steps - 1]!);
        if (residual <= tol * Math.max(1, Math.abs(r.theta)) || exhausted) {
          final = { theta: r.theta, z: r.z!, residual };
          break;
        }
      }
      lastTheta = theta;
    }
    b.push(beta);
    const t = prev;
    prev = cur;
    cur = t;
    for (let i = 0; i < len; i++) cur[i] = w[i]! / beta;
  }
  if (!final) throw new ConvergenceError("Lanczos", `no convergence in ${maxSteps} steps`, { matvecs });
  const vectors: Float64Array[] = [];
  if (options.vectors ?? true) {
    // second pass: the same recursion from the same start, accumulating y = sum z_i v_i
    const y = new Float64Array(len);
    prev = new Float64Array(len);
    cur = Float64Array.from(start);
    let bt = 0;
    for (let j = 0; j < steps; j++) {
      axpy(final.z[j]!, 0, cur, y, complex);
      if (j + 1 === steps) break;
      op.apply(cur, w);
      matvecs++;
      for (let i = 0; i < len; i++) w[i] = w[i]! - a[j]! * cur[i]! - bt * prev[i]!;
      bt = b[j]!;
      const t = prev;
      prev = cur;
      cur = t;
      for (let i = 0; i < len; i++) cur[i] = w[i]! / bt;
    }
    const ny = norm(y);
    for (let i = 0; i < len; i++) y[i] = y[i]! / ny;
    vectors.push(y);
  }
  return { values: [final.theta], vectors, residuals: [final.residual], matvecs, restarts: 0 };
}
