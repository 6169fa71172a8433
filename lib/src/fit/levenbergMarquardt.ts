/**
 * Levenberg-Marquardt minimization of a sum of squares ||r(p)||^2, after J. More's MINPACK design
 * (J. More, "The Levenberg-Marquardt algorithm: implementation and theory", Lecture Notes in
 * Mathematics 630, 105-116 (1978); K. Levenberg, Q. Appl. Math. 2, 164 (1944); D. Marquardt,
 * J. SIAM 11, 431 (1963)):
 *
 * - the step solves min ||J p + r||^2 subject to ||D p|| <= Delta (trust region) through the
 *   damped system (J^T J + lambda D^2) p = -J^T r; lambda is found by More's safeguarded Newton
 *   iteration on phi(lambda) = ||D p(lambda)|| - Delta, with Householder QR (column pivoting) of J
 *   and Givens eliminations of sqrt(lambda) D, never forming J^T J (its condition number would be
 *   the square of J's);
 * - scaling D_j = max over iterations of the column norms of J (MINPACK mode 1);
 * - the trust radius grows or shrinks from the ratio of actual to predicted reduction.
 *
 * Box bounds (our choice, documented): *projection with an active set*. A parameter sitting on a
 * bound whose gradient points out of the box is frozen for that iteration; the trial point is
 * clipped into the box and the predicted reduction is recomputed for the clipped step, so the
 * trust-region logic stays exact. Unlike a variable transformation (sin or exp mappings) this
 * leaves the Jacobian, and so the covariance of parameters inside the box, untouched. A parameter
 * that ends ON a bound is reported as such: its standard error is not defined by the curvature
 * (the optimum is not a stationary point in that direction); the covariance is then computed for
 * the free parameters only, with the bounded one held fixed (conditional covariance).
 *
 * Convergence (as MINPACK, all relative): ftol on the relative reduction of the sum of squares,
 * xtol on the relative size of the trust region, gtol on the cosine between r and every free
 * Jacobian column, a maximum number of residual evaluations; and an AbortSignal-like stop flag
 * checked between evaluations (status "stopped").
 */
import { pivotedQr, applyQt, solveDampedTriangular, solveUpperTransposed, choleskyLower } from "../numeric/denseLinalg.js";
import { gramMatrix } from "../numeric/gramMatrix.js";

export interface LmProblem {
  /** Number of parameters. */
  n: number;
  /** Number of residuals. */
  m: number;
  /** Write the (weighted) residuals at p into out (length m). */
  residuals(p: Float64Array, out: Float64Array): void;
  /** Optional analytic Jacobian dr/dp (column-major m x n) at p; r is the residual at p. */
  jacobian?(p: Float64Array, out: Float64Array, r: Float64Array): void;
  lower?: ArrayLike<number>;
  upper?: ArrayLike<number>;
  /** Typical magnitude of each parameter (finite-difference steps and the zero-start scale). */
  typical?: ArrayLike<number>;
}

export interface LmOptions {
  /** Relative reduction of the sum of squares below which we stop (default 1e-12). */
  ftol?: number;
  /** Relative trust-region size below which we stop (default 1e-12). */
  xtol?: number;
  /** Cosine between residual and Jacobian columns below which we stop (default 1e-12). */
  gtol?: number;
  /** Maximum residual evaluations, excluding those of finite differences (default 200 (n + 1)). */
  maxEvaluations?: number;
  /** Initial trust radius factor: Delta_0 = stepBound * ||D x0|| (default 1, more cautious than MINPACK's 100, which lets BoxBOD from NIST start 1 run off to the b2 -> infinity plateau). */
  stepBound?: number;
  /** Called after every accepted iteration. */
  onProgress?: (info: LmProgress) => void;
  /** Stop flag: checked between evaluations. `{aborted: true}` or an AbortSignal. */
  signal?: { readonly aborted: boolean };
}

export interface LmProgress {
  iteration: number;
  evaluations: number;
  sumOfSquares: number;
  parameters: Float64Array;
}

