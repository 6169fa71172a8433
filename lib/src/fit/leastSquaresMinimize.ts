/**
 * The minimization shared by the least-squares driver (leastSquares.ts), its covariance
 * (fitCovariance.ts), profile likelihood (profileLikelihood.ts) and bootstrap (fitBootstrap.ts):
 * Levenberg-Marquardt on the weighted residuals (f - y) / sigma with some parameters held fixed,
 * and the weighted Jacobian at a point (the model's analytic one when it has it, else central
 * differences inside the box).
 */
import type { FitParameter, LeastSquaresProblem } from "./leastSquares.js";
import { levenbergMarquardt, centralDifferenceJacobian, type LmOptions, type LmProblem, type LmStatus } from "./levenbergMarquardt.js";
import { gather } from "../numeric/indexing.js";

/** Typical size of a parameter (the scale of its finite-difference step and of the LM scaling). */
export function typicalOf(p: FitParameter): number {
  if (p.typical && p.typical > 0) return p.typical;
  if (p.value !== 0) return Math.abs(p.value);
  const span = (p.max ?? Infinity) - (p.min ?? -Infinity);
  return Number.isFinite(span) && span > 0 ? span * 1e-3 : 1;
}

export interface Core {
  x: Float64Array; // full vector
  status: LmStatus;
  reason: string;
  message: string;
  evaluations: number;
  jacobianEvaluations: number;
  iterations: number;
  chiSquare: number;
  /** Weighted residuals (f - y) / sigma at x, from the last evaluation of the minimizer. */
  residuals: Float64Array;
}

/** Minimize with the parameters in `freeIdx` free, others held at `base`. */
export function minimize(problem: LeastSquaresProblem, base: Float64Array, freeIdx: number[], lo: Float64Array, hi: Float64Array, options: LmOptions): Core {
  const { m, y, sigma } = problem;
  const nAll = base.length;
  const full = Float64Array.from(base);
  const model = new Float64Array(m);
  const fullJac = problem.modelJacobian ? new Float64Array(m * nAll) : null;
  const setFull = (p: Float64Array) => {
    for (let k = 0; k < freeIdx.length; k++) full[freeIdx[k]!] = p[k]!;
  };
  const lm: LmProblem = {
    n: freeIdx.length,
    m,
    residuals(p, out) {
      setFull(p);
      problem.model(full, model);
      if (sigma) for (let i = 0; i < m; i++) out[i] = (model[i]! - y[i]!) / sigma[i]!;
      else for (let i = 0; i < m; i++) out[i] = model[i]! - y[i]!;
    },
    lower: gather(lo, freeIdx, "lower bounds"),
    upper: gather(hi, freeIdx, "upper bounds"),
    typical: freeIdx.map((j) => typicalOf(problem.parameters[j]!)),
  };
  if (problem.modelJacobian && fullJac) {
    lm.jacobian = (p, out) => {
      setFull(p);
      problem.modelJacobian!(full, fullJac);
      for (let k = 0; k < freeIdx.length; k++) {
        const src = freeIdx[k]! * m;
        const dst = k * m;
        if (sigma) for (let i = 0; i < m; i++) out[dst + i] = fullJac[src + i]! / sigma[i]!;
        else out.set(fullJac.subarray(src, src + m), dst);
      }
    };
  }
  const r = levenbergMarquardt(lm, gather(base, freeIdx, "start values"), options);
  setFull(r.x);
  return {
    x: Float64Array.from(full),
    status: r.status,
    reason: r.reason,
    message: r.message,
    evaluations: r.evaluations + r.differenceEvaluations,
    jacobianEvaluations: r.jacobianEvaluations,
    iterations: r.iterations,
    chiSquare: r.sumOfSquares,
    residuals: r.residuals,
  };
}

/** Weighted Jacobian of the residuals (column-major m x freeIdx.length) at the full vector x. */
export function weightedJacobian(problem: LeastSquaresProblem, x: Float64Array, freeIdx: number[], lo: Float64Array, hi: Float64Array): Float64Array {
  const { m, sigma } = problem;
  const nAll = x.length;
  const out = new Float64Array(m * freeIdx.length);
  if (problem.modelJacobian) {
    const full = new Float64Array(m * nAll);
    problem.modelJacobian(x, full);
    for (let k = 0; k < freeIdx.length; k++) {
      const src = freeIdx[k]! * m;
      for (let i = 0; i < m; i++) out[k * m + i] = full[src + i]! / (sigma ? sigma[i]! : 1);
    }
    return out;
  }
  const base = Float64Array.from(x);
  const model = new Float64Array(m);
  const lmp: LmProblem = {
    n: freeIdx.length,
    m,
    residuals(p, o) {
      for (let k = 0; k < freeIdx.length; k++) base[freeIdx[k]!] = p[k]!;
      problem.model(base, model);
      for (let i = 0; i < m; i++) o[i] = (model[i]! - problem.y[i]!) / (sigma ? sigma[i]! : 1);
    },
    lower: gather(lo, freeIdx, "lower bounds"),
    upper: gather(hi, freeIdx, "upper bounds"),
    typical: freeIdx.map((j) => typicalOf(problem.parameters[j]!)),
  };
  centralDifferenceJacobian(lmp, Float64Array.from(gather(x, freeIdx, "fitted values")), out);
  return out;
}