export type LmStatus = "converged" | "max-evaluations" | "stopped" | "failed";

export interface LmResult {
  status: LmStatus;
  /** Which tests stopped it: "ftol", "xtol", "gtol", "ftol+xtol", "machine-precision", ... */
  reason: string;
  message: string;
  x: Float64Array;
  residuals: Float64Array;
  sumOfSquares: number;
  /** Residual evaluations (not counting finite-difference ones). */
  evaluations: number;
  /** Jacobian evaluations (analytic or by central differences). */
  jacobianEvaluations: number;
  /** Residual evaluations spent on finite differences. */
  differenceEvaluations: number;
  iterations: number;
  /** Parameters on a bound at the end (indices). */
  atBound: number[];
}

const EPS = 2.220446049250313e-16;

/**
 * R (upper triangular, R^T R = J^T J over the free columns, identity permutation) and
 * Q^T f = R^-T J^T f from a Cholesky factorization of the column-scaled normal matrix; null when
 * its reciprocal condition estimate is below 1e-8 (then the caller uses QR).
 */
function fastFactor(
  jac: Float64Array,
  m: number,
  free: number[],
  g: Float64Array,
  cn: Float64Array,
): { r: Float64Array; perm: Int32Array; rank: number; qtf: Float64Array } | null {
  const nf = free.length;
  if (m < 4 * nf || nf > 12) return null;
  for (const j of free) if (cn[j] === 0) return null;
  const G = gramMatrix(jac, m, nf, free);
  for (let a = 0; a < nf; a++) for (let b = 0; b <= a; b++) G[a + b * nf]! /= cn[free[a]!]! * cn[free[b]!]!;
  // Cholesky G = L L^T (lower, column-major)
  const L = choleskyLower(G, nf, 1e-4);
  if (!L) return null;
  // R = L^T diag(cn): R_ij = L_ji cn_j
  const r = new Float64Array(nf * nf);
  for (let i = 0; i < nf; i++) for (let j = i; j < nf; j++) r[i + j * nf] = L[j + i * nf]! * cn[free[j]!]!;
  // qtf = R^-T (J^T f): forward substitution with R^T (lower)
  const qtf = new Float64Array(nf);
  for (let i = 0; i < nf; i++) {
    let s = g[free[i]!]!;
    for (let k = 0; k < i; k++) s -= r[k + i * nf]! * qtf[k]!;
    qtf[i] = s / r[i + i * nf]!;
  }
  const perm = new Int32Array(nf);
  for (let i = 0; i < nf; i++) perm[i] = i;
  return { r, perm, rank: nf, qtf };
}
const DWARF = 2.2250738585072014e-308;

/** Central-difference Jacobian (one-sided second-order formula next to a bound). */
export function centralDifferenceJacobian(problem: LmProblem, p: Float64Array, out: Float64Array): number {
  const { n, m } = problem;
  const h0 = Math.cbrt(EPS);
  const lo = problem.lower;
  const hi = problem.upper;
  const ra = new Float64Array(m);
  const rb = new Float64Array(m);
  const q = Float64Array.from(p);
  let evals = 0;
  for (let j = 0; j < n; j++) {
    const typ = problem.typical ? Math.abs(problem.typical[j]!) : 0;
    const scale = Math.max(Math.abs(p[j]!), typ > 0 ? typ : Math.abs(p[j]!) > 0 ? 0 : 1);
    let h = h0 * (scale > 0 ? scale : 1);
    const l = lo ? lo[j]! : -Infinity;
    const u = hi ? hi[j]! : Infinity;
    const off = j * m;
    if (p[j]! - h >= l && p[j]! + h <= u) {
      q[j] = p[j]! + h;
      const hp = q[j]! - p[j]!;
      problem.residuals(q, ra);
      q[j] = p[j]! - h;
      const hm = p[j]! - q[j]!;
      problem.residuals(q, rb);
      evals += 2;
      const d = hp + hm;
      for (let i = 0; i < m; i++) out[off + i] = (ra[i]! - rb[i]!) / d;
    } else {
      // one-sided, second order: f'(x) ~ (-3 f0 + 4 f1 - f2) / (2 h), stepping into the box
      const dir = p[j]! + 2 * h <= u ? 1 : -1;
      if (dir < 0 && p[j]! - 2 * h < l) h = Math.max((p[j]! - l) / 2, EPS * Math.max(1, Math.abs(p[j]!)));
      const r0 = new Float64Array(m);
      q[j] = p[j]!;
      problem.residuals(q, r0);
      q[j] = p[j]! + dir * h;
      problem.residuals(q, ra);
      q[j] = p[j]! + 2 * dir * h;
      problem.residuals(q, rb);
      evals += 3;
      for (let i = 0; i < m; i++) out[off + i] = (dir * (-3 * r0[i]! + 4 * ra[i]! - rb[i]!)) / (2 * h);
    }
    q[j] = p[j]!;
  }
  return evals;
}

function norm(a: ArrayLike<number>): number {
  // scaled to avoid overflow
  let scale = 0;
  let ssq = 1;
  for (let i = 0; i < a.length; i++) {
    const v = a[i]!;
    if (v !== 0) {
      const av = Math.abs(v);
      if (scale < av) {
        ssq = 1 + ssq * (scale / av) * (scale / av);
        scale = av;
      } else ssq += (av / scale) * (av / scale);
    }
  }
  return scale * Math.sqrt(ssq);
}

/**
 * More's LM parameter: returns the step p (in free-parameter order) with ||D p|| ~ Delta and the
 * lambda used. `rfull` is R of J P = Q R (nf x nf), diagP the scaling in pivoted order.
 */
function lmStep(
  r: Float64Array,
  nf: number,
  perm: Int32Array,
  rank: number,
  diag: Float64Array,
  delta: number,
  qtf: Float64Array,
  lambda0: number,
): { p: Float64Array; lambda: number } {
  const diagP = new Float64Array(nf);
  for (let j = 0; j < nf; j++) diagP[j] = diag[perm[j]!]!;
  const negQtf = qtf.map((v) => -v);
  const toX = (z: Float64Array) => {
    const p = new Float64Array(nf);
    for (let j = 0; j < nf; j++) p[perm[j]!] = z[j]!;
    return p;
  };
  const dnorm = (p: Float64Array) => {
    let s = 0;
    for (let j = 0; j < nf; j++) s += (diag[j]! * p[j]!) ** 2;
    return Math.sqrt(s);
  };
  // Gauss-Newton step
  const gn = solveDampedTriangular(r, nf, diagP, 0, negQtf, rank);
  let p = toX(gn.z);
  let dxnorm = dnorm(p);
  let fp = dxnorm - delta;
  if (fp <= 0.1 * delta) return { p, lambda: 0 };
  // lower bound
  let parl = 0;
  if (rank === nf) {
    const wa = new Float64Array(nf);
    for (let j = 0; j < nf; j++) {
      const l = perm[j]!;
      wa[j] = (diag[l]! * (diag[l]! * p[l]!)) / dxnorm;
    }
    const w = solveUpperTransposed(r, nf, wa);
    const t = norm(w);
    parl = fp / delta / (t * t);
  }
  // upper bound
  const g = new Float64Array(nf);
  for (let j = 0; j < nf; j++) {
    let s = 0;
    for (let i = 0; i <= j; i++) s += r[i + j * nf]! * qtf[i]!;
    g[j] = s / diagP[j]!;
  }
  const gnorm = norm(g);
  let paru = gnorm / delta;
  if (paru === 0) paru = DWARF / Math.min(delta, 0.1);
  let lambda = Math.min(Math.max(lambda0, parl), paru);
  if (lambda === 0) lambda = gnorm / dxnorm;
  for (let iter = 1; iter <= 10; iter++) {
    if (lambda === 0) lambda = Math.max(DWARF, 0.001 * paru);
    const sol = solveDampedTriangular(r, nf, diagP, lambda, negQtf, nf);
    p = toX(sol.z);
    dxnorm = dnorm(p);
    const temp = fp;
    fp = dxnorm - delta;
    if (Math.abs(fp) <= 0.1 * delta || (parl === 0 && fp <= temp && temp < 0) || iter === 10) break;
    const wa = new Float64Array(nf);
    for (let j = 0; j < nf; j++) {
      const l = perm[j]!;
      wa[j] = (diag[l]! * (diag[l]! * p[l]!)) / dxnorm;
    }
    const w = solveUpperTransposed(sol.s, nf, wa);
    const t = norm(w);
    const parc = fp / delta / (t * t);
    if (fp > 0) parl = Math.max(parl, lambda);
    if (fp < 0) paru = Math.min(paru, lambda);
    lambda = Math.max(parl, lambda + parc);
  }
  return { p, lambda };
}

/** Run Levenberg-Marquardt from x0 (which must lie inside the bounds). */
export function levenbergMarquardt(problem: LmProblem, x0: ArrayLike<number>, options: LmOptions = {}): LmResult {
  const { n, m } = problem;
  const ftol = options.ftol ?? 1e-12;
  const xtol = options.xtol ?? 1e-12;
  const gtol = options.gtol ?? 1e-12;
  const maxfev = options.maxEvaluations ?? 200 * (n + 1);
  const factor = options.stepBound ?? 1;
  const lo = problem.lower ?? new Float64Array(n).fill(-Infinity);
  const hi = problem.upper ?? new Float64Array(n).fill(Infinity);
  const x = Float64Array.from(x0);
  const f = new Float64Array(m);
  const ft = new Float64Array(m);
  const jac = new Float64Array(m * n);
  let nfev = 0;
  let njev = 0;
  let ndiff = 0;
  let iterations = 0;
  const result = (status: LmStatus, reason: string, message: string): LmResult => {
    const atBound: number[] = [];
    for (let j = 0; j < n; j++) if (x[j]! <= lo[j]! || x[j]! >= hi[j]!) atBound.push(j);
    return {
      status,
      reason,
      message,
      x: Float64Array.from(x),
      residuals: Float64Array.from(f),
      sumOfSquares: sumsq(f),
      evaluations: nfev,
      jacobianEvaluations: njev,
      differenceEvaluations: ndiff,
      iterations,
      atBound,
    };
  };
  problem.residuals(x, f);
  nfev++;
  let fnorm = norm(f);
  if (!Number.isFinite(fnorm)) {
    return result("failed", "non-finite-start", "the residuals at the start values are not finite (NaN or infinity)");
  }
  const diag = new Float64Array(n);
  let delta = 0;
  let xnorm = 0;
  let lambda = 0;
  let first = true;
  let jfree: Float64Array | null = null; // allocated on the first QR step only
  const jpa = new Float64Array(m);
  const dots = new Float64Array(2);
  for (;;) {
    if (options.signal?.aborted) return result("stopped", "stopped", "stopped on request before convergence");
    // Jacobian
    if (problem.jacobian) problem.jacobian(x, jac, f);
    else ndiff += centralDifferenceJacobian(problem, x, jac);
    njev++;

    // gradient g = J^T f, active set
    const free: number[] = [];
    const g = new Float64Array(n);
    const cn = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      const off = j * m;
      columnDot(jac, off, f, m, dots);
      const s = dots[0]!;
      const c = dots[1]!;
      if (!Number.isFinite(s) || !Number.isFinite(c)) {
        let row = 0;
        while (row < m && Number.isFinite(jac[off + row])) row++;
        return result("failed", "non-finite-jacobian", `the Jacobian column of parameter #${j} is not finite at row ${row}`);
      }
      g[j] = s;
      cn[j] = Math.sqrt(c);
      const blockedLow = x[j]! <= lo[j]! && s > 0;
      const blockedHigh = x[j]! >= hi[j]! && s < 0;
      if (!blockedLow && !blockedHigh) free.push(j);
    }
    const nf = free.length;
    // gradient test (projected)
    let gnorm = 0;
    if (fnorm > 0) {
      for (const j of free) if (cn[j]! > 0) gnorm = Math.max(gnorm, Math.abs(g[j]!) / (cn[j]! * fnorm));
    }
    if (nf === 0) return result("converged", "bounds", "every parameter is held by a bound with the gradient pointing outward");
    if (gnorm <= gtol) return result("converged", "gtol", `the residual is orthogonal to the Jacobian columns to gtol = ${gtol}`);
    // scaling
    if (first) {
      for (let j = 0; j < n; j++) diag[j] = cn[j] === 0 ? 1 : cn[j]!;
      xnorm = scaledNorm(diag, x);
      delta = factor * xnorm;
      if (delta === 0) delta = factor;
    } else {
      for (let j = 0; j < n; j++) diag[j] = Math.max(diag[j]!, cn[j]!);
    }
    // R and Q^T f of the free columns: from the Cholesky factor of the column-scaled J^T J when it
    // is well conditioned (cond(J) < 1e4: one pass over J, the step accuracy is then ~1e-8 and the
    // residuals themselves are always evaluated exactly), else Householder QR with pivoting
    let qr = fastFactor(jac, m, free, g, cn);
    let qtf: Float64Array;
    if (qr) {
      qtf = qr.qtf;
    } else {
      // QR of the column-normalized J (so the numerical-rank decision does not depend on the
      // units of the parameters: columns may differ by 1e16 in norm), then R rescaled:
      // J C^-1 P = Q R'  =>  J P = Q R' (P^T C P), still upper triangular
      for (let k = 0; k < nf; k++) {
        const c = cn[free[k]!]! > 0 ? 1 / cn[free[k]!]! : 1;
        const src = free[k]! * m;
        const dst = k * m;
        jfree ??= new Float64Array(m * n);
        for (let i = 0; i < m; i++) jfree[dst + i] = jac[src + i]! * c;
      }
      const full = pivotedQr(jfree!.subarray(0, nf * m), m, nf);
      qtf = applyQt(full, f).subarray(0, nf);
      const rs = full.r;
      for (let j = 0; j < nf; j++) {
        const c = cn[free[full.perm[j]!]!]! > 0 ? cn[free[full.perm[j]!]!]! : 1;
        for (let i = 0; i <= j; i++) rs[i + j * nf]! *= c;
      }
      qr = { r: rs, perm: full.perm, rank: full.rank, qtf };
    }
    const diagFree = new Float64Array(nf);
    for (let k = 0; k < nf; k++) diagFree[k] = diag[free[k]!]!;
    // inner loop
    for (;;) {
      if (options.signal?.aborted) return result("stopped", "stopped", "stopped on request before convergence");
      const step = lmStep(qr.r, nf, qr.perm, qr.rank, diagFree, delta, Float64Array.from(qtf), lambda);
      lambda = step.lambda;
      const xt = Float64Array.from(x);
      for (let k = 0; k < nf; k++) {
        const j = free[k]!;
        xt[j] = Math.min(hi[j]!, Math.max(lo[j]!, x[j]! + step.p[k]!));
      }
      const pa = new Float64Array(n);
      for (let j = 0; j < n; j++) pa[j] = xt[j]! - x[j]!;
      const pnorm = scaledNorm(diag, pa);
      if (first) delta = Math.min(delta, pnorm);
      problem.residuals(xt, ft);
      nfev++;
      const fnorm1 = norm(ft);
      const finite = Number.isFinite(fnorm1);
      const actred = finite && 0.1 * fnorm1 < fnorm ? 1 - (fnorm1 / fnorm) ** 2 : -1;
      // predicted reduction of the (clipped) step from the linear model
      jacobianTimes(jac, pa, m, n, jpa);
      linearModel(f, jpa, m, dots);
      const fjp = dots[0]!;
      const sq = dots[1]!;
      const f2 = fnorm * fnorm;
      const prered = f2 > 0 ? 1 - sq / f2 : 0;
      const dirder = f2 > 0 ? fjp / f2 : 0;
      const ratio = prered !== 0 ? actred / prered : 0;
      if (ratio <= 0.25) {
        let temp = actred >= 0 ? 0.5 : (0.5 * dirder) / (dirder + 0.5 * actred);
        if (!finite || 0.1 * fnorm1 >= fnorm || temp < 0.1) temp = 0.1;
        delta = temp * Math.min(delta, pnorm / 0.1);
        lambda = lambda / temp;
      } else if (lambda === 0 || ratio >= 0.75) {
        delta = pnorm / 0.5;
        lambda = 0.5 * lambda;
      }
      let accepted = false;
      if (ratio >= 1e-4 && finite) {
        x.set(xt);
        f.set(ft);
        fnorm = fnorm1;
        xnorm = scaledNorm(diag, x);
        iterations++;
        accepted = true;
        options.onProgress?.({ iteration: iterations, evaluations: nfev, sumOfSquares: fnorm * fnorm, parameters: Float64Array.from(x) });
      }
      first = false;
      const fconv = Math.abs(actred) <= ftol && prered <= ftol && 0.5 * ratio <= 1;
      const xconv = delta <= xtol * xnorm;
      if (fconv && xconv) return result("converged", "ftol+xtol", "both the relative reduction of the sum of squares and the relative step are below tolerance");
      if (fconv) return result("converged", "ftol", `the relative reduction of the sum of squares is below ftol = ${ftol}`);
      if (xconv) return result("converged", "xtol", `the relative change of the parameters is below xtol = ${xtol}`);
      if (fnorm === 0) return result("converged", "exact", "the residuals are exactly zero");
      if (nfev >= maxfev) return result("max-evaluations", "max-evaluations", `stopped after ${nfev} evaluations (maxEvaluations = ${maxfev}) before convergence`);
      if (Math.abs(actred) <= EPS && prered <= EPS && 0.5 * ratio <= 1)
        return result("converged", "machine-precision", "no further reduction of the sum of squares is possible in double precision (ftol too small)");
      if (delta <= EPS * xnorm) return result("converged", "machine-precision", "no further improvement of the parameters is possible in double precision (xtol too small)");
      if (accepted) break;
    }
  }
}

// Hot loops over the residuals live in small functions of their own, so the JIT optimizes them
// early and independently of the large driver (measured: the driver's own loops cost ~8 ms per
// 4000-point fit before this split).

/** out[0] = J_col . f, out[1] = |J_col|^2 for the column starting at off. */
function columnDot(jac: Float64Array, off: number, f: Float64Array, m: number, out: Float64Array): void {
  let s = 0;
  let c = 0;
  for (let i = 0; i < m; i++) {
    const v = jac[off + i]!;
    s += v * f[i]!;
    c += v * v;
  }
  out[0] = s;
  out[1] = c;
}

/** out = J p (column-major J, m x n). */
function jacobianTimes(jac: Float64Array, p: Float64Array, m: number, n: number, out: Float64Array): void {
  out.fill(0);
  for (let j = 0; j < n; j++) {
    const pj = p[j]!;
    if (pj === 0) continue;
    const off = j * m;
    for (let i = 0; i < m; i++) out[i]! += jac[off + i]! * pj;
  }
}

/** out[0] = f . Jp, out[1] = |f + Jp|^2. */
function linearModel(f: Float64Array, jp: Float64Array, m: number, out: Float64Array): void {
  let fjp = 0;
  let sq = 0;
  for (let i = 0; i < m; i++) {
    const v = jp[i]!;
    fjp += f[i]! * v;
    const w = f[i]! + v;
    sq += w * w;
  }
  out[0] = fjp;
  out[1] = sq;
}

function sumsq(a: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * a[i]!;
  return s;
}

function scaledNorm(d: ArrayLike<number>, x: ArrayLike<number>): number {
  let s = 0;
  for (let j = 0; j < x.length; j++) s += (d[j]! * x[j]!) ** 2;
  return Math.sqrt(s);
}
